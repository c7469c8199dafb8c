// Worked cases of our own invention for the second-round ventilator and oxygen rules (clinical-scope section 10),
// through interpret(). Each check value is worked by hand from the published source named beside it.
import { describe, expect, it } from 'vitest';
import { interpret } from '../../calc/index.ts';
import { codes, read } from './helpers.ts';
import { stiffLungs, asthma, septic, ards, copd, embolism } from './ventilatorCases.ts';

describe('1. the volume route respects mechanics', () => {
  it('VT 400 mL is 7.6 mL/kg but would give a driving pressure of 16: not offered; RR 21 is', () => {
    const f = read(stiffLungs);
    // target: [H+] 46.77 x (25.1 - 5.5) / (24 - 4.677) = 47.4 mmHg (Henderson with the Berend 2014 acute rule)
    expect(f.derived.targetPco2).toBe(47.4);
    // Crs 360 / (26 - 12) = 25.7 (clinical-scope section 10)
    expect(f.derived.compliance).toBe(25.7);
    // VT 115.3 + 244.7 x 55 / 47.44 = 399 -> 400 mL (West); plateau 12 + 400 / 25.71 = 27.6 -> 28, driving 15.6 -> 16
    expect(f.derived).toMatchObject({
      suggestedVt: 400,
      suggestedVtPerKgPbw: 7.6,
      predictedPlateau: 28,
      predictedDrivingPressure: 16,
    });
    expect(f.ventilation?.vtRoute).toMatchObject({
      offered: false,
      limits: ['driving_pressure_above_15'], // Amato 2015: 15 cmH2O or less
    });
    // RR 18 x 55 / 47.44 = 20.9 -> 21 (West), within 35
    expect(f.derived.suggestedRr).toBe(21);
    expect(f.ventilation?.rrRoute?.offered).toBe(true);
    expect(codes(f)).toContain('suggested_vt_pressure_limits');
  });
});

describe('2. the rate route respects expiratory time', () => {
  it('RR 19 leaves an expiratory time of 2.2 s (3.3 s now); asthma: air trapping flagged', () => {
    const f = read(asthma);
    // target [H+] 50.12 x (24.2 - 6.4) / (24 - 5.012) = 47.0 (Henderson, Berend 2014 acute rule); RR 14 x 64 / 47 = 19
    expect(f.derived.targetPco2).toBe(47);
    expect(f.derived.suggestedRr).toBe(19);
    // Te = 60 / RR - Ti (common practice): 60 / 14 - 1.0 = 3.3 s; 60 / 19 - 1.0 = 2.2 s
    expect(f.derived.expiratoryTime).toBe(3.3);
    expect(f.derived.suggestedExpiratoryTime).toBe(2.2);
    expect(f.ventilation?.obstruction).toBe('asthma');
    expect(f.flags.find((x) => x.code === 'air_trapping_risk')?.values).toMatchObject({
      obstruction: 'asthma',
      rr: 14,
      suggestedRr: 19,
      expiratoryTime: 3.3,
      suggestedExpiratoryTime: 2.2,
    });
  });

  it('a rate that leaves no time to breathe out is not offered: Ti 2.0 s at RR 31 leaves 60 / 31 - 2 < 0', () => {
    const f = read({
      ...asthma,
      context: {},
      ventilator: { vt: 400, rr: 20, inspiratoryTime: 2.0, targetPco2: 41 },
    });
    // RR 20 x 64 / 41 = 31.2 -> 31 (West); Te = 1.94 - 2.0 = -0.06 s
    expect(f.derived.suggestedRr).toBe(31);
    expect(f.ventilation?.rrRoute).toMatchObject({
      offered: false,
      limits: ['no_expiratory_time'],
    });
  });

  it('without known obstruction, a PaCO2 above 45 with a plateau above 30 counts as obstruction', () => {
    const f = read({ ...asthma, context: {}, ventilator: { ...asthma.ventilator, pplat: 33 } });
    expect(f.ventilation?.obstruction).toBe('pressures');
  });
});

describe('3. metabolic acidosis on a ventilator', () => {
  it("the target is Winters' 1.5 x 10.9 + 8 = 24.4, never 40; beyond safe settings: the best within them and the levers", () => {
    const f = read(septic);
    expect(f.derived.targetPco2).toBe(24.4); // Albert, Dell and Winters 1967
    expect(f.ventilation).toMatchObject({ targetBasis: 'compensation', requestedTarget: 40 });
    // RR 28 x 36 / 24.35 = 41 > 35; VT 167.3 + 282.7 x 36 / 24.35 = 585 -> 590, plateau 8 + 590 / 32.14 = 26,
    // driving pressure 18 > 15 (West; Amato 2015)
    expect(f.derived).toMatchObject({
      suggestedRr: 41,
      suggestedVt: 590,
      predictedDrivingPressure: 18,
    });
    // best: VT min(608, 707, 15 x 32.14 = 482) -> 480, RR 35; PaCO2 36 x 28 x 282.7 / (35 x 312.7) = 26.0;
    // HCO3 10.9 - 1.0 = 9.9, [H+] 63.1, pH 7.20
    expect(f.ventilation?.best).toMatchObject({
      vt: 480,
      rr: 35,
      reachesTarget: false,
      vtLimitedBy: 'driving_pressure',
    });
    expect(f.derived).toMatchObject({ bestVt: 480, bestRr: 35, bestPco2: 26, bestPh: 7.2 });
    // pH 7.10 is at or below 7.20: bicarbonate with acute kidney injury (BICAR-ICU, Jaber 2018)
    expect(f.ventilation?.beyondVentilator).toEqual({ bicarbonate: true });
    expect(codes(f)).toContain('compensation_beyond_ventilator');
    expect(codes(f)).not.toContain('permissive_hypercapnia_possible');
  });

  it('no target asked, PaCO2 above the Winters band: the band middle is the target', () => {
    const f = read({ ...septic, ventilator: { vt: 450, rr: 28, pplat: 22 } });
    expect(f.derived.targetPco2).toBe(24.4);
    expect(f.ventilation?.targetBasis).toBe('compensation');
    expect(codes(f)).not.toContain('no_ventilation_target');
  });
});

describe('4. lung-protective ventilation: permissive hypercapnia only in the ARDS Network pH range', () => {
  it('pH 7.18: no permissive hypercapnia; RR up to 35 with the PaCO2 and pH it gives (ARDS Network 2000)', () => {
    const f = read(ards);
    // target 44.67 x 18.1 / 19.53 = 41.4; RR 30 x 68 / 41.39 = 49; VT 155.3 + 264.7 x 68 / 41.39 = 590 (8.4 mL/kg)
    expect(f.derived).toMatchObject({ targetPco2: 41.4, suggestedRr: 49, suggestedVt: 590 });
    // best: Crs 420 / 15 = 28, driving 15 at 420 mL: VT 420, RR 35; PaCO2 68 x 30 / 35 = 58.3, pH 7.23
    expect(f.derived).toMatchObject({ bestVt: 420, bestRr: 35, bestPco2: 58.3, bestPh: 7.23 });
    expect(f.ventilation?.ardsnetStep).toBe('raise_rr');
    expect(f.flags.find((x) => x.code === 'ph_below_ardsnet_goal')?.values).toMatchObject({
      ph: 7.18,
      bestRr: 35,
      bestPh: 7.23,
      bicarbonate: false,
    });
    expect(codes(f)).not.toContain('permissive_hypercapnia_possible');
  });

  it('pH 7.08 (PaCO2 95, HCO3 27.6): at RR 35 the PaCO2 95 x 30 / 35 = 81.4 and the pH 7.13 stay too low, so bicarbonate may be considered', () => {
    // [H+] 24 x 95 / 27.6 = 82.6, pH 7.08 (Henderson); at the best setting HCO3 27.6 - 1.36 = 26.24, [H+] 74.5, pH 7.13
    const f = read({ ...ards, gas: { ph: 7.08, pco2: 95, po2: 70, hco3: 27.6 } });
    expect(f.derived.bestPh).toBe(7.13);
    expect(f.ventilation?.ardsnetStep).toBe('bicarbonate');
    expect(f.flags.find((x) => x.code === 'ph_below_ardsnet_goal')?.values.bicarbonate).toBe(true);
  });
});

describe('5. chronic hypercapnia', () => {
  it('a target pH of 7.40 asks 53.5, below the usual 58: the usual value is the target, RR 14 x 76 / 58 = 18', () => {
    const f = read(copd);
    // 39.81 x (34.5 - 7.6) / (24 - 3.981) = 53.5 (Henderson, Berend 2014 acute rule)
    expect(f.ventilation).toMatchObject({
      targetBasis: 'usual',
      requestedTarget: 53.5,
      usualPco2: 58,
    });
    expect(f.derived.targetPco2).toBe(58);
    expect(f.derived.suggestedRr).toBe(18); // West
    expect(f.flags.find((x) => x.code === 'target_pco2_below_baseline')?.values).toEqual({
      target: 53.5,
      usual: 58,
      estimated: false,
    });
    // known COPD: the rate rise comes with the air-trapping caution
    expect(codes(f)).toContain('air_trapping_risk');
  });
});

describe("6. oxygen targets (BTS guideline, O'Driscoll 2017)", () => {
  // a 68-year-old woman with COPD on a 60% venturi mask
  const retainer = {
    gas: { ph: 7.31, pco2: 63, po2: 165, hco3: 31.3, sao2: 99 },
    patient: { ageYears: 68, sex: 'female' },
    context: { conditions: ['copd'] },
    oxygen: { fio2: 0.6, spo2: 99 },
  };

  it('COPD: target 88-92%, SpO2 99% on FiO2 0.60 is too much oxygen (a warning)', () => {
    const f = read(retainer);
    expect(f.oxygenation.target).toEqual({ low: 88, high: 92, basis: 'hypercapnic_risk' });
    expect(f.oxygenation.aboveTarget).toBe(true);
    expect(f.flags.find((x) => x.code === 'spo2_above_target')).toMatchObject({
      severity: 'warning',
      values: { saturation: 99, source: 'spo2', low: 88, high: 92, basis: 'hypercapnic_risk' },
    });
  });

  it('no risk of hypercapnia: 94-98%, SpO2 99% on FiO2 0.60 is flagged as information only', () => {
    const f = read({
      ...retainer,
      context: {},
      gas: { ph: 7.42, pco2: 38, po2: 165, hco3: 24.3, sao2: 99 },
    });
    expect(f.oxygenation.target).toEqual({ low: 94, high: 98, basis: 'standard' });
    expect(f.flags.find((x) => x.code === 'spo2_above_target')?.severity).toBe('info');
  });

  it('room air: no oxygen to reduce, nothing flagged', () => {
    const f = read({
      ...retainer,
      oxygen: { fio2: 0.21, spo2: 99 },
      gas: { ...retainer.gas, po2: 90 },
    });
    expect(codes(f)).not.toContain('spo2_above_target');
  });

  it('pregnancy at 30 weeks: the weeks say pregnant; target 95-98% (from memory) and the pregnancy reference', () => {
    const f = read({
      gas: { ph: 7.44, pco2: 30, po2: 98, hco3: 20.1 },
      patient: { ageYears: 29, sex: 'female', pregnancyWeeks: 30 },
      oxygen: { fio2: 0.21, spo2: 97 },
    });
    expect(f.case.patient.pregnant).toBe(true);
    expect(f.reference.kind).toBe('pregnancy');
    expect(f.oxygenation.target).toEqual({ low: 95, high: 98, basis: 'pregnancy' });
  });
});

describe('7. severe hypoxaemia and the ARDS paragraph', () => {
  it('P/F 86 / 0.8 = 108 on FiO2 0.80, PEEP 12: severe (PROSEVA, Guerin 2013)', () => {
    const f = read({
      gas: { ph: 7.34, pco2: 48, po2: 86, hco3: 25.5 },
      patient: { ageYears: 44, sex: 'male', heightCm: 178 },
      oxygen: { fio2: 0.8, peep: 12 },
      ventilator: { vt: 460, rr: 24, pplat: 27 },
    });
    expect(f.derived.pfRatio).toBe(108);
    expect(f.oxygenation.severeHypoxaemia).toBe(true);
    expect(f.oxygenation.ardsCriterionMet).toBe(true);
    expect(codes(f)).toContain('severe_hypoxaemia');
  });

  it.each([
    ['P/F 140 on FiO2 0.50 (below 0.6)', { fio2: 0.5, peep: 10 }, 70],
    ['P/F 140 with PEEP 4 (below 5)', { fio2: 0.6, peep: 4 }, 84],
    ['P/F 160 on FiO2 0.6', { fio2: 0.6, peep: 10 }, 96],
  ])('%s: not severe by the PROSEVA entry criteria', (_what, oxygen, po2) => {
    const f = read({ gas: { ph: 7.4, pco2: 40, po2, hco3: 24 }, oxygen });
    expect(f.oxygenation.severeHypoxaemia).toBe(false);
  });

  it('the ARDS oxygenation criterion applies only with PEEP 5 or more and P/F 300 or less, or S/F (Berlin 2012; global 2024)', () => {
    const noPeep = read({ gas: { ph: 7.4, pco2: 40, po2: 61, hco3: 24 }, oxygen: { fio2: 0.21 } });
    expect(noPeep.oxygenation.ardsCriterionMet).toBe(false);
    const highPf = read({
      gas: { ph: 7.4, pco2: 40, po2: 160, hco3: 24 },
      oxygen: { fio2: 0.5, peep: 5 },
    });
    expect(highPf.oxygenation.ardsCriterionMet).toBe(false); // 320
    const sf = read({ gas: { ph: 7.4, pco2: 40, hco3: 24 }, oxygen: { fio2: 0.4, spo2: 93 } });
    expect(sf.oxygenation.ardsCriterionMet).toBe(true); // 93 / 0.4 = 232.5 <= 315 with SpO2 <= 97
  });
});

describe('8. hypoxaemia explained', () => {
  it('room air, PaO2 61, PaCO2 31, age 39: PAO2 0.21 x 713 - 31 / 0.8 = 111, A-a 50 above 13.75: gas exchange impaired', () => {
    const f = read({
      gas: { ph: 7.46, pco2: 31, po2: 61, hco3: 21.7 },
      patient: { ageYears: 39, sex: 'female' },
      oxygen: { fio2: 0.21 },
    });
    expect(f.derived).toMatchObject({ alveolarPo2: 111, aaGradient: 50 });
    expect(f.oxygenation).toMatchObject({ aaRaised: true, gasExchangeImpaired: true });
  });

  it('room air, PaO2 55, PaCO2 70, age 40: PAO2 149.7 - 87.5 = 62.2, A-a 7.2 within 14: hypoventilation', () => {
    const f = read({
      gas: { ph: 7.25, pco2: 70, po2: 55, hco3: 29.8 },
      patient: { ageYears: 40 },
      oxygen: { fio2: 0.21 },
    });
    expect(f.oxygenation).toMatchObject({
      aaRaised: false,
      lowInspiredOrHypoventilation: true,
      gasExchangeImpaired: false,
    });
  });
});

describe('10. saturations and CO-oximetry (common practice thresholds)', () => {
  it('COHb 24%, SpO2 98%, SaO2 74%: COHb raised even for a smoker, a saturation gap of 24, judged by the SaO2', () => {
    const f = read({
      gas: { ph: 7.33, pco2: 34, po2: 380, hco3: 17.6, sao2: 74, cohb: 24, lactate: 4.5 },
      patient: { ageYears: 52, sex: 'male' },
      oxygen: { fio2: 0.8, spo2: 98 },
    });
    expect(f.flags.find((x) => x.code === 'cohb_raised')).toMatchObject({
      severity: 'critical',
      values: { band: 'raised' },
    });
    expect(f.derived.saturationGap).toBe(24);
    expect(codes(f)).toContain('saturation_gap');
    // with COHb raised, the pulse oximeter is not the saturation judged against the target
    expect(f.oxygenation.saturation).toEqual({ value: 74, source: 'sao2' });
    expect(f.oxygenation.belowTarget).toBe(true);
  });

  it('MetHb 12%: raised; COHb 2.5%: not', () => {
    const f = read({ gas: { ph: 7.4, pco2: 40, hco3: 24, methb: 12, cohb: 2.5 } });
    expect(codes(f)).toContain('methb_raised');
    expect(codes(f)).not.toContain('cohb_raised');
  });

  it('weeks of pregnancy with "not pregnant" are refused with a clear message', () => {
    const r = interpretOrErrors({
      gas: { ph: 7.4, pco2: 40, hco3: 24 },
      patient: { pregnant: false, pregnancyWeeks: 20 },
    });
    expect(r).toEqual([expect.objectContaining({ path: 'patient.pregnancyWeeks' })]);
  });
});

describe('11. dead space from end-tidal CO2', () => {
  it('VD = 111.3 + (380 - 111.3) x (52 - 29) / 52 = 230 mL, physiological (Enghoff form); VA 20 x 149.8 = 3.0 L/min', () => {
    const f = read(embolism);
    expect(f.ventilation?.deadSpaceSource).toBe('end_tidal');
    expect(f.derived).toMatchObject({
      alveolarDeadSpaceFraction: 0.44,
      deadSpaceMl: 230,
      alveolarVentilation: 3,
    });
    // target 43.65 x 19.9 / 19.635 = 44.2; VT 230.2 + 149.8 x 52 / 44.24 = 406 -> 410 (West)
    expect(f.derived).toMatchObject({ targetPco2: 44.2, suggestedVt: 410 });
    const estimate = read({
      ...embolism,
      ventilator: { ...embolism.ventilator, etco2: undefined },
    });
    expect(estimate.ventilation?.deadSpaceSource).toBe('estimated');
    expect(estimate.derived.deadSpaceMl).toBe(111); // 2.2 x 50.6 (Radford 1955)
  });

  it('an end-tidal CO2 above the PaCO2 is flagged and the estimate kept', () => {
    const f = read({ ...embolism, ventilator: { ...embolism.ventilator, etco2: 56 } });
    expect(codes(f)).toContain('etco2_above_paco2');
    expect(f.ventilation?.deadSpaceSource).toBe('estimated');
  });
});

function interpretOrErrors(c: unknown) {
  const r = interpret(c);
  return r.ok ? [] : r.errors;
}
