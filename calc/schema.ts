// The case schema: the single source of shapes and plausibility ranges.
// Ranges are in canonical units (clinical-scope section 3, or "common practice" where marked) and are
// checked after converting the entered value, so a kPa entry is judged by the same range as mmHg.
import { z } from 'zod';
import {
  DEFAULT_UNITS,
  fromCanonical,
  toCanonical,
  unitLabel,
  type Quantity,
  type Units,
} from './units.ts';

export interface Range {
  label: string;
  min: number;
  max: number;
  /** the unit as it is written in canonical form, when not convertible */
  unit: string;
  /** convertible quantity: the range is shown in the clinician's own unit */
  kind?: Quantity;
  decimals: number;
}

const r = (
  label: string,
  min: number,
  max: number,
  unit: string,
  decimals: number,
  kind?: Quantity,
): Range =>
  kind ? { label, min, max, unit, decimals, kind } : { label, min, max, unit, decimals };

// clinical-scope section 3 unless marked "common practice" (our own plausibility limits).
export const GAS_RANGES = {
  ph: r('pH', 6.5, 8.0, '', 2),
  pco2: r('PaCO2', 5, 200, 'mmHg', 0, 'pressure'),
  po2: r('PaO2', 10, 760, 'mmHg', 0, 'pressure'),
  hco3: r('HCO3', 1, 70, 'mmol/L', 0),
  baseExcess: r('Base excess', -40, 40, 'mmol/L', 0), // common practice
  sao2: r('SaO2', 30, 100, '%', 0), // common practice; a percent
  lactate: r('Lactate', 0, 40, 'mmol/L', 0),
  hb: r('Hb', 2, 25, 'g/dL', 0, 'hb'), // common practice
} satisfies Record<string, Range>;

export const CHEMISTRY_RANGES = {
  na: r('Na', 90, 200, 'mmol/L', 0),
  k: r('K', 1, 10, 'mmol/L', 0),
  cl: r('Cl', 50, 160, 'mmol/L', 0),
  albumin: r('Albumin', 0.5, 7, 'g/dL', 1, 'albumin'),
  glucose: r('Glucose', 0, 120, 'mmol/L', 0, 'glucose'),
  urea: r('Urea', 0, 100, 'mmol/L', 0, 'urea'), // common practice (BUN 0-280 mg/dL)
  creatinine: r('Creatinine', 10, 3000, 'umol/L', 0, 'creatinine'), // common practice
  osmolality: r('Osmolality', 200, 500, 'mOsm/kg', 0), // common practice
  ethanol: r('Ethanol', 0, 220, 'mmol/L', 0, 'ethanol'), // common practice (about 1000 mg/dL)
  ionisedCalcium: r('Ionised calcium', 0.2, 3, 'mmol/L', 1), // common practice
  magnesium: r('Magnesium', 0.1, 5, 'mmol/L', 1), // common practice
  phosphate: r('Phosphate', 0.1, 6, 'mmol/L', 1), // common practice
} satisfies Record<string, Range>;

export const URINE_RANGES = {
  na: r('Urine Na', 0, 300, 'mmol/L', 0), // common practice
  k: r('Urine K', 0, 250, 'mmol/L', 0), // common practice
  cl: r('Urine Cl', 0, 350, 'mmol/L', 0), // common practice
} satisfies Record<string, Range>;

export const PATIENT_RANGES = {
  ageYears: r('Age', 0, 120, 'years', 0),
  heightCm: r('Height', 100, 250, 'cm', 0),
} satisfies Record<string, Range>;

export const CONTEXT_RANGES = {
  barometricPressure: r('Barometric pressure', 400, 800, 'mmHg', 0, 'pressure'), // common practice
  altitudeM: r('Altitude', -500, 6000, 'm', 0), // common practice
  temperatureC: r('Temperature', 25, 43, '°C', 0), // common practice
} satisfies Record<string, Range>;

export const OXYGEN_RANGES = {
  peep: r('PEEP', 0, 30, 'cmH2O', 0),
  spo2: r('SpO2', 30, 100, '%', 0), // common practice; a percent
} satisfies Record<string, Range>;

export const FIO2_RANGE = {
  fraction: { min: 0.21, max: 1.0 },
  percent: { min: 21, max: 100 },
} as const;

export const VENTILATOR_RANGES = {
  vt: r('VT', 100, 2000, 'mL', 0),
  rr: r('RR', 1, 80, '/min', 0),
  pplat: r('Plateau pressure', 5, 60, 'cmH2O', 0), // common practice
  deadSpaceMl: r('Apparatus dead space', 0, 500, 'mL', 0), // common practice
  deadSpaceFraction: r('VD/VT', 0.1, 0.9, '', 2), // common practice
  targetPh: r('Target pH', 7.0, 7.6, '', 2), // common practice
  targetPco2: r('Target PaCO2', 20, 120, 'mmHg', 0, 'pressure'), // common practice
} satisfies Record<string, Range>;

export const SETTINGS_RANGES = {
  anionGapNormal: r('Anion gap reference', 0, 30, 'mmol/L', 0),
  anionGapHalfWidth: r('Anion gap half-width', 1, 10, 'mmol/L', 0),
} satisfies Record<string, Range>;

export const MAX_PREVIOUS_GASES = 20;

// ---------- shapes ----------

const number = (label: string) =>
  z.number({
    error: (issue) =>
      issue.input === undefined ? `${label} is required` : `${label} must be a number`,
  });
const optionalNumber = (label: string) => number(label).nullish();
const oneOf = <const T extends readonly [string, ...string[]]>(label: string, values: T) =>
  z.enum(values, { error: () => `${label} must be one of: ${values.join(', ')}` });

const numbersOf = <K extends string>(ranges: Record<K, Range>) =>
  Object.fromEntries(
    Object.entries<Range>(ranges).map(([key, range]) => [key, optionalNumber(range.label)]),
  ) as Record<K, ReturnType<typeof optionalNumber>>;

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

export const gasSchema = group('gas', numbersOf(GAS_RANGES));

export const unitsSchema = group('units', {
  pressure: oneOf('Pressure unit', ['mmHg', 'kPa']).nullish(),
  albumin: oneOf('Albumin unit', ['g/dL', 'g/L']).nullish(),
  hb: oneOf('Hb unit', ['g/dL', 'g/L']).nullish(),
  glucose: oneOf('Glucose unit', ['mg/dL', 'mmol/L']).nullish(),
  urea: oneOf('Urea unit', ['bun-mg/dL', 'urea-mmol/L']).nullish(),
  creatinine: oneOf('Creatinine unit', ['mg/dL', 'umol/L']).nullish(),
  ethanol: oneOf('Ethanol unit', ['mg/dL', 'mmol/L']).nullish(),
});

const baselineSchema = group('context.baseline', {
  pco2: optionalNumber('Usual PaCO2'),
  hco3: optionalNumber('Usual HCO3'),
  ph: optionalNumber('Usual pH'),
});

const previousSchema = group('previous gas', {
  takenAt: z
    .string({ error: 'takenAt must be text (a date and time)' })
    .max(40, 'takenAt is too long')
    .nullish(),
  label: z.string({ error: 'label must be text' }).max(80, 'label is too long').nullish(),
  gas: gasSchema,
  oxygen: group('oxygen', { fio2: optionalNumber('FiO2'), peep: optionalNumber('PEEP') }).nullish(),
  ventilator: group('ventilator', { vt: optionalNumber('VT'), rr: optionalNumber('RR') }).nullish(),
});

export const caseShape = z.strictObject({
  sample: oneOf('Sample type', ['arterial', 'venous', 'capillary']).nullish(),
  units: unitsSchema.nullish(),
  gas: gasSchema,
  chemistry: group('chemistry', { ...numbersOf(CHEMISTRY_RANGES) }).nullish(),
  urine: group('urine', numbersOf(URINE_RANGES)).nullish(),
  patient: group('patient', {
    ...numbersOf(PATIENT_RANGES),
    sex: oneOf('Sex', ['male', 'female']).nullish(),
    pregnant: z.boolean({ error: 'pregnant must be true or false' }).nullish(),
  }).nullish(),
  context: group('context', {
    ...numbersOf(CONTEXT_RANGES),
    timing: oneOf('Timing', ['acute', 'chronic', 'unknown']).nullish(),
    baseline: baselineSchema.nullish(),
  }).nullish(),
  oxygen: group('oxygen', { ...numbersOf(OXYGEN_RANGES), fio2: optionalNumber('FiO2') }).nullish(),
  ventilator: group('ventilator', numbersOf(VENTILATOR_RANGES)).nullish(),
  settings: group('settings', {
    ...numbersOf(SETTINGS_RANGES),
    anionGapIncludesK: z.boolean({ error: 'anionGapIncludesK must be true or false' }).nullish(),
  }).nullish(),
  previous: z
    .array(previousSchema, { error: 'previous must be a list of earlier gases' })
    .max(MAX_PREVIOUS_GASES, `At most ${MAX_PREVIOUS_GASES} earlier gases`)
    .nullish(),
});

export type CaseInput = z.input<typeof caseShape>;
export type ParsedCase = z.output<typeof caseShape>;

// ---------- ranges, checked in canonical units ----------

export interface FieldError {
  path: string;
  message: string;
}

export function resolveUnits(units: ParsedCase['units']): Units {
  const u = units ?? {};
  return {
    pressure: u.pressure ?? DEFAULT_UNITS.pressure,
    albumin: u.albumin ?? DEFAULT_UNITS.albumin,
    hb: u.hb ?? DEFAULT_UNITS.hb,
    glucose: u.glucose ?? DEFAULT_UNITS.glucose,
    urea: u.urea ?? DEFAULT_UNITS.urea,
    creatinine: u.creatinine ?? DEFAULT_UNITS.creatinine,
    ethanol: u.ethanol ?? DEFAULT_UNITS.ethanol,
  };
}

/** Format a range limit in the clinician's unit. */
export function rangeText(range: Range, units: Units): string {
  const kind = range.kind;
  const unit = kind ? unitLabel(kind, units) : range.unit;
  const show = (v: number) => {
    const shown = kind ? fromCanonical(kind, v, units) : v;
    // a converted limit that is a whole number prints as one (5-70 g/L), else with 2 or 1 decimals by size
    const whole = Math.abs(shown - Math.round(shown)) < 1e-9;
    const decimals =
      kind && shown !== v ? (whole ? 0 : Math.abs(shown) < 10 ? 2 : 1) : range.decimals;
    return shown.toFixed(decimals);
  };
  return `${show(range.min)}-${show(range.max)}${unit ? ` ${unit}` : ''}`;
}

function checkRange(
  value: number | null | undefined,
  range: Range,
  units: Units,
  path: string | (() => string),
  errors: FieldError[],
) {
  if (value === null || value === undefined) return;
  const canonical = range.kind ? toCanonical(range.kind, value, units) : value;
  if (canonical < range.min || canonical > range.max) {
    if (typeof path === 'function') path = path();
    const unit = range.kind ? unitLabel(range.kind, units) : range.unit;
    const hint = range.kind === 'pressure' ? pressureHint(value, units) : '';
    errors.push({
      path,
      message: `${range.label} ${value}${unit ? ` ${unit}` : ''} is outside ${rangeText(range, units)}: check the value${hint}`,
    });
  }
}

function pressureHint(value: number, units: Units): string {
  // a likely unit slip is named as a question; the value is still rejected, never converted
  if (units.pressure === 'kPa' && value > 26) return ' (was it entered in mmHg?)';
  if (units.pressure === 'mmHg' && value < 5) return ' (was it entered in kPa?)';
  return '';
}

const ENTRIES = new WeakMap<Record<string, Range>, [string, Range][]>();
/** The entries of a ranges table, listed once. */
function entriesOf(ranges: Record<string, Range>): [string, Range][] {
  let entries = ENTRIES.get(ranges);
  if (!entries) {
    entries = Object.entries(ranges);
    ENTRIES.set(ranges, entries);
  }
  return entries;
}

function checkGroup(
  group: Record<string, unknown> | null | undefined,
  ranges: Record<string, Range>,
  units: Units,
  prefix: string,
  errors: FieldError[],
) {
  if (!group) return;
  for (const [key, range] of entriesOf(ranges)) {
    const value = group[key] as number | null | undefined;
    if (value !== null && value !== undefined)
      checkRange(value, range, units, () => `${prefix}.${key}`, errors);
  }
}

export function checkFio2(value: number | null | undefined, path: string, errors: FieldError[]) {
  if (value === null || value === undefined) return;
  const { fraction, percent } = FIO2_RANGE;
  const ok =
    value > 1
      ? value >= percent.min && value <= percent.max
      : value >= fraction.min && value <= fraction.max;
  if (!ok)
    errors.push({
      path,
      message: `FiO2 ${value} is neither a fraction (0.21-1.00) nor a percent (21-100): check the value`,
    });
}

function checkGas(gas: ParsedCase['gas'], units: Units, prefix: string, errors: FieldError[]) {
  checkGroup(gas, GAS_RANGES, units, prefix, errors);
  const known = [gas.ph, gas.pco2, gas.hco3].filter((v) => v !== null && v !== undefined).length;
  if (known < 2)
    errors.push({
      path: prefix,
      message:
        'Give at least two of pH, PaCO2 and HCO3 (the third follows from the Henderson equation)',
    });
}

/** Every plausibility check on a case of the right shape. */
export function rangeErrors(c: ParsedCase): FieldError[] {
  const units = resolveUnits(c.units);
  const errors: FieldError[] = [];
  checkGas(c.gas, units, 'gas', errors);
  checkGroup(c.chemistry, CHEMISTRY_RANGES, units, 'chemistry', errors);
  checkGroup(c.urine, URINE_RANGES, units, 'urine', errors);
  checkGroup(c.patient, PATIENT_RANGES, units, 'patient', errors);
  checkGroup(c.context, CONTEXT_RANGES, units, 'context', errors);
  const baseline = c.context?.baseline;
  if (baseline) {
    checkRange(
      baseline.pco2,
      { ...GAS_RANGES.pco2, label: 'Usual PaCO2' },
      units,
      'context.baseline.pco2',
      errors,
    );
    checkRange(
      baseline.hco3,
      { ...GAS_RANGES.hco3, label: 'Usual HCO3' },
      units,
      'context.baseline.hco3',
      errors,
    );
    checkRange(
      baseline.ph,
      { ...GAS_RANGES.ph, label: 'Usual pH' },
      units,
      'context.baseline.ph',
      errors,
    );
  }
  checkGroup(c.oxygen, OXYGEN_RANGES, units, 'oxygen', errors);
  checkFio2(c.oxygen?.fio2, 'oxygen.fio2', errors);
  checkGroup(c.ventilator, VENTILATOR_RANGES, units, 'ventilator', errors);
  checkGroup(c.settings, SETTINGS_RANGES, units, 'settings', errors);
  if (c.patient?.pregnant && c.patient.sex === 'male') {
    errors.push({
      path: 'patient.pregnant',
      message: 'Pregnant is set for a male patient: check sex and pregnancy',
    });
  }
  c.previous?.forEach((p, i) => {
    checkGas(p.gas, units, `previous.${i}.gas`, errors);
    checkFio2(p.oxygen?.fio2, `previous.${i}.oxygen.fio2`, errors);
    checkRange(p.oxygen?.peep, OXYGEN_RANGES.peep, units, `previous.${i}.oxygen.peep`, errors);
    checkRange(
      p.ventilator?.vt,
      VENTILATOR_RANGES.vt,
      units,
      `previous.${i}.ventilator.vt`,
      errors,
    );
    checkRange(
      p.ventilator?.rr,
      VENTILATOR_RANGES.rr,
      units,
      `previous.${i}.ventilator.rr`,
      errors,
    );
  });
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
