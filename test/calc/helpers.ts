// Shared test helpers for the calculation core: an independent unit library, the findings guard,
// a walk over every number in an output, and the fast-check arbitrary over the whole case schema.
import { createRequire } from 'node:module';
import fc from 'fast-check';
import { expect } from 'vitest';
import { interpret, type CaseInput, type Findings, type Rejected } from '../../calc/index.ts';
import {
  CONDITIONS,
  fieldsOf,
  keyOf,
  units as U,
  type KeysOf,
  type Quantity,
  type Units,
} from '../../calc/index.ts';

const { fromCanonical } = U;

/** A group's plausibility ranges, read from the table of fields (canonical units). */
export interface Range {
  label: string;
  min: number;
  max: number;
  unit: string;
  kind?: Quantity;
  decimals: number;
}
const rangesOf = <G extends string>(group: G) =>
  Object.fromEntries(
    fieldsOf(group)
      .filter((f) => f.path !== 'oxygen.fio2')
      .map((f) => [
        keyOf(f),
        {
          label: f.label,
          min: f.range[0],
          max: f.range[1],
          unit: f.unit,
          kind: f.quantity,
          decimals: f.decimals,
        },
      ]),
  ) as Record<KeysOf<G>, Range>;
export const GAS_RANGES = rangesOf('gas');
export const CHEMISTRY_RANGES = rangesOf('chemistry');
export const URINE_RANGES = rangesOf('urine');
export const PATIENT_RANGES = rangesOf('patient');
export const CONTEXT_RANGES = rangesOf('context');
export const OXYGEN_RANGES = rangesOf('oxygen');
export const VENTILATOR_RANGES = rangesOf('ventilator');
export const SETTINGS_RANGES = rangesOf('settings');
export const FIO2_RANGE = {
  fraction: { min: 0.21, max: 1.0 },
  percent: { min: 21, max: 100 },
} as const;

/** fast-check run count: FC_RUNS in the environment, 300 by default so the suite stays fast. */
export const FC_RUNS =
  Number.parseInt(process.env.FC_RUNS ?? '', 10) > 0
    ? Number.parseInt(process.env.FC_RUNS as string, 10)
    : 300;

// @lhncbc/ucum-lhc ships CommonJS without type declarations; loaded through require it is typed `any`.
const ucumUtils = createRequire(import.meta.url)('@lhncbc/ucum-lhc').UcumLhcUtils.getInstance();

/** Convert with the UCUM library (an outside reference), failing the test if UCUM refuses. */
export function ucum(
  fromCode: string,
  value: number,
  toCode: string,
  molecularWeight?: number,
): number {
  const result = ucumUtils.convertUnitTo(
    fromCode,
    value,
    toCode,
    molecularWeight === undefined ? {} : { molecularWeight },
  );
  if (result.status !== 'succeeded')
    throw new Error(`UCUM could not convert ${fromCode} to ${toCode}: ${result.msg}`);
  return result.toVal as number;
}

/** Molar masses, g/mol (IUPAC standard atomic weights; common practice figures as in clinical-scope section 1). */
export const MOLAR_MASS = {
  glucose: 180.16,
  ureaNitrogen: 28.01,
  creatinine: 113.12,
  ethanol: 46.07,
} as const;

/** interpret() that must succeed: a rejection fails the test with its messages. */
export function read(c: unknown): Findings {
  const result = interpret(c);
  if (!result.ok) throw new Error(`case rejected: ${JSON.stringify(result.errors)}`);
  return result;
}

/** interpret() that must reject. */
export function reject(c: unknown): Rejected {
  const result = interpret(c);
  if (result.ok) throw new Error('case accepted, expected a rejection');
  return result;
}

export const codes = (f: Findings): string[] => f.flags.map((x) => x.code);
export const disorderList = (f: Findings): [string, string | null][] =>
  f.disorders.map((d) => [d.code, d.detail]);

/** Every number anywhere inside a value, with its path. */
export function numbersIn(
  value: unknown,
  path = '',
  out: { path: string; value: number }[] = [],
): { path: string; value: number }[] {
  if (typeof value === 'number') out.push({ path, value });
  else if (Array.isArray(value)) {
    for (const [i, v] of value.entries()) numbersIn(v, `${path}[${i}]`, out);
  } else if (value && typeof value === 'object') {
    // a reading keeps its explanations behind a getter; its toJSON() is what goes over the wire, explanations included
    const plain =
      typeof (value as { toJSON?: unknown }).toJSON === 'function'
        ? (value as { toJSON: () => unknown }).toJSON()
        : value;
    for (const [k, v] of Object.entries(plain as object))
      numbersIn(v, path ? `${path}.${k}` : k, out);
  }
  return out;
}

/** Near-equality for reported (rounded) figures: within `tolerance`. */
export function expectNear(actual: number | null | undefined, expected: number, tolerance: number) {
  expect(actual, `expected about ${expected}`).not.toBeNull();
  expect(Math.abs((actual as number) - expected), `${actual} vs ${expected}`).toBeLessThanOrEqual(
    tolerance,
  );
}

// ---------- the arbitrary over the whole schema ----------

const SI: Units = {
  pressure: 'kPa',
  albumin: 'g/L',
  hb: 'g/L',
  glucose: 'mmol/L',
  urea: 'urea-mmol/L',
  creatinine: 'umol/L',
  ethanol: 'mmol/L',
};
const CONVENTIONAL: Units = {
  pressure: 'mmHg',
  albumin: 'g/dL',
  hb: 'g/dL',
  glucose: 'mg/dL',
  urea: 'bun-mg/dL',
  creatinine: 'mg/dL',
  ethanol: 'mg/dL',
};
export const UNIT_SYSTEMS = { SI, CONVENTIONAL } as const;

/** A value inside a range, drawn in the clinician's unit (a hair inside the limits, so conversion round-off cannot push it out). */
export function inRange(range: Range, units: Units): fc.Arbitrary<number> {
  const lo = range.kind ? fromCanonical(range.kind, range.min, units) : range.min;
  const hi = range.kind ? fromCanonical(range.kind, range.max, units) : range.max;
  const inset = (hi - lo) * 1e-9;
  return fc.double({ min: lo + inset, max: hi - inset, noNaN: true, noDefaultInfinity: true });
}

const maybe = <T>(arb: fc.Arbitrary<T>) => fc.option(arb, { nil: null, freq: 3 });

function groupOf(
  ranges: Record<string, Range>,
  units: Units,
): fc.Arbitrary<Partial<Record<string, number | null>>> {
  const model: Record<string, fc.Arbitrary<number | null>> = {};
  for (const [key, range] of Object.entries(ranges)) model[key] = maybe(inRange(range, units));
  return fc.record(model, { requiredKeys: [] });
}

const fio2 = fc.oneof(
  fc.double({ min: FIO2_RANGE.fraction.min, max: FIO2_RANGE.fraction.max, noNaN: true }),
  fc.double({ min: FIO2_RANGE.percent.min + 1e-9, max: FIO2_RANGE.percent.max, noNaN: true }),
);

function gasOf(units: Units) {
  const { ph, pco2, hco3, ...rest } = GAS_RANGES;
  // half the time near the usual clinical values, so that normal-pH and mixed readings are drawn often too
  const near = (range: Range, lo: number, hi: number) =>
    fc.oneof(inRange(range, units), inRange({ ...range, min: lo, max: hi }, units));
  const core = fc.record({
    ph: near(ph, 7.3, 7.5),
    pco2: near(pco2, 25, 60),
    hco3: near(hco3, 15, 35),
  });
  // all three, or any two (the third is worked out)
  const omit = fc.constantFrom<'ph' | 'pco2' | 'hco3' | null>(null, 'ph', 'pco2', 'hco3');
  return fc.tuple(core, omit, groupOf(rest, units)).map(([c, drop, others]) => {
    const gas: Partial<Record<string, number | null>> = { ...others, ...c };
    if (drop) delete gas[drop];
    return gas;
  });
}

/** Any case the schema accepts by shape and range, in either unit system, every optional group optional. */
export const anyCase: fc.Arbitrary<CaseInput> = fc.constantFrom(SI, CONVENTIONAL).chain((units) =>
  fc
    .record(
      {
        sample: fc.constantFrom('arterial', 'venous', 'capillary'),
        units: fc.constant(units),
        gas: gasOf(units),
        chemistry: groupOf(CHEMISTRY_RANGES, units),
        urine: groupOf(URINE_RANGES, units),
        patient: fc
          .tuple(
            groupOf(PATIENT_RANGES, units),
            fc.constantFrom('male', 'female', null),
            fc.boolean(),
          )
          .map(([p, sex, pregnant]) => {
            const { pregnancyWeeks, ...rest } = p;
            // weeks of pregnancy only for a pregnant patient (the schema refuses them otherwise)
            const isPregnant = sex === 'female' && pregnant;
            return {
              ...rest,
              ...(isPregnant ? { pregnancyWeeks } : {}),
              sex,
              pregnant: sex === 'female' ? pregnant : false,
            };
          }),
        context: fc
          .tuple(
            groupOf(CONTEXT_RANGES, units),
            fc.constantFrom('acute', 'chronic', 'unknown', null),
            fc.record(
              {
                pco2: maybe(inRange(GAS_RANGES.pco2, units)),
                hco3: maybe(inRange(GAS_RANGES.hco3, units)),
                ph: maybe(inRange(GAS_RANGES.ph, units)),
              },
              { requiredKeys: [] },
            ),
            maybe(fc.subarray([...CONDITIONS])),
          )
          .map(([ctx, timing, baseline, conditions]) => ({ ...ctx, timing, baseline, conditions })),
        oxygen: fc
          .tuple(groupOf(OXYGEN_RANGES, units), maybe(fio2))
          .map(([o, f]) => ({ ...o, fio2: f })),
        ventilator: groupOf(VENTILATOR_RANGES, units),
        settings: fc
          .tuple(groupOf(SETTINGS_RANGES, units), fc.option(fc.boolean(), { nil: null }))
          .map(([s, k]) => ({ ...s, anionGapIncludesK: k })),
        previous: fc.array(
          fc.record(
            {
              takenAt: fc.constantFrom('2026-03-02T04:10', 'day 2 06:00', null),
              gas: gasOf(units),
              oxygen: fc.record(
                { fio2: maybe(fio2), peep: maybe(inRange(OXYGEN_RANGES.peep, units)) },
                { requiredKeys: [] },
              ),
              ventilator: fc.record(
                {
                  vt: maybe(inRange(VENTILATOR_RANGES.vt, units)),
                  rr: maybe(inRange(VENTILATOR_RANGES.rr, units)),
                },
                { requiredKeys: [] },
              ),
            },
            { requiredKeys: ['gas'] },
          ),
          { maxLength: 3 },
        ),
        // the conventional units are the defaults, so their group may be left out; SI units must be stated
        dropUnits: fc.boolean(),
      },
      { requiredKeys: ['gas', 'units', 'dropUnits'] },
    )
    .map(({ dropUnits, ...c }) => {
      if (dropUnits && units === CONVENTIONAL) delete (c as { units?: Units }).units;
      return c;
    }),
) as fc.Arbitrary<CaseInput>;
