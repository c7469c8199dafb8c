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
import { applyStep, summary } from './answers.ts';
import { isObject, type FormValues, type Json } from './paths.ts';
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
}

export const emptyState = (): FlowState => ({ answers: {}, done: [], format: 'text' });

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
  const state: FlowState = {
    answers,
    done: done.filter((s) => (held ? s !== GAS_STEP || 'gas' in answers : !!STEPS[s].beforeGas)),
    format: form.format === 'markdown' ? 'markdown' : 'text',
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
  return { state, findings: f, ctx: contextOf(state.answers, respiratory) };
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

/** May the clinician open this step now: it is answered, or skipped and its step lets it be opened anyway. */
export function canOpen(read: Read, id: StepId): boolean {
  const status = statuses(read.state, read.ctx).find((s) => s.id === id)!.status;
  return status === 'done' || (status === 'skipped' && !!STEPS[id].openWhenSkipped);
}

export interface StepOutcome {
  state: FlowState;
  /** the step left open with its errors and what was typed, when the answer did not pass */
  invalid: { step: StepId; errors: FieldError[]; typed: FormValues } | null;
  /** steps that must be looked at again because an answer changed what they ask */
  reopened: StepId[];
  /** the new state read, when the answer was taken */
  read: Read | null;
}

/** Answer one step: write its fields, check the whole case with the schema and the core once, and move on. */
export function answerStep(
  state: FlowState,
  id: StepId,
  form: FormValues,
  skip: boolean,
  options?: InterpretOptions,
): StepOutcome {
  const step = STEPS[id];
  // a step's questions depend on the case's sample and units, not on its findings
  const { answers, errors } = applyStep(
    step,
    state.answers,
    form,
    contextOf(state.answers, null),
    skip,
  );
  const refused = (list: FieldError[], typed = form): StepOutcome => ({
    state,
    invalid: { step: id, errors: list, typed },
    reopened: [],
    read: null,
  });
  const settled = step.settle?.({ before: state.answers, answers, done: state.done }) ?? {};
  if (settled.refuse) return refused([settled.refuse]);

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
  const next = { ...state, answers, done: STEP_IDS.filter((s) => done.includes(s)) };
  return { state: next, invalid: null, reopened, read: readOf(next, options, null, findings) };
}

/** What the live region says after an answer: what was kept, what was not asked and why, what comes next. */
export function announceAnswer(read: Read, id: StepId, reopened: StepId[]): string {
  const phrases = summary(STEPS[id], read.ctx);
  const parts = [`${STEPS[id].title}: ${phrases.length ? phrases.join(', ') : 'nothing entered'}.`];
  const list = statuses(read.state, read.ctx);
  const next = list.find((s) => s.status === 'todo');
  const from = list.findIndex((s) => s.id === id);
  const to = next ? list.findIndex((s) => s.id === next.id) : list.length;
  for (const s of list.slice(from + 1, to))
    if (s.status === 'skipped' && s.reason) parts.push(s.reason);
  if (reopened.length)
    parts.push(
      `Check ${reopened.map((s) => STEPS[s].title.toLowerCase()).join(' and ')} again: the question changed.`,
    );
  parts.push(
    next ? `Next: ${STEPS[next.id].title.toLowerCase()}.` : 'The draft note is ready below.',
  );
  return parts.join(' ');
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
