// Oxygenation: barometric pressure, alveolar gas, A-a gradient, P/F and S/F bands, O2 content.
import { OXYGENATION, PHYSIOLOGY } from './reference.ts';

// ICAO standard atmosphere (ISO 2533): PB = 760 x (1 - 2.25577e-5 x h)^5.25588, h in metres.
export const barometricPressureAtAltitude = (altitudeM: number): number =>
  760 * (1 - 2.25577e-5 * altitudeM) ** 5.25588;

// Alveolar gas equation: PAO2 = FiO2 x (PB - 47) - PaCO2 / 0.8.
export const alveolarPo2 = (
  fio2: number,
  pco2: number,
  barometric: number = PHYSIOLOGY.seaLevelMmHg,
): number =>
  fio2 * (barometric - PHYSIOLOGY.waterVapourMmHg) - pco2 / PHYSIOLOGY.respiratoryQuotient;

// A-a gradient = PAO2 - PaO2.
export const aaGradient = (alveolar: number, po2: number): number => alveolar - po2;

// Expected A-a gradient on room air about age/4 + 4 mmHg (common practice).
export const expectedAaGradient = (ageYears: number): number => ageYears / 4 + 4;

// P/F ratio = PaO2 / FiO2 (mmHg).
export const pfRatio = (po2: number, fio2: number): number => po2 / fio2;

// SpO2/FiO2 ratio (SpO2 in percent).
export const sfRatio = (spo2: number, fio2: number): number => spo2 / fio2;

export type PfBand = 'none' | 'mild' | 'moderate' | 'severe';
// Berlin definition 2012: with PEEP/CPAP >= 5, <= 300 mild, <= 200 moderate, <= 100 severe.
export function pfBand(ratio: number): PfBand {
  if (ratio <= OXYGENATION.pfSevere) return 'severe';
  if (ratio <= OXYGENATION.pfModerate) return 'moderate';
  if (ratio <= OXYGENATION.pfMild) return 'mild';
  return 'none';
}

// 2024 global definition: SpO2/FiO2 <= 315 meets the oxygenation criterion when SpO2 <= 97%.
export const sfMeetsCriterion = (spo2: number, ratio: number): boolean | null =>
  spo2 > OXYGENATION.sfMaxSpo2 ? null : ratio <= OXYGENATION.sfThreshold;

// Oxygen content CaO2 = 1.34 x Hb x SaO2 + 0.003 x PaO2 (mL/dL; Hb g/dL, SaO2 fraction).
export const oxygenContent = (hbGdl: number, sao2Percent: number, po2: number): number =>
  1.34 * hbGdl * (sao2Percent / 100) + 0.003 * po2;

export type OxygenationLevel = 'normal' | 'hypoxaemia' | 'respiratory_failure';
// Common practice: PaO2 < 80 mmHg hypoxaemia, < 60 respiratory failure.
export function oxygenationLevel(po2: number): OxygenationLevel {
  if (po2 < OXYGENATION.respiratoryFailure) return 'respiratory_failure';
  if (po2 < OXYGENATION.hypoxaemia) return 'hypoxaemia';
  return 'normal';
}
