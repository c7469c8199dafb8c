// The paste reader's results, as the page and the API use them.
import type { CaseInput, FieldPath, PressureUnit } from '../../../calc/index.ts';
import type { Question } from '../case.ts';

export const MAX_PASTE_CHARS = 50_000; // with the rest of the form, within the 64 KiB body limit

/** Where the unit of a read value came from. */
export type UnitSource =
  | 'text' // written beside the value
  | 'printout' // written on another pressure line or in a column header of the same paste
  | 'magnitude' // the only unit in which the number is plausible
  | 'implied'; // the quantity has one unit in practice (pH none, Na mmol/L, FiO2 fraction or percent, BUN mg/dL)

export interface ReadValue {
  path: FieldPath;
  value: number;
  /** the unit as read: 'mmHg', 'kPa', 'mmol/L', '%', 'fraction', 'g/dL', ... ('' for pH) */
  unit: string;
  sourceText: string;
  /** 1-based line of the (tag-stripped) paste */
  line: number;
  unitFrom: UnitSource;
  note?: string;
  /** as written, when the case takes it in another unit (Ca++ 2.3 mEq/L is 1.15 mmol/L) */
  written?: { value: number; unit: string };
}

/** A label that was recognised but deliberately not used, with the reason. */
export interface Skipped {
  sourceText: string;
  reason: string;
  line: number;
}

export interface PasteResult {
  /** a partial case of the interface contract; units set from what was read */
  case: CaseInput;
  read: ReadValue[];
  questions: Question[];
  /** lines (or parts of lines) that gave nothing */
  ignored: string[];
  skipped: Skipped[];
  /** of pH, PaCO2 and HCO3 (the schema needs two), the ones neither read nor asked about */
  missing: FieldPath[];
}

/** The trade shorthand pH/PaCO2/PaO2/HCO3, as written; null for a place holder such as '-'. */
export interface Shorthand {
  ph: number;
  pco2: number | null;
  po2: number | null;
  hco3: number | null;
  /** the pressure unit written after it, if any */
  unit: PressureUnit | null;
  sourceText: string;
}
