// The case schema: shapes from the table of fields (fields.ts), ranges checked in canonical units, so that a kPa
// entry is judged by the same range as mmHg. Every error names the path of its field.
import { z } from 'zod';
import { FIELD, FIELDS, fieldsOf, keyOf, MAX_PREVIOUS_GASES, PREVIOUS_SETTINGS } from './fields.ts';
import { CONDITIONS } from './conditions.ts';
import type { FieldPath, FieldSpec, KeysOf } from './fields.ts';
import {
  QUANTITIES,
  QUANTITY_NAMES,
  fromCanonical,
  resolveUnits,
  toCanonical,
  unitLabel,
} from './units.ts';
import type { Quantity, UnitOf, Units } from './units.ts';

export interface FieldError {
  path: string;
  message: string;
}

// ---------- shapes ----------

const number = (label: string) =>
  z.number({
    error: (issue) =>
      issue.input === undefined ? `${label} is required` : `${label} must be a number`,
  });
const optionalNumber = (label: string) => number(label).nullish();
type OptionalNumber = ReturnType<typeof optionalNumber>;
const oneOf = <const T extends readonly [string, ...string[]]>(label: string, values: T) =>
  z.enum(values, { error: () => `${label} must be one of: ${values.join(', ')}` });
/**
 * Characters that change how text is displayed without being seen: the bidirectional embeddings, overrides and
 * isolates (U+202A-202E, U+2066-2069), the directional marks (U+200E, U+200F, U+061C) and the zero-width ones
 * (U+200B-200D, U+2060, U+FEFF). One right-to-left override makes "PaCO2 48 to 42" display reversed; none belongs
 * in a clinical note, so free text loses them at the edge.
 */
export const INVISIBLE = /[\u202a-\u202e\u2066-\u2069\u200e\u200f\u061c\u200b-\u200d\u2060\ufeff]/g;
export const withoutInvisible = (text: string): string => text.replace(INVISIBLE, '');

/** Free text of a case (a gas's time or label): the invisible controls above are removed. */
const freeText = (message: string, max: number, long: string) =>
  z.string({ error: message }).transform(withoutInvisible).pipe(z.string().max(max, long));

const yesNo = (label: string) => z.boolean({ error: `${label} must be true or false` }).nullish();

/** A group's numbers, one optional number per row of the table. */
const numbersOf = <G extends string>(group: G) =>
  Object.fromEntries(fieldsOf(group).map((f) => [keyOf(f), optionalNumber(f.label)])) as Record<
    KeysOf<G>,
    OptionalNumber
  >;

// a group that is missing (where required) or not an object gets a message that names it
const group = <S extends z.core.$ZodLooseShape>(name: string, shape: S) =>
  z.strictObject(shape, {
    error: (issue) =>
      issue.code !== 'invalid_type'
        ? undefined
        : issue.input === undefined
          ? `${name} is required: give at least two of pH, PaCO2 and HCO3`
          : `${name} must be an object of named values`,
  });

const unitChoice = <Q extends Quantity>(q: Q) =>
  oneOf(
    `${q[0]!.toUpperCase()}${q.slice(1)} unit`,
    Object.keys(QUANTITIES[q].units) as [UnitOf<Q>, ...UnitOf<Q>[]],
  ).nullish();
const unitsShape = Object.fromEntries(QUANTITY_NAMES.map((q) => [q, unitChoice(q)])) as {
  [Q in Quantity]: ReturnType<typeof unitChoice<Q>>;
};

export const gasSchema = group('gas', numbersOf('gas'));

const settingsOf = <P extends (typeof PREVIOUS_SETTINGS)[number]>(g: string, paths: readonly P[]) =>
  group(
    g,
    Object.fromEntries(
      paths
        .filter((p) => p.startsWith(`${g}.`))
        .map((p) => [keyOf(FIELD[p]), optionalNumber(FIELD[p].label)]),
    ) as Record<string, OptionalNumber>,
  ).nullish();

const previousSchema = group('previous gas', {
  takenAt: freeText('takenAt must be text (a date and time)', 40, 'takenAt is too long').nullish(),
  label: freeText('label must be text', 80, 'label is too long').nullish(),
  gas: gasSchema,
  oxygen: settingsOf('oxygen', PREVIOUS_SETTINGS),
  ventilator: settingsOf('ventilator', PREVIOUS_SETTINGS),
});

export const caseShape = z.strictObject({
  sample: oneOf('Sample type', ['arterial', 'venous', 'capillary']).nullish(),
  units: group('units', unitsShape).nullish(),
  gas: gasSchema,
  chemistry: group('chemistry', numbersOf('chemistry')).nullish(),
  urine: group('urine', numbersOf('urine')).nullish(),
  patient: group('patient', {
    ...numbersOf('patient'),
    sex: oneOf('Sex', ['male', 'female']).nullish(),
    pregnant: yesNo('pregnant'),
  }).nullish(),
  context: group('context', {
    ...numbersOf('context'),
    timing: oneOf('Timing', ['acute', 'chronic', 'unknown']).nullish(),
    conditions: z
      .array(oneOf('Condition', CONDITIONS), {
        error: 'conditions must be a list of known conditions',
      })
      .max(CONDITIONS.length * 2, 'conditions lists too many entries')
      .nullish(),
    baseline: group('context.baseline', numbersOf('context.baseline')).nullish(),
  }).nullish(),
  oxygen: group('oxygen', numbersOf('oxygen')).nullish(),
  ventilator: group('ventilator', numbersOf('ventilator')).nullish(),
  settings: group('settings', {
    ...numbersOf('settings'),
    anionGapIncludesK: yesNo('anionGapIncludesK'),
  }).nullish(),
  previous: z
    .array(previousSchema, { error: 'previous must be a list of earlier gases' })
    .max(MAX_PREVIOUS_GASES, `At most ${MAX_PREVIOUS_GASES} earlier gases`)
    .nullish(),
});

export type CaseInput = z.input<typeof caseShape>;
export type ParsedCase = z.output<typeof caseShape>;

// ---------- ranges, checked in canonical units ----------

/** The unit a field is entered in, as the clinician reads it. */
export const enteredUnit = (f: FieldSpec, units: Units): string =>
  f.quantity ? unitLabel(f.quantity, units) : f.unit;

/** A field's range in the clinician's unit ("5-70 g/L"). */
export function rangeText(f: FieldSpec, units: Units): string {
  const unit = enteredUnit(f, units);
  // whole-number limits print as such (1-70 mmol/L); otherwise with the field's decimals (6.50-8.00)
  const decimals = f.range.every(Number.isInteger) ? 0 : f.decimals;
  const show = (v: number) => {
    if (!f.quantity) return v.toFixed(decimals);
    const shown = fromCanonical(f.quantity, v, units);
    if (shown === v) return v.toFixed(decimals);
    // a converted limit that is a whole number prints as one (5-70 g/L), else with 2 or 1 decimals by size
    const whole = Math.abs(shown - Math.round(shown)) < 1e-9;
    return shown.toFixed(whole ? 0 : Math.abs(shown) < 10 ? 2 : 1);
  };
  return `${show(f.range[0])}-${show(f.range[1])}${unit ? ` ${unit}` : ''}`;
}

/** Is an entered value inside its field's range once converted? */
export function inRange(f: FieldSpec, value: number, units: Units): boolean {
  if (f.path === 'oxygen.fio2') return fio2Plausible(value);
  const canonical = f.quantity ? toCanonical(f.quantity, value, units) : value;
  return canonical >= f.range[0] && canonical <= f.range[1];
}

// FiO2: a fraction 0.21-1.00 or a percent 21-100 (clinical-scope section 1)
const fio2Plausible = (v: number) => (v > 1 ? v >= 21 && v <= 100 : v >= 0.21 && v <= 1);

function pressureHint(value: number, units: Units): string {
  // a likely unit slip is named as a question; the value is still rejected, never converted
  if (units.pressure === 'kPa' && value > 26) return ' (was it entered in mmHg?)';
  if (units.pressure === 'mmHg' && value < 5) return ' (was it entered in kPa?)';
  return '';
}

function outOfRange(f: FieldSpec, value: number, units: Units): string {
  if (f.path === 'oxygen.fio2')
    return `FiO2 ${value} is neither a fraction (0.21-1.00) nor a percent (21-100): check the value`;
  const unit = enteredUnit(f, units);
  const hint = f.quantity === 'pressure' ? pressureHint(value, units) : '';
  return `${f.label} ${value}${unit ? ` ${unit}` : ''} is outside ${rangeText(f, units)}: check the value${hint}`;
}

const at = (obj: unknown, key: string): unknown =>
  obj !== null && typeof obj === 'object' ? (obj as Record<string, unknown>)[key] : undefined;
const valueAt = (obj: unknown, path: string): unknown => path.split('.').reduce(at, obj);

function check(f: FieldSpec, root: unknown, prefix: string, units: Units, errors: FieldError[]) {
  const value = valueAt(root, f.path);
  if (typeof value !== 'number' || inRange(f, value, units)) return;
  errors.push({ path: prefix + f.path, message: outOfRange(f, value, units) });
}

function checkGas(gas: ParsedCase['gas'], prefix: string, errors: FieldError[]) {
  const known = [gas.ph, gas.pco2, gas.hco3].filter((v) => v !== null && v !== undefined).length;
  if (known < 2)
    errors.push({
      path: `${prefix}gas`,
      message:
        'Give at least two of pH, PaCO2 and HCO3 (the third follows from the Henderson equation)',
    });
}

const GAS_FIELDS = fieldsOf('gas');
const EARLIER_FIELDS: FieldSpec[] = [...GAS_FIELDS, ...PREVIOUS_SETTINGS.map((p) => FIELD[p])];

/** Every plausibility check on a case of the right shape. */
export function rangeErrors(c: ParsedCase): FieldError[] {
  const units = resolveUnits(c.units);
  const errors: FieldError[] = [];
  for (const f of FIELDS as readonly FieldSpec[]) check(f, c, '', units, errors);
  checkGas(c.gas, '', errors);
  if (c.patient?.pregnant && c.patient.sex === 'male')
    errors.push({
      path: 'patient.pregnant',
      message: 'Pregnant is set for a male patient: check sex and pregnancy',
    });
  if (
    c.patient?.pregnancyWeeks != null &&
    (c.patient?.pregnant === false || c.patient?.sex === 'male')
  )
    errors.push({
      path: 'patient.pregnancyWeeks',
      message: 'Weeks of pregnancy are given for a patient not pregnant or male: check pregnancy',
    });
  for (const [i, p] of (c.previous ?? []).entries()) {
    for (const f of EARLIER_FIELDS) check(f, p, `previous.${i}.`, units, errors);
    checkGas(p.gas, `previous.${i}.`, errors);
  }
  return errors;
}

/** The full schema: shape, then ranges. Every error carries the path of its field. */
export const caseSchema = caseShape.superRefine((c, ctx) => {
  for (const e of rangeErrors(c))
    ctx.addIssue({
      code: 'custom',
      path: e.path.split('.').map((p) => (/^\d+$/.test(p) ? Number(p) : p)),
      message: e.message,
    });
});

/** zod issues to the contract's error list. */
export function toFieldErrors(error: { issues: readonly z.core.$ZodIssue[] }): FieldError[] {
  const out: FieldError[] = [];
  for (const issue of error.issues) {
    const base = issue.path.map(String);
    if (issue.code === 'unrecognized_keys') {
      // an empty key is written "" so that the error still names a path
      for (const key of issue.keys)
        out.push({
          path: [...base, key === '' ? '""' : key].join('.'),
          message: `Unknown field "${key}": check its spelling against the contract`,
        });
    } else {
      out.push({
        path: base.join('.') || '(body)',
        message:
          issue.code === 'invalid_type' && base.length === 0
            ? 'The case must be a JSON object with at least a gas'
            : issue.message,
      });
    }
  }
  return out;
}

export type SafeParse = { ok: true; value: ParsedCase } | { ok: false; errors: FieldError[] };

export function parseCase(input: unknown): SafeParse {
  const result = caseSchema.safeParse(input);
  return result.success
    ? { ok: true, value: result.data }
    : { ok: false, errors: toFieldErrors(result.error) };
}

export type { FieldPath };
