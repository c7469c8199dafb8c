// The note: Findings in, words out. Wording and order live in the .njk files beside this one; a department
// may override any of them with a file of the same name in its own folder (NOTE_TEMPLATES).
import nunjucks from 'nunjucks';
import { readdirSync, statSync } from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import type { Findings, Flag } from '../calc/index.ts';
import { formatter } from './format.ts';
import { flagView } from './flagView.ts';
import { buildView, type NoteFormat } from './view.ts';
import { createCompiledTemplates, Unsupported } from './compile.ts';

export interface Note {
  line: string;
  text: string;
  handover: string;
  format: 'text' | 'markdown';
}

export interface NoteRenderer {
  /** 'compiled': the templates run as compiled functions (compile.ts); 'nunjucks': nunjucks' own runtime */
  readonly engine: 'compiled' | 'nunjucks';
  render(findings: Findings, options?: { format?: 'text' | 'markdown' }): Note;
  /** one sentence per flag, used for the API's flags[].message */
  flagMessage(flag: Flag, findings: Findings): string;
}

/** The default templates: this folder. */
export const DEFAULT_TEMPLATE_DIR = path.dirname(fileURLToPath(import.meta.url));

/** The templates the renderer calls by name; the others are imported or included by these. */
const ENTRY = { line: 'line.njk', note: 'note.njk', handover: 'handover.njk' } as const;
const FLAG_MESSAGE_SOURCE = '{% import "flag.njk" as fl %}{{ fl.message(flag) }}';

/**
 * Whitespace inside a paragraph becomes single spaces; no space is left before punctuation, and a sentence
 * that a template tag ran into the next one gets its space back. Character classes for the rules below, for
 * every UTF-16 code unit; SPACE is exactly what a regular expression's \s matches (the test checks all 65,536).
 */
const SPACE = 1,
  UPPER = 2,
  STOP = 3,
  CLOSING = 4,
  OPENING = 5; // STOP (. ; :) also closes
export const WHITESPACE_CODES = [
  9, 10, 11, 12, 13, 32, 160, 5760, 8192, 8193, 8194, 8195, 8196, 8197, 8198, 8199, 8200, 8201,
  8202, 8232, 8233, 8239, 8287, 12288, 65279,
];
const CLASS = new Uint8Array(65536);
for (const c of WHITESPACE_CODES) CLASS[c] = SPACE;
for (let c = 65; c <= 90; c++) CLASS[c] = UPPER;
for (const c of [46, 59, 58]) CLASS[c] = STOP;
for (const c of [44, 41]) CLASS[c] = CLOSING;
CLASS[40] = OPENING;

/**
 * One pass over the text: whitespace runs become one space, no space before , . ; : ) or after (, a space
 * after . ; : when a capital follows directly, and no space at either end. Stretches that need no change
 * (words with single spaces between them) are copied whole; only the places that change break the copy.
 */
export function paragraph(value: unknown): string {
  const text = String(value ?? '');
  const n = text.length;
  let out = '';
  let start = -1; // where the stretch being copied began; -1 while none is open
  let last = -1; // class of the last character kept that is not a space; -1 while none is
  let prev = -1; // class of the character just before this one in the output
  let i = 0;
  while (i < n) {
    const c = CLASS[text.charCodeAt(i)]!;
    if (c !== SPACE) {
      if (start < 0) start = i;
      else if (c === UPPER && prev === STOP) {
        out += text.slice(start, i) + ' ';
        start = i;
      }
      prev = last = c;
      i++;
      continue;
    }
    let j = i + 1;
    while (j < n && CLASS[text.charCodeAt(j)] === SPACE) j++;
    if (j >= n) break; // trailing whitespace goes
    const next = CLASS[text.charCodeAt(j)];
    const keep = last !== -1 && next !== STOP && next !== CLOSING && last !== OPENING;
    // one plain space that stays: the stretch goes on
    if (keep && j === i + 1 && text.charCodeAt(i) === 32) {
      prev = SPACE;
      i = j;
      continue;
    }
    if (start >= 0) out += text.slice(start, i);
    if (keep) {
      out += ' ';
      prev = SPACE;
    }
    start = j;
    i = j;
  }
  return start >= 0 ? out + text.slice(start, i) : out;
}

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
export function createNoteRenderer(
  options: { templateDir?: string | null; engine?: 'compiled' | 'nunjucks' } = {},
): NoteRenderer {
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
  // the built-in trim runs a regular expression over the whole text; the native trim does the same job
  env.addFilter('trim', (value: unknown) => String(value ?? '').trim());
  env.addFilter('sentence', sentenceCase);
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

  // read and compile everything now, the department's files and the defaults alike, by one engine or the other
  const names = new Set<string>(searchPaths.flatMap((dir) => templateFiles(dir)));
  const entries =
    compiledEntries(env, names, options.engine ?? 'compiled') ?? nunjucksEntries(env, names);

  return {
    engine: entries.engine,
    render(findings, renderOptions = {}) {
      if (!isFindings(findings))
        throw new TypeError(
          'render() needs the findings of an accepted case (interpret() returned errors)',
        );
      const format: NoteFormat = renderOptions.format ?? 'text';
      if (format !== 'text' && format !== 'markdown')
        throw new TypeError(`Unknown note format "${String(format)}": use "text" or "markdown"`);
      const v = buildView(findings, format);
      const oneLine = paragraph(entries.line({ v }));
      return {
        line: oneLine,
        text: tidy(entries.note({ v, line: oneLine })),
        handover: tidy(entries.handover({ v })),
        format,
      };
    },
    flagMessage(flag, findings) {
      if (!isFindings(findings))
        throw new TypeError('flagMessage() needs the findings the flag came from');
      const view = flagView(flag, findings, formatter(findings.units));
      return paragraph(entries.flagMessage({ flag: view, v: { md: false } }));
    },
  };
}

type Entry = (data: Record<string, unknown>) => string;
interface Entries {
  engine: 'compiled' | 'nunjucks';
  line: Entry;
  note: Entry;
  handover: Entry;
  flagMessage: Entry;
}

/** nunjucks' own runtime: the reference the compiled templates are tested against, and the fallback. */
function nunjucksEntries(env: nunjucks.Environment, names: Iterable<string>): Entries {
  for (const name of names) env.getTemplate(name, true);
  const line = env.getTemplate(ENTRY.line, true);
  const note = env.getTemplate(ENTRY.note, true);
  const handover = env.getTemplate(ENTRY.handover, true);
  const flagMessage = new nunjucks.Template(FLAG_MESSAGE_SOURCE, env, 'flag-message', true);
  return {
    engine: 'nunjucks',
    line: (d) => line.render(d),
    note: (d) => note.render(d),
    handover: (d) => handover.render(d),
    flagMessage: (d) => flagMessage.render(d),
  };
}

/**
 * The same templates compiled to functions (compile.ts), every file up front so that nothing is compiled during
 * a request. A department template using something the compiler does not handle keeps the whole renderer on nunjucks.
 */
function compiledEntries(
  env: nunjucks.Environment,
  names: Iterable<string>,
  engine: 'compiled' | 'nunjucks',
): Entries | null {
  if (engine === 'nunjucks') return null;
  try {
    const compiled = createCompiledTemplates(env);
    for (const name of names) compiled.get(name);
    return {
      engine: 'compiled',
      line: compiled.entry(compiled.get(ENTRY.line)),
      note: compiled.entry(compiled.get(ENTRY.note)),
      handover: compiled.entry(compiled.get(ENTRY.handover)),
      flagMessage: compiled.entry(compiled.fromString('flag-message', FLAG_MESSAGE_SOURCE)),
    };
  } catch (error) {
    if (error instanceof Unsupported) return null;
    throw error;
  }
}
