// The table of case fields: every number a case can carry is described here once. The schema (ranges, messages),
// the conversion to canonical units, number formatting in the note, the page's steps, the paste reader and the
// FHIR reader all read it. A new optional value is one row here plus its wording.
//
// Ranges are plausibility limits in canonical units (clinical-scope section 3, or "common practice" where marked:
// our own limits). LOINC codes carry their long common name; "checked" names the published list each was compared
// against (DICOM PS3.16 CID 3524/3526/3527/3528; VSAC value sets by OID; the GECCO FHIR profiles; HL7 examples;
// the HL7 PDDI CDS calcium value set); "from memory" where no list was at hand. Specimen is LOINC's System axis
// (blood = not stated).
import type { Quantity } from './units.ts';

export type Specimen = 'arterial' | 'venous' | 'capillary' | 'blood' | 'serum' | 'none';

export interface Loinc {
  code: string;
  specimen: Specimen;
  /** LOINC long common name */
  name: string;
  /** for a kind with a unit choice: the unit the code's property implies (mass or moles) */
  unit?: string;
}

/** How a printout labels the value: a regular-expression source, matched as a whole word. */
export interface Printed {
  pattern: string;
  /** match regardless of case (default: case as written, since "NA" is "not available" on many printouts) */
  anyCase?: boolean;
  /** a reader's finer distinction: actual, standard or plain base excess, SO2 or O2Hb, BUN */
  variant?: 'actual' | 'plain' | 'standard' | 'so2' | 'o2hb' | 'bun';
}

export interface FieldSpec {
  path: string;
  /** the label as clinicians write it (messages, the note) */
  label: string;
  /** how the page asks for it, where that differs from the label */
  ask?: string;
  /** the canonical unit ('' for pH and ratios) */
  unit: string;
  /** a kind with a unit choice (the case's `units` group): the value is entered in the chosen unit */
  quantity?: Quantity;
  /** plausibility limits, canonical */
  range: readonly [number, number];
  /** decimals shown, for a value without a unit choice */
  decimals: number;
  /** a univalent (1) or divalent (2) ion: mEq/L = charge x mmol/L; no charge means mEq/L is not accepted */
  charge?: 1 | 2;
  /** a saturation in percent: a UCUM '1' (fraction) value is x 100 */
  percent?: boolean;
  /** UCUM codes of the canonical unit, for values without a unit choice */
  ucum?: readonly string[];
  /** the page step that asks it (the page's order follows this table) */
  step?: 'gas' | 'chemistry' | 'timing' | 'oxygen' | 'ventilator' | 'patient';
  /** asked only when the earlier answers call for it, or under "if you have them" */
  optional?: boolean;
  printed?: readonly Printed[];
  loinc?: readonly Loinc[];
  /**
   * Where a number printed without a unit is a believable adult result, by unit (our own limits, common practice):
   * a reader takes the one unit whose window holds the number, and asks when two do or none the case takes.
   */
  typical?: Readonly<Record<string, readonly [number, number]>>;
}

const MMOL = ['mmol/L', 'mmol/l'];
const PERCENT = ['%', '1'];
const L = (code: string, specimen: Specimen, name: string, unit?: string): Loinc =>
  unit ? { code, specimen, name, unit } : { code, specimen, name };
const P = (pattern: string, more: Omit<Printed, 'pattern'> = {}): Printed => ({ pattern, ...more });

// biome-ignore format: a table reads best one field to a block, its codes one to a line
export const FIELDS = [
  // ---------- gas ----------
  {
    path: 'gas.ph', label: 'pH', unit: '', range: [6.5, 8.0], decimals: 2, ucum: ['[pH]', '1'], step: 'gas',
    printed: [P('pH|PH')],
    loinc: [
      L('2744-1', 'arterial', 'pH of Arterial blood'), // checked: DICOM CID 3528, GECCO pH profile, VSAC 2.16.840.1.113762.1.4.1248.96
      L('2746-6', 'venous', 'pH of Venous blood'), // checked: DICOM CID 3528
      L('2745-8', 'capillary', 'pH of Capillary blood'), // checked: GECCO pH profile
      L('11558-4', 'blood', 'pH of Blood'), // checked: DICOM CID 3528, GECCO pH profile
    ],
  },
  {
    path: 'gas.pco2', label: 'PaCO2', unit: 'mmHg', quantity: 'pressure', range: [5, 200], decimals: 0, step: 'gas',
    typical: { mmHg: [10, 150], kPa: [1.3, 20] },
    printed: [
      P('[pP]\\s?[aAvV]?\\s?[cC][oO]2'),
      P('carbon\\s+dioxide,?\\s+partial\\s+pressure|partial\\s+pressure\\s+of\\s+carbon\\s+dioxide', { anyCase: true }),
    ],
    loinc: [
      L('2019-8', 'arterial', 'Carbon dioxide [Partial pressure] in Arterial blood'), // checked: DICOM CID 3524, GECCO PaCO2 profile, VSAC ...1248.95
      L('2021-4', 'venous', 'Carbon dioxide [Partial pressure] in Venous blood'), // checked: DICOM CID 3524
      L('2020-6', 'capillary', 'Carbon dioxide [Partial pressure] in Capillary blood'), // checked: GECCO PaCO2 profile
      L('11557-6', 'blood', 'Carbon dioxide [Partial pressure] in Blood'), // checked: DICOM CID 3524, GECCO PaCO2 profile
    ],
  },
  {
    path: 'gas.po2', label: 'PaO2', unit: 'mmHg', quantity: 'pressure', range: [10, 760], decimals: 0, step: 'gas',
    typical: { mmHg: [15, 700], kPa: [2, 93] },
    printed: [P('[pP]\\s?[aAvV]?\\s?[oO]2')],
    loinc: [
      L('2703-7', 'arterial', 'Oxygen [Partial pressure] in Arterial blood'), // checked: DICOM CID 3524, GECCO PaO2 profile, VSAC ...1248.94
      L('2705-2', 'venous', 'Oxygen [Partial pressure] in Venous blood'), // checked: DICOM CID 3524
      L('2704-5', 'capillary', 'Oxygen [Partial pressure] in Capillary blood'), // checked: GECCO PaO2 profile
      L('11556-8', 'blood', 'Oxygen [Partial pressure] in Blood'), // checked: DICOM CID 3524, GECCO PaO2 profile
    ],
  },
  {
    path: 'gas.hco3', label: 'HCO3', unit: 'mmol/L', range: [1, 70], decimals: 1, charge: 1, ucum: MMOL, step: 'gas',
    printed: [
      P('[caCA]?HCO3-?(?:\\s?\\(\\s*(?:P|B|a|act)\\s*(?:,\\s*c)?\\s*\\))?(?:\\s?act(?:ual)?)?|act(?:ual)?\\.?\\s?HCO3-?|actual\\s+bicarbonate|bicarbonate|bicarb', { anyCase: true }),
    ],
    loinc: [
      L('1960-4', 'arterial', 'Bicarbonate [Moles/volume] in Arterial blood'), // checked: VSAC Bicarbonate Lab Test 2.16.840.1.113762.1.4.1045.139
      L('14627-4', 'venous', 'Bicarbonate [Moles/volume] in Venous blood'), // checked: VSAC 2.16.840.1.113762.1.4.1045.139
      L('1959-6', 'blood', 'Bicarbonate [Moles/volume] in Blood'), // checked: VSAC 2.16.840.1.113762.1.4.1045.139, HL7 ObservationDefinition example
    ],
  },
  {
    // common practice
    path: 'gas.baseExcess', label: 'Base excess', unit: 'mmol/L', range: [-40, 40], decimals: 1, charge: 1, ucum: MMOL,
    step: 'gas', optional: true,
    printed: [
      P('BE\\s?\\(\\s*(?:B|b|act|blood)\\s*\\)|BEb|BE-b|ABE|cBase\\s?\\(\\s*B\\s*\\)', { variant: 'actual' }),
      P('act(?:ual)?\\.?\\s+base\\s+excess|base\\s+excess\\s*\\(\\s*(?:B|blood|act(?:ual)?)\\s*\\)', { anyCase: true, variant: 'actual' }),
      P('BE\\s?\\(\\s*(?:ecf|st|std)\\s*\\)|BE-?ecf|SBE|cBase\\s?\\(\\s*ecf\\s*\\)|standard\\s+base\\s+excess|base\\s+excess\\s*\\(\\s*(?:ecf|std|st)\\s*\\)', { anyCase: true, variant: 'standard' }),
      P('BE|B\\.E\\.', { variant: 'plain' }),
      P('base\\s+excess|cBase', { anyCase: true, variant: 'plain' }),
    ],
    loinc: [
      L('1925-7', 'arterial', 'Base excess in Arterial blood by calculation'), // checked: DICOM CID 3527 (long name from memory)
      L('1927-3', 'venous', 'Base excess in Venous blood by calculation'), // checked: DICOM CID 3527 (long name from memory)
      L('11555-0', 'blood', 'Base excess in Blood by calculation'), // checked: DICOM CID 3527 (long name from memory)
    ],
  },
  {
    // common practice; a percent
    path: 'gas.sao2', label: 'SaO2', unit: '%', range: [30, 100], decimals: 0, percent: true, ucum: PERCENT,
    step: 'gas', optional: true,
    printed: [
      P('[sS]\\s?[aA]?\\s?[oO]2|O2\\s?sat(?:uration)?|sat(?:uration)?\\s?O2|oxygen\\s+saturation', { anyCase: true, variant: 'so2' }),
      P('F?O2\\s?Hb|HbO2|oxyh(?:a)?emoglobin', { anyCase: true, variant: 'o2hb' }),
    ],
    loinc: [
      L('2708-6', 'arterial', 'Oxygen saturation in Arterial blood'), // checked: DICOM CID 3526, GECCO oxygen saturation profile
      L('2711-0', 'venous', 'Oxygen saturation in Venous blood'), // checked: DICOM CID 3526
      L('2709-4', 'capillary', 'Oxygen saturation in Capillary blood'), // checked: DICOM CID 3526
      L('20564-1', 'blood', 'Oxygen saturation in Blood'), // checked: DICOM CID 3526
    ],
  },
  {
    path: 'gas.lactate', label: 'Lactate', unit: 'mmol/L', range: [0, 40], decimals: 1, charge: 1, ucum: MMOL,
    step: 'gas', optional: true,
    printed: [P('c?Lac(?:t(?:ate)?)?|lactic\\s+acid', { anyCase: true })],
    loinc: [
      L('2518-9', 'arterial', 'Lactate [Moles/volume] in Arterial blood'), // checked: GECCO laboratory code list
      L('2519-7', 'venous', 'Lactate [Moles/volume] in Venous blood'), // checked: GECCO laboratory code list
      L('19239-3', 'capillary', 'Lactate [Moles/volume] in Capillary blood'), // checked: GECCO laboratory code list
      L('32693-4', 'blood', 'Lactate [Moles/volume] in Blood'), // checked: GECCO laboratory code list
      L('2524-7', 'serum', 'Lactate [Moles/volume] in Serum or Plasma'), // checked: GECCO laboratory code list
    ],
  },
  {
    // common practice
    path: 'gas.hb', label: 'Hb', unit: 'g/dL', quantity: 'hb', range: [2, 25], decimals: 1, step: 'gas', optional: true,
    typical: { 'g/dL': [3, 25], 'g/L': [30, 250], 'mmol/L': [1.8, 15.5] },
    printed: [P('c?t?Hb|THb|Hgb|HGB|HB'), P('ha?emoglobin(?:\\s+total)?|total\\s+ha?emoglobin', { anyCase: true })],
    loinc: [
      L('718-7', 'blood', 'Hemoglobin [Mass/volume] in Blood'), // checked: VSAC Hemoglobin lab test 2.16.840.1.113762.1.4.1248.219, HL7 ObservationDefinition example
      L('30313-1', 'arterial', 'Hemoglobin [Mass/volume] in Arterial blood'), // checked: VSAC 2.16.840.1.113762.1.4.1248.219
      L('30350-3', 'venous', 'Hemoglobin [Mass/volume] in Venous blood'), // checked: VSAC 2.16.840.1.113762.1.4.1248.219
      L('30352-9', 'capillary', 'Hemoglobin [Mass/volume] in Capillary blood'), // checked: VSAC 2.16.840.1.113762.1.4.1248.219
      L('20509-6', 'blood', 'Hemoglobin [Mass/volume] in Blood by calculation'), // checked: VSAC 2.16.840.1.113762.1.4.1248.219
    ],
  },
  {
    // common practice; a percent of total haemoglobin (CO-oximetry)
    path: 'gas.cohb', label: 'COHb', unit: '%', range: [0, 80], decimals: 1, percent: true, ucum: PERCENT,
    step: 'gas', optional: true,
    printed: [P('F?COHb|HbCO|carboxyh(?:a)?emoglobin', { anyCase: true })],
    loinc: [L('20563-3', 'blood', 'Carboxyhemoglobin/Hemoglobin.total in Blood')], // from memory
  },
  {
    // common practice; a percent of total haemoglobin (CO-oximetry)
    path: 'gas.methb', label: 'MetHb', unit: '%', range: [0, 80], decimals: 1, percent: true, ucum: PERCENT,
    step: 'gas', optional: true,
    printed: [P('F?MetHb|methaemoglobin|methemoglobin', { anyCase: true })],
    // no LOINC code: none at hand that could be checked (a code from memory failed the check digit)
  },
  // ---------- chemistry ----------
  {
    path: 'chemistry.na', label: 'Na', unit: 'mmol/L', range: [90, 200], decimals: 0, charge: 1, ucum: MMOL, step: 'chemistry',
    // capitals only with a sign or an equals sign after them: a bare NA is "not available"
    printed: [P('c?Na\\+?|NA\\+|NA(?=\\s*[=:])'), P('sodium', { anyCase: true })],
    loinc: [
      L('2951-2', 'serum', 'Sodium [Moles/volume] in Serum or Plasma'), // checked: VSAC Sodium Lab Test 2.16.840.1.113762.1.4.1045.119
      L('2947-0', 'blood', 'Sodium [Moles/volume] in Blood'), // checked: VSAC 2.16.840.1.113762.1.4.1045.119
      L('32717-1', 'arterial', 'Sodium [Moles/volume] in Arterial blood'), // checked: VSAC 2.16.840.1.113762.1.4.1045.119
      L('39791-9', 'venous', 'Sodium [Moles/volume] in Venous blood'), // checked: VSAC 2.16.840.1.113762.1.4.1045.119
    ],
  },
  {
    path: 'chemistry.k', label: 'K', unit: 'mmol/L', range: [1, 10], decimals: 1, charge: 1, ucum: MMOL, step: 'chemistry',
    printed: [P('c?K\\+?'), P('potassium', { anyCase: true })],
    loinc: [
      L('2823-3', 'serum', 'Potassium [Moles/volume] in Serum or Plasma'), // checked: HL7 ObservationDefinition example
      L('6298-4', 'blood', 'Potassium [Moles/volume] in Blood'), // from memory
    ],
  },
  {
    path: 'chemistry.cl', label: 'Cl', unit: 'mmol/L', range: [50, 160], decimals: 0, charge: 1, ucum: MMOL, step: 'chemistry',
    printed: [P('c?Cl-?|CL-|CL(?=\\s*[=:])'), P('chloride', { anyCase: true })],
    loinc: [
      L('2075-0', 'serum', 'Chloride [Moles/volume] in Serum or Plasma'), // checked: HL7 ObservationDefinition example
      L('2069-3', 'blood', 'Chloride [Moles/volume] in Blood'), // from memory
    ],
  },
  {
    path: 'chemistry.albumin', label: 'Albumin', unit: 'g/dL', quantity: 'albumin', range: [0.5, 7], decimals: 1, step: 'chemistry',
    typical: { 'g/dL': [0.8, 6.5], 'g/L': [8, 65] },
    printed: [P('alb(?:umin)?', { anyCase: true })],
    loinc: [L('1751-7', 'serum', 'Albumin [Mass/volume] in Serum or Plasma')], // checked: HL7 ObservationDefinition example
  },
  {
    path: 'chemistry.glucose', label: 'Glucose', unit: 'mmol/L', quantity: 'glucose', range: [0, 120], decimals: 1, step: 'chemistry',
    typical: { 'mmol/L': [0.5, 60], 'mg/dL': [20, 1500] },
    printed: [P('c?Glu(?:c(?:ose)?)?', { anyCase: true })],
    loinc: [
      L('2345-7', 'serum', 'Glucose [Mass/volume] in Serum or Plasma', 'mg/dL'), // checked: HL7 ObservationDefinition example, VSAC 2.16.840.1.113762.1.4.1160.5
      L('2339-0', 'blood', 'Glucose [Mass/volume] in Blood', 'mg/dL'), // from memory
      L('14749-6', 'serum', 'Glucose [Moles/volume] in Serum or Plasma', 'mmol/L'), // from memory
      L('15074-8', 'blood', 'Glucose [Moles/volume] in Blood', 'mmol/L'), // from memory
    ],
  },
  {
    // common practice (BUN 0-280 mg/dL)
    path: 'chemistry.urea', label: 'Urea', ask: 'Urea or BUN', unit: 'mmol/L', quantity: 'urea', range: [0, 100], decimals: 1, step: 'chemistry',
    typical: { 'mmol/L': [0.5, 60], 'mg/dL': [3, 360] },
    printed: [P('BUN|(?:blood\\s+)?urea\\s+nitrogen', { anyCase: true, variant: 'bun' }), P('urea', { anyCase: true })],
    loinc: [
      L('3094-0', 'serum', 'Urea nitrogen [Mass/volume] in Serum or Plasma', 'bun-mg/dL'), // checked: VSAC BUN lab test 2.16.840.1.113762.1.4.1248.218
      L('6299-2', 'blood', 'Urea nitrogen [Mass/volume] in Blood', 'bun-mg/dL'), // checked: VSAC 2.16.840.1.113762.1.4.1248.218
      L('22664-7', 'serum', 'Urea [Moles/volume] in Serum or Plasma', 'urea-mmol/L'), // from memory (agrees with several published code lists)
    ],
  },
  {
    // common practice
    path: 'chemistry.creatinine', label: 'Creatinine', unit: 'µmol/L', quantity: 'creatinine', range: [10, 3000], decimals: 0,
    typical: { 'mg/dL': [0.15, 25], 'umol/L': [15, 2500] },
    step: 'chemistry',
    printed: [P('c?crea(?:t(?:inine)?)?', { anyCase: true }), P('Cr')],
    loinc: [
      L('2160-0', 'serum', 'Creatinine [Mass/volume] in Serum or Plasma', 'mg/dL'), // checked: VSAC Creatinine Lab Test 2.16.840.1.113883.3.666.5.2363
      L('38483-4', 'blood', 'Creatinine [Mass/volume] in Blood', 'mg/dL'), // checked: VSAC 2.16.840.1.113883.3.666.5.2363
      L('14682-9', 'serum', 'Creatinine [Moles/volume] in Serum or Plasma', 'umol/L'), // checked: VSAC 2.16.840.1.113883.3.666.5.2363
      L('59826-8', 'blood', 'Creatinine [Moles/volume] in Blood', 'umol/L'), // checked: VSAC 2.16.840.1.113883.3.666.5.2363
    ],
  },
  {
    // common practice
    path: 'chemistry.osmolality', label: 'Osmolality', ask: 'Measured osmolality', unit: 'mOsm/kg', range: [200, 500], decimals: 0,
    ucum: ['mosm/kg', 'mosm/kg{H2O}'], step: 'chemistry',
    printed: [P('(?:measured\\s+|serum\\s+)?osm(?:o(?:lality)?)?(?:\\s*\\(\\s*meas(?:ured)?\\.?\\s*\\))?', { anyCase: true })],
    loinc: [L('2692-2', 'serum', 'Osmolality of Serum or Plasma')], // from memory (agrees with several published code lists)
  },
  // common practice (about 1000 mg/dL)
  { path: 'chemistry.ethanol', label: 'Ethanol', unit: 'mmol/L', quantity: 'ethanol', range: [0, 220], decimals: 1, step: 'chemistry', optional: true },
  {
    // common practice
    path: 'chemistry.ionisedCalcium', label: 'Ionised calcium', unit: 'mmol/L', range: [0.2, 3], decimals: 2, charge: 2, ucum: MMOL,
    typical: { 'mmol/L': [0.4, 2], 'mg/dL': [2.5, 10] },
    loinc: [
      L('1994-3', 'blood', 'Calcium.ionized [Moles/volume] in Blood'), // checked: HL7 PDDI CDS calcium value set
      L('1995-0', 'serum', 'Calcium.ionized [Moles/volume] in Serum or Plasma'), // checked: HL7 PDDI CDS calcium value set
    ],
    printed: [
      P('c?Ca(?:2\\+|\\+\\+)|iCa|ioni[sz]ed\\s+ca(?:lcium)?|ca(?:lcium)?,?\\s+ioni[sz]ed|ca(?:lcium)?\\s*\\(\\s*ioni[sz]ed\\s*\\)', { anyCase: true }),
    ],
  },
  {
    // common practice
    path: 'chemistry.magnesium', label: 'Magnesium', unit: 'mmol/L', range: [0.1, 5], decimals: 2, charge: 2, ucum: MMOL,
    typical: { 'mmol/L': [0.2, 2.5], 'mg/dL': [0.5, 6] },
    // "Mg" as written, never before a slash (mg/dL is a unit)
    printed: [P('c?Mg(?:2\\+|\\+\\+)?(?!\\s*\\/)'), P('magnesium', { anyCase: true })],
    loinc: [L('2601-3', 'serum', 'Magnesium [Moles/volume] in Serum or Plasma')], // checked: HL7 PDDI CDS magnesium value set
  },
  {
    // common practice; phosphate is a mix of valences, so mEq/L is not taken
    path: 'chemistry.phosphate', label: 'Phosphate', unit: 'mmol/L', range: [0.1, 6], decimals: 2, ucum: MMOL,
    typical: { 'mmol/L': [0.2, 4], 'mg/dL': [0.6, 12] },
    printed: [P('PO4|phos(?:phate)?|phosphorus|inorganic\\s+phosph(?:ate|orus)', { anyCase: true })],
    // checked: a published national LOINC code list and a laboratory-to-LOINC mapping (no HL7 value set found)
    loinc: [L('14879-1', 'serum', 'Phosphate [Moles/volume] in Serum or Plasma')],
  },
  // ---------- urine (common practice) ----------
  { path: 'urine.na', label: 'Urine Na', unit: 'mmol/L', range: [0, 300], decimals: 0, charge: 1, ucum: MMOL },
  { path: 'urine.k', label: 'Urine K', unit: 'mmol/L', range: [0, 250], decimals: 0, charge: 1, ucum: MMOL },
  { path: 'urine.cl', label: 'Urine Cl', unit: 'mmol/L', range: [0, 350], decimals: 0, charge: 1, ucum: MMOL },
  // ---------- context ----------
  {
    path: 'context.baseline.pco2', label: 'Usual PaCO2', unit: 'mmHg', quantity: 'pressure', range: [5, 200], decimals: 0,
    step: 'timing', optional: true,
  },
  { path: 'context.baseline.hco3', label: 'Usual HCO3', unit: 'mmol/L', range: [1, 70], decimals: 1, step: 'timing', optional: true },
  { path: 'context.baseline.ph', label: 'Usual pH', unit: '', range: [6.5, 8.0], decimals: 2, step: 'timing', optional: true },
  // common practice
  {
    path: 'context.barometricPressure', label: 'Barometric pressure', unit: 'mmHg', quantity: 'pressure', range: [400, 800], decimals: 0,
    step: 'oxygen', optional: true,
  },
  { path: 'context.altitudeM', label: 'Altitude', ask: 'Altitude above sea level', unit: 'm', range: [-500, 6000], decimals: 0, step: 'oxygen', optional: true },
  {
    // common practice
    path: 'context.temperatureC', label: 'Temperature', ask: 'Patient temperature', unit: '°C', range: [25, 43], decimals: 1, ucum: ['Cel'],
    step: 'gas', optional: true,
    loinc: [L('8310-5', 'none', 'Body temperature')], // from memory (FHIR vital signs profile code)
  },
  // ---------- oxygen ----------
  {
    // a fraction 0.21-1.00, or a percent 21-100 (clinical-scope section 1)
    path: 'oxygen.fio2', label: 'FiO2', unit: '', range: [0.21, 1], decimals: 2, ucum: ['%', '1'], step: 'oxygen',
    printed: [P('F\\s?[iI]\\s?O2|FO2\\s?\\(\\s*I\\s*\\)')],
    loinc: [
      L('3150-0', 'none', 'Inhaled oxygen concentration'), // checked: GECCO FiO2 profile
      L('19994-3', 'none', 'Oxygen/Total gas setting [Volume Fraction] Ventilator'), // checked: HL7 SANER ventilator observations value set
    ],
  },
  {
    path: 'oxygen.peep', label: 'PEEP', ask: 'PEEP or CPAP', unit: 'cmH2O', range: [0, 30], decimals: 0, ucum: ['cm[H2O]'],
    step: 'oxygen',
    loinc: [L('20077-4', 'none', 'Positive end expiratory pressure setting Ventilator')], // checked: HL7 SANER ventilator observations value set
  },
  {
    // common practice; a percent
    path: 'oxygen.spo2', label: 'SpO2', unit: '%', range: [30, 100], decimals: 0, percent: true, ucum: PERCENT,
    step: 'oxygen', optional: true,
    printed: [P('SpO2', { anyCase: true })],
    loinc: [L('59408-5', 'none', 'Oxygen saturation in Arterial blood by Pulse oximetry')], // from memory (FHIR pulse oximetry profile code)
  },
  // ---------- ventilator ----------
  { path: 'ventilator.vt', label: 'VT', unit: 'mL', range: [100, 2000], decimals: 0, step: 'ventilator' },
  { path: 'ventilator.rr', label: 'RR', unit: '/min', range: [1, 80], decimals: 0, step: 'ventilator' },
  // common practice
  { path: 'ventilator.pplat', label: 'Plateau pressure', unit: 'cmH2O', range: [5, 60], decimals: 0, step: 'ventilator' },
  {
    // common practice; same pressure unit as PaCO2 (interface contract)
    path: 'ventilator.etco2', label: 'EtCO2', ask: 'End-tidal CO2', unit: 'mmHg', quantity: 'pressure', range: [5, 150],
    decimals: 0, step: 'ventilator',
    loinc: [L('19889-5', 'none', 'Carbon dioxide/Gas.total.at end expiration in Exhaled gas')], // from memory
  },
  // common practice
  { path: 'ventilator.inspiratoryTime', label: 'Inspiratory time', ask: 'Inspiratory time (Ti)', unit: 's', range: [0.2, 5], decimals: 1, ucum: ['s'], step: 'ventilator' },
  { path: 'ventilator.deadSpaceMl', label: 'Apparatus dead space', unit: 'mL', range: [0, 500], decimals: 0 },
  { path: 'ventilator.deadSpaceFraction', label: 'VD/VT', unit: '', range: [0.1, 0.9], decimals: 2 },
  { path: 'ventilator.targetPh', label: 'Target pH', unit: '', range: [7.0, 7.6], decimals: 2, step: 'ventilator', optional: true },
  {
    path: 'ventilator.targetPco2', label: 'Target PaCO2', unit: 'mmHg', quantity: 'pressure', range: [20, 120], decimals: 0,
    step: 'ventilator', optional: true,
  },
  // ---------- patient ----------
  { path: 'patient.heightCm', label: 'Height', unit: 'cm', range: [100, 250], decimals: 0, step: 'ventilator' },
  { path: 'patient.ageYears', label: 'Age', unit: 'years', range: [0, 120], decimals: 0, step: 'patient' },
  // common practice (weeks of gestation); a number of weeks says the patient is pregnant
  { path: 'patient.pregnancyWeeks', label: 'Weeks of pregnancy', ask: 'Weeks of pregnancy, if pregnant', unit: 'weeks', range: [1, 44], decimals: 0, step: 'patient', optional: true },
  // ---------- settings (a department's or a clinician's) ----------
  { path: 'settings.anionGapNormal', label: 'Anion gap reference', unit: 'mmol/L', range: [0, 30], decimals: 0 },
  { path: 'settings.anionGapHalfWidth', label: 'Anion gap half-width', unit: 'mmol/L', range: [1, 10], decimals: 0 },
] as const satisfies readonly FieldSpec[];

export type FieldPath = (typeof FIELDS)[number]['path'];

/** Every field by its path. */
export const FIELD = Object.fromEntries(FIELDS.map((f) => [f.path, f as FieldSpec])) as Record<
  FieldPath,
  FieldSpec
>;

/** The keys of a group's own numbers: KeysOf<'gas'> is 'ph' | 'pco2' | ...; nested groups are not included. */
export type KeysOf<G extends string> = {
  [P in FieldPath]: P extends `${G}.${infer K}`
    ? K extends `${string}.${string}`
      ? never
      : K
    : never;
}[FieldPath];

/** The fields directly in a group, in table order. */
export const fieldsOf = (group: string): readonly FieldSpec[] => GROUPS.get(group) ?? [];

/** The last part of a field's path: its key in its group. */
export const keyOf = (f: FieldSpec): string => f.path.slice(f.path.lastIndexOf('.') + 1);

// each group's fields, listed once: the table does not change while the program runs
const GROUPS = new Map<string, FieldSpec[]>();
for (const f of FIELDS as readonly FieldSpec[]) {
  const group = f.path.slice(0, f.path.lastIndexOf('.'));
  GROUPS.set(group, [...(GROUPS.get(group) ?? []), f]);
}

/** The fields an earlier gas may carry besides its gas: the settings it was taken on. */
export const PREVIOUS_SETTINGS = [
  'oxygen.fio2',
  'oxygen.peep',
  'ventilator.vt',
  'ventilator.rr',
] as const;

export const MAX_PREVIOUS_GASES = 20;
