// A paste on the first step: what the intake read (handed in by the server as data, see intake.ts), shown for the
// clinician to confirm, and its questions asked as form controls (confirming it: pasteConfirm.ts).
// The text travels with the confirm form; a fingerprint of the text that was shown makes sure the values
// used are the ones the clinician saw.
import { createHash } from 'node:crypto';
import { FIELD, FIELDS, type FieldError, type FieldPath, type FieldSpec } from '../calc/index.ts';
import { unitOptions } from './fields.ts';
import { labelOf, type Intake, type Question } from './intake.ts';
import { getPath, type FormValues } from './paths.ts';
import { OXYGENATION_PATHS, STEPS, STEP_IDS, choiceOf, sampleOf, stepOf } from './steps.ts';

export const fingerprint = (text: string): string =>
  createHash('sha256').update(text, 'utf8').digest('hex').slice(0, 32);

export const capital = (s: string) => s.charAt(0).toUpperCase() + s.slice(1);

// ---------- the questions as controls ----------

/**
 * An intake's answer that sets a value with its unit: the kind of value, the unit, and its label. The answer may
 * give the unit as the table keys it or as it reads; a unit that names the value itself (urea in mg/dL may be urea
 * or urea nitrogen) is taken only when the answer names it too ("BUN mg/dL").
 */
export function unitAnswer(path: string, answer: string) {
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

/** The most entries each list of the confirm view shows (set aside, lines with no result, notes, conversions,
 *  problems); the rest are counted. A long paste would otherwise come back as a page several times its size. */
export const MAX_LISTED = 20;
/** A list as the page shows it: its first MAX_LISTED entries, its length, and how many are not shown. */
const listed = <T>(list: readonly T[]) => ({
  items: list.slice(0, MAX_LISTED),
  total: list.length,
  more: Math.max(0, list.length - MAX_LISTED),
});

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
  // errors about the values as they stand; an error on a question's answer is shown at the question
  const blocking = errors.filter((e) => !e.path.startsWith('answer-')).map((e) => e.message);
  return {
    type: 'paste',
    id: 'paste',
    title: 'Check what was read',
    source: intake.kind === 'fhir' ? 'FHIR JSON' : 'the pasted text',
    text: intake.text,
    fingerprint: fingerprint(intake.text),
    remark,
    /** whether something stops the values being used as they stand */
    errors: blocking.length > 0,
    /** those errors, then what could not be read */
    problems: listed([...blocking, ...intake.problems]),
    sample:
      known && intake.sampleFrom
        ? { value: capital(String(intake.case.sample)), from: intake.sampleFrom }
        : null,
    read,
    questions,
    missing: read.length ? missing : [],
    setAside: listed(intake.setAside),
    conversions: listed(intake.conversions),
    notes: listed(intake.notes),
    ignored: listed(intake.ignored),
    canConfirm: usable,
  };
}

export type PasteView = ReturnType<typeof pasteView>;
