// The LOINC codes the FHIR intake reads, and the case fields both intakes (paste, FHIR) fill.
// Every code is on one line with its LOINC long common name. "checked" names the published list it was
// compared against: DICOM PS3.16 context groups CID 3524 (blood gas pressure), CID 3526 (saturation),
// CID 3527 (base excess), CID 3528 (pH); the VSAC eCQM value sets named by OID; the German COVID-19
// research dataset (GECCO) FHIR profiles; HL7 example ObservationDefinitions. "from memory" where no
// list was at hand. Specimen (arterial, venous, capillary, blood = not stated) is LOINC's System axis.
import type { Units } from '../../calc/units.ts';
import type { CaseInput } from '../../calc/schema.ts';

// ---------- case targets (shared by the paste and FHIR intakes) ----------

export type CasePath =
  | 'gas.ph'
  | 'gas.pco2'
  | 'gas.po2'
  | 'gas.hco3'
  | 'gas.baseExcess'
  | 'gas.sao2'
  | 'gas.lactate'
  | 'gas.hb'
  | 'chemistry.na'
  | 'chemistry.k'
  | 'chemistry.cl'
  | 'chemistry.albumin'
  | 'chemistry.glucose'
  | 'chemistry.urea'
  | 'chemistry.creatinine'
  | 'chemistry.osmolality'
  | 'oxygen.fio2'
  | 'oxygen.spo2'
  | 'context.temperatureC';

export type Sample = 'arterial' | 'venous' | 'capillary';

/** The case JSON of the interface contract, as far as an intake fills it. */
export interface IntakeCase {
  sample?: Sample;
  units?: Partial<Units>;
  gas: Partial<
    Record<'ph' | 'pco2' | 'po2' | 'hco3' | 'baseExcess' | 'sao2' | 'lactate' | 'hb', number>
  >;
  chemistry?: Partial<
    Record<'na' | 'k' | 'cl' | 'albumin' | 'glucose' | 'urea' | 'creatinine' | 'osmolality', number>
  >;
  oxygen?: Partial<Record<'fio2' | 'spo2', number>>;
  context?: Partial<Record<'temperatureC', number>>;
}

// compile-time check: a draft is a case input of the schema (it still goes through parseCase before use)
type Assert<T extends true> = T;
export type IntakeCaseIsCaseInput = Assert<IntakeCase extends CaseInput ? true : false>;

/** A reading the intake is not sure of: shown to the clinician, never filled into the case. */
export interface Question {
  /** the case field (or 'sample', 'units.pressure', 'gas') the question is about */
  path: string;
  reason: string;
  options?: string[];
  /** the option the other values point to (for example by the Henderson equation); still only a suggestion */
  suggested?: string;
  value?: number;
  sourceText?: string;
}

/** The three values of which the schema needs at least two. */
export const REQUIRED_GAS: readonly CasePath[] = ['gas.ph', 'gas.pco2', 'gas.hco3'];

type ValueGroup = 'gas' | 'chemistry' | 'oxygen' | 'context';

export function setCaseValue(c: IntakeCase, path: CasePath, value: number): void {
  const [group, key] = path.split('.') as [ValueGroup, string];
  const groups = c as unknown as Record<ValueGroup, Record<string, number> | undefined>;
  groups[group] ??= {};
  groups[group][key] = value;
}

export function getCaseValue(c: IntakeCase, path: CasePath): number | undefined {
  const [group, key] = path.split('.') as [ValueGroup, string];
  return (c as unknown as Record<ValueGroup, Record<string, number> | undefined>)[group]?.[key];
}

export const missingGas = (c: IntakeCase, pending: ReadonlySet<string> = new Set()): CasePath[] =>
  REQUIRED_GAS.filter((p) => getCaseValue(c, p) === undefined && !pending.has(p));

// ---------- units as FHIR sends them (UCUM, case-sensitive codes) ----------

/** How an Observation's value must be given; each kind lists the UCUM codes it accepts. */
export type QuantityKind =
  | 'ph'
  | 'pressure'
  | 'mmol'
  | 'percent'
  | 'fio2'
  | 'hb'
  | 'albumin'
  | 'glucoseMass'
  | 'glucoseMolar'
  | 'bun'
  | 'ureaMolar'
  | 'creatinineMass'
  | 'creatinineMolar'
  | 'osmolality'
  | 'celsius';

export interface UcumUnit {
  /** the unit as the clinician reads it */
  label: string;
  /** the case's units setting this unit implies */
  units?: { [K in keyof Units]: [K, Units[K]] }[keyof Units];
  /** multiply to get the case's unit (a fraction 0.95 becomes 95 %) */
  scale?: number;
}

// UCUM codes (unitsofmeasure.org, case-sensitive form); each one is checked against a UCUM library in the tests.
export const UCUM: Record<QuantityKind, Record<string, UcumUnit>> = {
  ph: { '[pH]': { label: '' }, '1': { label: '' } },
  pressure: {
    'mm[Hg]': { label: 'mmHg', units: ['pressure', 'mmHg'] },
    kPa: { label: 'kPa', units: ['pressure', 'kPa'] },
  },
  // mmol/L; meq/L is the same number for the monovalent ions read here (Na, K, Cl, HCO3, lactate, base excess)
  mmol: {
    'mmol/L': { label: 'mmol/L' },
    'mmol/l': { label: 'mmol/L' },
    'meq/L': { label: 'mmol/L' },
    'meq/l': { label: 'mmol/L' },
  },
  percent: { '%': { label: '%' }, '1': { label: '%', scale: 100 } },
  fio2: { '%': { label: '%' }, '1': { label: 'fraction' } },
  hb: {
    'g/dL': { label: 'g/dL', units: ['hb', 'g/dL'] },
    'g/dl': { label: 'g/dL', units: ['hb', 'g/dL'] },
    'g/L': { label: 'g/L', units: ['hb', 'g/L'] },
    'g/l': { label: 'g/L', units: ['hb', 'g/L'] },
  },
  albumin: {
    'g/dL': { label: 'g/dL', units: ['albumin', 'g/dL'] },
    'g/dl': { label: 'g/dL', units: ['albumin', 'g/dL'] },
    'g/L': { label: 'g/L', units: ['albumin', 'g/L'] },
    'g/l': { label: 'g/L', units: ['albumin', 'g/L'] },
  },
  glucoseMass: {
    'mg/dL': { label: 'mg/dL', units: ['glucose', 'mg/dL'] },
    'mg/dl': { label: 'mg/dL', units: ['glucose', 'mg/dL'] },
  },
  glucoseMolar: {
    'mmol/L': { label: 'mmol/L', units: ['glucose', 'mmol/L'] },
    'mmol/l': { label: 'mmol/L', units: ['glucose', 'mmol/L'] },
  },
  bun: {
    'mg/dL': { label: 'mg/dL (BUN)', units: ['urea', 'bun-mg/dL'] },
    'mg/dl': { label: 'mg/dL (BUN)', units: ['urea', 'bun-mg/dL'] },
  },
  ureaMolar: {
    'mmol/L': { label: 'mmol/L (urea)', units: ['urea', 'urea-mmol/L'] },
    'mmol/l': { label: 'mmol/L (urea)', units: ['urea', 'urea-mmol/L'] },
  },
  creatinineMass: {
    'mg/dL': { label: 'mg/dL', units: ['creatinine', 'mg/dL'] },
    'mg/dl': { label: 'mg/dL', units: ['creatinine', 'mg/dL'] },
  },
  creatinineMolar: {
    'umol/L': { label: 'µmol/L', units: ['creatinine', 'umol/L'] },
    'umol/l': { label: 'µmol/L', units: ['creatinine', 'umol/L'] },
  },
  osmolality: { 'mosm/kg': { label: 'mOsm/kg' }, 'mosm/kg{H2O}': { label: 'mOsm/kg' } },
  celsius: { Cel: { label: '°C' } },
};

/** Kinds whose value means nothing without a unit (pH is the one that may come without). */
export const UNIT_OPTIONAL: ReadonlySet<QuantityKind> = new Set(['ph']);

// ---------- the codes ----------

export type Specimen = Sample | 'blood' | 'serum' | 'none';

export interface LoincEntry {
  code: string;
  path: CasePath;
  kind: QuantityKind;
  specimen: Specimen;
  /** LOINC long common name */
  name: string;
}

const e = (
  code: string,
  path: CasePath,
  kind: QuantityKind,
  specimen: Specimen,
  name: string,
): LoincEntry => ({ code, path, kind, specimen, name });

export const LOINC_CODES: readonly LoincEntry[] = [
  e('2744-1', 'gas.ph', 'ph', 'arterial', 'pH of Arterial blood'), // checked: DICOM CID 3528, GECCO pH profile, VSAC 2.16.840.1.113762.1.4.1248.96
  e('2746-6', 'gas.ph', 'ph', 'venous', 'pH of Venous blood'), // checked: DICOM CID 3528
  e('2745-8', 'gas.ph', 'ph', 'capillary', 'pH of Capillary blood'), // checked: GECCO pH profile
  e('11558-4', 'gas.ph', 'ph', 'blood', 'pH of Blood'), // checked: DICOM CID 3528, GECCO pH profile
  e(
    '2019-8',
    'gas.pco2',
    'pressure',
    'arterial',
    'Carbon dioxide [Partial pressure] in Arterial blood',
  ), // checked: DICOM CID 3524, GECCO PaCO2 profile, VSAC ...1248.95
  e(
    '2021-4',
    'gas.pco2',
    'pressure',
    'venous',
    'Carbon dioxide [Partial pressure] in Venous blood',
  ), // checked: DICOM CID 3524
  e(
    '2020-6',
    'gas.pco2',
    'pressure',
    'capillary',
    'Carbon dioxide [Partial pressure] in Capillary blood',
  ), // checked: GECCO PaCO2 profile
  e('11557-6', 'gas.pco2', 'pressure', 'blood', 'Carbon dioxide [Partial pressure] in Blood'), // checked: DICOM CID 3524, GECCO PaCO2 profile
  e('2703-7', 'gas.po2', 'pressure', 'arterial', 'Oxygen [Partial pressure] in Arterial blood'), // checked: DICOM CID 3524, GECCO PaO2 profile, VSAC ...1248.94
  e('2705-2', 'gas.po2', 'pressure', 'venous', 'Oxygen [Partial pressure] in Venous blood'), // checked: DICOM CID 3524
  e('2704-5', 'gas.po2', 'pressure', 'capillary', 'Oxygen [Partial pressure] in Capillary blood'), // checked: GECCO PaO2 profile
  e('11556-8', 'gas.po2', 'pressure', 'blood', 'Oxygen [Partial pressure] in Blood'), // checked: DICOM CID 3524, GECCO PaO2 profile
  e('1960-4', 'gas.hco3', 'mmol', 'arterial', 'Bicarbonate [Moles/volume] in Arterial blood'), // checked: VSAC Bicarbonate Lab Test 2.16.840.1.113762.1.4.1045.139
  e('14627-4', 'gas.hco3', 'mmol', 'venous', 'Bicarbonate [Moles/volume] in Venous blood'), // checked: VSAC 2.16.840.1.113762.1.4.1045.139
  e('1959-6', 'gas.hco3', 'mmol', 'blood', 'Bicarbonate [Moles/volume] in Blood'), // checked: VSAC 2.16.840.1.113762.1.4.1045.139, HL7 ObservationDefinition example
  e('1925-7', 'gas.baseExcess', 'mmol', 'arterial', 'Base excess in Arterial blood by calculation'), // checked: DICOM CID 3527 (long name from memory)
  e('1927-3', 'gas.baseExcess', 'mmol', 'venous', 'Base excess in Venous blood by calculation'), // checked: DICOM CID 3527 (long name from memory)
  e('11555-0', 'gas.baseExcess', 'mmol', 'blood', 'Base excess in Blood by calculation'), // checked: DICOM CID 3527 (long name from memory)
  e('2708-6', 'gas.sao2', 'percent', 'arterial', 'Oxygen saturation in Arterial blood'), // checked: DICOM CID 3526, GECCO oxygen saturation profile
  e('2711-0', 'gas.sao2', 'percent', 'venous', 'Oxygen saturation in Venous blood'), // checked: DICOM CID 3526
  e('2709-4', 'gas.sao2', 'percent', 'capillary', 'Oxygen saturation in Capillary blood'), // checked: DICOM CID 3526
  e('20564-1', 'gas.sao2', 'percent', 'blood', 'Oxygen saturation in Blood'), // checked: DICOM CID 3526
  e(
    '59408-5',
    'oxygen.spo2',
    'percent',
    'none',
    'Oxygen saturation in Arterial blood by Pulse oximetry',
  ), // from memory (FHIR pulse oximetry profile code)
  e('2518-9', 'gas.lactate', 'mmol', 'arterial', 'Lactate [Moles/volume] in Arterial blood'), // checked: GECCO laboratory code list
  e('2519-7', 'gas.lactate', 'mmol', 'venous', 'Lactate [Moles/volume] in Venous blood'), // checked: GECCO laboratory code list
  e('19239-3', 'gas.lactate', 'mmol', 'capillary', 'Lactate [Moles/volume] in Capillary blood'), // checked: GECCO laboratory code list
  e('32693-4', 'gas.lactate', 'mmol', 'blood', 'Lactate [Moles/volume] in Blood'), // checked: GECCO laboratory code list
  e('2524-7', 'gas.lactate', 'mmol', 'serum', 'Lactate [Moles/volume] in Serum or Plasma'), // checked: GECCO laboratory code list
  e('718-7', 'gas.hb', 'hb', 'blood', 'Hemoglobin [Mass/volume] in Blood'), // checked: VSAC Hemoglobin lab test 2.16.840.1.113762.1.4.1248.219, HL7 ObservationDefinition example
  e('30313-1', 'gas.hb', 'hb', 'arterial', 'Hemoglobin [Mass/volume] in Arterial blood'), // checked: VSAC 2.16.840.1.113762.1.4.1248.219
  e('30350-3', 'gas.hb', 'hb', 'venous', 'Hemoglobin [Mass/volume] in Venous blood'), // checked: VSAC 2.16.840.1.113762.1.4.1248.219
  e('30352-9', 'gas.hb', 'hb', 'capillary', 'Hemoglobin [Mass/volume] in Capillary blood'), // checked: VSAC 2.16.840.1.113762.1.4.1248.219
  e('20509-6', 'gas.hb', 'hb', 'blood', 'Hemoglobin [Mass/volume] in Blood by calculation'), // checked: VSAC 2.16.840.1.113762.1.4.1248.219
  e('2951-2', 'chemistry.na', 'mmol', 'serum', 'Sodium [Moles/volume] in Serum or Plasma'), // checked: VSAC Sodium Lab Test 2.16.840.1.113762.1.4.1045.119
  e('2947-0', 'chemistry.na', 'mmol', 'blood', 'Sodium [Moles/volume] in Blood'), // checked: VSAC 2.16.840.1.113762.1.4.1045.119
  e('32717-1', 'chemistry.na', 'mmol', 'arterial', 'Sodium [Moles/volume] in Arterial blood'), // checked: VSAC 2.16.840.1.113762.1.4.1045.119
  e('39791-9', 'chemistry.na', 'mmol', 'venous', 'Sodium [Moles/volume] in Venous blood'), // checked: VSAC 2.16.840.1.113762.1.4.1045.119
  e('2823-3', 'chemistry.k', 'mmol', 'serum', 'Potassium [Moles/volume] in Serum or Plasma'), // checked: HL7 ObservationDefinition example
  e('6298-4', 'chemistry.k', 'mmol', 'blood', 'Potassium [Moles/volume] in Blood'), // from memory
  e('2075-0', 'chemistry.cl', 'mmol', 'serum', 'Chloride [Moles/volume] in Serum or Plasma'), // checked: HL7 ObservationDefinition example
  e('2069-3', 'chemistry.cl', 'mmol', 'blood', 'Chloride [Moles/volume] in Blood'), // from memory
  e('1751-7', 'chemistry.albumin', 'albumin', 'serum', 'Albumin [Mass/volume] in Serum or Plasma'), // checked: HL7 ObservationDefinition example
  e(
    '2345-7',
    'chemistry.glucose',
    'glucoseMass',
    'serum',
    'Glucose [Mass/volume] in Serum or Plasma',
  ), // checked: HL7 ObservationDefinition example, VSAC 2.16.840.1.113762.1.4.1160.5
  e('2339-0', 'chemistry.glucose', 'glucoseMass', 'blood', 'Glucose [Mass/volume] in Blood'), // from memory
  e(
    '14749-6',
    'chemistry.glucose',
    'glucoseMolar',
    'serum',
    'Glucose [Moles/volume] in Serum or Plasma',
  ), // from memory
  e('15074-8', 'chemistry.glucose', 'glucoseMolar', 'blood', 'Glucose [Moles/volume] in Blood'), // from memory
  e('3094-0', 'chemistry.urea', 'bun', 'serum', 'Urea nitrogen [Mass/volume] in Serum or Plasma'), // checked: VSAC BUN lab test 2.16.840.1.113762.1.4.1248.218
  e('6299-2', 'chemistry.urea', 'bun', 'blood', 'Urea nitrogen [Mass/volume] in Blood'), // checked: VSAC 2.16.840.1.113762.1.4.1248.218
  e('22664-7', 'chemistry.urea', 'ureaMolar', 'serum', 'Urea [Moles/volume] in Serum or Plasma'), // from memory (agrees with several published code lists)
  e(
    '2160-0',
    'chemistry.creatinine',
    'creatinineMass',
    'serum',
    'Creatinine [Mass/volume] in Serum or Plasma',
  ), // checked: VSAC Creatinine Lab Test 2.16.840.1.113883.3.666.5.2363
  e(
    '38483-4',
    'chemistry.creatinine',
    'creatinineMass',
    'blood',
    'Creatinine [Mass/volume] in Blood',
  ), // checked: VSAC 2.16.840.1.113883.3.666.5.2363
  e(
    '14682-9',
    'chemistry.creatinine',
    'creatinineMolar',
    'serum',
    'Creatinine [Moles/volume] in Serum or Plasma',
  ), // checked: VSAC 2.16.840.1.113883.3.666.5.2363
  e(
    '59826-8',
    'chemistry.creatinine',
    'creatinineMolar',
    'blood',
    'Creatinine [Moles/volume] in Blood',
  ), // checked: VSAC 2.16.840.1.113883.3.666.5.2363
  e('2692-2', 'chemistry.osmolality', 'osmolality', 'serum', 'Osmolality of Serum or Plasma'), // from memory (agrees with several published code lists)
  e('3150-0', 'oxygen.fio2', 'fio2', 'none', 'Inhaled oxygen concentration'), // checked: GECCO FiO2 profile
  e('8310-5', 'context.temperatureC', 'celsius', 'none', 'Body temperature'), // from memory (FHIR vital signs profile code)
];

/** Codes a gas bundle often carries that are deliberately not read, with the reason shown to the clinician. */
export const LOINC_NOT_READ: Readonly<Record<string, { name: string; reason: string }>> = {
  '33254-4': {
    name: "pH of Arterial blood adjusted to patient's actual temperature",
    reason: 'temperature-corrected value; the 37 °C value is the one read',
  }, // checked: VSAC ...1248.96
  '32771-8': {
    name: "Carbon dioxide [Partial pressure] adjusted to patient's actual temperature in Arterial blood",
    reason: 'temperature-corrected value; the 37 °C value is the one read',
  }, // checked: VSAC ...1248.95
  '19255-9': {
    name: "Oxygen [Partial pressure] adjusted to patient's actual temperature in Arterial blood",
    reason: 'temperature-corrected value; the 37 °C value is the one read',
  }, // checked: VSAC ...1248.94
  '19230-2': {
    name: 'Bicarbonate [Moles/volume] standard in Arterial blood',
    reason: 'standard bicarbonate is not the actual HCO3',
  }, // checked: VSAC 2.16.840.1.113762.1.4.1045.139
  '19232-8': {
    name: 'Bicarbonate [Moles/volume] standard in Venous blood',
    reason: 'standard bicarbonate is not the actual HCO3',
  }, // checked: VSAC 2.16.840.1.113762.1.4.1045.139
  '1963-8': {
    name: 'Bicarbonate [Moles/volume] in Serum or Plasma',
    reason:
      'serum bicarbonate is a chemistry value, not the blood-gas HCO3; enter it by hand to use it',
  }, // checked: VSAC 2.16.840.1.113762.1.4.1045.139
  '2028-9': {
    name: 'Carbon dioxide, total [Moles/volume] in Serum or Plasma',
    reason: 'total CO2 is not the blood-gas HCO3 (it runs about 1-2 mmol/L higher)',
  }, // checked: VSAC 2.16.840.1.113762.1.4.1045.139
  '59260-0': {
    name: 'Hemoglobin [Moles/volume] in Blood',
    reason: 'Hb in mmol/L is not a unit the case takes; enter Hb in g/dL or g/L',
  }, // checked: VSAC 2.16.840.1.113762.1.4.1248.219
  '14937-7': {
    name: 'Urea nitrogen [Moles/volume] in Serum or Plasma',
    reason: 'urea nitrogen in moles is read differently from lab to lab; enter urea by hand',
  }, // checked: VSAC 2.16.840.1.113762.1.4.1248.218
  '24336-0': {
    name: 'Gas panel - Arterial blood',
    reason: 'a panel: its member results are read one by one',
  }, // from memory (seen as the arterial blood gas panel code in an HL7 example)
};

export const LOINC_SYSTEM = 'http://loinc.org';
export const UCUM_SYSTEM = 'http://unitsofmeasure.org';

const BY_CODE = new Map(LOINC_CODES.map((entry) => [entry.code, entry]));
export const loincEntry = (code: string): LoincEntry | undefined => BY_CODE.get(code);
