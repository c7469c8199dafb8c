// How a number was reached: formula, inputs and source, so that any figure can be explained. A derived value is
// recorded once, with its explanation; the value reported is rounded as the explanation says, the arithmetic
// that follows uses the unrounded one.
import { SOURCES, type SourceKey } from './sources.ts';

export interface Input {
  name: string;
  value: number;
  unit: string;
}

export interface Explanation {
  key: string;
  label: string;
  value: number;
  unit: string;
  formula: string;
  inputs: Input[];
  source: string;
}

/** How a value was reached, and the decimals it is reported with. */
export interface How {
  label: string;
  unit: string;
  decimals: number;
  formula: string;
  inputs: Input[];
  source: SourceKey;
}

export const input = (name: string, value: number, unit: string): Input => ({ name, value, unit });

/**
 * Decimals an input is reported with, by unit: a value converted from the clinician's unit (7.6 kPa is
 * 57.004712 mmHg) is shown as a reader would write it, not with the conversion's noise. Unlisted units keep 3.
 */
const INPUT_DECIMALS: Readonly<Record<string, number>> = {
  mmHg: 1,
  'nmol/L': 1,
  'mmol/L': 2,
  'g/dL': 2,
  'mOsm/kg': 1,
  mL: 1,
  'mL/min': 0,
  '/min': 1,
  cm: 1,
  m: 0,
  cmH2O: 1,
  '%': 1,
  years: 1,
};

/** A value rounded for reporting (not for further arithmetic). */
export const round = (value: number, decimals: number): number => {
  const f = 10 ** decimals;
  return Math.round(value * f) / f;
};

export function explanation(key: string, value: number, how: How): Explanation {
  return {
    key,
    label: how.label,
    value: round(value, how.decimals),
    unit: how.unit,
    formula: how.formula,
    inputs: how.inputs.map((i) => ({ ...i, value: round(i.value, INPUT_DECIMALS[i.unit] ?? 3) })),
    source: SOURCES[how.source],
  };
}

/** The derived values of one reading and how each was reached. */
export interface Ledger<K extends string> {
  derived: Record<K, unknown>;
  explain: Record<string, Explanation>;
}

/** Record a derived value with its explanation; returns the unrounded value for the arithmetic that follows. */
export function record<K extends string>(
  ledger: Ledger<K>,
  key: K,
  value: number,
  how: How,
): number {
  const e = explanation(key, value, how);
  ledger.derived[key] = e.value;
  ledger.explain[key] = e;
  return value;
}
