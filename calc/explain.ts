// How a number was reached: formula, inputs and source, so that any figure can be explained.
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

export function explanation(
  key: string,
  label: string,
  value: number,
  unit: string,
  formula: string,
  inputs: Input[],
  source: SourceKey,
): Explanation {
  const shown = inputs.map((i) => ({
    name: i.name,
    value: round(i.value, INPUT_DECIMALS[i.unit] ?? 3),
    unit: i.unit,
  }));
  return { key, label, value, unit, formula, inputs: shown, source: SOURCES[source] };
}

/** A value rounded for reporting (not for further arithmetic). */
export function round(value: number, decimals: number): number {
  const f = POWERS_OF_TEN[decimals] ?? 10 ** decimals;
  return Math.round(value * f) / f;
}
const POWERS_OF_TEN = [1, 10, 100, 1000, 10000];
