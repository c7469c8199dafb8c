// Oxygen saturation targets (O'Driscoll BR et al., BTS guideline for oxygen use in adults, Thorax 2017;72:ii1):
// 94-98%, or 88-92% for those at risk of hypercapnic respiratory failure; pregnancy: maternal SpO2 95% or more
// (from memory). Local targets take precedence.
import type { Condition } from './conditions.ts';
import { OXYGEN_TARGETS, OXYGENATION } from './reference.ts';

export type TargetBasis = 'hypercapnic_risk' | 'standard' | 'pregnancy';

export interface Spo2Target {
  low: number;
  high: number;
  basis: TargetBasis;
}

/** Conditions that put a patient at risk of hypercapnic respiratory failure (BTS 2017). */
export const HYPERCAPNIC_RISK: readonly Condition[] = [
  'chronic_hypercapnia',
  'copd',
  'obesity_hypoventilation',
  'neuromuscular',
];

/** The SpO2 target band: pregnancy first (the fetus), then a risk of hypercapnia, else the standard band. */
export function spo2Target(x: {
  conditions: readonly Condition[];
  usualPco2: number | null;
  pregnant: boolean;
}): Spo2Target {
  if (x.pregnant) return { ...OXYGEN_TARGETS.pregnancy, basis: 'pregnancy' };
  const retainer =
    x.conditions.some((c) => HYPERCAPNIC_RISK.includes(c)) ||
    (x.usualPco2 !== null && x.usualPco2 > OXYGENATION.hypercapnia);
  return retainer
    ? { ...OXYGEN_TARGETS.hypercapnicRisk, basis: 'hypercapnic_risk' }
    : { ...OXYGEN_TARGETS.standard, basis: 'standard' };
}

/** On supplemental oxygen (FiO2 above room air) with a saturation above the band. */
export const aboveTarget = (saturation: number, fio2: number, target: Spo2Target): boolean =>
  fio2 > OXYGENATION.roomAirFio2 + 0.005 && saturation > target.high;
