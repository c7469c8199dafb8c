// Confirming a paste: the case from what was read and the answers given to the intake's questions, checked and read
// once, and the steps it answers marked answered. Nothing unsure goes into the case: an open question leaves its
// value out and its step open for it, with the reason shown there.
import { interpretParsed, type FieldError, type InterpretOptions } from '../calc/index.ts';
import { allFields } from './answers.ts';
import { checkAnswers, readOf, statuses, type FlowState, type Read } from './flow.ts';
import { labelOf, type Intake } from './intake.ts';
import { LEAVE_OUT, capital, controlOf, unitAnswer } from './paste.ts';
import {
  dropEmptyGroups,
  getPath,
  isObject,
  setPath,
  type FormValues,
  type Json,
} from './paths.ts';
import {
  OXYGENATION_PATHS,
  STEPS,
  STEP_IDS,
  choiceOf,
  contextOf,
  sampleOf,
  stepOf,
  type StepId,
} from './steps.ts';

export type ConfirmOutcome =
  | { ok: true; read: Read; announce: string; remarks: string[] }
  | { ok: false; errors: FieldError[] };

interface Answered {
  answers: Json;
  errors: FieldError[];
  /** why a step stays open, by step */
  open: Map<StepId, string[]>;
  /** the unit choices the clinician made in an answer (units.pressure) */
  chosen: Set<string>;
}

/** The intake's case with the clinician's answers to its questions written in. */
function withAnswers(intake: Intake, form: FormValues): Answered {
  const out: Answered = {
    answers: structuredClone(intake.case),
    errors: [],
    open: new Map(),
    chosen: new Set(),
  };
  const { answers, errors } = out;
  for (const [i, q] of intake.questions.entries()) {
    const name = `answer-${i}`;
    const control = controlOf(q);
    const raw = form[name] ?? '';
    const step = stepOf(q.path);
    const label = labelOf(q.path, sampleOf(answers));
    if (control.kind === 'step') leaveOpen(out, step, capital(q.reason));
    else if (raw === '' || raw === LEAVE_OUT)
      leaveOpen(out, step, `${label}: left out at the paste; enter it here if you have it`);
    else if (!control.options.some((o) => o.value === raw))
      errors.push({ path: name, message: 'Choose one of the answers offered' });
    else if (control.effect === 'choice')
      setPath(answers, q.path, choiceOf(q.path)!.options.find((o) => o.value === raw)!.json);
    else if (control.effect === 'number') setPath(answers, q.path, Number(raw));
    else {
      const { quantity, unit } = unitAnswer(q.path, raw)!;
      const held = getPath(answers, `units.${quantity}`);
      if (held !== undefined && held !== unit) {
        errors.push({
          path: name,
          message: `${label} cannot be in ${unit}: other values of the case are in ${String(held)}, and the case holds one unit for them`,
        });
        continue;
      }
      setPath(answers, `units.${quantity}`, unit);
      setPath(answers, q.path, q.value);
      out.chosen.add(`units.${quantity}`);
    }
  }
  return out;
}

function leaveOpen(a: Answered, step: StepId | null, why: string) {
  if (step) a.open.set(step, [...(a.open.get(step) ?? []), why]);
}

const has = (answers: Json, path: string) => getPath(answers, path) != null;

/** The case from what was read and the answers given; the steps it answers are marked answered. */
export function confirmPaste(
  state: FlowState,
  intake: Intake,
  form: FormValues,
  options?: InterpretOptions,
): ConfirmOutcome {
  const answered = withAnswers(intake, form);
  const { answers } = answered;
  if (answered.errors.length) return { ok: false, errors: answered.errors };

  const dropped: string[] = [];
  const sample = sampleOf(answers);
  if (answers.sample !== undefined && sample !== 'arterial') {
    // as on the sample step: a venous or capillary PO2 or saturation says nothing about oxygenation
    for (const path of OXYGENATION_PATHS) {
      const v = getPath(answers, path);
      if (v !== undefined) {
        dropped.push(`${labelOf(path, sample)} ${String(v)}`);
        setPath(answers, path, undefined);
      }
    }
  }
  dropEmptyGroups(answers);
  if (!isObject(answers.gas)) {
    return {
      ok: false,
      errors: [
        {
          path: 'gas',
          message:
            'No gas value was read: at least two of pH, PaCO2 and HCO3 are needed. Add them to the text and read it again, or enter the gas by hand.',
        },
      ],
    };
  }
  const checked = checkAnswers(answers);
  if (!checked.parsed)
    return {
      ok: false,
      errors: checked.errors.map((e) => ({
        path: e.path,
        message: e.path.includes('.') ? `${labelOf(e.path, sample)}: ${e.message}` : e.message,
      })),
    };
  const findings = interpretParsed(checked.parsed, options);
  if (!findings.ok) return { ok: false, errors: findings.errors };

  // a step the paste filled counts as answered, unless it still asks something: a question of its own (the unit
  // of a PCO2 that looks like the other unit, unless chosen here), what it lacks, or a required choice
  const ctx = contextOf(answers, null);
  const done = STEP_IDS.filter((id) => {
    const step = STEPS[id];
    const fields = allFields(step.groups(ctx));
    if (!fields.some((f) => !(f.kind === 'choice' && f.pseudo) && has(answers, f.name)))
      return false;
    const asked = step.confirm?.(answers, {}, findings);
    if (asked && !answered.chosen.has(asked.error.path))
      leaveOpen(answered, id, asked.error.message);
    const lacking = step.lacking?.(ctx);
    if (lacking) leaveOpen(answered, id, lacking);
    const unanswered = fields.some(
      (f) =>
        f.kind === 'choice' &&
        f.required &&
        (f.pseudo ? f.pseudo.shown(answers) === '' : !has(answers, f.name)),
    );
    return !unanswered && !answered.open.has(id);
  });

  const read = readOf({ ...state, answers, done }, options, checked.parsed, findings);
  const first = statuses(read.state, read.ctx).find((s) => s.status === 'todo')?.id ?? null;
  const kept = new Set(
    [...intake.read.map((r) => r.path), ...intake.questions.map((q) => q.path)].filter(
      (p) => p !== 'sample' && p.includes('.') && has(answers, p),
    ),
  ).size;
  const remarks: string[] = [];
  if (first) {
    const prefilled = intake.read
      .filter((r) => stepOf(r.path) === first && has(answers, r.path))
      .map((r) => labelOf(r.path, sample));
    if (prefilled.length) remarks.push(`From the paste: ${prefilled.join(', ')}. Check and go on.`);
    remarks.push(...(answered.open.get(first) ?? []));
  }
  if (dropped.length) remarks.push(`Not used, as the sample is ${sample}: ${dropped.join(', ')}.`);
  // what comes next, and the reading, are said by the reply that follows these words
  const announce = `Kept from the paste: ${kept} value${kept === 1 ? '' : 's'}.${dropped.length ? ` Not used for a ${sample} sample: ${dropped.join(', ')}.` : ''}`;
  return { ok: true, read, announce, remarks };
}
