// Glucose and what follows from it: the sodium corrected for hyperglycaemia, the effective osmolality, and the
// thresholds of the hyperosmolar state and the ketoacidosis pattern (clinical-scope section 10).
import { GLUCOSE, POTASSIUM } from './reference.ts';
import { QUANTITIES } from './units.ts';

// glucose mg/dL per mmol/L (molar mass 180.16 g/mol: 18.016)
const MG_DL_PER_MMOL_L = 1 / QUANTITIES.glucose.units['mg/dL'].factor;

/** mmol/L to mg/dL, for the formulas written in mg/dL. */
export const glucoseMgDl = (glucoseMmolL: number): number => glucoseMmolL * MG_DL_PER_MMOL_L;

// Katz MA, N Engl J Med 1973;289:843: corrected Na = Na + 1.6 x (glucose mg/dL - 100) / 100.
export const correctedSodiumKatz = (na: number, glucoseMmolL: number): number =>
  na + (1.6 * (glucoseMgDl(glucoseMmolL) - 100)) / 100;

// Hillier TA et al., Am J Med 1999;106:399: corrected Na = Na + 2.4 x (glucose mg/dL - 100) / 100.
export const correctedSodiumHillier = (na: number, glucoseMmolL: number): number =>
  na + (2.4 * (glucoseMgDl(glucoseMmolL) - 100)) / 100;

// Effective (tonic) osmolality = 2 Na + glucose, mmol/L; urea crosses cell membranes and is left out (Kitabchi 2009).
export const effectiveOsmolality = (na: number, glucoseMmolL: number): number =>
  2 * na + glucoseMmolL;

// Hyperglycaemia as the ketoacidosis pattern reads it: glucose above 11 mmol/L (JBDS; from memory).
export const hyperglycaemic = (glucoseMmolL: number): boolean => glucoseMmolL > GLUCOSE.high;

// Hyperosmolar state: effective osmolality >= 320 mOsm/kg with glucose >= 30 mmol/L (Kitabchi 2009; JBDS).
export const hyperosmolarState = (effective: number, glucoseMmolL: number): boolean =>
  effective >= GLUCOSE.hyperosmolarOsmolality && glucoseMmolL >= GLUCOSE.hyperosmolarGlucose;

export type PotassiumBeforeInsulin = 'low' | 'high' | 'within' | 'not_given';

// Before insulin: below 3.5 mmol/L potassium is replaced first (JBDS 3.5; Kitabchi 2009 3.3); above 5.5 it is high.
export function potassiumBeforeInsulin(k: number | null): PotassiumBeforeInsulin {
  if (k === null) return 'not_given';
  if (k < POTASSIUM.beforeInsulinBelow) return 'low';
  if (k > POTASSIUM.highAbove) return 'high';
  return 'within';
}
