// The findings of one reading: the shape interpret() returns (data only), and the helpers its parts share.
import type { FieldError } from './schema.ts';
import type { CanonicalCase, Gas } from './canonical.ts';
import type { Settings } from './reference.ts';
import type { Consistency } from './acidBase.ts';
import type { Band, Compensation, Disorder, PhStatus, ReferencePoint } from './compensation.ts';
import type { DeltaBand } from './anionGap.ts';
import type { LactateBand } from './osmolality.ts';
import type { OxygenationLevel, PfBand } from './oxygenation.ts';
import type { Flag } from './flags.ts';
import type { Explanation } from './explain.ts';
import type { Units } from './units.ts';

export type N = number | null;

export interface Derived {
  hPlus: number;
  hco3Henderson: N;
  phHendersonHasselbalch: N;
  anionGap: N;
  anionGapCorrected: N;
  deltaRatio: N;
  expectedPco2: Band | null;
  expectedHco3: Band | null;
  standardBaseExcess: N;
  sodiumChlorideEffect: N;
  albuminEffect: N;
  unmeasuredIonEffect: N;
  apparentSid: N;
  effectiveSid: N;
  strongIonGap: N;
  calculatedOsmolality: N;
  osmolarGap: N;
  urineAnionGap: N;
  barometricPressure: N;
  alveolarPo2: N;
  aaGradient: N;
  aaGradientExpected: N;
  pfRatio: N;
  sfRatio: N;
  oxygenContent: N;
  predictedBodyWeightKg: N;
  vtPerKgPbw: N;
  drivingPressure: N;
  deadSpaceMl: N;
  minuteVentilation: N;
  alveolarVentilation: N;
  co2Production: N;
  ventilatoryRatio: N;
  targetPco2: N;
  targetPco2Simple: N;
  suggestedRr: N;
  suggestedVt: N;
  suggestedVtPerKgPbw: N;
  predictedPco2: N;
}

export interface Metabolic {
  anionGapIncludesK: boolean;
  anionGapUpperLimit: number;
  anionGapRaised: boolean | null;
  anionGapUsed: 'corrected' | 'uncorrected' | null;
  deltaBand: DeltaBand | null;
  lactateBand: LactateBand | null;
  osmolarGapRaised: boolean | null;
  urineAnionGapNegative: boolean | null;
  urineChlorideResponsive: boolean | null;
}

export interface Oxygenation {
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
}

export interface Ventilation {
  ventilated: boolean;
  deadSpaceSource: 'measured_fraction' | 'estimated' | null;
  targetSource: 'target_pco2' | 'target_ph' | null;
  targetForm: 'acute_buffering' | 'as_given' | null;
  recheckMinutes: { low: number; high: number };
  compensationTarget: Band | null;
  usualPco2: N;
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

export interface Serial {
  /** the latest earlier gas */
  last: PreviousGas;
  ventilatorChanged: boolean;
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

/** Explanations are built only when read: each is a thunk over the values of one reading. */
export type Explainers = Record<string, () => Explanation>;
