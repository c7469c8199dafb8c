// A follow-up gas: the current gas, with the settings it was taken on, becomes an earlier gas of the case, and the
// steps that ask a gas and those settings open again for the new one. Undone while the new gas is not entered.
import {
  FIELD,
  MAX_PREVIOUS_GASES,
  PREVIOUS_SETTINGS,
  enteredUnit,
  fieldsOf,
  type FieldSpec,
  type ParsedCase,
} from '../calc/index.ts';
import { awaitingFollowUp, checkAnswers, type FlowState } from './flow.ts';
import { earlierGases, getPath, isObject, setPath, type Json } from './paths.ts';
import { STEPS, STEP_IDS, contextOf, type StepId } from './steps.ts';

/** An ISO-like date and time (2026-03-02T04:10, 2026-03-02 04:10, 2026-03-02): kept as takenAt; other words are a label. */
const DATE_TIME = /^\d{4}-\d{2}-\d{2}(?:[T ]\d{2}:\d{2}(?::\d{2})?)?$/;
const MAX_WHEN = 80;

/** The steps that ask what an earlier gas keeps: its gas and the settings it was taken on. */
const FOLLOW_UP_STEPS = new Set<StepId>(
  [...fieldsOf('gas'), ...PREVIOUS_SETTINGS.map((p) => FIELD[p])].flatMap((f: FieldSpec) =>
    f.step ? [f.step] : [],
  ),
);

export type FollowUpOutcome =
  | { ok: true; state: FlowState; moved: Json }
  | { ok: false; message: string };

/** The settings an earlier gas keeps (FiO2, PEEP, VT, RR), as they stand in the case. */
function settingsOf(answers: Json): Json {
  const out: Json = {};
  for (const path of PREVIOUS_SETTINGS) {
    const value = getPath(answers, path);
    if (value !== undefined && value !== null) setPath(out, path, value);
  }
  return out;
}

/** A time or a label as typed: a date and time is kept as takenAt, other words as a label. */
function whenOf(text: string): Json {
  if (!text) return {};
  return DATE_TIME.test(text) && text.length <= 40 ? { takenAt: text } : { label: text };
}

/**
 * Move the current gas, with its FiO2 and PEEP and its VT and RR, into the earlier gases, and open the gas,
 * oxygen and ventilator steps for the new values. The moved gas keeps the time it was given when it was
 * entered (or "first gas"); the time typed now belongs to the new gas. Chemistry, patient and context stay; the
 * oxygen and ventilator answers stay in the forms as a starting point, to be confirmed for the new gas.
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
  const own = (state.taken ?? '').trim();
  const moved: Json = whenOf(own || (earlier.length ? '' : 'first gas'));
  moved.gas = answers.gas;
  Object.assign(moved, settingsOf(answers));
  answers.previous = [...earlier, moved];
  delete answers.gas;
  const { errors } = checkAnswers(answers);
  if (errors.length)
    return {
      ok: false,
      message: `The earlier gas could not be kept: ${errors.map((e) => e.message).join('; ')}.`,
    };
  const done = state.done.filter((s) => !FOLLOW_UP_STEPS.has(s));
  return {
    ok: true,
    state: { ...state, answers, done, finished: false, taken: text },
    moved,
  };
}

/** One value then and now ("RR 22 to 28/min"). */
export interface Change {
  label: string;
  then: number;
  now: number;
  unit: string;
}

/**
 * What changed since the last earlier gas: the gas values both hold, and the settings it was taken on (FiO2,
 * PEEP, VT, RR) where either holds one. Values as entered, in the case's units.
 */
export function changesSince(
  answers: Json,
): { when: string | null; gas: Change[]; settings: Change[] } | null {
  const last = earlierGases(answers).at(-1);
  if (!last || !isObject(answers.gas)) return null;
  const units = contextOf(answers, null).units;
  const pair = (f: FieldSpec, then: unknown, now: unknown): Change[] =>
    typeof then === 'number' && typeof now === 'number'
      ? [{ label: f.label, then, now, unit: enteredUnit(f, units) }]
      : [];
  const gas = fieldsOf('gas')
    .filter((f) => !f.optional)
    .flatMap((f) => pair(f, getPath(last, f.path), getPath(answers, f.path)));
  const settings = PREVIOUS_SETTINGS.flatMap((path) => {
    const then = getPath(last, path);
    const now = getPath(answers, path);
    return then === now ? [] : pair(FIELD[path], then, now);
  });
  const when = [last.takenAt, last.label].find((x) => typeof x === 'string' && x.trim() !== '');
  return { when: typeof when === 'string' ? when : null, gas, settings };
}

/** A change as people say it: "RR 22 to 28/min", "PaCO2 61 to 50 mmHg". */
export const changeText = (c: Change) =>
  `${c.label} ${c.then} to ${c.now}${c.unit && !c.unit.startsWith('/') ? ' ' : ''}${c.unit}`;

/** Undo a follow-up not yet entered: the last earlier gas becomes the current gas again. */
export function cancelFollowUp(
  state: FlowState,
): { state: FlowState; parsed: ParsedCase | null } | null {
  if (!awaitingFollowUp(state.answers)) return null;
  const answers = structuredClone(state.answers);
  const earlier = earlierGases(answers);
  const last = earlier.pop();
  if (!last || !isObject(last.gas)) return null;
  answers.gas = last.gas;
  if (earlier.length) answers.previous = earlier;
  else delete answers.previous;
  // the oxygen and ventilator answers stayed in the case; the earlier gas's own FiO2, PEEP, VT and RR are put back
  for (const path of PREVIOUS_SETTINGS) setPath(answers, path, getPath(last, path) ?? undefined);
  const checked = checkAnswers(answers);
  if (checked.errors.length) return null;
  // the follow-up's steps count as answered again, those that apply to this case (the ventilator only if ventilated)
  const ctx = contextOf(answers, null);
  const restored = new Set<StepId>([
    ...state.done,
    ...[...FOLLOW_UP_STEPS].filter((s) => STEPS[s].skipReason(ctx, true) === null),
  ]);
  const own = [last.takenAt, last.label].find((x) => typeof x === 'string' && x !== 'first gas');
  return {
    state: {
      ...state,
      answers,
      done: STEP_IDS.filter((s) => restored.has(s)),
      taken: typeof own === 'string' ? own : '',
    },
    parsed: checked.parsed,
  };
}
