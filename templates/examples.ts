// Invented patients in scenarios of our own, one for each kind of reading the note words (no real person). They are
// data (examples.json: what each patient is, and the case as the API takes it): at start-up a department's own
// templates must render every one of them, and the tests use them. Each gas is built to be internally consistent by
// the Henderson equation, [H+] = 24 x PaCO2 / HCO3 (clinical-scope section 2), so the core reads it as entered.
import { readFileSync } from 'node:fs';
import type { CaseInput } from '../calc/index.ts';

export interface Example {
  /** who the invented patient is */
  about: string;
  case: CaseInput;
}

const file = new URL('./examples.json', import.meta.url);

/** Every invented example by name. */
export const EXAMPLE_LIST: Readonly<Record<string, Example>> = JSON.parse(
  readFileSync(file, 'utf8'),
);

/** The cases alone, by name. */
export const EXAMPLES: Readonly<Record<string, CaseInput>> = Object.fromEntries(
  Object.entries(EXAMPLE_LIST).map(([name, example]) => [name, example.case]),
);
