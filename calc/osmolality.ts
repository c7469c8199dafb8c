// Osmolar gap and lactate bands.
import { QUANTITIES } from './units.ts';

// ethanol mg/dL per mmol/L (molar mass 46.07 g/mol)
const ETHANOL_MG_DL_PER_MMOL_L = 1 / QUANTITIES.ethanol.units['mg/dL'].factor;
import { LACTATE, OSMOLAR_GAP_RAISED } from './reference.ts';

// Calculated osmolality = 2 Na + glucose + urea (mmol/L), + ethanol mg/dL / 3.7 (Purssell et al. 2001).
export function calculatedOsmolality(
  na: number,
  glucose: number,
  urea: number,
  ethanolMmolL: number | null = null,
): number {
  const ethanol = ethanolMmolL === null ? 0 : (ethanolMmolL * ETHANOL_MG_DL_PER_MMOL_L) / 3.7;
  return 2 * na + glucose + urea + ethanol;
}

// Same in conventional units: 2 Na + glucose mg/dL / 18 + BUN mg/dL / 2.8 (+ ethanol mg/dL / 3.7).
export function calculatedOsmolalityConventional(
  na: number,
  glucoseMgDl: number,
  bunMgDl: number,
  ethanolMgDl: number | null = null,
): number {
  return 2 * na + glucoseMgDl / 18 + bunMgDl / 2.8 + (ethanolMgDl ?? 0) / 3.7;
}

// Osmolar gap = measured - calculated; above 10 is raised (common practice).
export const osmolarGap = (measured: number, calculated: number): number => measured - calculated;
export const osmolarGapRaised = (gap: number): boolean => gap > OSMOLAR_GAP_RAISED;

export type LactateBand = 'normal' | 'raised' | 'high';
// Surviving Sepsis Campaign 2021: >= 2 raised, >= 4 high.
export function lactateBand(lactate: number): LactateBand {
  if (lactate >= LACTATE.high) return 'high';
  if (lactate >= LACTATE.raised) return 'raised';
  return 'normal';
}
