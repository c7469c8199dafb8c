// The conversation as data: the case so far, which steps are answered, which one is open.
// Nothing is kept on the server: every request brings the case in a hidden field, and the same
// zod schema checks it every time before anything is read from it.
import { caseShape, interpret, parseCase, type FieldError, type Findings, type InterpretOptions } from '../calc/index.ts';
import {
  STEPS, STEP_IDS, applyStep, contextOf, getPath, isStepId, ownedPaths, setPath,
  type FormValues, type Json, type StepContext, type StepId,
} from './steps.ts';

export type Format = 'text' | 'markdown';

export interface FlowState {
  answers: Json;
  done: StepId[];
  format: Format;
}

export const emptyState = (): FlowState => ({ answers: {}, done: [], format: 'text' });

export type ReadResult = { ok: true; state: FlowState } | { ok: false; message: string };

const isObject = (x: unknown): x is Json => x !== null && typeof x === 'object' && !Array.isArray(x);

/** Check a case that travelled with a request. Before the gas is given only the sample and units may be present. */
export function checkAnswers(answers: Json): FieldError[] {
  if ('gas' in answers) {
    const parsed = parseCase(answers);
    return parsed.ok ? [] : parsed.errors;
  }
  const errors: FieldError[] = [];
  for (const key of Object.keys(answers)) {
    if (key !== 'sample' && key !== 'units') errors.push({ path: key, message: `"${key}" cannot come before the gas` });
  }
  for (const key of ['sample', 'units'] as const) {
    if (!(key in answers)) continue;
    const result = caseShape.shape[key].safeParse(answers[key]);
    if (!result.success) errors.push({ path: key, message: result.error.issues[0]?.message ?? 'not valid' });
  }
  return errors;
}

/** The state a form carried: the case (JSON), the answered steps, the note format. */
export function readState(form: FormValues): ReadResult {
  let answers: unknown = {};
  const raw = form.case ?? '';
  if (raw.trim() !== '') {
    try { answers = JSON.parse(raw); } catch { return { ok: false, message: 'The case sent with the form is not readable.' }; }
  }
  if (!isObject(answers)) return { ok: false, message: 'The case sent with the form is not an object.' };
  const errors = checkAnswers(answers);
  if (errors.length) return { ok: false, message: `The case sent with the form did not pass the checks: ${errors.map((e) => `${e.path}: ${e.message}`).join('; ')}` };
  const done = [...new Set((form.done ?? '').split(/[\s,]+/).filter(isStepId))];
  // a step counts as answered only with the gas behind it
  const state: FlowState = { answers, done: 'gas' in answers ? done : done.filter((s) => s === 'sample'), format: form.format === 'markdown' ? 'markdown' : 'text' };
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
  const respiratory = f ? f.disorders.some((d) => d.code === 'respiratory_acidosis' || d.code === 'respiratory_alkalosis') : null;
  return contextOf(state.answers, respiratory);
}

/** Steps in order with what each is now: answered, skipped (with the reason), or still to ask. */
export function statuses(state: FlowState, ctx: StepContext): { id: StepId; status: 'done' | 'skipped' | 'todo'; reason: string | null }[] {
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
export function answerStep(state: FlowState, id: StepId, form: FormValues, skip: boolean, options?: InterpretOptions): StepOutcome {
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
      for (const path of ['gas.po2', 'gas.sao2', 'oxygen.fio2', 'oxygen.spo2']) setPath(answers, path, undefined);
    } else if (before !== null && before !== 'arterial') {
      // an arterial sample asks for PaO2 and FiO2, which were not asked before
      reopened.push(...(['gas', 'oxygen'] as const).filter((s) => done.includes(s)));
    }
  }
  if (id === 'gas') {
    const before = getPath(state.answers, 'units.pressure') ?? 'mmHg';
    const after = getPath(answers, 'units.pressure') ?? 'mmHg';
    if (before !== after) {
      // other pressures in the case were entered in the old unit: ask for them again in the new one
      if (getPath(answers, 'context.baseline.pco2') !== undefined) reopened.push('timing');
      if (getPath(answers, 'ventilator.targetPco2') !== undefined) reopened.push('ventilator');
    }
  }
  if (id === 'patient' && getPath(answers, 'patient.sex') === 'male') setPath(answers, 'patient.pregnant', undefined);

  const all = errors.concat(checkAnswers(answers).filter((e) => !errors.some((u) => u.path === e.path)));
  if (!all.length && 'gas' in answers) {
    const result = interpret(answers, options);
    if (!result.ok) all.push(...result.errors);
  }
  if (!all.length && id === 'gas') {
    const question = unitQuestion(answers, form, options);
    if (question) return { state, invalid: { step: id, errors: [question], typed: { ...form, unitAsked: String(getPath(answers, 'units.pressure') ?? 'mmHg') } }, reopened: [] };
  }
  if (all.length) {
    return { state, invalid: { step: id, errors: all, typed: form }, reopened: [] };
  }
  done = done.filter((s) => !reopened.includes(s));
  done.push(id);
  if (id === 'oxygen' && !answers.ventilator) done = done.filter((s) => s !== 'ventilator');
  return { state: { ...state, answers, done: STEP_IDS.filter((s) => done.includes(s)) }, invalid: null, reopened };
}

/**
 * A PCO2 that fits the other pressure unit better (the core's unit screen) is asked about at the field,
 * once; pressing Next again with the same unit keeps it, and the core then withholds the reading and says why.
 */
function unitQuestion(answers: Json, form: FormValues, options?: InterpretOptions): FieldError | null {
  const f = findingsOf(answers, options);
  if (!f || !f.flags.some((x) => x.code === 'unit_ambiguous')) return null;
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
export function placeErrors(id: StepId, errors: FieldError[], ctx: StepContext): { fields: Map<string, string>; step: FieldError[] } {
  const owned = new Set(ownedPaths(STEPS[id].groups(ctx)).concat(id === 'oxygen' ? ['ventilated'] : []));
  const fields = new Map<string, string>();
  const step: FieldError[] = [];
  for (const e of errors) {
    if (owned.has(e.path) && !fields.has(e.path)) fields.set(e.path, e.message);
    else step.push(e);
  }
  return { fields, step };
}
