// How a number was reached: formula, inputs and source, so that any figure can be explained.
import { SOURCES, type SourceKey } from './sources.ts';

export interface Input { name: string; value: number; unit: string }

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

export function explanation(key: string, label: string, value: number, unit: string, formula: string, inputs: Input[], source: SourceKey): Explanation {
  return { key, label, value, unit, formula, inputs, source: SOURCES[source] };
}

/** A value rounded for reporting (not for further arithmetic). */
export function round(value: number, decimals: number): number {
  const f = 10 ** decimals;
  return Math.round(value * f) / f;
}
