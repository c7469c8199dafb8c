// Corrected sodium, effective osmolality and the thresholds around ketoacidosis (calc/glucose.ts), with check values
// by hand from the published formulas; glucose units checked against the UCUM library.
import { describe, expect, it } from 'vitest';
import { glucose } from '../../calc/index.ts';
import { MOLAR_MASS, ucum } from './helpers.ts';

const {
  correctedSodiumHillier,
  correctedSodiumKatz,
  effectiveOsmolality,
  glucoseMgDl,
  hyperglycaemic,
  hyperosmolarState,
  potassiumBeforeInsulin,
} = glucose;

// glucose in mmol/L from mg/dL by UCUM (an outside reference), molar mass 180.16 g/mol
const mmol = (mgDl: number) => ucum('mg/dL', mgDl, 'mmol/L', MOLAR_MASS.glucose);

describe('sodium corrected for glucose', () => {
  it.each([
    // Na, glucose mg/dL, Katz (1.6 per 100 mg/dL above 100), Hillier (2.4 per 100), by hand
    [129, 612, 137.19, 141.29],
    [148, 936.832, 161.39, 168.08],
    [135, 100, 135, 135],
    [130, 400, 134.8, 137.2],
  ])(
    'Na %s with glucose %s mg/dL: %s (Katz MA, N Engl J Med 1973) or %s (Hillier TA et al., Am J Med 1999)',
    (na, mgDl, katz, hillier) => {
      expect(correctedSodiumKatz(na, mmol(mgDl))).toBeCloseTo(katz, 2);
      expect(correctedSodiumHillier(na, mmol(mgDl))).toBeCloseTo(hillier, 2);
    },
  );

  it('works in mg/dL whatever unit the glucose came in: 33.97 mmol/L is 612 mg/dL (UCUM, 180.16 g/mol)', () => {
    expect(glucoseMgDl(mmol(612))).toBeCloseTo(612, 6);
  });
});

describe('effective osmolality and the hyperosmolar state (Kitabchi AE et al., Diabetes Care 2009)', () => {
  it.each([
    // Na, glucose mmol/L, 2 Na + glucose, hyperosmolar (>= 320 with glucose >= 30)
    [148, 52, 348, true],
    [129, 33.97, 291.97, false],
    [160, 8, 328, false], // hypernatraemia alone is not the hyperglycaemic state
    [145, 30, 320, true], // both limits met exactly
  ])('Na %s, glucose %s: %s mOsm/kg, hyperosmolar %s', (na, g, effective, state) => {
    expect(effectiveOsmolality(na, g)).toBeCloseTo(effective, 6);
    expect(hyperosmolarState(effectiveOsmolality(na, g), g)).toBe(state);
  });

  it('hyperglycaemia above 11 mmol/L (JBDS; from memory)', () => {
    expect(hyperglycaemic(11)).toBe(false);
    expect(hyperglycaemic(11.1)).toBe(true);
  });
});

describe('potassium before insulin (JBDS, from memory: replace below 3.5; above 5.5 is high)', () => {
  it.each([
    [3.1, 'low'],
    [3.49, 'low'],
    [3.5, 'within'],
    [5.5, 'within'],
    [5.9, 'high'],
    [null, 'not_given'],
  ] as const)('K %s: %s', (k, status) => {
    expect(potassiumBeforeInsulin(k)).toBe(status);
  });
});
