// Ventilation: predicted body weight, VT per kg, driving pressure, alveolar ventilation, dead space,
// ventilatory ratio, the target PaCO2 and the RR or VT that should reach it.
import { PHYSIOLOGY } from './reference.ts';

export type Sex = 'male' | 'female';

// ARDS Network 2000: PBW male 50 + 0.91 x (height cm - 152.4); female 45.5 + 0.91 x (height cm - 152.4).
export const predictedBodyWeight = (sex: Sex, heightCm: number): number =>
  (sex === 'male' ? 50 : 45.5) + 0.91 * (heightCm - 152.4);

export const vtPerKg = (vt: number, weightKg: number): number => vt / weightKg;

// Driving pressure = Pplat - PEEP (Amato et al. 2015).
export const drivingPressure = (pplat: number, peep: number): number => pplat - peep;

// Anatomic dead space about 2.2 mL/kg (Radford 1955), plus apparatus dead space.
export const estimatedDeadSpace = (pbwKg: number, apparatusMl = 0): number =>
  PHYSIOLOGY.anatomicDeadSpaceMlPerKg * pbwKg + apparatusMl;

// Minute ventilation VE = RR x VT, in L/min.
export const minuteVentilation = (rr: number, vt: number): number => (rr * vt) / 1000;

// Alveolar ventilation VA = RR x (VT - VD), in L/min.
export const alveolarVentilation = (rr: number, vt: number, deadSpace: number): number =>
  (rr * (vt - deadSpace)) / 1000;

// West: PaCO2 = 0.863 x VCO2 / VA, so VCO2 = PaCO2 x VA / 0.863 (mL/min, L/min, mmHg).
export const pco2FromVentilation = (vco2: number, va: number): number =>
  (PHYSIOLOGY.alveolarConstant * vco2) / va;
export const co2ProductionEstimate = (pco2: number, va: number): number =>
  (pco2 * va) / PHYSIOLOGY.alveolarConstant;

// At constant VCO2: VA1 x PaCO2_1 = VA2 x PaCO2_2.
export const predictedPco2AfterChange = (pco2Now: number, vaNow: number, vaNew: number): number =>
  (pco2Now * vaNow) / vaNew;

// Ventilatory ratio = (VE mL/min x PaCO2) / (PBW x 100 x 37.5) (Sinha et al. 2009).
export const ventilatoryRatio = (veMlMin: number, pco2: number, pbwKg: number): number =>
  (veMlMin * pco2) / (pbwKg * 100 * 37.5);

// Simple form, HCO3 held constant: PaCO2_t = [H+]_t x HCO3 / 24.
export const targetPco2Simple = (targetHPlus: number, hco3: number): number =>
  (targetHPlus * hco3) / 24;

// Acute buffering (HCO3 moves 0.1 mmol/L per mmHg): PaCO2_t = [H+]_t x (HCO3 - 0.1 PaCO2) / (24 - 0.1 [H+]_t).
export function targetPco2Buffered(
  targetHPlus: number,
  hco3: number,
  pco2Now: number,
): number | null {
  const k = PHYSIOLOGY.acuteBufferPerMmHg;
  const denominator = 24 - k * targetHPlus;
  const numerator = targetHPlus * (hco3 - k * pco2Now);
  const value = numerator / denominator;
  return denominator > 0 && value > 0 ? value : null;
}

// At fixed VT (dead space per breath unchanged): RR_new = RR x PaCO2_now / PaCO2_target.
export const rrForTarget = (rr: number, pco2Now: number, pco2Target: number): number =>
  (rr * pco2Now) / pco2Target;

// At fixed RR: VT_new = VD + (VT - VD) x PaCO2_now / PaCO2_target.
export const vtForTarget = (
  vt: number,
  deadSpace: number,
  pco2Now: number,
  pco2Target: number,
): number => deadSpace + ((vt - deadSpace) * pco2Now) / pco2Target;
