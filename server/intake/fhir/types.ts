// The FHIR reader's results, as the page and the API use them.
import type { CaseInput, FieldError, FieldPath } from '../../../calc/index.ts';
import type { Question } from '../case.ts';

export interface FhirRead {
  path: FieldPath;
  value: number;
  /** the unit as the clinician reads it ('mmHg', 'kPa', '%', 'g/L', ... ; '' for pH) */
  unit: string;
  code: string;
  display: string;
  /** where in the payload: entry[2].resource, entry[0].resource.component[1] */
  source: string;
  /** the Observation's effective time, as sent */
  effective: string | null;
  sourceText: string;
}

export interface FhirUnused {
  code: string | null;
  display: string;
  reason: string;
  source: string;
}

/** An earlier gas kept in the case: case.previous[index], with what was read into it. */
export interface FhirPrevious {
  index: number;
  /** its effective time, as sent (the case's previous[index].takenAt) */
  takenAt: string;
  read: FhirRead[];
}

/** A result the case does not hold, with its time and the reason: an older repeat, a value of another time. */
export interface FhirEarlier {
  path: FieldPath;
  code: string;
  value: number;
  unit: string;
  effective: string | null;
  source: string;
  reason: string;
}

export interface FhirConversion {
  path: FieldPath;
  source: string;
  from: { value: number; unit: string };
  to: { value: number; unit: string };
  reason: string;
  /** the earlier gas (case.previous[previous]) the value belongs to; absent for the case's own values */
  previous?: number;
}

export interface FhirResult {
  /** true when there is nothing to fix or confirm: no errors, no questions */
  ok: boolean;
  /** the newest gas, its chemistry and settings, and the earlier gases as `previous` (oldest first) */
  case: CaseInput;
  /** the effective time of the case's gas, as sent (null when the results carry none) */
  takenAt: string | null;
  /** the values of the case's own gas, chemistry and settings */
  read: FhirRead[];
  previous: FhirPrevious[];
  earlier: FhirEarlier[];
  unused: FhirUnused[];
  conversions: FhirConversion[];
  /** { path, message } with the path inside the payload, such as entry[3].resource.valueQuantity.code */
  errors: FieldError[];
  questions: Question[];
  notes: string[];
  /** of pH, PaCO2 and HCO3 (the schema needs two), the ones not found */
  missing: FieldPath[];
}
