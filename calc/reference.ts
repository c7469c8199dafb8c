// Reference values and thresholds: the one place they live. Ranges of plausibility live in schema.ts.
// All in canonical units (mmHg, mmol/L, g/dL). Departments may override the configurable ones.

/** Normal arterial values (common practice). */
export const NORMAL = {
  ph: { low: 7.35, high: 7.45, mid: 7.4 },
  pco2: { low: 35, high: 45, mid: 40 },
  hco3: { low: 22, high: 26, mid: 24 },
  hPlus: 40,
} as const;

/** Pregnancy reference (textbook common practice: physiological chronic respiratory alkalosis). */
export const PREGNANCY = {
  pco2: { low: 28, high: 32, mid: 30 },
  hco3: { low: 18, high: 22, mid: 20 },
} as const;

/** Compensation band half-width, mmol/L or mmHg, unless a rule states its own (Berend 2014). */
export const COMPENSATION_BAND = 2;

/** Henderson consistency tolerance (clinical-scope section 2): flag beyond 3 mmol/L or 10%. */
export const CONSISTENCY = { absolute: 3, relative: 0.1 } as const;

/** Unit mix-up screen: a PaCO2 below this in "mmHg" with a near-normal pH is probably kPa. */
export const UNIT_SCREEN = { pco2MmHgBelow: 15, phLow: 7.3, phHigh: 7.5 } as const;

/** Delta ratio bands (Wrenn 1990). `minHco3Fall`: a fall in HCO3 from its reference smaller than the +/- 2 mmol/L
 * band of the compensation rules cannot be told from noise, so no ratio is worked out from it (our own limit,
 * common practice); the raised gap then stands beside an HCO3 that has not fallen. */
export const DELTA_RATIO = {
  normalGapBelow: 0.4,
  mixedBelow: 0.8,
  highGapUpTo: 2.0,
  minHco3Fall: 2,
} as const;

/** Respiratory compensation for a metabolic alkalosis seldom takes PaCO2 above about 55-60 mmHg (common practice,
 * from memory; clinical-scope section 10). */
export const ALKALOSIS_CEILING = { low: 55, high: 60 } as const;

/** Glucose and potassium around ketoacidosis and the hyperosmolar state. Hyperglycaemia above 11 mmol/L and ketones
 * of 3 mmol/L or more (Joint British Diabetes Societies DKA guideline; from memory); effective osmolality 320 mOsm/kg
 * or more with glucose 30 mmol/L or more, a hyperosmolar state (Kitabchi 2009 gives 600 mg/dL, 33.3 mmol/L; the JBDS
 * hyperosmolar guideline 30 mmol/L, from memory); potassium below 3.5 mmol/L is replaced before insulin (JBDS 3.5,
 * Kitabchi 2009 3.3) and above 5.5 mmol/L is high (JBDS: no potassium in the fluids above 5.5, from memory). */
export const GLUCOSE = {
  high: 11,
  ketones: 3,
  hyperosmolarGlucose: 30,
  hyperosmolarOsmolality: 320,
} as const;
export const POTASSIUM = { beforeInsulinBelow: 3.5, highAbove: 5.5 } as const;

/** Acute asthma: a PaCO2 that is normal (4.6-6.0 kPa, about 35-45 mmHg) or raised is a life-threatening feature
 * (BTS/SIGN British guideline on the management of asthma; from memory). */
export const ASTHMA = { pco2NotLowFrom: 35 } as const;

/** Lactate bands (Surviving Sepsis Campaign 2021). */
export const LACTATE = { raised: 2, high: 4 } as const;

/** Osmolar gap above this is raised (common practice). */
export const OSMOLAR_GAP_RAISED = 10;

/** Urine chloride below this suggests chloride-responsive metabolic alkalosis (common practice). */
export const URINE_CHLORIDE_RESPONSIVE = 20;

/** Oxygenation bands. */
export const OXYGENATION = {
  hypoxaemia: 80, // PaO2 below 80 mmHg: hypoxaemia (common practice)
  respiratoryFailure: 60, // PaO2 below 60 mmHg: respiratory failure (common practice)
  hypercapnia: 45, // PaCO2 above 45 mmHg with PaO2 < 60: type 2 failure (common practice)
  pfMinimumPeep: 5, // Berlin: bands apply with PEEP or CPAP >= 5 cmH2O
  pfMild: 300,
  pfModerate: 200,
  pfSevere: 100,
  sfThreshold: 315, // 2024 global definition: SpO2/FiO2 <= 315 when SpO2 <= 97%
  sfMaxSpo2: 97,
  roomAirFio2: 0.21,
} as const;

/** Standard physiological constants (common practice / textbook). */
export const PHYSIOLOGY = {
  waterVapourMmHg: 47,
  respiratoryQuotient: 0.8,
  seaLevelMmHg: 760,
  typicalVco2: 200, // mL/min
  typicalVo2: 250, // mL/min
  anatomicDeadSpaceMlPerKg: 2.2, // Radford 1955
  acuteBufferPerMmHg: 0.1, // HCO3 mmol/L per mmHg PaCO2, acute (Berend 2014)
  alveolarConstant: 0.863, // West
} as const;

/** Peripheral venous against arterial (Byrne et al. 2014, from memory): pH about 0.03 lower, HCO3 about
 * 1 higher, PCO2 about 4-6 mmHg higher with limits of agreement near +/- 20; venous PCO2 below 45 makes arterial hypercapnia unlikely.
 * Below `minPco2` the fixed offset is not applied (it would leave an implausible arterial value). */
export const VENOUS = {
  ph: 0.03,
  hco3: 1,
  pco2Low: 4,
  pco2High: 6,
  pco2Mid: 5,
  pco2Limits: 20,
  hypercapniaBelow: 45,
  minPco2: 15,
} as const;

/** Serial gases: an observed PaCO2 within the larger of 3 mmHg or 10% of the one predicted by the alveolar
 * ventilation equation counts as "as predicted" (our own tolerance for analyser and sampling variation;
 * common practice). */
export const SERIAL = {
  pco2Absolute: 3,
  pco2Relative: 0.1,
  // a follow-up gas "at target": within 0.02 of a target pH or 2 mmHg of a target PaCO2 (common practice: about the
  // analyser's repeatability and the smallest change a ventilator step aims at; from memory)
  targetPh: 0.02,
  targetPco2: 2,
} as const;

/** Lung-protective ventilation thresholds. */
export const VENTILATION = {
  vtTargetPerKg: 6,
  vtLowPerKg: 4,
  vtHighPerKg: 8, // ARDS Network 2000
  plateauMax: 30, // ARDS Network 2000
  drivingPressureMax: 15, // Amato 2015
  rrMax: 35, // air trapping, auto-PEEP (common practice)
  recheckMinutes: { low: 20, high: 30 }, // common practice
} as const;

/** ARDS Network protocol (ARDS Network 2000): pH goal 7.30-7.45; below 7.30 raise RR up to 35; below 7.15 RR 35
 * and bicarbonate may be considered. */
export const ARDSNET_PH = { goalLow: 7.3, bicarbonateBelow: 7.15 } as const;

/** Sodium bicarbonate in severe metabolic acidaemia with acute kidney injury: pH 7.20 or less (Jaber S et al.,
 * BICAR-ICU, Lancet 2018;392:31). */
export const BICARBONATE_PH_AT_OR_BELOW = 7.2;

/** Severe hypoxaemia: P/F below 150 mmHg on FiO2 0.6 or more with PEEP 5 cmH2O or more: prone positioning for 16 h
 * or more a day (Guerin C et al., PROSEVA, N Engl J Med 2013;368:2159). */
export const SEVERE_HYPOXAEMIA = { pfBelow: 150, fio2AtLeast: 0.6, peepAtLeast: 5 } as const;

/** SpO2 targets, percent (BTS oxygen guideline, O'Driscoll 2017; pregnancy 95% or more from memory, the upper
 * limit of the standard band kept). */
export const OXYGEN_TARGETS = {
  standard: { low: 94, high: 98 },
  hypercapnicRisk: { low: 88, high: 92 },
  pregnancy: { low: 95, high: 98 },
} as const;

/** CO-oximetry thresholds, percent (common practice): COHb above 3 (non-smoker) or 10 (smoker), MetHb above 2; a
 * pulse oximeter reading more than 5 points above the measured SaO2 is a saturation gap (common practice, from
 * memory). */
export const CO_OXIMETRY = {
  cohbNonSmoker: 3,
  cohbSmoker: 10,
  methb: 2,
  saturationGap: 5,
} as const;

/** Settings a department or a clinician may change. */
export interface Settings {
  anionGapNormal: number; // mmol/L, mid of the lab's reference
  anionGapHalfWidth: number; // mmol/L, upper limit = normal + halfWidth
  anionGapIncludesK: boolean;
  critical: {
    phLow: number;
    phHigh: number;
    pco2High: number;
    po2Low: number;
    kLow: number;
    kHigh: number;
    lactateHigh: number;
  };
}

// AG 12 +/- 4 by default; many modern analysers report 3-11 (Kraut and Madias 2007).
export const DEFAULT_SETTINGS: Settings = {
  anionGapNormal: 12,
  anionGapHalfWidth: 4,
  anionGapIncludesK: false,
  critical: {
    phLow: 7.2,
    phHigh: 7.6,
    pco2High: 70,
    po2Low: 60,
    kLow: 2.8,
    kHigh: 6.2,
    lactateHigh: 4,
  },
};

export function mergeSettings(
  partial:
    | (Partial<Omit<Settings, 'critical'>> & { critical?: Partial<Settings['critical']> })
    | undefined
    | null,
): Settings {
  if (!partial) return DEFAULT_SETTINGS;
  return {
    anionGapNormal: partial.anionGapNormal ?? DEFAULT_SETTINGS.anionGapNormal,
    anionGapHalfWidth: partial.anionGapHalfWidth ?? DEFAULT_SETTINGS.anionGapHalfWidth,
    anionGapIncludesK: partial.anionGapIncludesK ?? DEFAULT_SETTINGS.anionGapIncludesK,
    critical: { ...DEFAULT_SETTINGS.critical, ...stripNullish(partial.critical ?? {}) },
  };
}

function stripNullish<T extends object>(o: T): Partial<T> {
  return Object.fromEntries(
    Object.entries(o).filter(([, v]) => v !== null && v !== undefined),
  ) as Partial<T>;
}
