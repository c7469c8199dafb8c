// Intake: outside text (a pasted printout, a FHIR R4 payload) -> a draft case of the interface contract.
// Each intake says what it read, what it must ask, and what it did not use; a draft goes through the
// case schema (calc's parseCase) like any other case before anything is worked out from it. Both intakes read
// calc's table of fields (labels, units, ranges, printout labels, LOINC codes) through calc/index.ts only.
export { parsePaste } from './paste/parse.ts';
export { parseShorthand } from './paste/shorthand.ts';
export { MAX_PASTE_CHARS } from './paste/types.ts';
export type { PasteResult, ReadValue, Skipped, Shorthand, UnitSource } from './paste/types.ts';
export { caseFromFhir, MAX_REPORTED } from './fhir/read.ts';
export { withoutInvisibleDeep } from './invisible.ts';
export type {
  FhirConversion,
  FhirEarlier,
  FhirPrevious,
  FhirRead,
  FhirResult,
  FhirUnused,
} from './fhir/types.ts';
export { LOINC_CODES, LOINC_NOT_READ, loincEntry, ucumCodes } from './loinc.ts';
export type { LoincEntry } from './loinc.ts';
export { REQUIRED_GAS } from './case.ts';
export type { Question, Sample } from './case.ts';
