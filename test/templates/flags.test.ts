// flagMessage: one sentence for every flag code the core can raise, read from calc/flags.ts itself so
// that a code added there without wording fails here.
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import type { Flag, FlagCode } from '../../calc/index.ts';
import { createNoteRenderer } from '../../templates/index.ts';
import * as C from './cases.ts';
import { kpaText, read, ucum } from './cases.ts';
import { LEAKS, unitlessNumbers } from './helpers.ts';

const source = readFileSync(new URL('../../calc/flags.ts', import.meta.url), 'utf8');
const union = /export type FlagCode =([\s\S]*?);/.exec(source)?.[1] ?? '';
const ALL_CODES = [...union.matchAll(/'([a-z0-9_]+)'/g)].map((m) => m[1] as FlagCode);

const renderer = createNoteRenderer();
const mmHgFindings = read(C.ventilatedMmHg);
const kpaFindings = read(C.ventilatedKpa);

/** One sentence: a capital to start, a full stop to end, no second sentence inside. */
function sentenceProblems(message: string): string[] {
  const out: string[] = [];
  if (!/^[A-Z]/.test(message)) out.push('does not start with a capital');
  if (!/\.$/.test(message)) out.push('does not end with a full stop');
  if (/[.!?] [A-Z]/.test(message)) out.push('holds more than one sentence');
  if (LEAKS.test(message)) out.push(`prints ${LEAKS.exec(message)?.[0]}`);
  if (/Check this result/.test(message)) out.push('falls back to the generic wording');
  if (/ {2,}|\s[,.;:]/.test(message)) out.push('has stray spaces');
  return out;
}

// Values in canonical units, shaped as calc/interpret.ts raises them, for the codes no invented case reaches.
const SAMPLE_VALUES: Record<FlagCode, Flag['values']> = {
  values_inconsistent: { reported: 30, calculated: 21.5, difference: 8.5 },
  gas_value_computed: { field: 'hco3', value: 23.5 },
  unit_ambiguous: { field: 'gas.pco2', entered: 'mmHg', pco2: 5.3, ph: 7.4 },
  po2_above_alveolar: { po2: 130, alveolarPo2: 102, fio2: 0.21 },
  oxygenation_not_assessable: { sample: 'venous' },
  venous_sample: { pco2: 46 },
  capillary_sample: { pco2: 46 },
  fio2_missing: {},
  aa_reference_room_air_only: { fio2: 0.4 },
  adult_rules_only: { ageYears: 14 },
  pregnancy_reference: { pco2: 30, hco3: 20 },
  baseline_estimated: { pco2: 55, hco3: 32, pco2Estimated: true, hco3Estimated: false },
  temperature_not_37: { temperatureC: 34 },
  critical_value: { field: 'po2', value: 52, limit: 60, direction: 'below' },
  vt_above_8_ml_per_kg: { which: 'current', vt: 560, vtPerKg: 9.4 },
  rr_above_35: { which: 'current', rr: 38 },
  plateau_above_30: { pplat: 33 },
  driving_pressure_above_15: { drivingPressure: 18 },
  dead_space_exceeds_vt: { vt: 300, deadSpace: 320 },
  pbw_not_applicable: { heightCm: 125 },
  target_pco2_above_compensation: { target: 40, expectedLow: 26, expectedHigh: 30 },
  target_pco2_below_baseline: { target: 45, usual: 58, estimated: true },
  permissive_hypercapnia_possible: { pco2: 65, target: 49 },
  target_not_reachable: { targetPh: 7.4 },
  no_ventilation_target: {},
  suggestion_from_venous_pco2: { sample: 'venous' },
  osmolar_gap_raised: { osmolarGap: 24.5 },
  lactate_raised: { lactate: 5.1, band: 'high' },
  relative_hypoventilation: { reason: 'asthma', pco2: 42, limit: 35 },
  ketoacidosis_pattern: { glucose: 34, knownDiabetes: true },
  hyperosmolar_state: { effectiveOsmolality: 348, glucose: 52 },
  potassium_before_insulin: { k: 3.1, status: 'low' },
  pf_adjusted_for_altitude: {
    pfRatio: 220,
    pfRatioAdjusted: 164,
    barometricPressure: 565,
    band: 'moderate',
    bandApplies: true,
  },
  low_inspired_po2: {
    barometricPressure: 487,
    altitudeM: 3600,
    alveolarPo2: 57.4,
    aaGradient: 5.4,
  },
  suggested_vt_pressure_limits: {
    vt: 430,
    predictedPlateau: 31,
    predictedDrivingPressure: 17,
    plateauOver: true,
    drivingOver: true,
  },
  air_trapping_risk: {
    obstruction: 'asthma',
    rr: 14,
    suggestedRr: 20,
    expiratoryTime: 3.3,
    suggestedExpiratoryTime: 2,
  },
  compensation_beyond_ventilator: { ph: 7.1, bestPco2: 29.5, bestPh: 7.16, bicarbonate: true },
  ph_below_ardsnet_goal: { ph: 7.18, bestRr: 35, bestPh: 7.22, bicarbonate: false },
  spo2_above_target: {
    saturation: 99,
    source: 'spo2',
    low: 88,
    high: 92,
    basis: 'hypercapnic_risk',
    fio2: 0.6,
  },
  severe_hypoxaemia: { pfRatio: 108, fio2: 0.8, peep: 12 },
  cohb_raised: { cohb: 24, band: 'raised' },
  methb_raised: { methb: 12 },
  saturation_gap: { spo2: 98, sao2: 74, gap: 24, cohb: 24, methb: null },
  etco2_above_paco2: { etco2: 45, pco2: 40 },
};

describe('flag codes', () => {
  it('are read from calc/flags.ts (the list is not empty and holds the contract codes)', () => {
    expect(ALL_CODES.length).toBeGreaterThan(20);
    // interface-contract.md: flags[].code at least these
    for (const code of [
      'values_inconsistent',
      'po2_above_alveolar',
      'oxygenation_not_assessable',
      'adult_rules_only',
      'critical_value',
      'vt_above_8_ml_per_kg',
      'rr_above_35',
      'unit_ambiguous',
      'target_pco2_above_compensation',
      'target_pco2_below_baseline',
    ]) {
      expect(ALL_CODES).toContain(code);
    }
  });

  it('each has sample values in this test', () => {
    expect(ALL_CODES.filter((code) => !(code in SAMPLE_VALUES))).toEqual([]);
  });
});

describe.each(ALL_CODES)('flagMessage(%s)', (code) => {
  it('is one sentence of its own, even with no values at all', () => {
    const message = renderer.flagMessage({ code, severity: 'warning', values: {} }, mmHgFindings);
    expect(sentenceProblems(message)).toEqual([]);
    expect(unitlessNumbers(message)).toEqual([]);
  });

  it('words its values with units, in mmHg and in kPa', () => {
    const flag: Flag = { code, severity: 'warning', values: SAMPLE_VALUES[code] ?? {} };
    const mmHg = renderer.flagMessage(flag, mmHgFindings);
    const kpa = renderer.flagMessage(flag, kpaFindings);
    for (const m of [mmHg, kpa]) {
      expect(sentenceProblems(m)).toEqual([]);
      expect(unitlessNumbers(m)).toEqual([]);
    }
    // only the unit question names both units
    if (code !== 'unit_ambiguous') expect(kpa).not.toContain('mmHg');
  });
});

describe('flag messages carry the numbers', () => {
  const message = (code: FlagCode, findings = mmHgFindings) =>
    renderer.flagMessage({ code, severity: 'warning', values: SAMPLE_VALUES[code] }, findings);

  it('pressures in the clinician unit (kPa by UCUM conversion)', () => {
    expect(message('po2_above_alveolar')).toContain(
      'PaO2 130 mmHg is above the calculated alveolar PO2 of 102 mmHg on FiO2 0.21',
    );
    expect(message('po2_above_alveolar', kpaFindings)).toContain(
      `PaO2 ${kpaText(130)} is above the calculated alveolar PO2 of ${kpaText(102)}`,
    );
    const kpa = (mmHg: number) => ucum('mm[Hg]', mmHg, 'kPa').toFixed(1);
    expect(message('target_pco2_above_compensation', kpaFindings)).toContain(
      `target PCO2 of ${kpaText(40)} is above the ${kpa(26)}-${kpa(30)} kPa`,
    );
    expect(message('target_pco2_below_baseline')).toMatch(
      /45 mmHg is below this patient's usual 58 mmHg \(estimated\)/,
    );
  });

  it('ventilator values and limits', () => {
    expect(message('vt_above_8_ml_per_kg')).toBe(
      'VT 560 mL is 9.4 mL/kg PBW, which is above 8 mL/kg PBW: consider a smaller VT for lung protection.',
    );
    expect(message('rr_above_35')).toMatch(/RR 38\/min is above 35\/min/);
    expect(message('plateau_above_30')).toMatch(/33 cmH2O is above 30 cmH2O/);
    expect(message('driving_pressure_above_15')).toMatch(/18 cmH2O is above 15 cmH2O/);
    expect(message('dead_space_exceeds_vt')).toMatch(/\(320 mL\) is as large as the VT \(300 mL\)/);
  });

  it('a critical value names the value and the limit', () => {
    expect(message('critical_value')).toBe(
      'Critical value: PaO2 52 mmHg is below the limit of 60 mmHg: act on it and report it under the local critical-value policy.',
    );
    expect(
      renderer.flagMessage(
        {
          code: 'critical_value',
          severity: 'critical',
          values: { field: 'lactate', value: 6.2, limit: 4, direction: 'above' },
        },
        mmHgFindings,
      ),
    ).toMatch(/lactate 6.2 mmol\/L is at or above the limit of 4 mmol\/L/);
  });

  it('the unit question quotes the entry as typed', () => {
    const f = read(C.withheld);
    const flag = f.flags.find((x) => x.code === 'unit_ambiguous');
    expect(flag).toBeDefined();
    expect(renderer.flagMessage(flag as Flag, f)).toMatch(
      /PaCO2 entered as 5.3 mmHg with a pH of 7.40 fits a value in kPa: confirm whether the pressures are in mmHg or kPa/,
    );
  });

  it('every flag the invented cases raise gets a clean sentence', () => {
    const seen = new Set<string>();
    for (const c of Object.values(C.ALL_CASES)) {
      const f = read(c);
      for (const flag of f.flags) {
        seen.add(flag.code);
        const m = renderer.flagMessage(flag, f);
        expect(sentenceProblems(m), `${flag.code}: ${m}`).toEqual([]);
        expect(unitlessNumbers(m), `${flag.code}: ${m}`).toEqual([]);
      }
    }
    // the cases reach a good share of the codes through the real core, not only through sample values
    expect(seen.size).toBeGreaterThanOrEqual(15);
  });
});
