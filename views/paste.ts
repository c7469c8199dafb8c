// A paste on the first step: what the intake read (handed in by the server as data, see intake.ts), shown for the
// clinician to confirm, its questions asked as form controls, and on confirm the case and the steps it answers.
// Nothing unsure goes into the case: an open question leaves its value out and its step open for it.
// The text travels with the confirm form; a fingerprint of the text that was shown makes sure the values
// used are the ones the clinician saw.
import { createHash } from 'node:crypto';
import {
  FIELD,
  FIELDS,
  interpretParsed,
  type FieldError,
  type FieldPath,
  type FieldSpec,
  type InterpretOptions,
} from '../calc/index.ts';
import { allFields } from './answers.ts';
import { unitOptions } from './fields.ts';
import { checkAnswers, readOf, statuses, type FlowState, type Read } from './flow.ts';
import { labelOf, type Intake, type Question } from './intake.ts';
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

export const fingerprint = (text: string): string =>
  createHash('sha256').update(text, 'utf8').digest('hex').slice(0, 32);

const capital = (s: string) => s.charAt(0).toUpperCase() + s.slice(1);

// ---------- the questions as controls ----------

/**
 * An intake's answer that sets a value with its unit: the kind of value, the unit, and its label. The answer may
 * give the unit as the table keys it or as it reads; a unit that names the value itself (urea in mg/dL may be urea
 * or urea nitrogen) is taken only when the answer names it too ("BUN mg/dL").
 */
function unitAnswer(path: string, answer: string) {
  const field = FIELD[path as FieldPath];
  const q = field?.quantity;
  if (!q) return null;
  const unit = unitOptions(field, q).find(
    (o) =>
      o.value === answer || o.label === answer || (o.name === field.label && o.unit === answer),
  );
  return unit ? { quantity: q, unit: unit.value, label: unit.label } : null;
}

export const LEAVE_OUT = 'leave-out';

export type Control =
  | {
      kind: 'choice';
      options: { value: string; label: string }[];
      leaveOut: boolean;
      effect: 'choice' | 'unit' | 'number';
    }
  | { kind: 'step' };

export function controlOf(q: Question): Control {
  const options = q.options ?? [];
  const choice = choiceOf(q.path);
  if (choice) {
    // a question about one of the steps' choices (the sample type) is asked with that choice's own options
    const valid = choice.options.filter((o) => options.includes(o.value));
    return valid.length
      ? {
          kind: 'choice',
          options: valid.map((o) => ({ value: o.value, label: o.label })),
          leaveOut: false,
          effect: 'choice',
        }
      : { kind: 'step' };
  }
  if (q.value !== undefined) {
    const valid = options.flatMap((o) => {
      const unit = unitAnswer(q.path, o);
      return unit ? [{ value: o, label: `${q.value} ${unit.label}` }] : [];
    });
    if (valid.length) return { kind: 'choice', options: valid, leaveOut: true, effect: 'unit' };
  }
  const field = FIELD[q.path as FieldPath];
  if (
    field &&
    !field.quantity &&
    options.length &&
    options.every((o) => /^-?\d+(\.\d+)?$/.test(o))
  ) {
    return {
      kind: 'choice',
      options: options.map((o) => ({
        value: o,
        label: `${o}${field.unit ? ` ${field.unit}` : ''}`,
      })),
      leaveOut: true,
      effect: 'number',
    };
  }
  return { kind: 'step' };
}

// ---------- the confirm view ----------

const TABLE_ORDER = new Map((FIELDS as readonly FieldSpec[]).map((f, i) => [f.path, i]));
/** The page's order: by step, then by the table within a step; anything else after. */
const order = (path: string): [number, number] => {
  const step = stepOf(path);
  return step === null
    ? [STEP_IDS.length, 0]
    : [STEP_IDS.indexOf(step), TABLE_ORDER.get(path) ?? FIELDS.length];
};
const byPageOrder = (a: string, b: string) => {
  const [x, y] = [order(a), order(b)];
  return x[0] - y[0] || x[1] - y[1];
};

/** Values a reading leans on; the confirm view says which of them the text did not have. */
const MISSING_CHECK = [
  'gas.ph',
  'gas.pco2',
  'gas.po2',
  'gas.hco3',
  'chemistry.na',
  'chemistry.k',
  'chemistry.cl',
  'chemistry.albumin',
];

/** The values to look at before the case is used, and the questions as form controls. */
export function pasteView(
  intake: Intake,
  form: FormValues | null,
  errors: FieldError[] = [],
  remark: string | null = null,
) {
  const sample = sampleOf(intake.case);
  const known = intake.case.sample !== undefined;
  const notOxygenation = known && sample !== 'arterial';
  const read = [...intake.read]
    .sort((a, b) => byPageOrder(a.path, b.path))
    .map((r) => ({
      label: labelOf(r.path, sample),
      value: String(r.value),
      unit: r.unit === 'fraction' ? '(fraction)' : r.unit,
      from: r.sourceText,
      notes: [
        ...r.notes,
        ...(notOxygenation && OXYGENATION_PATHS.includes(r.path)
          ? [`not used: the PO2 and saturation of a ${sample} sample do not show oxygenation`]
          : []),
      ],
    }));
  const questions = intake.questions.map((q, i) => {
    const name = `answer-${i}`;
    const control = controlOf(q);
    const typed = form?.[name];
    const step = stepOf(q.path);
    // the intake's own words assume a default; the page asks instead and assumes nothing
    const reason =
      q.path === 'sample' && !q.sourceText && (q.options ?? []).length === 3
        ? `The ${intake.kind === 'fhir' ? 'codes do' : 'text does'} not say whether the sample is arterial, venous or capillary.`
        : capital(q.reason);
    const base = {
      id: `q-${i}`,
      name,
      legend: `${labelOf(q.path, sample)}${q.value !== undefined ? ` ${q.value}` : ''}`,
      reason,
      sourceText: q.sourceText ?? null,
      stepTitle: step ? STEPS[step].title : null,
      error: errors.find((e) => e.path === name)?.message ?? null,
    };
    if (control.kind === 'step') return { ...base, kind: 'step' as const, options: [] };
    const options = [
      ...control.options,
      ...(control.leaveOut
        ? [
            {
              value: LEAVE_OUT,
              label: `Neither: leave it out, I will enter it at the ${(step ? STEPS[step].title : 'gas').toLowerCase()} step`,
            },
          ]
        : []),
    ];
    return {
      ...base,
      kind: 'choice' as const,
      suggested: q.suggested ?? null,
      options: options.map((o, j) => ({
        id: `q-${i}-${j}`,
        value: o.value,
        label: o.label,
        checked: typed === o.value,
      })),
    };
  });
  const missing = MISSING_CHECK.filter((p) => !(notOxygenation && OXYGENATION_PATHS.includes(p)))
    .filter(
      (p) => getPath(intake.case, p) === undefined && !intake.questions.some((q) => q.path === p),
    )
    .map((p) => labelOf(p, sample));
  const usable = intake.read.length > 0 || questions.some((q) => q.kind === 'choice');
  return {
    type: 'paste',
    id: 'paste',
    title: 'Check what was read',
    source: intake.kind === 'fhir' ? 'FHIR JSON' : 'the pasted text',
    text: intake.text,
    fingerprint: fingerprint(intake.text),
    remark,
    problems: intake.problems,
    errors: errors.filter((e) => !e.path.startsWith('answer-')).map((e) => e.message),
    sample:
      known && intake.sampleFrom
        ? { value: capital(String(intake.case.sample)), from: intake.sampleFrom }
        : null,
    read,
    questions,
    missing: read.length ? missing : [],
    setAside: intake.setAside,
    conversions: intake.conversions,
    notes: intake.notes,
    ignored: intake.ignored,
    canConfirm: usable,
  };
}

export type PasteView = ReturnType<typeof pasteView>;

// ---------- confirming ----------

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
  const announce = `Kept from the paste: ${kept} value${kept === 1 ? '' : 's'}.${dropped.length ? ` Not used for a ${sample} sample: ${dropped.join(', ')}.` : ''} ${first ? `Next: ${STEPS[first].title.toLowerCase()}.` : 'The draft note is ready below.'}`;
  return { ok: true, read, announce, remarks };
}
