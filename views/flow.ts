// The conversation as data: the case so far, which steps are answered, which one is open.
// Nothing is kept on the server: every request brings the case in a hidden field, and the same
// zod schema checks it every time before anything is read from it.
import {
  caseShape,
  interpret,
  parseCase,
  type FieldError,
  type Findings,
  type InterpretOptions,
} from '../calc/index.ts';
import { MAX_PREVIOUS_GASES } from '../calc/index.ts';
import {
  STEPS,
  STEP_IDS,
  applyStep,
  contextOf,
  getPath,
  isStepId,
  ownedPaths,
  setPath,
  type FormValues,
  type Json,
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

export type ReadResult = { ok: true; state: FlowState } | { ok: false; message: string };

const isObject = (x: unknown): x is Json =>
  x !== null && typeof x === 'object' && !Array.isArray(x);

/** The earlier gases of a case, when it holds any. */
export const earlierGases = (answers: Json): Json[] =>
  Array.isArray(answers.previous) ? answers.previous.filter(isObject) : [];

/** A follow-up is under way: the last gas has become an earlier one and the new gas is not yet entered. */
export const awaitingFollowUp = (answers: Json): boolean =>
  !('gas' in answers) && Array.isArray(answers.previous) && answers.previous.length > 0;

/**
 * Check a case that travelled with a request. Before the gas is given only the sample and units may be present,
 * except while a follow-up gas is awaited: then the rest of the case is checked with the last earlier gas standing
 * in for the gas (it is never interpreted), so that chemistry, patient and context can wait with it.
 */
export function checkAnswers(answers: Json): FieldError[] {
  if ('gas' in answers) {
    const parsed = parseCase(answers);
    return parsed.ok ? [] : parsed.errors;
  }
  if (awaitingFollowUp(answers)) {
    const last = (answers.previous as unknown[]).at(-1);
    const standIn = isObject(last) ? last.gas : undefined;
    const parsed = parseCase({ ...answers, gas: standIn });
    return parsed.ok
      ? []
      : parsed.errors.filter((e) => e.path !== 'gas' && !e.path.startsWith('gas.'));
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
  return errors;
}

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
  const errors = checkAnswers(answers);
  if (errors.length)
    return {
      ok: false,
      message: `The case sent with the form did not pass the checks: ${errors.map((e) => `${e.path}: ${e.message}`).join('; ')}`,
    };
  const done = [...new Set((form.done ?? '').split(/[\s,]+/).filter(isStepId))];
  // a step counts as answered only with the gas behind it (or, during a follow-up, the earlier gas)
  const held = 'gas' in answers || awaitingFollowUp(answers);
  const state: FlowState = {
    answers,
    done: held
      ? done.filter((s) => s !== 'gas' || 'gas' in answers)
      : done.filter((s) => s === 'sample'),
    format: form.format === 'markdown' ? 'markdown' : 'text',
  };
  return { ok: true, state };
}

/** Findings for the case so far, when it holds a gas. */
export function findingsOf(answers: Json, options?: InterpretOptions): Findings | null {
  if (!('gas' in answers)) return null;
  const result = interpret(answers, options);
  return result.ok ? result : null;
}

export function contextFor(state: FlowState, options?: InterpretOptions): StepContext {
  const f = state.done.includes('gas') ? findingsOf(state.answers, options) : null;
  const respiratory = f
    ? f.disorders.some(
        (d) => d.code === 'respiratory_acidosis' || d.code === 'respiratory_alkalosis',
      )
    : null;
  return contextOf(state.answers, respiratory);
}

/** Steps in order with what each is now: answered, skipped (with the reason), or still to ask. */
export function statuses(
  state: FlowState,
  ctx: StepContext,
): { id: StepId; status: 'done' | 'skipped' | 'todo'; reason: string | null }[] {
  return STEP_IDS.map((id) => {
    const done = state.done.includes(id);
    const reason = STEPS[id].skipReason(ctx, done);
    return { id, status: reason ? 'skipped' : done ? 'done' : 'todo', reason };
  });
}

export interface StepOutcome {
  state: FlowState;
  /** the step left open with its errors and what was typed, when the answer did not pass */
  invalid: { step: StepId; errors: FieldError[]; typed: FormValues } | null;
  /** steps that must be looked at again because an answer changed what they ask */
  reopened: StepId[];
}

/** Answer one step: write its fields, check the whole case with the schema and the core, and move on. */
export function answerStep(
  state: FlowState,
  id: StepId,
  form: FormValues,
  skip: boolean,
  options?: InterpretOptions,
): StepOutcome {
  const step = STEPS[id];
  const ctx = contextFor(state, options);
  const { answers, errors } = applyStep(step, state.answers, form, ctx, skip);
  let done = state.done.filter((s) => s !== id);
  const reopened: StepId[] = [];

  if (id === 'sample') {
    const before = state.done.includes('sample') ? ctx.sample : null;
    const after = answers.sample;
    if (after !== 'arterial' && after !== undefined) {
      // venous and capillary oxygen values say nothing about oxygenation: they leave the case
      for (const path of ['gas.po2', 'gas.sao2', 'oxygen.fio2', 'oxygen.spo2'])
        setPath(answers, path, undefined);
    } else if (before !== null && before !== 'arterial') {
      // an arterial sample asks for PaO2 and FiO2, which were not asked before
      reopened.push(...(['gas', 'oxygen'] as const).filter((s) => done.includes(s)));
    }
  }
  if (id === 'gas') {
    const before = getPath(state.answers, 'units.pressure') ?? 'mmHg';
    const after = getPath(answers, 'units.pressure') ?? 'mmHg';
    if (before !== after && earlierGases(answers).length) {
      // the earlier gases were entered in the old unit and are not converted behind the clinician's back
      return {
        state,
        invalid: {
          step: id,
          errors: [
            {
              path: 'units.pressure',
              message: `The earlier gases of this case are in ${before}: enter the follow-up gas in ${before} too, or start a new case`,
            },
          ],
          typed: form,
        },
        reopened: [],
      };
    }
    if (before !== after) {
      // other pressures in the case were entered in the old unit: ask for them again in the new one
      if (getPath(answers, 'context.baseline.pco2') !== undefined) reopened.push('timing');
      if (getPath(answers, 'ventilator.targetPco2') !== undefined) reopened.push('ventilator');
    }
  }
  if (id === 'patient' && getPath(answers, 'patient.sex') === 'male')
    setPath(answers, 'patient.pregnant', undefined);

  const all = errors.concat(
    checkAnswers(answers).filter((e) => !errors.some((u) => u.path === e.path)),
  );
  if (!all.length && 'gas' in answers) {
    const result = interpret(answers, options);
    if (!result.ok) all.push(...result.errors);
  }
  if (!all.length && id === 'gas') {
    const question = unitQuestion(answers, form, options);
    if (question)
      return {
        state,
        invalid: {
          step: id,
          errors: [question],
          typed: { ...form, unitAsked: String(getPath(answers, 'units.pressure') ?? 'mmHg') },
        },
        reopened: [],
      };
  }
  if (all.length) {
    return { state, invalid: { step: id, errors: all, typed: form }, reopened: [] };
  }
  done = done.filter((s) => !reopened.includes(s));
  done.push(id);
  if (id === 'oxygen' && !answers.ventilator) done = done.filter((s) => s !== 'ventilator');
  return {
    state: { ...state, answers, done: STEP_IDS.filter((s) => done.includes(s)) },
    invalid: null,
    reopened,
  };
}

/**
 * A PCO2 that fits the other pressure unit better (the core's unit screen) is asked about at the field,
 * once; pressing Next again with the same unit keeps it, and the core then withholds the reading and says why.
 */
export function unitQuestion(
  answers: Json,
  form: FormValues,
  options?: InterpretOptions,
): FieldError | null {
  const f = findingsOf(answers, options);
  if (!f?.flags.some((x) => x.code === 'unit_ambiguous')) return null;
  const unit = String(getPath(answers, 'units.pressure') ?? 'mmHg');
  if (form.unitAsked === unit) return null;
  const other = unit === 'mmHg' ? 'kPa' : 'mmHg';
  const pco2 = getPath(answers, 'gas.pco2');
  const ph = getPath(answers, 'gas.ph');
  return {
    path: 'units.pressure',
    message: `PCO2 ${pco2} ${unit} with pH ${ph} looks like ${other}: check the unit on the printout. To keep ${unit}, press Next again.`,
  };
}

/** Split errors between the fields of a step and the step as a whole. */
export function placeErrors(
  id: StepId,
  errors: FieldError[],
  ctx: StepContext,
): { fields: Map<string, string>; step: FieldError[] } {
  const owned = new Set(
    ownedPaths(STEPS[id].groups(ctx)).concat(id === 'oxygen' ? ['ventilated'] : []),
  );
  const fields = new Map<string, string>();
  const step: FieldError[] = [];
  for (const e of errors) {
    if (owned.has(e.path) && !fields.has(e.path)) fields.set(e.path, e.message);
    else step.push(e);
  }
  return { fields, step };
}

// ---------- a follow-up gas ----------

/** An ISO-like date and time (2026-03-02T04:10, 2026-03-02 04:10, 2026-03-02): kept as takenAt; other words are a label. */
const DATE_TIME = /^\d{4}-\d{2}-\d{2}(?:[T ]\d{2}:\d{2}(?::\d{2})?)?$/;
const MAX_WHEN = 80;

export type FollowUpOutcome =
  | { ok: true; state: FlowState; moved: Json }
  | { ok: false; message: string };

/**
 * Move the current gas, with its FiO2 and PEEP and its VT and RR, into the earlier gases, and open the gas,
 * oxygen and ventilator steps for the new values. Chemistry, patient and context stay; the oxygen and
 * ventilator answers stay in the forms as a starting point, to be confirmed for the new gas.
 */
export function startFollowUp(state: FlowState, when: string): FollowUpOutcome {
  const answers = structuredClone(state.answers);
  if (!isObject(answers.gas)) return { ok: false, message: 'There is no gas to follow up yet.' };
  const earlier = earlierGases(answers);
  if (earlier.length >= MAX_PREVIOUS_GASES) {
    return {
      ok: false,
      message: `This case already holds ${MAX_PREVIOUS_GASES} earlier gases, the most it can: start a new case for the next gas.`,
    };
  }
  const text = when.trim().replace(/\s+/g, ' ');
  if (text.length > MAX_WHEN)
    return {
      ok: false,
      message: `Keep the time or label to ${MAX_WHEN} characters or fewer (it has ${text.length}).`,
    };
  const moved: Json = {};
  if (text && DATE_TIME.test(text) && text.length <= 40) moved.takenAt = text;
  else if (text) moved.label = text;
  moved.gas = answers.gas;
  const oxygen = pick(answers.oxygen, ['fio2', 'peep']);
  if (oxygen) moved.oxygen = oxygen;
  const ventilator = pick(answers.ventilator, ['vt', 'rr']);
  if (ventilator) moved.ventilator = ventilator;
  answers.previous = [...earlier, moved];
  delete answers.gas;
  const errors = checkAnswers(answers);
  if (errors.length)
    return {
      ok: false,
      message: `The earlier gas could not be kept: ${errors.map((e) => e.message).join('; ')}.`,
    };
  const done = state.done.filter((s) => s !== 'gas' && s !== 'oxygen' && s !== 'ventilator');
  return { ok: true, state: { ...state, answers, done }, moved };
}

/** Undo a follow-up not yet entered: the last earlier gas becomes the current gas again. */
export function cancelFollowUp(state: FlowState): FlowState | null {
  if (!awaitingFollowUp(state.answers)) return null;
  const answers = structuredClone(state.answers);
  const earlier = earlierGases(answers);
  const last = earlier.pop();
  if (!last || !isObject(last.gas)) return null;
  answers.gas = last.gas;
  if (earlier.length) answers.previous = earlier;
  else delete answers.previous;
  // the oxygen and ventilator answers stayed in the case; the earlier gas's own FiO2, PEEP, VT and RR are put back
  for (const [group, keys] of [
    ['oxygen', ['fio2', 'peep']],
    ['ventilator', ['vt', 'rr']],
  ] as const) {
    const from = isObject(last[group]) ? last[group] : {};
    for (const key of keys) setPath(answers, `${group}.${key}`, (from as Json)[key] ?? undefined);
  }
  if (checkAnswers(answers).length) return null;
  const restored = new Set<StepId>([
    ...state.done,
    'gas',
    'oxygen',
    ...(isObject(answers.ventilator) ? ['ventilator' as const] : []),
  ]);
  return { ...state, answers, done: STEP_IDS.filter((s) => restored.has(s)) };
}

function pick(group: unknown, keys: string[]): Json | null {
  if (!isObject(group)) return null;
  const out: Json = {};
  for (const key of keys)
    if (group[key] !== undefined && group[key] !== null) out[key] = group[key];
  return Object.keys(out).length ? out : null;
}
