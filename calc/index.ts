// The calculation core's public surface.
export { interpret, interpretParsed } from './interpret.ts';
export type {
  Findings,
  Rejected,
  Derived,
  Metabolic,
  Oxygenation,
  Ventilation,
  Venous,
  Change,
  PreviousGas,
  Serial,
  InterpretOptions,
} from './findings.ts';
export {
  caseSchema,
  caseShape,
  parseCase,
  rangeErrors,
  toFieldErrors,
  resolveUnits,
  rangeText,
} from './schema.ts';
export type { CaseInput, ParsedCase, FieldError, Range } from './schema.ts';
export type { CanonicalCase, Gas } from './canonical.ts';
export type { Flag, FlagCode, Severity } from './flags.ts';
export type {
  Disorder,
  DisorderCode,
  DisorderDetail,
  Band,
  Compensation,
  ReferencePoint,
  Timing,
  PhStatus,
} from './compensation.ts';
export type { Explanation, Input } from './explain.ts';
export * as units from './units.ts';
export * as reference from './reference.ts';
export { SOURCES } from './sources.ts';
