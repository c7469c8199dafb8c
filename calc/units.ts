// Unit conversions, done once at the edge. Inside the core: mmHg, mmol/L, g/dL (albumin, Hb),
// nmol/L ([H+]), mL, kg, and FiO2 as a fraction.

export type PressureUnit = 'mmHg' | 'kPa';
export type AlbuminUnit = 'g/dL' | 'g/L';
export type HbUnit = 'g/dL' | 'g/L';
export type GlucoseUnit = 'mg/dL' | 'mmol/L';
export type UreaUnit = 'bun-mg/dL' | 'urea-mmol/L';
export type CreatinineUnit = 'mg/dL' | 'umol/L';
export type EthanolUnit = 'mg/dL' | 'mmol/L';

export interface Units {
  pressure: PressureUnit;
  albumin: AlbuminUnit;
  hb: HbUnit;
  glucose: GlucoseUnit;
  urea: UreaUnit;
  creatinine: CreatinineUnit;
  ethanol: EthanolUnit;
}

export const DEFAULT_UNITS: Units = {
  pressure: 'mmHg',
  albumin: 'g/dL',
  hb: 'g/dL',
  glucose: 'mg/dL',
  urea: 'bun-mg/dL',
  creatinine: 'mg/dL',
  ethanol: 'mg/dL',
};

// SI: 1 mmHg = 101325 / 760 = 133.3224 Pa (133.322 rounded), so 1 kPa = 760 / 101.325 = 7.50062 mmHg.
export const MMHG_PER_KPA = 7.50062;
// Glucose molar mass 180.16 g/mol: mmol/L = mg/dL x 10 / 180.16 = mg/dL / 18.016.
export const GLUCOSE_MG_DL_PER_MMOL_L = 18.016;
// Urea carries two nitrogens, 2 x 14.007 = 28.01 g/mol: BUN mg/dL = urea mmol/L x 2.801.
export const BUN_MG_DL_PER_UREA_MMOL_L = 2.801;
// Creatinine molar mass 113.12 g/mol: umol/L = mg/dL x 88.4.
export const CREATININE_UMOL_L_PER_MG_DL = 88.4;
// Ethanol molar mass 46.07 g/mol: mg/dL = mmol/L x 4.607.
export const ETHANOL_MG_DL_PER_MMOL_L = 4.607;

export const kpaToMmHg = (kpa: number): number => kpa * MMHG_PER_KPA;
export const mmHgToKpa = (mmHg: number): number => mmHg / MMHG_PER_KPA;
export const glucoseMgDlToMmolL = (mgDl: number): number => mgDl / GLUCOSE_MG_DL_PER_MMOL_L;
export const glucoseMmolLToMgDl = (mmolL: number): number => mmolL * GLUCOSE_MG_DL_PER_MMOL_L;
export const bunMgDlToUreaMmolL = (mgDl: number): number => mgDl / BUN_MG_DL_PER_UREA_MMOL_L;
export const ureaMmolLToBunMgDl = (mmolL: number): number => mmolL * BUN_MG_DL_PER_UREA_MMOL_L;
export const creatinineMgDlToUmolL = (mgDl: number): number => mgDl * CREATININE_UMOL_L_PER_MG_DL;
export const creatinineUmolLToMgDl = (umolL: number): number => umolL / CREATININE_UMOL_L_PER_MG_DL;
export const ethanolMgDlToMmolL = (mgDl: number): number => mgDl / ETHANOL_MG_DL_PER_MMOL_L;
export const ethanolMmolLToMgDl = (mmolL: number): number => mmolL * ETHANOL_MG_DL_PER_MMOL_L;
// Albumin and haemoglobin: g/L = 10 x g/dL.
export const gPerLToGPerDl = (gL: number): number => gL / 10;
export const gPerDlToGPerL = (gDl: number): number => gDl * 10;

/** FiO2 as entered: a fraction 0.21-1.00, or a percent 21-100 (any value above 1 is a percent). */
export function fio2Fraction(entered: number): number {
  return entered > 1 ? entered / 100 : entered;
}

/** A canonical value expressed in the unit the clinician uses, for display and messages. */
export type Quantity =
  | 'pressure'
  | 'albumin'
  | 'hb'
  | 'glucose'
  | 'urea'
  | 'creatinine'
  | 'ethanol';

export function toCanonical(kind: Quantity, value: number, units: Units): number {
  switch (kind) {
    case 'pressure':
      return units.pressure === 'kPa' ? kpaToMmHg(value) : value;
    case 'albumin':
      return units.albumin === 'g/L' ? gPerLToGPerDl(value) : value;
    case 'hb':
      return units.hb === 'g/L' ? gPerLToGPerDl(value) : value;
    case 'glucose':
      return units.glucose === 'mg/dL' ? glucoseMgDlToMmolL(value) : value;
    case 'urea':
      return units.urea === 'bun-mg/dL' ? bunMgDlToUreaMmolL(value) : value;
    case 'creatinine':
      return units.creatinine === 'mg/dL' ? creatinineMgDlToUmolL(value) : value;
    case 'ethanol':
      return units.ethanol === 'mg/dL' ? ethanolMgDlToMmolL(value) : value;
  }
}

export function fromCanonical(kind: Quantity, value: number, units: Units): number {
  switch (kind) {
    case 'pressure':
      return units.pressure === 'kPa' ? mmHgToKpa(value) : value;
    case 'albumin':
      return units.albumin === 'g/L' ? gPerDlToGPerL(value) : value;
    case 'hb':
      return units.hb === 'g/L' ? gPerDlToGPerL(value) : value;
    case 'glucose':
      return units.glucose === 'mg/dL' ? glucoseMmolLToMgDl(value) : value;
    case 'urea':
      return units.urea === 'bun-mg/dL' ? ureaMmolLToBunMgDl(value) : value;
    case 'creatinine':
      return units.creatinine === 'mg/dL' ? creatinineUmolLToMgDl(value) : value;
    case 'ethanol':
      return units.ethanol === 'mg/dL' ? ethanolMmolLToMgDl(value) : value;
  }
}

/** The label of the unit a clinician sees for a quantity. */
export function unitLabel(kind: Quantity, units: Units): string {
  switch (kind) {
    case 'pressure':
      return units.pressure;
    case 'albumin':
      return units.albumin;
    case 'hb':
      return units.hb;
    case 'glucose':
      return units.glucose;
    case 'urea':
      return units.urea === 'bun-mg/dL' ? 'mg/dL' : 'mmol/L';
    case 'creatinine':
      return units.creatinine === 'umol/L' ? 'µmol/L' : 'mg/dL';
    case 'ethanol':
      return units.ethanol;
  }
}
