// The page as HTML: a view model built from the flow, rendered by nunjucks (autoescaped).
// The full page and the htmx fragment come from the same templates.
import { fileURLToPath } from 'node:url';
import nunjucks from 'nunjucks';
import { marked } from 'marked';
import sanitizeHtml from 'sanitize-html';
import {
  units as U,
  type FieldError,
  type Findings,
  type InterpretOptions,
} from '../calc/index.ts';
import { FIELD, MAX_PREVIOUS_GASES, enteredUnit, type FieldPath } from '../calc/index.ts';
import type { NoteRenderer } from '../templates/index.ts';
import {
  STEPS,
  formValue,
  gasLabel,
  summary,
  type FieldDef,
  type FormValues,
  type Group,
  type Json,
  type StepContext,
  type StepId,
} from './steps.ts';
import {
  awaitingFollowUp,
  contextFor,
  earlierGases,
  findingsOf,
  placeErrors,
  statuses,
  type FlowState,
  type Format,
} from './flow.ts';
import { acidBaseMap } from './map.ts';
import type { PasteView } from './paste.ts';

const VIEWS_DIR = fileURLToPath(new URL('.', import.meta.url));

const env = new nunjucks.Environment(new nunjucks.FileSystemLoader(VIEWS_DIR), {
  autoescape: true,
  trimBlocks: true,
  lstripBlocks: true,
});

// every page template is read and compiled once, here, when the module loads; a render reads no file
for (const name of ['page.njk', 'fragment.njk', 'preview.njk', 'problem.njk'])
  env.getTemplate(name, true);
const render = (name: string, data: Record<string, unknown>) => env.render(name, data);

export interface RenderDeps {
  renderer: NoteRenderer;
  interpretOptions?: InterpretOptions;
}

/** What the page shows besides the flow itself. */
export interface Presentation {
  /** the step opened for a change, or the one left open by an error */
  open?: StepId | null;
  invalid?: { step: StepId; errors: FieldError[]; typed: FormValues } | null;
  /** the text for the live region */
  announce?: string;
  /** the clinician's own edits of the draft, kept across a preview */
  edited?: { note?: string; handover?: string } | null;
  /** steps whose questions changed because of an earlier answer */
  reopened?: StepId[];
  /** leave the focus where it was (a format switch), instead of moving it to the draft */
  keepFocus?: boolean;
  /** the confirm view of a paste, shown in place of the first step */
  paste?: PasteView | null;
  /** remarks for the step opened after a paste: what it filled, what is left to enter */
  pasted?: string[];
  /** the follow-up form on the draft, refused with its message and what was typed */
  followUp?: { error: string; typed: string } | null;
  /** a message above the flow (a launch from the record that could not go on), the manual path still open */
  notice?: { title: string; message: string } | null;
  /** the launch from the record: its start link on the first step, filing the draft back when granted */
  launch?: { standalone: string | null; fileBack: boolean } | null;
  /** what filing the draft back gave */
  filed?: { ok: boolean; message: string } | null;
}

const fieldId = (name: string) => `f-${name.replace(/[^a-zA-Z0-9]+/g, '-')}`;

// ---------- the form of an open step ----------

function fieldView(
  f: FieldDef,
  ctx: StepContext,
  typed: FormValues | null,
  errors: Map<string, string>,
) {
  const id = fieldId(f.name);
  const error =
    errors.get(f.name) ??
    (f.kind === 'number' && f.unitChoice ? errors.get(f.unitChoice.name) : undefined) ??
    null;
  const value = formValue(f, ctx.answers, typed);
  const describedBy =
    [f.hint ? `${id}-hint` : '', error ? `${id}-error` : ''].filter(Boolean).join(' ') || null;
  if (f.kind === 'choice') {
    return {
      kind: f.quick ? 'quick' : 'choice',
      id,
      name: f.name,
      label: f.label,
      hint: f.hint ?? null,
      error,
      describedBy,
      options: f.options.map((o, i) => ({
        id: `${id}-${i}`,
        value: o.value,
        label: o.label,
        checked: o.value === value,
      })),
    };
  }
  const unitChoice = f.unitChoice
    ? {
        id: fieldId(f.unitChoice.name),
        name: f.unitChoice.name,
        label: f.unitChoice.label,
        options: f.unitChoice.options.map((o) => ({
          ...o,
          selected: o.value === formValue(f.unitChoice!, ctx.answers, typed),
        })),
      }
    : null;
  return {
    kind: 'number',
    id,
    name: f.name,
    label: f.label,
    hint: f.hint ?? null,
    error,
    describedBy,
    unit: f.unit,
    livePressure: isPressureField(f.name),
    value,
    inputmode: f.negative ? 'text' : 'decimal',
    unitChoice,
  };
}

const isPressureField = (name: string) => ['gas.pco2', 'gas.po2'].includes(name);

function formView(id: StepId, ctx: StepContext, state: FlowState, p: Presentation) {
  const step = STEPS[id];
  const invalid = p.invalid?.step === id ? p.invalid : null;
  const groups: Group[] = step.groups(ctx);
  const placed = placeErrors(id, invalid?.errors ?? [], ctx);
  const views = groups.map((g) => ({
    legend: g.legend ?? null,
    fields: g.fields.map((f) => fieldView(f, ctx, invalid?.typed ?? null, placed.fields)),
  }));
  // focus: the first field with an error, else the first field (the pressure unit, set once, is passed over)
  const flat = views.flatMap((g) => g.fields) as Array<
    ReturnType<typeof fieldView> & { autofocus?: boolean }
  >;
  const target =
    flat.find((f) => f.error) ?? flat.find((f) => f.name !== 'units.pressure') ?? flat[0];
  if (target) target.autofocus = true;
  for (const f of flat) {
    if ((f.kind !== 'choice' && f.kind !== 'quick') || !('options' in f)) continue;
    const opts = f.options as Array<{ checked: boolean; autofocus?: boolean }>;
    if (f.autofocus) (opts.find((o) => o.checked) ?? opts[0]!).autofocus = true;
  }
  const stepErrors = placed.step.map((e) => ({ message: e.message, href: null as string | null }));
  const fieldErrors = flat
    .filter((f) => f.error)
    .map((f) => ({ message: f.error!, href: `#${f.id}` }));
  const last = statuses({ ...state, done: [...state.done.filter((s) => s !== id), id] }, ctx).every(
    (s) => s.status !== 'todo',
  );
  // a paste starts a case: offered on the first step, and from the gas step while no gas is entered
  const fresh = !('gas' in ctx.answers) && !awaitingFollowUp(ctx.answers);
  return {
    type: 'form',
    id,
    title: step.title,
    question: step.question,
    remarks: [...(p.pasted ?? []), ...step.remarks(ctx)],
    groups: views,
    paste: id === 'sample' && fresh,
    pasteLink: id === 'gas' && fresh && state.done.includes('sample'),
    summaryErrors: [...stepErrors, ...fieldErrors],
    skippable: !!step.skippable,
    quick: flat.some((f) => f.kind === 'quick'),
    reopened: (p.reopened ?? []).includes(id),
    unitAsked: invalid?.typed.unitAsked ?? null,
    nextLabel: last ? 'Show the draft' : 'Next',
  };
}

// ---------- the draft ----------

const SEVERITY_LABEL = { critical: 'Critical', warning: 'Check', info: 'Note' } as const;

/** A number as shown in the explain view: rounded for reading only (the core keeps its own precision). */
const shown = (value: number) => String(Math.round(value * 100) / 100);

/** A value with its unit; a pressure also in kPa when that is the clinician's unit. */
function valueText(value: number, unit: string, units: U.Units): string {
  const main = `${shown(value)}${unit ? ` ${unit}` : ''}`;
  if (unit === 'mmHg' && units.pressure === 'kPa')
    return `${main} (${U.fromCanonical('pressure', value, units).toFixed(1)} kPa)`;
  return main;
}

/** Rows enough for the text, so the whole note shows without scrolling inside the box. */
function rowsFor(text: string, min: number, max: number): number {
  const rows = text
    .split('\n')
    .reduce((n, line) => n + Math.max(1, Math.ceil(line.length / 70)), 0);
  return Math.min(max, Math.max(min, rows + 1));
}

/** Markdown to HTML for the preview, then sanitised: the clinician's text may hold anything. */
export function markdownPreview(text: string): string {
  const html = marked.parse(text, { async: false, gfm: true, breaks: false });
  return sanitizeHtml(html, {
    allowedTags: [
      'p',
      'br',
      'strong',
      'em',
      'b',
      'i',
      'ul',
      'ol',
      'li',
      'h1',
      'h2',
      'h3',
      'h4',
      'h5',
      'h6',
      'blockquote',
      'code',
      'pre',
      'hr',
      'table',
      'thead',
      'tbody',
      'tr',
      'th',
      'td',
      'del',
    ],
    allowedAttributes: {},
  });
}

/** The acid-base map and its words; a drawing it cannot make leaves the draft without it rather than failing. */
function mapView(f: Findings) {
  try {
    // the drawing's own size (680 wide, its labels laid out for it); the key grows one row per gas, up to six
    const map = acidBaseMap(f, { height: 660 + Math.min(f.previous.length, 5) * 16 });
    return { svg: map.svg, lines: map.text.split('\n').filter((line) => line.trim() !== '') };
  } catch (e) {
    if (e instanceof RangeError) return null;
    throw e;
  }
}

function followUpView(answers: Json, p: Presentation) {
  const count = earlierGases(answers).length;
  return {
    can: count < MAX_PREVIOUS_GASES,
    count,
    max: MAX_PREVIOUS_GASES,
    error: p.followUp?.error ?? null,
    value: p.followUp?.typed ?? '',
  };
}

function draftView(f: Findings, format: Format, deps: RenderDeps, edited: Presentation['edited']) {
  const note = deps.renderer.render(f, { format });
  const text = edited?.note ?? note.text;
  const handover = edited?.handover ?? note.handover;
  return {
    // the one line above the box reads as plain words whatever the box's format
    format,
    line: format === 'text' ? note.line : deps.renderer.render(f, { format: 'text' }).line,
    text,
    handover,
    withheld: f.withheld,
    rows: { text: rowsFor(text, 10, 60), handover: rowsFor(handover, 5, 30) },
    edited: !!edited,
    previewHtml: format === 'markdown' ? markdownPreview(text) : null,
    flags: f.flags.map((flag) => ({
      severity: flag.severity,
      label: SEVERITY_LABEL[flag.severity],
      message: deps.renderer.flagMessage(flag, f),
    })),
    map: mapView(f),
    explain: Object.values(f.explain).map((e) => ({
      key: e.key,
      label: e.label,
      value: valueText(e.value, e.unit, f.units),
      formula: e.formula,
      source: e.source,
      inputs: e.inputs.map((i) => `${i.name} ${valueText(i.value, i.unit, f.units)}`).join('; '),
    })),
  };
}

// ---------- the whole flow ----------

export function flowView(state: FlowState, deps: RenderDeps, p: Presentation = {}) {
  const ctx = contextFor(state, deps.interpretOptions);
  const list = statuses(state, ctx);
  const explicit = p.invalid?.step ?? p.open ?? null;
  const open = explicit ?? list.find((s) => s.status === 'todo')?.id ?? null;
  const items: unknown[] = earlierGases(state.answers).map((g, i, all) =>
    earlierView(g, i, all.length, ctx),
  );
  // a skipped step is shown once the conversation has got to it: before the first unanswered step,
  // or among answers already given after it
  const frontier = list.findIndex((s) => s.status === 'todo');
  const lastDone = list.reduce((last, s, i) => (s.status === 'done' ? i : last), -1);
  list.forEach((s, i) => {
    const step = STEPS[s.id];
    if (s.id === open && p.paste) {
      items.push(p.paste);
    } else if (s.id === open) {
      items.push(formView(s.id, ctx, state, p));
    } else if (s.status === 'done') {
      const ventilatedAnswered = state.done.includes('oxygen');
      items.push({
        type: 'answer',
        id: s.id,
        title: step.title,
        question: step.question,
        phrases: summary(step, ctx, { ventilatedAnswered }),
      });
    } else if (s.status === 'skipped' && (frontier === -1 || i < frontier || i < lastDone)) {
      items.push({
        type: 'skipped',
        id: s.id,
        title: step.title,
        reason: s.reason,
        canOpen: s.id === 'timing',
      });
    }
  });
  const findings = open === null ? findingsOf(state.answers, deps.interpretOptions) : null;
  const draft = findings
    ? {
        ...draftView(findings, state.format, deps, p.edited ?? null),
        followUp: followUpView(state.answers, p),
        fileBack: p.launch?.fileBack ? { filed: p.filed ?? null } : null,
        autofocus: !p.keepFocus && !p.followUp && !p.filed,
      }
    : null;
  const openTitle = p.paste ? p.paste.title : open ? STEPS[open].title : null;
  return {
    title: `${openTitle ?? (draft ? 'Draft note' : 'New case')} · Gasline`,
    announce: p.announce ?? '',
    notice: p.notice ?? null,
    launch: p.launch ?? null,
    state: stateFields(state),
    items,
    draft,
  };
}

// ---------- earlier gases ----------

const EARLIER_FIELDS: [string, string][] = [
  ['gas.ph', 'pH'],
  ['gas.pco2', ''],
  ['gas.po2', ''],
  ['gas.hco3', 'HCO3'],
  ['gas.baseExcess', 'Base excess'],
  ['gas.lactate', 'Lactate'],
  ['oxygen.fio2', 'FiO2'],
  ['oxygen.peep', 'PEEP'],
  ['ventilator.vt', 'VT'],
  ['ventilator.rr', 'RR'],
];
const EARLIER_UNITS: Record<string, string> = {
  'oxygen.peep': 'cmH2O',
  'ventilator.vt': 'mL',
  'ventilator.rr': '/min',
};

/** An earlier gas in the log, read back as entered, with the way back while its follow-up is not yet entered. */
function earlierView(g: Json, index: number, count: number, ctx: StepContext) {
  const phrases: string[] = [];
  for (const [path, name] of EARLIER_FIELDS) {
    const [group, key] = path.split('.') as [string, string];
    const value = (g[group] as Json | undefined)?.[key];
    if (typeof value !== 'number') continue;
    const range = group === 'gas' ? FIELD[path as FieldPath] : null;
    const label =
      path === 'gas.pco2'
        ? gasLabel(ctx.sample, 'CO2')
        : path === 'gas.po2'
          ? gasLabel(ctx.sample, 'O2')
          : name;
    const unit = range ? enteredUnit(range, ctx.units) : (EARLIER_UNITS[path] ?? '');
    phrases.push(`${label} ${value}${unit ? (unit === '/min' ? unit : ` ${unit}`) : ''}`);
  }
  const when = [typeof g.takenAt === 'string' ? g.takenAt.replace('T', ' ') : null, g.label]
    .filter((x): x is string => typeof x === 'string' && x.trim() !== '')
    .join(', ');
  return {
    type: 'earlier',
    id: `earlier-${index + 1}`,
    title: `Earlier gas ${count > 1 ? `${index + 1} of ${count}` : ''}`.trim(),
    when: when || null,
    phrases,
    canCancel: index === count - 1 && awaitingFollowUp(ctx.answers),
  };
}

export function stateFields(state: FlowState) {
  return { case: JSON.stringify(state.answers), done: state.done.join(' '), format: state.format };
}

export type FlowView = ReturnType<typeof flowView>;

export const renderPage = (view: FlowView): string => render('page.njk', { view });
export const renderFragment = (view: FlowView): string => render('fragment.njk', { view });
export const renderPreview = (html: string): string => render('preview.njk', { html });
export const renderProblem = (message: string, fragment = false): string =>
  render('problem.njk', { message, fragment, view: { title: 'Could not go on · Gasline' } });
