// CO-oximetry: carboxyhaemoglobin, methaemoglobin and the gap between pulse oximetry and the measured SaO2
// (clinical-scope section 10; thresholds common practice).
import { CO_OXIMETRY } from './reference.ts';

export type CohbBand = 'normal' | 'raised_for_non_smoker' | 'raised';

// COHb above about 3% is raised in a non-smoker, above about 10% even in a smoker (common practice).
export function cohbBand(cohb: number): CohbBand {
  if (cohb > CO_OXIMETRY.cohbSmoker) return 'raised';
  if (cohb > CO_OXIMETRY.cohbNonSmoker) return 'raised_for_non_smoker';
  return 'normal';
}

// MetHb above about 2% is raised (common practice).
export const methbRaised = (methb: number): boolean => methb > CO_OXIMETRY.methb;

// Saturation gap = SpO2 - SaO2 (percentage points): pulse oximetry reads falsely high with COHb or MetHb.
export const saturationGap = (spo2: number, sao2: number): number => spo2 - sao2;
