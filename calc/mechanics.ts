// Respiratory-system mechanics on the ventilator: compliance, the plateau and driving pressure a new VT would give,
// the expiratory time at a rate, and the largest VT that stays within lung-protective limits.
import { VENTILATION } from './reference.ts';

// Static compliance Crs = VT / (Pplat - PEEP), mL/cmH2O (clinical-scope section 10); null without a positive
// driving pressure.
export const compliance = (vt: number, pplat: number, peep: number): number | null =>
  pplat > peep ? vt / (pplat - peep) : null;

// Predicted plateau for a new VT at the same compliance and PEEP: Pplat = PEEP + VT_new / Crs.
export const predictedPlateau = (vtNew: number, crs: number, peep: number): number =>
  peep + vtNew / crs;

// Expiratory time Te = 60 / RR - Ti (s).
export const expiratoryTime = (rr: number, inspiratoryTime: number): number =>
  60 / rr - inspiratoryTime;

export type VtLimit = 'per_kg' | 'plateau' | 'driving_pressure';

/**
 * The largest VT (mL) that keeps VT <= 8 mL/kg PBW (ARDS Network 2000), the predicted plateau <= 30 cmH2O
 * (ARDS Network 2000) and the predicted driving pressure <= 15 cmH2O (Amato 2015), and the limit that binds.
 * Without a compliance only the per-kg limit is known.
 */
export function largestSafeVt(
  pbwKg: number,
  crs: number | null,
  peep: number | null,
): { vt: number; limitedBy: VtLimit } {
  const V = VENTILATION;
  const candidates: { vt: number; limitedBy: VtLimit }[] = [
    { vt: V.vtHighPerKg * pbwKg, limitedBy: 'per_kg' },
  ];
  if (crs !== null && peep !== null) {
    candidates.push({ vt: (V.plateauMax - peep) * crs, limitedBy: 'plateau' });
    candidates.push({ vt: V.drivingPressureMax * crs, limitedBy: 'driving_pressure' });
  }
  return candidates.reduce((a, b) => (b.vt < a.vt ? b : a));
}

// pH after an acute change of PaCO2, HCO3 moving 0.1 mmol/L per mmHg (Berend 2014 acute rule) and the Henderson
// equation: HCO3_new = HCO3 + 0.1 x (PaCO2_new - PaCO2); pH = 9 - log10(24 x PaCO2_new / HCO3_new).
export function phAfterAcuteChange(
  hco3: number,
  pco2Now: number,
  pco2New: number,
  bufferPerMmHg: number,
): number | null {
  const hco3New = hco3 + bufferPerMmHg * (pco2New - pco2Now);
  if (hco3New <= 0 || pco2New <= 0) return null;
  return 9 - Math.log10((24 * pco2New) / hco3New);
}
