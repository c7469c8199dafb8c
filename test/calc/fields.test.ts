// The table of fields is the one description of a case's numbers: every row is accepted by the schema at its
// path, checked against its own range (in the clinician's unit where it has a unit choice) and converted by it.
import { describe, expect, it } from 'vitest';
import { FIELDS, interpret, parseCase, units, type FieldSpec } from '../../calc/index.ts';

// every unit kind in its canonical unit (the one whose factor is 1), so that the table's ranges apply as written
const canonicalUnits = Object.fromEntries(
  Object.entries(units.QUANTITIES).map(([q, def]) => [
    q,
    Object.entries(def.units).find(([, u]) => u.factor === 1)![0],
  ]),
);
const base = () =>
  ({ units: canonicalUnits, gas: { ph: 7.4, pco2: 40, hco3: 24 } }) as Record<string, unknown>;

function withValue(f: FieldSpec, value: number): Record<string, unknown> {
  const c = base();
  const keys = f.path.split('.');
  let at = c;
  for (const key of keys.slice(0, -1)) {
    at[key] = (at[key] as Record<string, unknown> | undefined) ?? {};
    at = at[key] as Record<string, unknown>;
  }
  at[keys.at(-1)!] = value;
  return c;
}

describe('every row of the table', () => {
  it.each(FIELDS.map((f) => [f.path, f] as const))(
    '%s: in range accepted, beyond it rejected at its path',
    (path, f) => {
      const [min, max] = f.range;
      const mid = path === 'oxygen.fio2' ? 0.4 : (min + max) / 2;
      expect(parseCase(withValue(f, mid)).ok, `${path} = ${mid}`).toBe(true);
      const beyond = parseCase(withValue(f, max + (max - min) + 1));
      expect(beyond.ok).toBe(false);
      if (!beyond.ok) expect(beyond.errors.map((e) => e.path)).toContain(path);
    },
  );

  it('has a label, a unit kind or a canonical unit, and a range whose low end is below its high end', () => {
    for (const f of FIELDS as readonly FieldSpec[]) {
      expect(f.label.length, f.path).toBeGreaterThan(0);
      expect(f.range[0], f.path).toBeLessThan(f.range[1]);
      if (f.charge) expect(f.unit, f.path).toBe('mmol/L');
    }
  });

  it('a value with a unit choice is converted by it: creatinine 1.0 mg/dL is 88.4 umol/L (clinical-scope section 1)', () => {
    const f = interpret({
      ...base(),
      units: { creatinine: 'mg/dL' },
      chemistry: { creatinine: 1.0 },
    });
    if (!f.ok) throw new Error(JSON.stringify(f.errors));
    expect(f.case.chemistry.creatinine).toBeCloseTo(88.4, 6);
  });
});
