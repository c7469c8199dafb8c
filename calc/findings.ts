// The findings of one reading: the shape interpret() returns (data only), and the helpers its parts share.
import type { FieldError } from './schema.ts';
import type { CanonicalCase, Gas } from './canonical.ts';
import type { Settings } from './reference.ts';
import type { Consistency } from './acidBase.ts';
import type { Band } from './compensation.ts';
import type { Compensation, Disorder, PhStatus } from './classify.ts';
import type { ReferencePoint } from './referencePoint.ts';
import type { DeltaBand } from './anionGap.ts';
import type { DeltaReading } from './deltaReference.ts';
import type { GlucoseReading } from './readGlucose.ts';
import type { LactateBand } from './osmolality.ts';
import type { OxygenationLevel, PfBand } from './oxygenation.ts';
import type { Spo2Target } from './oxygenTargets.ts';
import type { Flag } from './flags.ts';
import type { Explanation } from './explain.ts';
import type { Units } from './units.ts';

export type N = number | null;

/** The numbers a reading derives, each reported rounded with its explanation (explain.ts); null when not computable. */
export const DERIVED_NUMBERS = [
  'hPlus',
  'hco3Henderson',
  'phHendersonHasselbalch',
  'anionGap',
  'anionGapCorrected',
  'deltaRatio',
  'deltaRatioAcute',
  'deltaRatioChronic',
  'standardBaseExcess',
  'sodiumChlorideEffect',
  'albuminEffect',
  'unmeasuredIonEffect',
  'apparentSid',
  'effectiveSid',
  'strongIonGap',
  'usualPco2',
  'usualHco3',
  'correctedSodium',
  'effectiveOsmolality',
  'calculatedOsmolality',
  'osmolarGap',
  'urineAnionGap',
  'barometricPressure',
  'alveolarPo2',
  'aaGradient',
  'aaGradientExpected',
  'pfRatio',
  'pfRatioAdjusted',
  'sfRatio',
  'oxygenContent',
  'predictedBodyWeightKg',
  'vtPerKgPbw',
  'drivingPressure',
  'deadSpaceMl',
  'minuteVentilation',
  'alveolarVentilation',
  'co2Production',
  'ventilatoryRatio',
  'targetPco2',
  'targetPco2Simple',
  'suggestedRr',
  'suggestedVt',
  'suggestedVtPerKgPbw',
  'predictedPco2',
  'compliance',
  'expiratoryTime',
  'suggestedExpiratoryTime',
  'predictedPlateau',
  'predictedDrivingPressure',
  'alveolarDeadSpaceFraction',
  'bestRr',
  'bestVt',
  'bestPco2',
  'bestPh',
  'saturationGap',
] as const;
export type DerivedNumber = (typeof DERIVED_NUMBERS)[number];

export type Derived = Record<Exclude<DerivedNumber, 'hPlus'>, N> & {
  hPlus: number;
  expectedPco2: Band | null;
  expectedHco3: Band | null;
};

const NOTHING_DERIVED = Object.freeze({
  ...Object.fromEntries(DERIVED_NUMBERS.map((key) => [key, null])),
  expectedPco2: null,
  expectedHco3: null,
});

export const emptyDerived = (hPlus: number): Derived => ({ ...NOTHING_DERIVED, hPlus }) as Derived;

/** What the parts of a reading write into: the derived values and how each was reached. */
export interface Book {
  derived: Derived;
  explain: Record<string, Explanation>;
}

export interface Metabolic {
  anionGapIncludesK: boolean;
  anionGapUpperLimit: number;
  anionGapRaised: boolean | null;
  anionGapUsed: 'corrected' | 'uncorrected' | null;
  /** Wrenn's band when the gap was measured against one reference HCO3 and the HCO3 fell from it */
  deltaBand: DeltaBand | null;
  /** the delta ratio against the HCO3 that applies (one reference, or acute and chronic) */
  delta: DeltaReading | null;
  lactateBand: LactateBand | null;
  osmolarGapRaised: boolean | null;
  urineAnionGapNegative: boolean | null;
  urineChlorideResponsive: boolean | null;
  /** urine values given but not read, because the disorder they speak to is absent: the urine anion gap is read in a
   *  normal-AG metabolic acidosis only, urine chloride in a metabolic alkalosis only */
  urineNotRead: { anionGap: boolean; chloride: boolean };
  glucose: GlucoseReading | null;
}

export interface Oxygenation {
  /** the SpO2 target band (BTS 2017) and the saturation judged against it */
  target: Spo2Target | null;
  saturation: { value: number; source: 'spo2' | 'sao2' } | null;
  aboveTarget: boolean;
  belowTarget: boolean;
  /** P/F below 150 on FiO2 0.6 or more with PEEP 5 or more (PROSEVA) */
  severeHypoxaemia: boolean;
  /** the 2012 or 2024 ARDS oxygenation criterion is met (PEEP 5 or more with P/F 300 or less, or S/F) */
  ardsCriterionMet: boolean;
  /** gas exchange impaired: a raised A-a gradient on room air, or P/F 300 or less on oxygen */
  gasExchangeImpaired: boolean;
  assessable: boolean;
  reason: 'venous' | 'capillary' | null;
  barometricSource: 'entered' | 'altitude' | 'sea_level';
  level: OxygenationLevel | null;
  failureType: 1 | 2 | null;
  pfBand: PfBand | null;
  pfBandApplies: boolean;
  sfMeetsCriterion: boolean | null;
  aaRaised: boolean | null;
  lowInspiredOrHypoventilation: boolean;
  /** hypoxaemia with a normal A-a gradient and no hypercapnia below sea-level pressure: a low inspired PO2 (altitude),
   *  not type 1 respiratory failure */
  lowInspiredPo2: boolean;
  /** the ratio the Berlin bands were judged on: at altitude, P/F x PB/760 */
  pfBandFrom: 'measured' | 'altitude_adjusted' | null;
}

/** Why a route to the target is not offered. */
export type RouteLimit =
  | 'rr_above_35'
  | 'no_expiratory_time'
  | 'vt_above_8_ml_per_kg'
  | 'vt_below_4_ml_per_kg'
  | 'plateau_above_30'
  | 'driving_pressure_above_15';

/** One way to the target: RR at unchanged VT, or VT at unchanged RR. */
export interface Route {
  value: number;
  /** within every limit that could be checked */
  offered: boolean;
  limits: RouteLimit[];
  /** the checks that could not be made for want of an input */
  unchecked: ('per_kg' | 'plateau')[];
}

/** The best setting within the limits when no single route reaches the target (clinical-scope section 10). */
export interface BestSetting {
  rr: number;
  vt: number;
  pco2: number;
  ph: number | null;
  /** the combination reaches the target (then rr is the rate it needs at this VT) */
  reachesTarget: boolean;
  /** the limit that holds the VT: per kg, plateau or driving pressure (null: VT unchanged, no PBW) */
  vtLimitedBy: 'per_kg' | 'plateau' | 'driving_pressure' | null;
}

export interface Ventilation {
  ventilated: boolean;
  deadSpaceSource: 'measured_fraction' | 'end_tidal' | 'estimated' | null;
  targetSource: 'target_pco2' | 'target_ph' | null;
  targetForm: 'acute_buffering' | 'as_given' | null;
  /** what the target used is: as requested, Winters' compensation, or the patient's usual PaCO2 */
  targetBasis: 'requested' | 'compensation' | 'usual' | null;
  /** the requested target, when another one is used in its place */
  requestedTarget: N;
  recheckMinutes: { low: number; high: number };
  compensationTarget: Band | null;
  usualPco2: N;
  /** obstructive disease: known asthma or COPD, or a high PaCO2 with a high plateau */
  obstruction: 'asthma' | 'copd' | 'pressures' | null;
  rrRoute: Route | null;
  vtRoute: Route | null;
  best: BestSetting | null;
  /** the step of the ARDS Network pH protocol that applies when lung-protective limits hold the PaCO2 up */
  ardsnetStep: 'goal' | 'raise_rr' | 'bicarbonate' | null;
  /** a metabolic acidosis the ventilator cannot compensate within limits: the levers beyond it */
  beyondVentilator: { bicarbonate: boolean } | null;
}

export interface Venous {
  sample: 'venous' | 'capillary';
  hypercapniaUnlikely: boolean;
  arterialEstimate: { ph: number; pco2Low: number; pco2High: number; hco3: number } | null;
}

export interface PreviousGas {
  takenAt: string | null;
  label: string | null;
  gas: Gas;
  hPlus: number;
  fio2: N;
  peep: N;
  vt: N;
  rr: N;
}

export interface Change {
  field: 'ph' | 'pco2' | 'hco3' | 'po2' | 'lactate';
  from: number;
  to: number;
  change: number;
}

/** A setting that differs between the latest earlier gas and this one. */
export interface SettingChange {
  field: 'fio2' | 'peep' | 'vt' | 'rr';
  from: number;
  to: number;
}

export interface Serial {
  /** the latest earlier gas */
  last: PreviousGas;
  ventilatorChanged: boolean;
  /** the settings that changed since the latest earlier gas, in a fixed order: rate, volume, PEEP, FiO2 */
  settingChanges: SettingChange[];
  /**
   * Whether this gas is at the ventilation target the clinician set (target pH, else target PaCO2), within
   * SERIAL.targetPh or SERIAL.targetPco2; null when no target was set.
   */
  target: { kind: 'ph' | 'pco2'; value: number; reached: boolean } | null;
  /** the alveolar ventilation equation applied to the change, when the settings allow */
  prediction: {
    vaBefore: number;
    vaNow: number;
    predicted: number;
    observed: number;
    difference: number;
    verdict: 'as_predicted' | 'higher' | 'lower';
  } | null;
  predictionUnavailable: 'settings_unchanged' | 'settings_missing' | 'dead_space_unknown' | null;
}

export interface Findings {
  ok: true;
  withheld: boolean;
  units: Units;
  case: CanonicalCase;
  phStatus: PhStatus;
  consistency: Consistency | null;
  reference: ReferencePoint;
  compensation: Compensation | null;
  disorders: Disorder[];
  derived: Derived;
  metabolic: Metabolic;
  oxygenation: Oxygenation;
  ventilation: Ventilation | null;
  venous: Venous | null;
  previous: PreviousGas[];
  changes: Change[];
  serial: Serial | null;
  flags: Flag[];
  explain: Record<string, Explanation>;
}

export interface Rejected {
  ok: false;
  errors: FieldError[];
}

export interface InterpretOptions {
  /** a department's defaults; a case's own settings override them */
  settings?: Partial<Settings> | null;
}

export const has = (x: N | undefined): x is number => x !== null && x !== undefined;
