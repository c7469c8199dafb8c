// Intake: outside text (a pasted printout, a FHIR R4 payload) -> a draft case of the interface contract.
// Each intake says what it read, what it must ask, and what it did not use; a draft goes through the
// case schema (calc's parseCase) like any other case before anything is worked out from it.
export { parsePaste, parseShorthand, MAX_PASTE_CHARS } from './paste.ts';
export type { PasteResult, ReadValue, Skipped, Shorthand, UnitSource } from './paste.ts';
export { caseFromFhir } from './fhir/read.ts';
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
