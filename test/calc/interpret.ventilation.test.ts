// Ventilated patients through interpret(): each safety flag, and the target PaCO2 checked by hand
// (clinical-scope section 8; ARDS Network 2000; Amato 2015; West; Berend 2014 acute rule).
import { describe, expect, it } from 'vitest';
import { codes, disorderList, read } from './helpers.ts';

// a 55-year-old man, 175 cm: PBW 50 + 0.91 x 22.6 = 70.57 kg (ARDS Network 2000)
const man = { sex: 'male', heightCm: 175, ageYears: 55 } as const;
// a 45-year-old woman, 160 cm: PBW 45.5 + 0.91 x 7.6 = 52.42 kg
const woman = { sex: 'female', heightCm: 160, ageYears: 45 } as const;
const normalGas = { ph: 7.4, pco2: 40, po2: 95, hco3: 24 };

describe('lung-protective limits', () => {
  it.each([
    [
      'VT 600 mL is 8.5 mL/kg PBW: above 8 (ARDS Network 2000)',
      { vt: 600, rr: 14 },
      5,
      'vt_above_8_ml_per_kg',
    ],
    [
      'RR 38 risks air trapping and auto-PEEP: above 35 (common practice)',
      { vt: 420, rr: 38 },
      5,
      'rr_above_35',
    ],
    [
      'plateau 33 cmH2O: above 30 (ARDS Network 2000)',
      { vt: 420, rr: 16, pplat: 33 },
      10,
      'plateau_above_30',
    ],
    [
      'plateau 28 with PEEP 10: driving pressure 18, above 15 (Amato 2015)',
      { vt: 420, rr: 16, pplat: 28 },
      10,
      'driving_pressure_above_15',
    ],
  ])('%s', (_what, ventilator, peep, flagCode) => {
    const f = read({ gas: normalGas, patient: man, oxygen: { fio2: 0.4, peep }, ventilator });
    expect(codes(f)).toContain(flagCode);
  });

  it('the limits are not flagged at 6 mL/kg, RR 16, plateau 24, PEEP 10 (driving pressure 14)', () => {
    const f = read({
      gas: normalGas,
      patient: man,
      oxygen: { fio2: 0.4, peep: 10 },
      ventilator: { vt: 420, rr: 16, pplat: 24 },
    });
    for (const code of [
      'vt_above_8_ml_per_kg',
      'rr_above_35',
      'plateau_above_30',
      'driving_pressure_above_15',
    ])
      expect(codes(f)).not.toContain(code);
    expect(f.derived).toMatchObject({
      predictedBodyWeightKg: 70.6,
      vtPerKgPbw: 6,
      drivingPressure: 14,
    });
  });

  it('the derived ventilation figures, by hand: VD 2.2 x 70.57 = 155, VE 6.7, VA 16 x (420 - 155) = 4.2 L/min, VCO2 40 x 4.24 / 0.863 = 196', () => {
    const f = read({
      gas: normalGas,
      patient: man,
      oxygen: { fio2: 0.4, peep: 10 },
      ventilator: { vt: 420, rr: 16 },
    });
    expect(f.derived).toMatchObject({
      deadSpaceMl: 155,
      minuteVentilation: 6.7,
      alveolarVentilation: 4.2,
      co2Production: 196,
      ventilatoryRatio: 1.02,
    });
    expect(f.ventilation?.deadSpaceSource).toBe('estimated');
  });

  it('a measured VD/VT replaces the estimate: 0.5 x 450 = 225 mL (West)', () => {
    const f = read({
      gas: normalGas,
      patient: man,
      ventilator: { vt: 450, rr: 16, deadSpaceFraction: 0.5 },
    });
    expect(f.derived.deadSpaceMl).toBe(225);
    expect(f.ventilation?.deadSpaceSource).toBe('measured_fraction');
  });

  it('predicted body weight is not used below 130 cm (outside the ARDS Network formula)', () => {
    const f = read({
      gas: normalGas,
      patient: { sex: 'male', heightCm: 120 },
      ventilator: { vt: 450, rr: 16 },
    });
    expect(codes(f)).toContain('pbw_not_applicable');
    expect(f.derived.predictedBodyWeightKg).toBeNull();
  });
});

describe('the target PaCO2 and the settings to reach it', () => {
  // ARDS, a woman of 160 cm: pH 7.22, PaCO2 65, HCO3 26; target pH 7.35 ([H+] 44.67)
  const ards = {
    gas: { ph: 7.22, pco2: 65, po2: 70, hco3: 26 },
    patient: woman,
    oxygen: { fio2: 0.7, peep: 14 },
    ventilator: { vt: 320, rr: 30, pplat: 28, targetPh: 7.35 },
  };

  it('acute-buffering form by hand: 44.67 x (26 - 6.5) / (24 - 4.467) = 44.6; simple form 44.67 x 26 / 24 = 48.4', () => {
    const f = read(ards);
    expect(f.derived.targetPco2).toBe(44.6);
    expect(f.derived.targetPco2Simple).toBe(48.4);
    expect(f.ventilation).toMatchObject({
      targetSource: 'target_ph',
      targetForm: 'acute_buffering',
    });
    expect(f.explain.targetPco2?.formula).toBe(
      'PaCO2_t = [H+]_t x (HCO3 - 0.1 x PaCO2) / (24 - 0.1 x [H+]_t)',
    );
  });

  it('RR at unchanged VT 30 x 65 / 44.6 = 44; VT at unchanged RR 115 + 205 x 65 / 44.6 = 410 (West)', () => {
    const f = read(ards);
    expect(f.derived.suggestedRr).toBe(44);
    expect(f.derived.suggestedVt).toBe(410);
    expect(f.derived.suggestedVtPerKgPbw).toBe(7.8);
  });

  it('the rate route beyond 35/min; the volume route within 8 mL/kg but over the plateau the compliance predicts', () => {
    const f = read(ards);
    expect(f.flags.find((x) => x.code === 'rr_above_35')?.values).toMatchObject({
      which: 'suggested',
      rr: 44,
    });
    // VT_new = VD + (VT - VD) x 65 / 44.6 with VD = 2.2 x 52.4 = 115: 115 + 205 x 1.457 = 414 -> 410 mL, 7.8 mL/kg
    expect(f.derived.suggestedVt).toBe(410);
    // Crs = 320 / (28 - 14) = 22.9 mL/cmH2O; plateau 14 + 410 / 22.9 = 31.9 > 30 (ARDS Network 2000), driving
    // pressure 17.9 > 15 (Amato 2015)
    expect(f.derived).toMatchObject({
      compliance: 22.9,
      predictedPlateau: 32,
      predictedDrivingPressure: 18,
    });
    expect(f.ventilation?.vtRoute).toMatchObject({
      offered: false,
      limits: ['plateau_above_30', 'driving_pressure_above_15'],
    });
    expect(codes(f)).toContain('suggested_vt_pressure_limits');
    expect(codes(f)).not.toContain('driving_pressure_above_15'); // 28 - 14 = 14 now
  });

  it('lung-protective VT with the target out of safe reach and pH 7.22: the ARDS Network steps, not permissive hypercapnia', () => {
    const f = read({ ...ards, ventilator: { ...ards.ventilator, vt: 380 } });
    // RR 30 x 65 / 44.6 = 44 /min; VT 115 + 265 x 1.457 = 501 -> 500 mL = 9.5 mL/kg PBW: both beyond limits
    expect(f.derived).toMatchObject({ suggestedRr: 44, suggestedVt: 500 });
    expect(codes(f)).toEqual(
      expect.arrayContaining(['rr_above_35', 'vt_above_8_ml_per_kg', 'ph_below_ardsnet_goal']),
    );
    // ARDS Network 2000: pH goal 7.30-7.45, below 7.30 raise RR up to 35
    expect(codes(f)).not.toContain('permissive_hypercapnia_possible');
    expect(f.ventilation?.ardsnetStep).toBe('raise_rr');
  });

  it('the same patient at pH 7.30 (PaCO2 60, HCO3 28.8, acute): within the ARDS Network pH goal, permissive hypercapnia may be accepted', () => {
    const f = read({
      ...ards,
      gas: { ph: 7.3, pco2: 60, po2: 70, hco3: 28.8 },
      context: { timing: 'acute' },
      ventilator: { ...ards.ventilator, vt: 380, targetPh: 7.4 },
    });
    expect(codes(f)).toContain('permissive_hypercapnia_possible');
    expect(f.ventilation?.ardsnetStep).toBe('goal');
    // the best setting within the limits: Crs 380 / 14 = 27.1, driving pressure 15 gives 407 -> 400 mL (Amato 2015),
    // RR 35; PaCO2 60 x 30 x (380 - 115.3) / (35 x (400 - 115.3)) = 47.8 mmHg (West)
    expect(f.ventilation?.best).toMatchObject({ rr: 35, vt: 400, vtLimitedBy: 'driving_pressure' });
    expect(f.derived.bestPco2).toBe(47.8);
  });

  it('every suggestion comes with a recheck 20-30 minutes later (common practice)', () => {
    expect(read(ards).ventilation?.recheckMinutes).toEqual({ low: 20, high: 30 });
  });

  it('the interface-contract example case: target 42.8 (by hand 44.67 x 18.7 / 19.53), RR 18, VT 490', () => {
    const f = read({
      gas: { ph: 7.31, pco2: 48, po2: 72, hco3: 23.5 },
      patient: { ageYears: 64, sex: 'female', heightCm: 162 },
      oxygen: { fio2: 0.4, peep: 8 },
      ventilator: { vt: 450, rr: 16, pplat: 24, targetPh: 7.35 },
    });
    expect(f.derived).toMatchObject({
      predictedBodyWeightKg: 54.2,
      vtPerKgPbw: 8.3,
      targetPco2: 42.8,
      targetPco2Simple: 43.7,
      suggestedRr: 18,
      suggestedVt: 490,
    });
    expect(
      f.flags.filter((x) => x.code === 'vt_above_8_ml_per_kg').map((x) => x.values.which),
    ).toEqual(['current', 'suggested']);
  });

  it('a target PaCO2 as given is used as it is', () => {
    const f = read({
      gas: normalGas,
      patient: man,
      ventilator: { vt: 450, rr: 16, targetPco2: 35, targetPh: 7.45 },
    });
    expect(f.derived.targetPco2).toBe(35);
    expect(f.ventilation).toMatchObject({ targetSource: 'target_pco2', targetForm: 'as_given' });
    expect(f.derived.suggestedRr).toBe(18); // 16 x 40 / 35
  });

  it("a target pH that no PaCO2 can give is said so; in a metabolic acidosis the target becomes Winters' 1.5 x 3 + 8 = 12.5", () => {
    const f = read({
      gas: { ph: 7.1, pco2: 30, hco3: 3.0 },
      patient: man,
      ventilator: { vt: 450, rr: 16, targetPh: 7.35 },
    });
    expect(codes(f)).toContain('target_not_reachable');
    expect(f.derived.targetPco2).toBe(12.5);
    expect(f.ventilation?.targetBasis).toBe('compensation');
    // neither route alone within limits (RR 16 x 30 / 12.5 = 38 > 35; VT 860 > 8 mL/kg): the best setting within the
    // limits, VT 8 x 70.57 = 565 -> 560 mL with the rate it needs, ceil(16 x 294.7 / 404.7 x 30 / 12.5) = 28/min
    expect(f.ventilation?.best).toMatchObject({
      vt: 560,
      rr: 28,
      reachesTarget: true,
      vtLimitedBy: 'per_kg',
    });
  });

  it('a target pH that no PaCO2 can give, outside a metabolic acidosis: nothing suggested', () => {
    const f = read({
      gas: { ph: 7.6, pco2: 30, hco3: 28.8 },
      patient: man,
      ventilator: { vt: 450, rr: 16, targetPh: 7.0 },
    });
    expect(f.derived.targetPco2).not.toBeNull();
    const g = read({
      gas: { ph: 7.45, pco2: 40, hco3: 27.2 },
      patient: man,
      ventilator: { vt: 450, rr: 16, targetPh: 7.6 },
    });
    // 25.1 x (27.2 - 4) / (24 - 2.51) = 27.1: reachable; a pH of 7.6 is inside the field's range, so the floor case is
    // the venous test's (HCO3 6.1)
    expect(g.derived.targetPco2).toBe(27.1);
  });

  it('no target: said so, nothing suggested', () => {
    const f = read({ gas: normalGas, patient: man, ventilator: { vt: 450, rr: 16 } });
    expect(codes(f)).toContain('no_ventilation_target');
    expect(f.derived.suggestedRr).toBeNull();
  });

  it('a suggestion from a venous PCO2 is flagged', () => {
    const f = read({ ...ards, sample: 'venous' });
    expect(codes(f)).toContain('suggestion_from_venous_pco2');
  });
});

describe('a target below what the patient needs (clinical-scope section 8)', () => {
  it("metabolic acidosis ventilated to a 'normal' PaCO2 40: above Winters' 24.7-28.7 (Albert 1967)", () => {
    // pH 7.30, PaCO2 26, HCO3 12.45: Winters 1.5 x 12.45 + 8 = 26.7 +/- 2
    const f = read({
      gas: { ph: 7.3, pco2: 26, hco3: 12.45 },
      patient: man,
      oxygen: { fio2: 0.4, peep: 5 },
      ventilator: { vt: 450, rr: 20, targetPco2: 40 },
    });
    expect(disorderList(f)).toEqual([['metabolic_acidosis', null]]);
    expect(f.flags.find((x) => x.code === 'target_pco2_above_compensation')?.values).toEqual({
      target: 40,
      expectedLow: 24.7,
      expectedHigh: 28.7,
    });
    // the requested 40 is replaced by Winters' middle, 26.7 (Albert 1967): RR 20 x 26 / 26.7 = 19.5 -> 19, never slowed
    // to 13 as a 'normal' 40 would ask
    expect(f.derived.targetPco2).toBe(26.7);
    expect(f.ventilation).toMatchObject({ targetBasis: 'compensation', requestedTarget: 40 });
    expect(f.derived.suggestedRr).toBe(19);
  });

  it('the same acidosis with a target inside the compensation is not flagged', () => {
    const f = read({
      gas: { ph: 7.3, pco2: 26, hco3: 12.45 },
      patient: man,
      ventilator: { vt: 450, rr: 20, targetPco2: 26 },
    });
    expect(codes(f)).not.toContain('target_pco2_above_compensation');
  });

  it('chronic hypercapnia with a usual PaCO2 of 60 and a target pH of 7.40: target 56.7 is below the usual (by hand 39.81 x 28.5 / 20.02)', () => {
    const f = read({
      gas: { ph: 7.3, pco2: 75, hco3: 36 },
      context: { baseline: { pco2: 60, hco3: 34 } },
      patient: man,
      oxygen: { fio2: 0.3, peep: 5 },
      ventilator: { vt: 450, rr: 14, targetPh: 7.4 },
    });
    expect(f.flags.find((x) => x.code === 'target_pco2_below_baseline')?.values).toEqual({
      target: 56.7,
      usual: 60,
      estimated: false,
    });
    expect(f.ventilation?.usualPco2).toBe(60);
    // the usual value becomes the target: RR 14 x 75 / 60 = 17.5 -> 18 (West)
    expect(f.derived.targetPco2).toBe(60);
    expect(f.ventilation).toMatchObject({ targetBasis: 'usual', requestedTarget: 56.7 });
    expect(f.derived.suggestedRr).toBe(18);
  });

  it('without a stated baseline the usual PaCO2 is the point on the chronic line from which an acute change reaches today: (36 - 10 - 7.5) / 0.25 = 74 (clinical-scope section 10)', () => {
    const f = read({
      gas: { ph: 7.3, pco2: 75, hco3: 36 },
      context: { timing: 'chronic' },
      patient: man,
      ventilator: { vt: 450, rr: 14, targetPh: 7.4 },
    });
    expect(f.flags.find((x) => x.code === 'target_pco2_below_baseline')?.values).toEqual({
      target: 56.7,
      usual: 74,
      estimated: true,
    });
  });

  it('an acute respiratory acidosis in a previously well patient has no usual hypercapnia to protect', () => {
    const f = read({
      gas: { ph: 7.25, pco2: 60, hco3: 26 },
      context: { timing: 'acute' },
      patient: man,
      ventilator: { vt: 450, rr: 14, targetPh: 7.4 },
    });
    expect(codes(f)).not.toContain('target_pco2_below_baseline');
    expect(f.ventilation?.usualPco2).toBeNull();
  });
});
