// Units as a printout writes them beside a value, read as tokens. Which unit a field takes, and what a token
// means for it (mEq/L by the ion's charge), is calc's readUnit over the table of fields, not decided here.

export type UnitToken =
  | 'kPa'
  | 'mmHg'
  | 'mmol/L'
  | 'mEq/L'
  | 'mg/dL'
  | 'g/dL'
  | 'g/L'
  | 'umol/L'
  | 'mOsm/kg'
  | 'mOsm/L'
  | '%'
  | 'nmol/L';

const UNIT_PATTERNS: readonly [UnitToken, RegExp][] = [
  ['kPa', /^kpa(?![a-z])/i],
  ['mmHg', /^(?:mm\s?hg|mm\[hg\]|torr)(?![a-z])/i],
  // osmolality in mmol/kg is the same number as mOsm/kg
  ['mOsm/kg', /^(?:mosm|mmol)\s?\/\s?kg(?:\s?h2o)?(?![a-z])/i],
  ['mOsm/L', /^mosm\s?\/\s?l(?![a-z])/i],
  ['mmol/L', /^mmol\s?\/\s?l(?![a-z])/i],
  ['mEq/L', /^meq\s?\/\s?l(?![a-z])/i],
  ['umol/L', /^umol\s?\/\s?l(?![a-z])/i],
  ['nmol/L', /^nmol\s?\/\s?l(?![a-z])/i],
  ['mg/dL', /^(?:mg\s?\/\s?dl|mg\s?%)(?![a-z])/i],
  ['g/dL', /^gm?\s?\/\s?dl(?![a-z])/i],
  ['g/L', /^g\s?\/\s?l(?![a-z])/i],
  ['%', /^%/],
];

/** The unit written at the start of the text, if any, and its length. */
export function unitAt(s: string): { unit: UnitToken; length: number } | null {
  for (const [unit, re] of UNIT_PATTERNS) {
    const m = re.exec(s);
    if (m) return { unit, length: m[0].length };
  }
  return null;
}

/** Any unit anywhere in a text (a unit in a later column of the line). */
export const UNIT_ANYWHERE =
  /(?<![a-z])(?:kpa|mm\s?hg|mm\[hg\]|torr|(?:mosm|mmol)\s?\/\s?kg(?:\s?h2o)?|mosm\s?\/\s?l|mmol\s?\/\s?l|meq\s?\/\s?l|umol\s?\/\s?l|nmol\s?\/\s?l|mg\s?\/\s?dl|mg\s?%|gm?\s?\/\s?dl|g\s?\/\s?l)(?![a-z])|%/gi;
