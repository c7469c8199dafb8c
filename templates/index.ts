// The note: Findings in, words out. Wording and order live in the .njk files beside this one; a department
// may override any of them with a file of the same name in its own folder (NOTE_TEMPLATES).
import nunjucks from 'nunjucks';
import { readdirSync, statSync } from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { interpret, type Findings, type Flag } from '../calc/index.ts';
import { EXAMPLES } from './examples.ts';
import { formatter } from './format.ts';
import { flagView } from './flagView.ts';
import { buildView, type NoteFormat } from './view.ts';

export interface Note {
  /** the one-line interpretation */
  line: string;
  /** the chart-ready note: the line, assessment and plan, and the cautions specific to this case */
  text: string;
  /** the full reasoning: interpretation, oxygenation, ventilation, plan, cautions */
  full: string;
  /** the handover block */
  handover: string;
  format: 'text' | 'markdown';
}

export interface NoteRenderer {
  render(findings: Findings, options?: { format?: 'text' | 'markdown' }): Note;
  /** one sentence per flag, used for the API's flags[].message */
  flagMessage(flag: Flag, findings: Findings): string;
}

/** The default templates: this folder. */
export const DEFAULT_TEMPLATE_DIR = path.dirname(fileURLToPath(import.meta.url));

/** The templates the renderer calls by name; the others are imported or included by these. */
const ENTRY = {
  line: 'line.njk',
  text: 'short.njk',
  full: 'note.njk',
  handover: 'handover.njk',
} as const;
const FLAG_MESSAGE_SOURCE = '{% import "flag.njk" as fl %}{{ fl.message(flag) }}';

/**
 * Whitespace inside a paragraph becomes single spaces; no space is left before , . ; : ) or after (, and a
 * sentence that a template tag ran into the next one gets its space back. One pass over the text (every bullet and
 * line of every note goes through here); the test beside it holds it to the same rules written as regular
 * expressions.
 */
export function paragraph(value: unknown): string {
  const text = String(value ?? '');
  const parts: string[] = [];
  let last = ''; // the last character written
  let space = false; // whitespace seen since it
  let start = 0; // the start of the run of characters not yet written
  for (let i = 0; i < text.length; i++) {
    const code = text.charCodeAt(i);
    const white =
      code <= 32 ? code === 32 || (code >= 9 && code <= 13) : code > 127 && WHITE.test(text[i]!);
    if (white) {
      if (start < i) parts.push(text.slice(start, i));
      start = i + 1;
      space = last !== '';
      continue;
    }
    const ch = text[i]!;
    if (space) {
      if (!CLOSING.includes(ch) && last !== '(') parts.push(' ');
    } else if (code >= 65 && code <= 90 && (last === '.' || last === ';' || last === ':')) {
      if (start < i) parts.push(text.slice(start, i));
      start = i;
      parts.push(' ');
    }
    space = false;
    last = ch;
  }
  if (start < text.length) parts.push(text.slice(start));
  return parts.join('');
}
const WHITE = /\s/;
const CLOSING = ',.;:)';

/** What nunjucks gives a filter as `this`: the render's context. */
type FilterThis = { lookup(name: string): { md?: boolean } | undefined };

/** First letter up, the rest untouched (unlike nunjucks' capitalize, which would spoil "PaCO2"). */
export function sentenceCase(value: unknown): string {
  const text = String(value ?? '').trim();
  return text.charAt(0).toUpperCase() + text.slice(1);
}

/** Trailing spaces go, runs of blank lines shrink to one. */
function tidy(text: string): string {
  return text
    .split('\n')
    .map((l) => l.trimEnd())
    .join('\n')
    .replace(/\n{3,}/g, '\n\n')
    .trim();
}

function templateFiles(dir: string, prefix = ''): string[] {
  const out: string[] = [];
  for (const entry of readdirSync(path.join(dir, prefix), { withFileTypes: true })) {
    const name = prefix ? `${prefix}/${entry.name}` : entry.name;
    if (entry.isDirectory()) out.push(...templateFiles(dir, name));
    else if (entry.isFile() && entry.name.endsWith('.njk')) out.push(name);
  }
  return out;
}

function checkFolder(dir: string): string {
  const resolved = path.resolve(dir);
  let ok = false;
  try {
    ok = statSync(resolved).isDirectory();
  } catch {
    ok = false;
  }
  if (!ok)
    throw new Error(
      `Note template folder "${dir}" does not exist or is not a folder (check NOTE_TEMPLATES)`,
    );
  return resolved;
}

function isFindings(x: unknown): x is Findings {
  return (
    typeof x === 'object' &&
    x !== null &&
    (x as { ok?: unknown }).ok === true &&
    'derived' in x &&
    'case' in x
  );
}

/**
 * One nunjucks environment per renderer. Every template is read and compiled here, once; a render reads no file.
 * A template that prints a missing value throws (throwOnUndefined), so a gap in the data never reaches a note.
 */
export function createNoteRenderer(options: { templateDir?: string | null } = {}): NoteRenderer {
  const departmentDir = options.templateDir ? checkFolder(options.templateDir) : null;
  const searchPaths =
    departmentDir && departmentDir !== DEFAULT_TEMPLATE_DIR
      ? [departmentDir, DEFAULT_TEMPLATE_DIR]
      : [DEFAULT_TEMPLATE_DIR];
  const loader = new nunjucks.FileSystemLoader(searchPaths, { noCache: false, watch: false });
  const env = new nunjucks.Environment(loader, {
    autoescape: false,
    throwOnUndefined: true,
    trimBlocks: true,
    lstripBlocks: true,
  });
  env.addFilter('para', paragraph);
  // the layout blocks of format.njk as filters: {% filter bullet %}...{% endfilter %} prints "- text" or nothing
  env.addFilter('bullet', (body: unknown) => {
    const text = paragraph(body);
    return text ? `- ${text}\n` : '';
  });
  env.addFilter('paragraph', (body: unknown) => {
    const text = paragraph(body);
    return text ? `${text}\n\n` : '';
  });
  env.addFilter('section', function (this: FilterThis, body: unknown, title: string) {
    const text = String(body ?? '').trim();
    return text ? `${this.lookup('v')?.md ? `## ${title}` : title.toUpperCase()}\n${text}\n\n` : '';
  });
  env.addFilter('subsection', function (this: FilterThis, body: unknown, title: string) {
    const text = String(body ?? '').trim();
    return text ? `${this.lookup('v')?.md ? `### ${title}` : `${title}:`}\n${text}\n\n` : '';
  });
  env.addFilter('sentence', sentenceCase);
  // nunjucks' own trim is a regular expression whose end anchor rescans long text; the native trim is the same rule
  env.addFilter('trim', (value: unknown) => String(value ?? '').trim());
  env.addFilter('known', (items: unknown) =>
    Array.isArray(items)
      ? items.filter((x) => x !== null && x !== undefined && String(x).trim() !== '')
      : [],
  );
  env.addFilter('knownPairs', (pairs: unknown) =>
    Array.isArray(pairs)
      ? pairs.filter(
          (p) =>
            Array.isArray(p) && p[1] !== null && p[1] !== undefined && String(p[1]).trim() !== '',
        )
      : [],
  );

  // read and compile everything now, the department's files and the defaults alike
  for (const dir of searchPaths) for (const name of templateFiles(dir)) env.getTemplate(name, true);
  const line = env.getTemplate(ENTRY.line, true);
  const text = env.getTemplate(ENTRY.text, true);
  const note = env.getTemplate(ENTRY.full, true);
  const handover = env.getTemplate(ENTRY.handover, true);
  const flagMessage = new nunjucks.Template(FLAG_MESSAGE_SOURCE, env, 'flag-message', true);

  const renderer: NoteRenderer = {
    render(findings, renderOptions = {}) {
      if (!isFindings(findings))
        throw new TypeError(
          'render() needs the findings of an accepted case (interpret() returned errors)',
        );
      const format: NoteFormat = renderOptions.format ?? 'text';
      if (format !== 'text' && format !== 'markdown')
        throw new TypeError(`Unknown note format "${String(format)}": use "text" or "markdown"`);
      const v = buildView(findings, format);
      const oneLine = paragraph(run(line, { v }));
      return {
        line: oneLine,
        text: tidy(run(text, { v, line: oneLine })),
        full: tidy(run(note, { v, line: oneLine })),
        handover: tidy(run(handover, { v })),
        format,
      };
    },
    flagMessage(flag, findings) {
      if (!isFindings(findings))
        throw new TypeError('flagMessage() needs the findings the flag came from');
      const view = flagView(flag, findings, formatter(findings.units));
      return paragraph(run(flagMessage, { flag: view, v: { md: false } }));
    },
  };
  // a department's folder is code: every invented example must render with it before the server starts
  if (departmentDir) checkDepartmentTemplates(renderer, departmentDir);
  return renderer;
}

/**
 * A template that failed while rendering: its class and the template's name only (the message of a template
 * error can quote the data, and no case value may reach a log).
 */
export class TemplateError extends Error {
  constructor(
    readonly template: string,
    readonly kind: string,
  ) {
    super(`template ${template} failed (${kind})`);
    this.name = 'TemplateError';
  }
}

function run(template: nunjucks.Template, data: Record<string, unknown>): string {
  try {
    return template.render(data);
  } catch (error) {
    // nunjucks names the template that failed at the start of its message: "(plan.njk) [Line 4, Column 3]"
    const named = /^\(([^()\n]{1,200})\)/.exec(error instanceof Error ? error.message : '');
    // the file name only: where a department keeps its folder is the deployment's business
    const file = named?.[1]?.replace(/^.*[\\/]/, '') ?? 'unknown';
    throw new TemplateError(file, error instanceof Error ? error.name : typeof error);
  }
}

/** Render every invented example, in both formats and every flag's sentence, or refuse with a clear message. */
function checkDepartmentTemplates(renderer: NoteRenderer, dir: string): void {
  for (const [name, example] of Object.entries(EXAMPLES)) {
    const findings = interpret(example);
    if (!findings.ok) continue;
    try {
      for (const format of ['text', 'markdown'] as const) renderer.render(findings, { format });
      for (const flag of findings.flags) renderer.flagMessage(flag, findings);
    } catch (error) {
      const what =
        error instanceof TemplateError ? `${error.template} failed (${error.kind})` : String(error);
      throw new Error(
        `The note templates in "${dir}" (NOTE_TEMPLATES) cannot render the invented example "${name}": ${what}. Gasline will not start with templates that fail; fix the template or remove it to use the default.`,
      );
    }
  }
}
