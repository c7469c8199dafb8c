// Flags as display-ready data: each code's numbers in the clinician's units, for flag.njk to word.
import { reference as R } from '../calc/index.ts';
import type { Findings, Flag, FlagCode } from '../calc/index.ts';
import type { Formatter, Text } from './format.ts';

export type FlagSection = 'interpretation' | 'oxygenation' | 'ventilation' | 'cautions';

export interface FlagView {
  code: FlagCode;
  severity: Flag['severity'];
  section: FlagSection;
  /** already said by the note's own paragraphs: not repeated in its lists of checks */
  inText: boolean;
  /** display strings for flag.njk; absent or null when unknown */
  v: Record<string, Text | boolean>;
}

type Values = Flag['values'];
type Builder = (
  values: Values,
  findings: Findings,
  fmt: Formatter,
) => Record<string, Text | boolean>;

const num = (values: Values, key: string): number | null => {
  const x = values[key];
  return typeof x === 'number' && Number.isFinite(x) ? x : null;
};
const str = (values: Values, key: string): string | null => {
  const x = values[key];
  return typeof x === 'string' && x.length > 0 ? x : null;
};
const bool = (values: Values, key: string): boolean => values[key] === true;

/** PaCO2, PvCO2 or PcCO2 as the sample is. */
export const co2Label = (sample: Findings['case']['sample']): string =>
  sample === 'venous' ? 'PvCO2' : sample === 'capillary' ? 'PcCO2' : 'PaCO2';
export const o2Label = (sample: Findings['case']['sample']): string =>
  sample === 'venous' ? 'PvO2' : sample === 'capillary' ? 'PcO2' : 'PaO2';

const GAS_FIELD_LABEL: Record<string, (f: Findings) => string> = {
  ph: () => 'pH',
  pco2: (f) => co2Label(f.case.sample),
  hco3: () => 'HCO3',
  po2: (f) => o2Label(f.case.sample),
  k: () => 'K',
  lactate: () => 'lactate',
};

/** A gas or chemistry value in its unit; a limit (a threshold, not a patient's figure) is written short. */
function gasValue(field: string | null, value: number | null, fmt: Formatter, limit = false): Text {
  if (field === null || value === null) return null;
  if (field === 'ph') return fmt.ph(value);
  if (field === 'pco2' || field === 'po2') return fmt.pressure(value);
  return limit ? fmt.withUnit(value, 1, 'mmol/L') : fmt.mmol(value);
}

const which = (values: Values) => ({ suggested: str(values, 'which') === 'suggested' });

/** One builder per flag code: the compiler refuses a new code until it has one. */
const BUILDERS: Record<FlagCode, Builder> = {
  values_inconsistent: (x, _f, fmt) => ({
    reported: fmt.mmol(num(x, 'reported')),
    calculated: fmt.mmol(num(x, 'calculated')),
    difference: fmt.mmol(abs(num(x, 'difference'))),
  }),
  gas_value_computed: (x, f, fmt) => {
    const field = str(x, 'field');
    return {
      label: field && GAS_FIELD_LABEL[field] ? GAS_FIELD_LABEL[field]!(f) : null,
      value: gasValue(field, num(x, 'value'), fmt),
    };
  },
  unit_ambiguous: (x, f, fmt) => ({
    label: co2Label(f.case.sample),
    entered: fmt.pressureAsEntered(num(x, 'pco2')),
    ph: fmt.ph(num(x, 'ph')),
    unit: fmt.pressureUnit,
    other: fmt.kpa ? 'mmHg' : 'kPa',
  }),
  po2_above_alveolar: (x, _f, fmt) => ({
    po2: fmt.pressure(num(x, 'po2')),
    alveolar: fmt.pressure(num(x, 'alveolarPo2')),
    fio2: fmt.fio2(num(x, 'fio2')),
  }),
  oxygenation_not_assessable: (x, f) => ({
    venous: (str(x, 'sample') ?? f.case.sample) === 'venous',
    capillary: (str(x, 'sample') ?? f.case.sample) === 'capillary',
  }),
  venous_sample: (x, f, fmt) => ({
    label: co2Label(f.case.sample),
    pco2: fmt.pressure(num(x, 'pco2')),
  }),
  capillary_sample: (x, f, fmt) => ({
    label: co2Label(f.case.sample),
    pco2: fmt.pressure(num(x, 'pco2')),
  }),
  fio2_missing: () => ({}),
  aa_reference_room_air_only: (x, _f, fmt) => ({ fio2: fmt.fio2(num(x, 'fio2')) }),
  adult_rules_only: (x, _f, fmt) => ({ age: fmt.withUnit(num(x, 'ageYears'), 0, 'years') }),
  pregnancy_reference: (x, f, fmt) => {
    const ref = f.reference.kind === 'pregnancy' ? f.reference : null;
    return {
      pco2: ref ? fmt.pressureBand(ref.pco2Band) : fmt.pressure(num(x, 'pco2')),
      hco3: ref
        ? fmt.range(ref.hco3Band.low, ref.hco3Band.high, 1, 'mmol/L')
        : fmt.withUnit(num(x, 'hco3'), 1, 'mmol/L'),
    };
  },
  baseline_estimated: (x, _f, fmt) => ({
    pco2: fmt.pressure(num(x, 'pco2')),
    hco3: fmt.mmol(num(x, 'hco3')),
    pco2Estimated: bool(x, 'pco2Estimated'),
    hco3Estimated: bool(x, 'hco3Estimated'),
    fromUsualPh: str(x, 'source') === 'usual_ph',
    fromChronicLine: str(x, 'source') === 'chronic_line',
  }),
  temperature_not_37: (x, _f, fmt) => ({
    temperature: fmt.withUnit(num(x, 'temperatureC'), 1, '°C'),
  }),
  critical_value: (x, f, fmt) => {
    const field = str(x, 'field');
    return {
      label: field && GAS_FIELD_LABEL[field] ? GAS_FIELD_LABEL[field]!(f) : null,
      value: gasValue(field, num(x, 'value'), fmt),
      limit: gasValue(field, num(x, 'limit'), fmt, true),
      below: str(x, 'direction') === 'below',
      above: str(x, 'direction') === 'above',
      atOrAbove: str(x, 'direction') === 'above' && field === 'lactate',
    };
  },
  vt_above_8_ml_per_kg: (x, f, fmt) => ({
    ...which(x),
    vt: fmt.withUnit(num(x, 'vt'), 0, 'mL'),
    perKg: fmt.withUnitFixed(num(x, 'vtPerKg'), 1, 'mL/kg PBW'),
    limit: limits(f, fmt).vtHigh,
  }),
  rr_above_35: (x, f, fmt) => ({
    ...which(x),
    rr: fmt.withUnit(num(x, 'rr'), 0, '/min'),
    limit: limits(f, fmt).rrMax,
  }),
  plateau_above_30: (x, f, fmt) => ({
    pplat: fmt.withUnit(num(x, 'pplat'), 0, 'cmH2O'),
    limit: limits(f, fmt).plateau,
  }),
  driving_pressure_above_15: (x, f, fmt) => ({
    drivingPressure: fmt.withUnit(num(x, 'drivingPressure'), 0, 'cmH2O'),
    limit: limits(f, fmt).drivingPressure,
  }),
  dead_space_exceeds_vt: (x, _f, fmt) => ({
    vt: fmt.withUnit(num(x, 'vt'), 0, 'mL'),
    deadSpace: fmt.withUnit(num(x, 'deadSpace'), 0, 'mL'),
  }),
  pbw_not_applicable: (x, _f, fmt) => ({ height: fmt.withUnit(num(x, 'heightCm'), 0, 'cm') }),
  target_pco2_above_compensation: (x, _f, fmt) => {
    const low = num(x, 'expectedLow'),
      high = num(x, 'expectedHigh');
    return {
      target: fmt.pressure(num(x, 'target')),
      expected: low !== null && high !== null ? fmt.pressureBand({ low, high }) : null,
    };
  },
  target_pco2_below_baseline: (x, _f, fmt) => ({
    target: fmt.pressure(num(x, 'target')),
    usual: fmt.pressure(num(x, 'usual')),
    estimated: bool(x, 'estimated'),
  }),
  permissive_hypercapnia_possible: (x, f, fmt) => ({
    label: co2Label(f.case.sample),
    pco2: fmt.pressure(num(x, 'pco2')),
    target: fmt.pressure(num(x, 'target')),
  }),
  target_not_reachable: (x, _f, fmt) => ({
    targetPh: fmt.ph(num(x, 'targetPh')),
    targetPco2: fmt.pressure(num(x, 'targetPco2')),
  }),
  no_ventilation_target: () => ({}),
  suggestion_from_venous_pco2: (x, f) => ({
    label: co2Label((str(x, 'sample') as Findings['case']['sample'] | null) ?? f.case.sample),
    capillary: (str(x, 'sample') ?? f.case.sample) === 'capillary',
  }),
  osmolar_gap_raised: (x, _f, fmt) => ({
    gap: fmt.mosm(num(x, 'osmolarGap')),
    limit: fmt.withUnit(R.OSMOLAR_GAP_RAISED, 0, 'mOsm/kg'),
    ethanolMeasured: bool(x, 'ethanolMeasured'),
    anionGapRaised: bool(x, 'anionGapRaised'),
  }),
  lactate_raised: (x, _f, fmt) => {
    const band = str(x, 'band');
    return {
      lactate: fmt.mmol(num(x, 'lactate')),
      high: band === 'high',
      limit: fmt.withUnit(band === 'high' ? R.LACTATE.high : R.LACTATE.raised, 1, 'mmol/L'),
    };
  },
  relative_hypoventilation: (x, f, fmt) => {
    const reason = str(x, 'reason');
    return {
      metabolic: reason === 'metabolic_acidosis',
      pregnancy: reason === 'pregnancy',
      asthma: reason === 'asthma',
      label: co2Label(f.case.sample),
      pco2: fmt.pressure(num(x, 'pco2')),
      limit: fmt.pressure(num(x, 'limit')),
      pregnancyBand: fmt.pressureBand({ low: R.PREGNANCY.pco2.low, high: R.PREGNANCY.pco2.high }),
    };
  },
  ketoacidosis_pattern: (x, _f, fmt) => ({
    glucose: fmt.field('chemistry.glucose', num(x, 'glucose')),
    knownDiabetes: bool(x, 'knownDiabetes'),
    ketones: fmt.withUnit(R.GLUCOSE.ketones, 1, 'mmol/L'),
  }),
  hyperosmolar_state: (x, _f, fmt) => ({
    effective: fmt.mosm(num(x, 'effectiveOsmolality')),
    glucose: fmt.field('chemistry.glucose', num(x, 'glucose')),
    osmolalityLimit: fmt.withUnit(R.GLUCOSE.hyperosmolarOsmolality, 0, 'mOsm/kg'),
    glucoseLimit: fmt.field('chemistry.glucose', R.GLUCOSE.hyperosmolarGlucose),
  }),
  potassium_before_insulin: (x, _f, fmt) => {
    const status = str(x, 'status');
    return {
      k: fmt.field('chemistry.k', num(x, 'k')),
      low: status === 'low',
      high: status === 'high',
      lowLimit: fmt.field('chemistry.k', R.POTASSIUM.beforeInsulinBelow),
      highLimit: fmt.field('chemistry.k', R.POTASSIUM.highAbove),
    };
  },
  pf_adjusted_for_altitude: (x, _f, fmt) => {
    const band = str(x, 'band');
    return {
      pf: fmt.pfRatio(num(x, 'pfRatio')),
      adjusted: fmt.pfRatio(num(x, 'pfRatioAdjusted')),
      pb: fmt.pressure(num(x, 'barometricPressure')),
      band: band === 'none' ? null : band,
      bandApplies: bool(x, 'bandApplies'),
    };
  },
  low_inspired_po2: (x, _f, fmt) => ({
    pb: fmt.pressure(num(x, 'barometricPressure')),
    altitude: fmt.withUnit(num(x, 'altitudeM'), 0, 'm'),
    alveolar: fmt.pressure(num(x, 'alveolarPo2')),
    aa: fmt.pressure(num(x, 'aaGradient')),
  }),
  suggested_vt_pressure_limits: (x, f, fmt) => ({
    vt: fmt.withUnit(num(x, 'vt'), 0, 'mL'),
    plateau: fmt.withUnit(num(x, 'predictedPlateau'), 0, 'cmH2O'),
    driving: fmt.withUnit(num(x, 'predictedDrivingPressure'), 0, 'cmH2O'),
    plateauOver: bool(x, 'plateauOver'),
    drivingOver: bool(x, 'drivingOver'),
    plateauLimit: limits(f, fmt).plateau,
    drivingLimit: limits(f, fmt).drivingPressure,
  }),
  air_trapping_risk: (x, _f, fmt) => {
    const why = str(x, 'obstruction');
    return {
      asthma: why === 'asthma',
      copd: why === 'copd',
      pressures: why === 'pressures',
      rr: fmt.withUnit(num(x, 'rr'), 0, '/min'),
      suggestedRr: fmt.withUnit(num(x, 'suggestedRr'), 0, '/min'),
      te: fmt.withUnit(num(x, 'expiratoryTime'), 1, 's'),
      suggestedTe: fmt.withUnit(num(x, 'suggestedExpiratoryTime'), 1, 's'),
    };
  },
  compensation_beyond_ventilator: (x, f, fmt) => ({
    label: co2Label(f.case.sample),
    ph: fmt.ph(num(x, 'ph')),
    bestPco2: fmt.pressure(num(x, 'bestPco2')),
    bestPh: fmt.ph(num(x, 'bestPh')),
    bicarbonate: bool(x, 'bicarbonate'),
    bicarbonatePh: fmt.ph(R.BICARBONATE_PH_AT_OR_BELOW),
  }),
  ph_below_ardsnet_goal: (x, f, fmt) => ({
    ph: fmt.ph(num(x, 'ph')),
    goal: fmt.ph(R.ARDSNET_PH.goalLow),
    floor: fmt.ph(R.ARDSNET_PH.bicarbonateBelow),
    bestRr: fmt.withUnit(num(x, 'bestRr'), 0, '/min'),
    bestPh: fmt.ph(num(x, 'bestPh')),
    bicarbonate: bool(x, 'bicarbonate'),
    rrMax: limits(f, fmt).rrMax,
  }),
  spo2_above_target: (x, _f, fmt) => ({
    saturation: fmt.withUnit(num(x, 'saturation'), 0, '%'),
    sao2: str(x, 'source') === 'sao2',
    target: fmt.range(num(x, 'low'), num(x, 'high'), 0, '%'),
    retainer: str(x, 'basis') === 'hypercapnic_risk',
    pregnancy: str(x, 'basis') === 'pregnancy',
    fio2: fmt.fio2(num(x, 'fio2')),
  }),
  severe_hypoxaemia: (x, _f, fmt) => ({
    pf: fmt.pfRatio(num(x, 'pfRatio')),
    fio2: fmt.fio2(num(x, 'fio2')),
    peep: fmt.withUnit(num(x, 'peep'), 0, 'cmH2O'),
    limit: fmt.pfRatio(R.SEVERE_HYPOXAEMIA.pfBelow),
  }),
  cohb_raised: (x, _f, fmt) => ({
    cohb: fmt.withUnit(num(x, 'cohb'), 1, '%'),
    smokerLimit: fmt.withUnit(R.CO_OXIMETRY.cohbSmoker, 0, '%'),
    nonSmokerLimit: fmt.withUnit(R.CO_OXIMETRY.cohbNonSmoker, 0, '%'),
    evenSmoker: str(x, 'band') === 'raised',
  }),
  methb_raised: (x, _f, fmt) => ({
    methb: fmt.withUnit(num(x, 'methb'), 1, '%'),
    limit: fmt.withUnit(R.CO_OXIMETRY.methb, 0, '%'),
  }),
  saturation_gap: (x, _f, fmt) => ({
    spo2: fmt.withUnit(num(x, 'spo2'), 0, '%'),
    sao2: fmt.withUnit(num(x, 'sao2'), 0, '%'),
    gap: fmt.withUnit(num(x, 'gap'), 0, '%'),
    cohb: num(x, 'cohb') !== null && (num(x, 'cohb') as number) > R.CO_OXIMETRY.cohbNonSmoker,
    methb: num(x, 'methb') !== null && (num(x, 'methb') as number) > R.CO_OXIMETRY.methb,
  }),
  etco2_above_paco2: (x, f, fmt) => ({
    label: co2Label(f.case.sample),
    etco2: fmt.pressure(num(x, 'etco2')),
    pco2: fmt.pressure(num(x, 'pco2')),
  }),
};

function abs(x: number | null): number | null {
  return x === null ? null : Math.abs(x);
}

/** Lung-protective limits and the like, in display form, from the core's one reference module. */
export function limits(_f: Findings | null, fmt: Formatter) {
  return {
    vtHigh: fmt.withUnit(R.VENTILATION.vtHighPerKg, 0, 'mL/kg PBW'),
    vtTarget: fmt.withUnit(R.VENTILATION.vtTargetPerKg, 0, 'mL/kg PBW'),
    vtLow: fmt.withUnit(R.VENTILATION.vtLowPerKg, 0, 'mL/kg PBW'),
    vtRange: fmt.range(R.VENTILATION.vtLowPerKg, R.VENTILATION.vtHighPerKg, 0, 'mL/kg PBW'),
    rrMax: fmt.withUnit(R.VENTILATION.rrMax, 0, '/min'),
    plateau: fmt.withUnit(R.VENTILATION.plateauMax, 0, 'cmH2O'),
    drivingPressure: fmt.withUnit(R.VENTILATION.drivingPressureMax, 0, 'cmH2O'),
  };
}

/** Where each flag belongs in the note. */
const SECTION: Record<FlagCode, FlagSection> = {
  values_inconsistent: 'interpretation',
  gas_value_computed: 'interpretation',
  unit_ambiguous: 'interpretation',
  adult_rules_only: 'interpretation',
  pregnancy_reference: 'interpretation',
  baseline_estimated: 'interpretation',
  temperature_not_37: 'interpretation',
  osmolar_gap_raised: 'interpretation',
  lactate_raised: 'interpretation',
  relative_hypoventilation: 'interpretation',
  ketoacidosis_pattern: 'interpretation',
  hyperosmolar_state: 'interpretation',
  potassium_before_insulin: 'interpretation',
  pf_adjusted_for_altitude: 'oxygenation',
  low_inspired_po2: 'oxygenation',
  po2_above_alveolar: 'oxygenation',
  oxygenation_not_assessable: 'oxygenation',
  venous_sample: 'oxygenation',
  capillary_sample: 'oxygenation',
  fio2_missing: 'oxygenation',
  aa_reference_room_air_only: 'oxygenation',
  vt_above_8_ml_per_kg: 'ventilation',
  rr_above_35: 'ventilation',
  plateau_above_30: 'ventilation',
  driving_pressure_above_15: 'ventilation',
  dead_space_exceeds_vt: 'ventilation',
  pbw_not_applicable: 'ventilation',
  target_pco2_above_compensation: 'ventilation',
  target_pco2_below_baseline: 'ventilation',
  permissive_hypercapnia_possible: 'ventilation',
  target_not_reachable: 'ventilation',
  no_ventilation_target: 'ventilation',
  suggestion_from_venous_pco2: 'ventilation',
  suggested_vt_pressure_limits: 'ventilation',
  air_trapping_risk: 'ventilation',
  compensation_beyond_ventilator: 'ventilation',
  ph_below_ardsnet_goal: 'ventilation',
  etco2_above_paco2: 'ventilation',
  spo2_above_target: 'oxygenation',
  severe_hypoxaemia: 'oxygenation',
  cohb_raised: 'oxygenation',
  methb_raised: 'oxygenation',
  saturation_gap: 'oxygenation',
  critical_value: 'cautions',
};

/** Flags the note's paragraphs already put into words (the view model carries their numbers). */
const IN_TEXT: ReadonlySet<FlagCode> = new Set<FlagCode>([
  'gas_value_computed',
  'pregnancy_reference',
  'baseline_estimated',
  'osmolar_gap_raised',
  'lactate_raised',
  'ketoacidosis_pattern',
  'hyperosmolar_state',
  'pf_adjusted_for_altitude',
  'oxygenation_not_assessable',
  'venous_sample',
  'capillary_sample',
  'fio2_missing',
  'aa_reference_room_air_only',
  'no_ventilation_target',
  'critical_value',
  'unit_ambiguous',
]);

export function flagView(flag: Flag, findings: Findings, fmt: Formatter): FlagView {
  const build = BUILDERS[flag.code] as Builder | undefined;
  const values = build ? build(flag.values ?? {}, findings, fmt) : {};
  return {
    code: flag.code,
    severity: flag.severity,
    section: SECTION[flag.code] ?? 'interpretation',
    inText: IN_TEXT.has(flag.code),
    v: values,
  };
}
