// Intake: outside text (a pasted printout, a FHIR R4 payload) -> a draft case of the interface contract.
// Each intake says what it read, what it must ask, and what it did not use; a draft goes through the
// case schema (calc/schema.ts) like any other case before anything is worked out from it.
export { parsePaste, parseShorthand, MAX_PASTE_CHARS } from './paste.ts';
export type { PasteResult, ReadValue, Skipped, Shorthand, UnitSource } from './paste.ts';
export { caseFromFhir } from './fhir.ts';
export type { FhirResult, FhirRead, FhirUnused, FhirSuperseded, FhirConversion } from './fhir.ts';
export { LOINC_CODES, LOINC_NOT_READ, UCUM, loincEntry, REQUIRED_GAS } from './loinc.ts';
export type {
  CasePath,
  IntakeCase,
  Question,
  Sample,
  LoincEntry,
  QuantityKind,
  Specimen,
} from './loinc.ts';
