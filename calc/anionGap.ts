// Anion gap, its albumin correction, the delta ratio, and the urine indices.
import { DELTA_RATIO, URINE_CHLORIDE_RESPONSIVE } from './reference.ts';

// Anion gap = Na - (Cl + HCO3) (Kraut and Madias 2007); with K when the laboratory adds it.
export const anionGap = (na: number, cl: number, hco3: number, k: number | null = null): number =>
  na + (k ?? 0) - (cl + hco3);

// Albumin-corrected AG = AG + 2.5 x (4.0 - albumin g/dL) (Figge et al. 1998).
export const albuminCorrectedAnionGap = (ag: number, albuminGdl: number): number =>
  ag + 2.5 * (4.0 - albuminGdl);

// Delta ratio = (AG - normal AG) / (reference HCO3 - HCO3) (Wrenn 1990), the reference being 24 or the HCO3 that
// applies to this patient (clinical-scope section 10); only defined while HCO3 is below that reference.
export function deltaRatio(
  ag: number,
  hco3: number,
  normalAg = 12,
  referenceHco3 = 24,
): number | null {
  const denominator = referenceHco3 - hco3;
  return denominator > 0 ? (ag - normalAg) / denominator : null;
}

export type DeltaBand = 'normal_gap' | 'mixed_high_and_normal_gap' | 'high_gap' | 'added_alkalosis';

// Wrenn 1990: < 0.4 normal-AG acidosis; 0.4-0.8 mixed; 0.8-2.0 high-AG acidosis; > 2 added alkalosis.
export function deltaRatioBand(ratio: number): DeltaBand {
  if (ratio < DELTA_RATIO.normalGapBelow) return 'normal_gap';
  if (ratio < DELTA_RATIO.mixedBelow) return 'mixed_high_and_normal_gap';
  if (ratio <= DELTA_RATIO.highGapUpTo) return 'high_gap';
  return 'added_alkalosis';
}

// Urine anion gap = uNa + uK - uCl (common practice): negative in GI bicarbonate loss.
export const urineAnionGap = (urineNa: number, urineK: number, urineCl: number): number =>
  urineNa + urineK - urineCl;

// Urine chloride < 20 mmol/L: chloride-responsive metabolic alkalosis (common practice).
export const chlorideResponsive = (urineCl: number): boolean => urineCl < URINE_CHLORIDE_RESPONSIVE;
