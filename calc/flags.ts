// Flags: what the clinician must see or answer. Data only; templates/ words them.

export type FlagCode =
  | 'values_inconsistent'
  | 'gas_value_computed'
  | 'unit_ambiguous'
  | 'po2_above_alveolar'
  | 'oxygenation_not_assessable'
  | 'venous_sample'
  | 'capillary_sample'
  | 'fio2_missing'
  | 'aa_reference_room_air_only'
  | 'adult_rules_only'
  | 'pregnancy_reference'
  | 'baseline_estimated'
  | 'temperature_not_37'
  | 'critical_value'
  | 'vt_above_8_ml_per_kg'
  | 'rr_above_35'
  | 'plateau_above_30'
  | 'driving_pressure_above_15'
  | 'dead_space_exceeds_vt'
  | 'pbw_not_applicable'
  | 'target_pco2_above_compensation'
  | 'target_pco2_below_baseline'
  | 'permissive_hypercapnia_possible'
  | 'target_not_reachable'
  | 'no_ventilation_target'
  | 'suggestion_from_venous_pco2'
  | 'osmolar_gap_raised'
  | 'lactate_raised'
  | 'relative_hypoventilation'
  | 'ketoacidosis_pattern'
  | 'hyperosmolar_state'
  | 'potassium_before_insulin'
  | 'pf_adjusted_for_altitude'
  | 'low_inspired_po2'
  | 'suggested_vt_pressure_limits'
  | 'air_trapping_risk'
  | 'compensation_beyond_ventilator'
  | 'ph_below_ardsnet_goal'
  | 'spo2_above_target'
  | 'severe_hypoxaemia'
  | 'cohb_raised'
  | 'methb_raised'
  | 'saturation_gap'
  | 'etco2_above_paco2';

export type Severity = 'critical' | 'warning' | 'info';

export type FlagValue = number | string | boolean | null;

export interface Flag {
  code: FlagCode;
  severity: Severity;
  /** the numbers behind the flag, canonical units; templates word them */
  values: Record<string, FlagValue>;
}

export const flag = (
  code: FlagCode,
  severity: Severity,
  values: Record<string, FlagValue> = {},
): Flag => ({ code, severity, values });

const ORDER: Record<Severity, number> = { critical: 0, warning: 1, info: 2 };
export const bySeverity = (a: Flag, b: Flag): number => ORDER[a.severity] - ORDER[b.severity];
