// Ionised calcium, magnesium and phosphate in both readers: mEq/L converts by the ion's charge (calc's table),
// checked against the general-purpose UCUM library @lhncbc/ucum-lhc, which converts meq/L to mmol/L given the
// charge (UCUM: an equivalent is a mole divided by the charge). Phosphate is a mix of valences at body pH
// (common practice), so its mEq/L is asked about, never converted. Every number is invented.
import { createRequire } from 'node:module';
import { describe, expect, it } from 'vitest';
import { caseFromFhir, parsePaste } from '../../../server/intake/index.ts';
import { parseCase } from '../../../calc/index.ts';

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

describe('paste: an ion in mEq/L is read by its charge', () => {
  // [text, field, value the case takes, source of that value]
  it.each([
    ['Ca++ 2.3 mEq/L', 'ionisedCalcium', meqToMmol(2.3, 2), 'ucum-lhc, charge 2'],
    ['iCa 2,4 mEq/L', 'ionisedCalcium', meqToMmol(2.4, 2), 'ucum-lhc, charge 2'],
    ['Mg2+ 1.7 mEq/L', 'magnesium', meqToMmol(1.7, 2), 'ucum-lhc, charge 2'],
    ['K+ 4.1 mEq/L', 'k', meqToMmol(4.1, 1), 'ucum-lhc, charge 1'],
    ['Na 138 meq/l', 'na', meqToMmol(138, 1), 'ucum-lhc, charge 1'],
  ] as const)('%s is %s %d mmol/L (%s)', (text, key, expected, _source) => {
    const r = parsePaste(text);
    expect(r.questions).toEqual([]);
    expect((r.case.chemistry as Record<string, number>)[key]).toBeCloseTo(expected, 10);
    expect(r.read[0]).toMatchObject({ unit: 'mmol/L', unitFrom: 'text' });
  });

  it('Ca++ 2.3 mEq/L reads as 1.15 mmol/L (2.3 mmol/L would pass the range unnoticed) and says what was written', () => {
    const r = parsePaste('pH 7.31\npCO2 40 mmHg\nHCO3 19.8 mmol/L\nCa++ 2.3 mEq/L');
    expect(meqToMmol(2.3, 2)).toBeCloseTo(1.15, 10); // the check value, from ucum-lhc
    expect(r.case.chemistry).toEqual({ ionisedCalcium: 1.15 });
    expect(r.read.find((x) => x.path === 'chemistry.ionisedCalcium')).toMatchObject({
      value: 1.15,
      unit: 'mmol/L',
      written: { value: 2.3, unit: 'mEq/L' },
      note: 'written 2.3 mEq/L: mmol/L = mEq/L / 2 for this ion',
    });
    expect(parseCase(r.case).ok).toBe(true);
  });

  it('a monovalent ion in mEq/L is the same number, with no conversion to report', () => {
    expect(parsePaste('K 4.1 mEq/L').read[0]).not.toHaveProperty('written');
  });

  it('an ion whose mEq/L is out of range once converted is asked about with both numbers', () => {
    const r = parsePaste('Ca++ 9 mEq/L');
    expect(r.case.chemistry).toBeUndefined();
    expect(r.questions[0]!.reason).toContain('4.5 mmol/L (9 mEq/L) is not plausible');
  });

  // [text, field asked about, what the reason says; source of the rule]
  it.each([
    ['Phosphate 3.4 mEq/L', 'chemistry.phosphate', 'not a single ion'], // a mix of valences (common practice)
    ['Phos 3.5 mg/dL', 'chemistry.phosphate', 'given in mg/dL; expected mmol/L'], // the case takes mmol/L (table)
    ['Mg 2.1 mg/dL', 'chemistry.magnesium', 'given in mg/dL; expected mmol/L'],
    ['iCa 4.6 mg/dL', 'chemistry.ionisedCalcium', 'given in mg/dL; expected mmol/L'],
    // a bare magnesium 0.9 is believable in mmol/L and in mg/dL (our own windows, common practice)
    ['Mg 0.9', 'chemistry.magnesium', 'fits mmol/L or mg/dL'],
    ['PO4 1.2', 'chemistry.phosphate', 'fits mmol/L or mg/dL'],
    // a bare 4.6 is an ionised calcium only in mg/dL, which the case does not take
    ['iCa 4.6', 'chemistry.ionisedCalcium', 'which the case does not take'],
  ])('%s is a question, not a guess', (text, path, reason) => {
    const r = parsePaste(text);
    expect(r.case).toEqual({ gas: {} });
    expect(r.questions).toEqual([expect.objectContaining({ path })]);
    expect(r.questions[0]!.reason).toContain(reason);
  });

  it('a bare ionised calcium is read where only mmol/L is believable (1.12: 0.4-2.0 mmol/L, our own window)', () => {
    expect(parsePaste('iCa 1.12').read[0]).toMatchObject({
      path: 'chemistry.ionisedCalcium',
      value: 1.12,
      unit: 'mmol/L',
      unitFrom: 'magnitude',
    });
  });

  it('"Ca" alone is total calcium: recognised and left out with the reason', () => {
    const r = parsePaste('Ca 2.35 mmol/L\nCalcium, ionized 1.18 mmol/L');
    expect(r.case.chemistry).toEqual({ ionisedCalcium: 1.18 });
    expect(r.skipped.map((s) => s.reason)).toEqual([
      'total calcium is not ionised calcium; enter ionised calcium by hand if it was measured',
    ]);
  });

  it('"mg/dL" is never read as a magnesium label', () => {
    const r = parsePaste('Glucose 110 mg/dL\nMg 0.82 mmol/L');
    expect(r.case.chemistry).toEqual({ glucose: 110, magnesium: 0.82 });
    expect(r.questions).toEqual([]);
  });
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
