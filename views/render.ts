// The page as HTML: a view model built from the flow, rendered by nunjucks (autoescaped).
// The full page and the htmx fragment come from the same templates.
import { fileURLToPath } from 'node:url';
import nunjucks from 'nunjucks';
import {
  FIELD,
  PREVIOUS_SETTINGS,
  enteredUnit,
  fieldsOf,
  inTimeOrder,
  type InterpretOptions,
} from '../calc/index.ts';
import type { NoteRenderer } from '../templates/index.ts';
import { formValue, summary } from './answers.ts';
import { draftView } from './draft.ts';
import type { FieldDef } from './fields.ts';
import {
  awaitingFollowUp,
  openStep,
  placeErrors,
  readOf,
  startsCase,
  statuses,
  type FlowState,
  type Invalid,
  type Read,
} from './flow.ts';
import { announceOf, replyView } from './reply.ts';
import type { PasteView } from './paste.ts';
import { earlierGases, getPath, type FormValues } from './paths.ts';
import { PASTE_STEP, STEPS, caseLabel, type StepContext, type StepId } from './steps.ts';

export { markdownPreview } from './draft.ts';

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
  invalid?: Invalid | null;
  /** the step just answered (and the steps its answer reopened): the assistant replies to it */
  answered?: { id: StepId; reopened: StepId[] } | null;
  /** the text for the live region (else the reply's own words) */
  announce?: string;
  /** words said before the reply's own in the live region (what a paste kept) */
  lead?: string;
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
  const common = { id, name: f.name, label: f.label, hint: f.hint ?? null, error, describedBy };
  if (f.kind === 'choice') {
    return {
      ...common,
      kind: f.quick ? 'quick' : 'choice',
      passOver: !!f.passOver,
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
          value: o.value,
          label: o.label,
          selected: o.value === formValue(f.unitChoice!, ctx.answers, typed),
        })),
      }
    : null;
  return {
    ...common,
    kind: 'number',
    passOver: false,
    unit: f.unit,
    liveUnit: f.liveUnit ?? null,
    value,
    inputmode: f.negative ? 'text' : 'decimal',
    unitChoice,
  };
}

function formView(id: StepId, read: Read, p: Presentation) {
  const { state, ctx } = read;
  const step = STEPS[id];
  const invalid = p.invalid?.step === id ? p.invalid : null;
  const placed = placeErrors(id, invalid?.errors ?? [], ctx);
  const views = step.groups(ctx).map((g) => ({
    legend: g.legend ?? null,
    fields: g.fields.map((f) => fieldView(f, ctx, invalid?.typed ?? null, placed.fields)),
  }));
  // focus: the first field with an error, else the first field not passed over (the pressure unit, set once)
  const flat = views.flatMap((g) => g.fields) as Array<
    ReturnType<typeof fieldView> & { autofocus?: boolean }
  >;
  const target = flat.find((f) => f.error) ?? flat.find((f) => !f.passOver) ?? flat[0];
  if (target) target.autofocus = true;
  for (const f of flat) {
    if ((f.kind !== 'choice' && f.kind !== 'quick') || !('options' in f)) continue;
    const opts = f.options as Array<{ checked: boolean; autofocus?: boolean }>;
    if (f.autofocus) (opts.find((o) => o.checked) ?? opts[0]!).autofocus = true;
  }
  const stepErrors = placed.step.map((e) => ({ message: e.message, href: null as string | null }));
  // a unit question sits at its field, with the switch as one press (and the focus on it)
  const doubts = invalid?.doubts ?? [];
  for (const d of doubts) {
    const at = flat.find((f) => f.name === d.path) as Record<string, unknown> | undefined;
    if (at) at.doubt = { ...d, switchValue: `${d.unitName}=${d.switchTo}` };
  }
  if (doubts.length && !flat.some((f) => f.error)) {
    for (const f of flat) f.autofocus = false;
    const first = flat.find((f) => f.name === doubts[0]!.path) as
      | Record<string, unknown>
      | undefined;
    if (first) (first.doubt as Record<string, unknown>).autofocus = true;
  }
  const last = statuses({ ...state, done: [...state.done.filter((s) => s !== id), id] }, ctx).every(
    (s) => s.status !== 'todo',
  );
  // a paste starts a case: its box on its own step, and a way back to it until a gas is entered
  const fresh = startsCase(ctx.answers);
  return {
    type: 'form',
    id,
    title: step.title,
    question: step.question,
    remarks: [...(p.pasted ?? []), ...step.remarks(ctx)],
    groups: views,
    paste: step.paste === 'box' && fresh,
    pasteLink: step.paste === 'link' && fresh && state.done.includes(PASTE_STEP),
    pasteStep: PASTE_STEP,
    // an error that belongs to a field is said there only (the focus goes to it); the note above the form holds
    // what belongs to the step as a whole
    summaryErrors: stepErrors,
    doubts: doubts.length,
    unitKept: invalid?.typed.unitKept ?? '',
    skippable: !!step.skippable,
    // Finish is there once a reading stands: it takes this answer and asks nothing more
    finish: !step.beforeGas && !last,
    quick: flat.some((f) => f.kind === 'quick'),
    reopened: (p.reopened ?? []).includes(id),
    unitAsked: invalid?.typed.unitAsked ?? null,
    nextLabel: last ? 'Finish' : 'Next',
  };
}

// ---------- the whole flow ----------

export function flowView(read: Read | FlowState, deps: RenderDeps, p: Presentation = {}) {
  const r = 'ctx' in read ? read : readOf(read, deps.interpretOptions);
  const { state, ctx } = r;
  const list = statuses(state, ctx);
  const open = openStep(r, p.invalid?.step ?? p.open ?? null);
  const items: unknown[] = earlierLog(ctx);
  // a skipped step is shown once the conversation has got to it: before the first unanswered step,
  // or among answers already given after it; after Finish, the steps not answered can still be added
  const frontier = list.findIndex((s) => s.status === 'todo');
  const lastDone = list.reduce((last, s, i) => (s.status === 'done' ? i : last), -1);
  const note = r.findings ? deps.renderer.render(r.findings, { format: 'text' }) : null;
  const said = replyView(r, p.paste ? null : open, p.answered ?? null, note?.line ?? null);

  list.forEach((s, i) => {
    const step = STEPS[s.id];
    if (s.id === open) {
      // the confirm view of a paste speaks for itself; a reply comes once its values are used
      if (!p.paste && (note || said.passed.length)) items.push(said);
      items.push(p.paste ?? formView(s.id, r, p));
    } else if (s.status === 'done') {
      items.push({
        type: 'answer',
        id: s.id,
        title: step.title,
        question: step.question,
        phrases: summary(step, ctx),
      });
    } else if (s.status === 'skipped' && (frontier === -1 || i < frontier || i < lastDone)) {
      items.push({
        type: 'skipped',
        id: s.id,
        title: step.title,
        reason: s.reason,
        canOpen: !!step.openWhenSkipped,
      });
    } else if (s.status === 'todo' && !open && note) {
      items.push({ type: 'notAsked', id: s.id, title: step.title });
    }
  });
  if (!open && note) items.push(said);
  const draft = r.findings
    ? draftView(r.findings, state.answers, deps.renderer, {
        format: state.format,
        edited: p.edited ?? null,
        followUp: p.followUp ?? null,
        fileBack: p.launch?.fileBack ? { filed: p.filed ?? null } : null,
        autofocus: !open && !p.keepFocus && !p.followUp && !p.filed,
        taken: state.taken ?? '',
      })
    : null;
  const openTitle = p.paste ? p.paste.title : open ? STEPS[open].title : null;
  return {
    title: `${openTitle ?? (draft ? 'Draft note' : 'New case')} · Gasline`,
    announce: p.announce ?? [p.lead, announceOf(said)].filter(Boolean).join(' '),
    notice: p.notice ?? null,
    launch: p.launch ?? null,
    state: stateFields(state),
    items,
    draft,
  };
}

// ---------- earlier gases ----------

/** What the log reads back of an earlier gas: its gas and the settings it was taken on, in table order. */
const EARLIER_FIELDS = [...fieldsOf('gas'), ...PREVIOUS_SETTINGS.map((p) => FIELD[p])];

/**
 * The earlier gases, oldest first by time taken (calc's inTimeOrder, the order of the note and the map), each read
 * back as entered; the one moved last keeps the way back while its follow-up is not yet entered.
 */
function earlierLog(ctx: StepContext) {
  const earlier = earlierGases(ctx.answers);
  const ordered = inTimeOrder(
    earlier.map((g, entered) => ({
      g,
      entered,
      takenAt: typeof g.takenAt === 'string' ? g.takenAt : null,
    })),
  );
  const count = ordered.length;
  return ordered.map(({ g, entered }, index) => {
    const phrases: string[] = [];
    for (const f of EARLIER_FIELDS) {
      const value = getPath(g, f.path);
      if (typeof value !== 'number') continue;
      const unit = enteredUnit(f, ctx.units);
      // a rate joins its number (14/min), any other unit stands apart (8 cmH2O)
      // a value whose unit never changes is written with the table's decimals (pH 7.30), as the note writes it
      const fixedUnit =
        f.path.startsWith('gas.') &&
        !f.quantity &&
        !f.percent &&
        (f.unit === '' || f.unit === 'mmol/L');
      const shown = fixedUnit ? value.toFixed(f.decimals) : String(value);
      phrases.push(
        `${caseLabel(f, ctx.sample)} ${shown}${unit && !unit.startsWith('/') ? ' ' : ''}${unit}`,
      );
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
      canCancel: entered === count - 1 && awaitingFollowUp(ctx.answers),
    };
  });
}

export function stateFields(state: FlowState) {
  return {
    case: JSON.stringify(state.answers),
    done: state.done.join(' '),
    format: state.format,
    finished: state.finished ? 'yes' : '',
    taken: state.taken ?? '',
  };
}

export type FlowView = ReturnType<typeof flowView>;

export const renderPage = (view: FlowView): string => render('page.njk', { view });
export const renderFragment = (view: FlowView): string => render('fragment.njk', { view });
export const renderPreview = (html: string): string => render('preview.njk', { html });
export const renderProblem = (message: string, fragment = false): string =>
  render('problem.njk', { message, fragment, view: { title: 'Could not go on · Gasline' } });
