// The calculation core's public surface: the only door the other rooms (and the tests) use.
export { interpret, interpretParsed, unitLooksMixed } from './interpret.ts';
export type {
  Book,
  Change,
  SettingChange,
  Derived,
  DerivedNumber,
  Findings,
  InterpretOptions,
  Metabolic,
  Oxygenation,
  PreviousGas,
  BestSetting,
  Rejected,
  Route,
  RouteLimit,
  Serial,
  Venous,
  Ventilation,
} from './findings.ts';
export { DERIVED_NUMBERS } from './findings.ts';
export {
  caseSchema,
  caseShape,
  enteredUnit,
  inRange,
  parseCase,
  rangeErrors,
  rangeText,
  toFieldErrors,
  withoutInvisible,
} from './schema.ts';
export type { CaseInput, FieldError, ParsedCase, SafeParse } from './schema.ts';
export {
  FIELD,
  FIELDS,
  MAX_PREVIOUS_GASES,
  PREVIOUS_SETTINGS,
  fieldsOf,
  keyOf,
} from './fields.ts';
export type { FieldPath, FieldSpec, KeysOf, Loinc, Printed, Specimen } from './fields.ts';
export { canonicalValue, completeGas } from './canonical.ts';
export type { CanonicalCase, Gas, Values } from './canonical.ts';
export { readUnit, resolveUnits } from './units.ts';
export type { PressureUnit, Quantity, UnitDef, UnitReading, Units } from './units.ts';
export { gasTime, inTimeOrder } from './readSerial.ts';
export type { Flag, FlagCode, FlagValue, Severity } from './flags.ts';
export type { Band, Timing } from './compensation.ts';
export type {
  Classification,
  Compensation,
  Disorder,
  DisorderBasis,
  DisorderCode,
  DisorderDetail,
  PhStatus,
} from './classify.ts';
export type { ReferencePoint, UsualPoint } from './referencePoint.ts';
export type { Spo2Target, TargetBasis } from './oxygenTargets.ts';
export { CONDITIONS, type Condition } from './conditions.ts';
export type { DeltaBasis, DeltaPoint, DeltaReading } from './deltaReference.ts';
export type { GlucoseReading } from './readGlucose.ts';
export type { HypoventilationReason } from './hypoventilation.ts';
export type { Explanation, How, Input } from './explain.ts';
export { round } from './explain.ts';
export { SOURCES, type SourceKey } from './sources.ts';
// the formulas, one namespace per physiological idea
export * as acidBase from './acidBase.ts';
export * as anionGap from './anionGap.ts';
export * as classification from './classify.ts';
export * as coOximetry from './coOximetry.ts';
export * as compensation from './compensation.ts';
export * as deadSpace from './deadSpace.ts';
export * as deltaReference from './deltaReference.ts';
export * as glucose from './glucose.ts';
export * as hypoventilation from './hypoventilation.ts';
export * as mechanics from './mechanics.ts';
export * as referencePoints from './referencePoint.ts';
export * as osmolality from './osmolality.ts';
export * as oxygenation from './oxygenation.ts';
export * as oxygenTargets from './oxygenTargets.ts';
export * as physicochemical from './physicochemical.ts';
export * as reference from './reference.ts';
export * as units from './units.ts';
export * as ventilation from './ventilation.ts';
