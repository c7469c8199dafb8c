// The conversation as data: the case so far, which steps are answered, which one is open.
// Nothing is kept on the server: every request brings the case in a hidden field, and the same zod schema checks
// it before anything is read from it. A request reads its case once (schema, then the core) and hands the reading
// down; the rules of each step come from the step table (steps.ts).
import {
  caseShape,
  interpretParsed,
  parseCase,
  type FieldError,
  type Findings,
  type InterpretOptions,
  type ParsedCase,
} from '../calc/index.ts';
import { applyStep, summary, type AnswerMode } from './answers.ts';
import { isObject, type FormValues, type Json } from './paths.ts';
import { keptOf, unitDoubts, withSwitch, type UnitDoubt } from './unitDoubt.ts';
import {
  GAS_STEP,
  STEPS,
  STEP_IDS,
  contextOf,
  isStepId,
  ownedPaths,
  type StepContext,
  type StepId,
} from './steps.ts';

export type Format = 'text' | 'markdown';

export interface FlowState {
  answers: Json;
  done: StepId[];
  format: Format;
  /** the clinician pressed Finish: no question is open unless one is opened again */
  finished?: boolean;
  /** when the current gas was taken (a time or a label), as the clinician gave it; '' when not given */
  taken?: string;
}

/** A new case, its units set beforehand (the deployment's default or the clinician's own preference). */
export const emptyState = (units: Json | null = null): FlowState => ({
  answers: units && Object.keys(units).length ? { units: { ...units } } : {},
  done: [],
  format: 'text',
  finished: false,
  taken: '',
});

const MAX_TAKEN = 80;

/** A follow-up is under way: the last gas has become an earlier one and the new gas is not yet entered. */
export const awaitingFollowUp = (answers: Json): boolean =>
  !('gas' in answers) && Array.isArray(answers.previous) && answers.previous.length > 0;

/** Nothing is entered yet beyond the sample and units: a paste may start the case. */
export const startsCase = (answers: Json): boolean =>
  !('gas' in answers) && !awaitingFollowUp(answers);

export interface Checked {
  errors: FieldError[];
  /** the case as the schema gives it back, when it holds a gas and passed */
  parsed: ParsedCase | null;
}

/**
 * Check a case that travelled with a request. Before the gas is given only the sample and units may be present,
 * except while a follow-up gas is awaited: then the rest of the case is checked with the last earlier gas standing
 * in for the gas (it is never interpreted), so that chemistry, patient and context can wait with it.
 */
export function checkAnswers(answers: Json): Checked {
  if ('gas' in answers) {
    const parsed = parseCase(answers);
    return parsed.ok
      ? { errors: [], parsed: parsed.value }
      : { errors: parsed.errors, parsed: null };
  }
  if (awaitingFollowUp(answers)) {
    const last = (answers.previous as unknown[]).at(-1);
    const standIn = isObject(last) ? last.gas : undefined;
    const parsed = parseCase({ ...answers, gas: standIn });
    const errors = parsed.ok
      ? []
      : parsed.errors.filter((e) => e.path !== 'gas' && !e.path.startsWith('gas.'));
    return { errors, parsed: null };
  }
  const errors: FieldError[] = [];
  for (const key of Object.keys(answers)) {
    if (key !== 'sample' && key !== 'units')
      errors.push({ path: key, message: `"${key}" cannot come before the gas` });
  }
  for (const key of ['sample', 'units'] as const) {
    if (!(key in answers)) continue;
    const result = caseShape.shape[key].safeParse(answers[key]);
    if (!result.success)
      errors.push({ path: key, message: result.error.issues[0]?.message ?? 'not valid' });
  }
  return { errors, parsed: null };
}

export type ReadResult =
  | { ok: true; state: FlowState; parsed: ParsedCase | null }
  | { ok: false; message: string };

/** The state a form carried: the case (JSON), the answered steps, the note format. */
export function readState(form: FormValues): ReadResult {
  let answers: unknown = {};
  const raw = form.case ?? '';
  if (raw.trim() !== '') {
    try {
      answers = JSON.parse(raw);
    } catch {
      return { ok: false, message: 'The case sent with the form is not readable.' };
    }
  }
  if (!isObject(answers))
    return { ok: false, message: 'The case sent with the form is not an object.' };
  const { errors, parsed } = checkAnswers(answers);
  if (errors.length)
    return {
      ok: false,
      message: `The case sent with the form did not pass the checks: ${errors.map((e) => `${e.path}: ${e.message}`).join('; ')}`,
    };
  const done = [...new Set((form.done ?? '').split(/[\s,]+/).filter(isStepId))];
  // a step counts as answered only with the gas behind it (or, during a follow-up, the earlier gas), the gas step
  // only with the gas itself; before any gas, only the steps answered before it
  const held = 'gas' in answers || awaitingFollowUp(answers);
  const taken = (form.taken ?? '').trim().replace(/\s+/g, ' ');
  if (taken.length > MAX_TAKEN)
    return { ok: false, message: 'The time of the gas sent with the form is too long.' };
  const state: FlowState = {
    answers,
    done: done.filter((s) => (held ? s !== GAS_STEP || 'gas' in answers : !!STEPS[s].beforeGas)),
    format: form.format === 'markdown' ? 'markdown' : 'text',
    finished: form.finished === 'yes' && 'gas' in answers,
    taken,
  };
  return { ok: true, state, parsed };
}

/** A state read for a request: the core's findings (with a gas) and what the steps need to know. */
export interface Read {
  state: FlowState;
  findings: Findings | null;
  ctx: StepContext;
}

/**
 * Read a state once: the findings of its case, when it holds a gas, and the steps' context. A caller that has
 * already parsed the case (or read it) passes what it has, so that nothing is worked out twice.
 */
export function readOf(
  state: FlowState,
  options?: InterpretOptions,
  parsed?: ParsedCase | null,
  findings?: Findings | null,
): Read {
  let f: Findings | null = findings ?? null;
  if (findings === undefined && 'gas' in state.answers) {
    const value = parsed ?? checkAnswers(state.answers).parsed;
    const result = value ? interpretParsed(value, options) : null;
    f = result?.ok ? result : null;
  }
  const respiratory =
    f && state.done.includes(GAS_STEP)
      ? f.disorders.some(
          (d) => d.code === 'respiratory_acidosis' || d.code === 'respiratory_alkalosis',
        )
      : null;
  return { state, findings: f, ctx: contextOf(state.answers, respiratory, f) };
}

export type Status = { id: StepId; status: 'done' | 'skipped' | 'todo'; reason: string | null };

/** Steps in order with what each is now: answered, skipped (with the reason), or still to ask. */
export function statuses(state: FlowState, ctx: StepContext): Status[] {
  return STEP_IDS.map((id) => {
    const done = state.done.includes(id);
    const reason = STEPS[id].skipReason(ctx, done);
    return { id, status: reason ? 'skipped' : done ? 'done' : 'todo', reason };
  });
}

/**
 * May the clinician open this step now: it is answered, or skipped and its step lets it be opened anyway, or not
 * yet answered while the reading stands (after Finish, or to answer it out of turn).
 */
export function canOpen(read: Read, id: StepId): boolean {
  const status = statuses(read.state, read.ctx).find((s) => s.id === id)!.status;
  return (
    status === 'done' ||
    (status === 'skipped' && !!STEPS[id].openWhenSkipped) ||
    (status === 'todo' && read.findings !== null)
  );
}

/** The step asked now: the one opened, else the first not yet answered, unless the clinician has finished. */
export function openStep(read: Read, explicit: StepId | null): StepId | null {
  if (explicit) return explicit;
  if (read.state.finished && read.findings) return null;
  return statuses(read.state, read.ctx).find((s) => s.status === 'todo')?.id ?? null;
}

/** A step left open: its errors, the unit questions at its fields, and what was typed. */
export interface Invalid {
  step: StepId;
  errors: FieldError[];
  typed: FormValues;
  doubts?: UnitDoubt[];
}

export interface StepOutcome {
  state: FlowState;
  /** the step left open with its errors and what was typed, when the answer did not pass */
  invalid: Invalid | null;
  /** steps that must be looked at again because an answer changed what they ask */
  reopened: StepId[];
  /** the new state read, when the answer was taken */
  read: Read | null;
}

/**
 * Answer one step: write its fields, check the whole case with the schema and the core once, and move on. A unit
 * switch pressed on a unit question is taken as the unit chosen; Finish takes the answer and asks nothing more.
 */
export function answerStep(
  state: FlowState,
  id: StepId,
  sent: FormValues,
  mode: AnswerMode,
  options?: InterpretOptions,
): StepOutcome {
  const step = STEPS[id];
  const form = withSwitch(sent);
  // a step's questions depend on the case's sample and units, not on its findings
  const ctx = contextOf(state.answers, null);
  const { answers, errors } = applyStep(step, state.answers, form, ctx, mode);
  const kept = keptOf(form);
  const refused = (list: FieldError[], typed = form, doubts: UnitDoubt[] = []): StepOutcome => ({
    state,
    invalid: { step: id, errors: list, typed: { ...typed, unitKept: [...kept].join(' ') }, doubts },
    reopened: [],
    read: null,
  });
  const settled = step.settle?.({ before: state.answers, answers, done: state.done }) ?? {};
  if (settled.refuse) return refused([settled.refuse]);
  // a value that makes sense only in another unit is asked about before the schema could refuse it
  const doubts = mode === 'skip' ? [] : unitDoubts(step.groups(ctx), answers, kept);
  if (doubts.length) return refused([], form, doubts);

  const checked = checkAnswers(answers);
  const all = errors.concat(checked.errors.filter((e) => !errors.some((u) => u.path === e.path)));
  let findings: Findings | null = null;
  if (!all.length && checked.parsed) {
    const result = interpretParsed(checked.parsed, options);
    if (result.ok) findings = result;
    else all.push(...result.errors);
  }
  if (all.length) return refused(all);
  const question = step.confirm?.(answers, form, findings);
  if (question) return refused([question.error], { ...form, ...question.typed });

  const reopened = settled.reopen ?? [];
  const leave = new Set<StepId>([id, ...reopened, ...(settled.undo ?? [])]);
  const done = [...state.done.filter((s) => !leave.has(s)), id];
  const next: FlowState = {
    ...state,
    answers,
    done: STEP_IDS.filter((s) => done.includes(s)),
    finished: state.finished || mode === 'finish',
  };
  return { state: next, invalid: null, reopened, read: readOf(next, options, null, findings) };
}

/** What the assistant says after an answer, besides the reading itself: what it passed over, what it asks next and why. */
export interface Reply {
  /** the step just answered and how it reads back ("Gas: pH 7.28, PaCO2 61 mmHg") */
  said: string | null;
  /** steps passed over since, with the reason */
  passed: string[];
  /** steps to look at again because their question changed */
  reopened: string | null;
  /** the question asked next and why, or null when nothing more is asked */
  next: { title: string; why: string | null } | null;
}

export function replyOf(
  read: Read,
  open: StepId | null,
  answered: StepId | null,
  reopened: StepId[] = [],
): Reply {
  const list = statuses(read.state, read.ctx);
  const from = answered ? list.findIndex((s) => s.id === answered) : -1;
  const to = open ? list.findIndex((s) => s.id === open) : list.length;
  // the steps passed over since the answer (without an answer, the log already shows them)
  const passed = list
    .slice(from + 1, answered ? Math.max(from + 1, to) : from + 1)
    .flatMap((s) => (s.status === 'skipped' && s.reason ? [s.reason] : []));
  const phrases = answered ? summary(STEPS[answered], read.ctx) : [];
  return {
    said: answered
      ? `${STEPS[answered].title}: ${phrases.length ? phrases.join(', ') : 'nothing entered'}.`
      : null,
    passed,
    reopened: reopened.length
      ? `Check ${reopened.map((s) => STEPS[s].title.toLowerCase()).join(' and ')} again: the question changed.`
      : null,
    next: open ? { title: STEPS[open].title, why: STEPS[open].why?.(read.ctx) ?? null } : null,
  };
}

/** Split errors between the fields of a step and the step as a whole. */
export function placeErrors(
  id: StepId,
  errors: FieldError[],
  ctx: StepContext,
): { fields: Map<string, string>; step: FieldError[] } {
  const owned = new Set(ownedPaths(STEPS[id].groups(ctx)));
  const fields = new Map<string, string>();
  const step: FieldError[] = [];
  for (const e of errors) {
    if (owned.has(e.path) && !fields.has(e.path)) fields.set(e.path, e.message);
    else step.push(e);
  }
  return { fields, step };
}
