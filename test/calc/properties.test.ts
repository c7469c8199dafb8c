// Property tests over the whole case schema (fast-check). Run count: FC_RUNS (default 300; the never-throws,
// never-NaN property runs 10,000 times unless FC_RUNS is set).
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { interpret, SOURCES } from '../../calc/index.ts';
import {
  CHEMISTRY_RANGES,
  GAS_RANGES,
  OXYGEN_RANGES,
  PATIENT_RANGES,
  VENTILATOR_RANGES,
  type Range,
} from './helpers.ts';
import { units } from '../../calc/index.ts';

const { fromCanonical } = units;
import { anyCase, FC_RUNS, numbersIn, UNIT_SYSTEMS } from './helpers.ts';

const params = { numRuns: FC_RUNS };

describe('for any in-range case, in either unit system', () => {
  // at least 10,000 runs over the whole schema unless FC_RUNS says otherwise (about 10 s here)
  it('interpret never throws and never returns NaN or Infinity anywhere in its output, explanations included', () => {
    let explained = 0;
    fc.assert(
      fc.property(anyCase, (c) => {
        const result = interpret(c);
        const numbers = numbersIn(result);
        if (numbers.some((n) => n.path.startsWith('explain.'))) explained++;
        for (const { path, value } of numbers) {
          if (!Number.isFinite(value)) throw new Error(`${path} is ${value}`);
        }
      }),
      { numRuns: process.env.FC_RUNS ? FC_RUNS : 10_000 },
    );
    expect(explained).toBeGreaterThan(0);
  });

  it('is accepted, or rejected only for a worked-out third gas value, with its path', () => {
    fc.assert(
      fc.property(anyCase, (c) => {
        const result = interpret(c);
        if (result.ok) return;
        for (const e of result.errors)
          expect(e.path).toMatch(/^(previous\.\d+\.)?gas\.(ph|pco2|hco3)$/);
      }),
      params,
    );
  });

  it('acidaemia exactly when pH < 7.35, alkalaemia exactly when pH > 7.45 (common practice)', () => {
    fc.assert(
      fc.property(anyCase, (c) => {
        const result = interpret(c);
        if (!result.ok) return;
        const ph = result.case.gas.ph;
        expect(result.phStatus === 'acidaemia').toBe(ph < 7.35);
        expect(result.phStatus === 'alkalaemia').toBe(ph > 7.45);
      }),
      params,
    );
  });

  it('is deterministic and leaves its input untouched', () => {
    fc.assert(
      fc.property(anyCase, (c) => {
        const copy = structuredClone(c);
        const first = interpret(c);
        expect(c).toEqual(copy);
        const second = interpret(copy);
        expect(second).toEqual(first);
        // the explanations sit behind a getter, so compare them as they go over the wire too
        expect(JSON.stringify(second)).toBe(JSON.stringify(first));
      }),
      params,
    );
  });

  it('names a primary process first, and a disorder never twice', () => {
    fc.assert(
      fc.property(anyCase, (c) => {
        const result = interpret(c);
        if (!result.ok) return;
        for (const [i, d] of result.disorders.entries())
          expect(d.role).toBe(i === 0 ? 'primary' : 'added');
        const keys = result.disorders.map((d) => `${d.code}/${d.detail}`);
        expect(new Set(keys).size).toBe(keys.length);
        // the reference point is a real gas: positive PaCO2 and HCO3
        expect(result.reference.pco2).toBeGreaterThan(0);
        expect(result.reference.hco3).toBeGreaterThan(0);
      }),
      params,
    );
  });

  it('every explained figure names a published source of calc/sources.ts, its formula and its inputs', () => {
    const sources = new Set<string>(Object.values(SOURCES));
    fc.assert(
      fc.property(anyCase, (c) => {
        const result = interpret(c);
        if (!result.ok) return;
        for (const [key, e] of Object.entries(result.explain)) {
          expect(e.key).toBe(key);
          expect(sources.has(e.source), `${key}: ${e.source}`).toBe(true);
          expect(e.formula.length).toBeGreaterThan(3);
          expect(e.inputs.length).toBeGreaterThan(0);
        }
      }),
      params,
    );
  });

  it('a withheld reading (unit_ambiguous) computes nothing but [H+]', () => {
    fc.assert(
      fc.property(anyCase, (c) => {
        const result = interpret(c);
        if (!result.ok || !result.withheld) return;
        expect(result.flags.some((x) => x.code === 'unit_ambiguous')).toBe(true);
        expect(result.disorders).toEqual([]);
        for (const [key, value] of Object.entries(result.derived))
          if (key !== 'hPlus') expect(value, key).toBeNull();
      }),
      params,
    );
  });
});

describe('a rejected field always carries its path', () => {
  // fields with a plain range, by path; the value is set just outside the range, in the clinician's unit
  const fields: [string, Range][] = [
    ...Object.entries(GAS_RANGES).map(([k, r]) => [`gas.${k}`, r] as [string, Range]),
    ...Object.entries(CHEMISTRY_RANGES).map(([k, r]) => [`chemistry.${k}`, r] as [string, Range]),
    ...Object.entries(PATIENT_RANGES).map(([k, r]) => [`patient.${k}`, r] as [string, Range]),
    ...Object.entries(OXYGEN_RANGES).map(([k, r]) => [`oxygen.${k}`, r] as [string, Range]),
    ...Object.entries(VENTILATOR_RANGES).map(([k, r]) => [`ventilator.${k}`, r] as [string, Range]),
  ];
  const outside = fc.record({
    field: fc.constantFrom(...fields),
    units: fc.constantFrom(UNIT_SYSTEMS.SI, UNIT_SYSTEMS.CONVENTIONAL),
    below: fc.boolean(),
    by: fc.double({ min: 0.01, max: 2, noNaN: true }),
  });

  it('an out-of-range value is rejected at its path, and the message repeats the value', () => {
    fc.assert(
      fc.property(anyCase, outside, (c, { field: [path, range], units, below, by }) => {
        const lo = range.kind ? fromCanonical(range.kind, range.min, units) : range.min;
        const hi = range.kind ? fromCanonical(range.kind, range.max, units) : range.max;
        const span = hi - lo;
        const value = below ? lo - span * by : hi + span * by;
        const bad = structuredClone(c) as Record<string, any>;
        bad.units = units;
        // keep the gas itself valid in these units so the only reason to reject is the chosen field
        bad.gas = { ph: 7.4, hco3: 24 };
        bad.patient = { ...bad.patient, sex: null, pregnant: false };
        bad.previous = [];
        const [group, key] = path.split('.') as [string, string];
        bad[group] = { ...(bad[group] ?? {}), [key]: value };
        const result = interpret(bad);
        expect(result.ok).toBe(false);
        if (result.ok) return;
        const error = result.errors.find((e) => e.path === path);
        expect(error, JSON.stringify(result.errors)).toBeDefined();
        expect(error?.message).toContain(String(value));
      }),
      params,
    );
  });

  it('a wrong type anywhere in a group is rejected at its path', () => {
    fc.assert(
      fc.property(
        fc.constantFrom(...fields.map(([p]) => p)),
        fc.constantFrom('7.4', true, [], {}),
        (path, wrong) => {
          const [group, key] = path.split('.') as [string, string];
          const c: Record<string, any> = { gas: { ph: 7.4, pco2: 40, hco3: 24 } };
          c[group] = { ...(c[group] ?? {}), [key]: wrong };
          const result = interpret(c);
          expect(result.ok).toBe(false);
          if (!result.ok) expect(result.errors.map((e) => e.path)).toContain(path);
        },
      ),
      params,
    );
  });
});

describe('unit systems agree', () => {
  // a plain gas in mmHg and its kPa twin (PaCO2 kept between 15 and 110 mmHg, where neither is screened as a unit slip)
  const gas = fc.record({
    ph: fc.double({ min: 6.9, max: 7.7, noNaN: true }),
    pco2: fc.double({ min: 15, max: 110, noNaN: true }),
    po2: fc.double({ min: 30, max: 600, noNaN: true }),
    fio2: fc.double({ min: 0.21, max: 1, noNaN: true }),
    age: fc.integer({ min: 16, max: 95 }),
  });

  it('mmHg and kPa give the same disorders and flags', () => {
    fc.assert(
      fc.property(gas, ({ ph, pco2, po2, fio2, age }) => {
        const mmHg = interpret({
          gas: { ph, pco2, po2 },
          oxygen: { fio2 },
          patient: { ageYears: age },
        });
        const kPa = interpret({
          units: { pressure: 'kPa' },
          gas: { ph, pco2: pco2 / 7.50062, po2: po2 / 7.50062 },
          oxygen: { fio2 },
          patient: { ageYears: age },
        });
        expect(kPa.ok).toBe(mmHg.ok);
        if (!mmHg.ok || !kPa.ok) return;
        expect(kPa.disorders).toEqual(mmHg.disorders);
        expect(kPa.flags.map((x) => x.code)).toEqual(mmHg.flags.map((x) => x.code));
        expect(
          Math.abs((kPa.derived.aaGradient ?? 0) - (mmHg.derived.aaGradient ?? 0)),
        ).toBeLessThanOrEqual(0.11);
      }),
      params,
    );
  });

  it('FiO2 as a fraction and as a percent give the same reading', () => {
    // a whole percent, so that the fraction p / 100 is the same double either way
    fc.assert(
      fc.property(gas, fc.integer({ min: 21, max: 100 }), ({ ph, pco2, po2 }, percentage) => {
        const fraction = interpret({ gas: { ph, pco2, po2 }, oxygen: { fio2: percentage / 100 } });
        const percent = interpret({ gas: { ph, pco2, po2 }, oxygen: { fio2: percentage } });
        expect(percent.ok).toBe(fraction.ok);
        if (!fraction.ok || !percent.ok) return;
        expect(percent.derived).toEqual(fraction.derived);
      }),
      params,
    );
  });
});
