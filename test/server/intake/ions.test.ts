// Ionised calcium, magnesium and phosphate in the FHIR reader: mEq/L converts by the ion's charge (calc's table),
// checked against the general-purpose UCUM library @lhncbc/ucum-lhc, which converts meq/L to mmol/L given the
// charge (UCUM: an equivalent is a mole divided by the charge). Phosphate is a mix of valences at body pH
// (common practice), so its mEq/L is asked about, never converted. Every number is invented.
import { createRequire } from 'node:module';
import { describe, expect, it } from 'vitest';
import { caseFromFhir } from '../../../server/intake/index.ts';

const ucum = createRequire(import.meta.url)('@lhncbc/ucum-lhc').UcumLhcUtils.getInstance();
/** meq/L to mmol/L by ucum-lhc, with the charge of the ion. */
const meqToMmol = (value: number, charge: number): number => {
  const r = ucum.convertUnitTo('meq/L', value, 'mmol/L', { charge });
  if (r.status !== 'succeeded') throw new Error('ucum-lhc could not convert meq/L');
  return r.toVal;
};

const T = '2026-03-02T04:10:00Z';
const obs = (code: string, value: number, unit: string) => ({
  resourceType: 'Observation',
  status: 'final',
  code: { coding: [{ system: 'http://loinc.org', code }] },
  effectiveDateTime: T,
  valueQuantity: { value, unit, code: unit, system: 'http://unitsofmeasure.org' },
});

describe('FHIR: the codes of the table for the ions, their units by charge', () => {
  // LOINC (long common name; the list it was checked against):
  // 1994-3 Calcium.ionized [Moles/volume] in Blood, 1995-0 ... in Serum or Plasma (HL7 PDDI CDS calcium value set);
  // 2601-3 Magnesium [Moles/volume] in Serum or Plasma (HL7 PDDI CDS magnesium value set);
  // 14879-1 Phosphate [Moles/volume] in Serum or Plasma (published LOINC code lists).
  it.each([
    ['1994-3', 2.3, 'meq/L', 'ionisedCalcium', meqToMmol(2.3, 2)],
    ['1995-0', 1.21, 'mmol/L', 'ionisedCalcium', 1.21],
    ['2601-3', 1.7, 'meq/L', 'magnesium', meqToMmol(1.7, 2)],
    ['2601-3', 0.74, 'mmol/L', 'magnesium', 0.74],
    ['14879-1', 1.3, 'mmol/L', 'phosphate', 1.3],
  ] as const)('%s %d %s is %s %d mmol/L', (code, value, unit, key, expected) => {
    const r = caseFromFhir(obs(code, value, unit));
    expect(r.errors).toEqual([]);
    expect((r.case.chemistry as Record<string, number>)[key]).toBeCloseTo(expected, 10);
    expect(r.conversions.length).toBe(unit === 'meq/L' ? 1 : 0);
  });

  it('the conversion of a divalent ion is reported', () => {
    const r = caseFromFhir(obs('1994-3', 2.3, 'meq/L'));
    expect(r.conversions).toEqual([
      {
        path: 'chemistry.ionisedCalcium',
        source: 'Observation',
        from: { value: 2.3, unit: 'meq/L' },
        to: { value: 1.15, unit: 'mmol/L' },
        reason: 'mEq/L of an ion of charge 2: mmol/L = mEq/L / 2',
      },
    ]);
  });

  it('phosphate in meq/L is an error at the unit that says why, and nothing is read', () => {
    const r = caseFromFhir(obs('14879-1', 3.4, 'meq/L'));
    expect(r.case.chemistry).toBeUndefined();
    expect(r.errors).toEqual([expect.objectContaining({ path: 'Observation.valueQuantity.code' })]);
    expect(r.errors[0]!.message).toContain(
      'Phosphate in mEq/L is not taken (it is not a single ion)',
    );
  });

  // mass codes (the lists named in the intake beside each): the case takes these ions in mmol/L only
  it.each([
    ['17861-6', 9.2, 'total calcium is not ionised calcium'],
    ['17864-0', 4.6, 'ionised calcium in mass units'],
    ['19123-9', 2.1, 'magnesium in mass units'],
    ['2777-1', 3.5, 'phosphate in mass units'],
  ])('%s in mg/dL is not read, with the reason', (code, value, reason) => {
    const r = caseFromFhir(obs(code, value, 'mg/dL'));
    expect(r.case).toEqual({ gas: {} });
    expect(r.unused).toEqual([expect.objectContaining({ code })]);
    expect(r.unused[0]!.reason).toContain(reason);
  });
});
