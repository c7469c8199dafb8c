// The hard cases beyond usual values (clinical-scope section 10) through interpret(): the ceiling of respiratory
// compensation, urine tests where they mean something, altitude, glucose and ketoacidosis, the osmolar gap with a
// measured ethanol, and a "normal" PaCO2 that is not normal. Invented patients in scenarios of our own; every gas is
// Henderson-consistent. The source is named beside each check value.
import { describe, expect, it } from 'vitest';
import { FIELD } from '../../calc/index.ts';
import { codes, disorderList, expectNear, read } from './helpers.ts';

const flagValues = (f: ReturnType<typeof read>, code: string) =>
  f.flags.filter((x) => x.code === code).map((x) => x.values);

describe('metabolic alkalosis near the ceiling of compensation (55-60 mmHg; common practice, from memory)', () => {
  it.each([
    // HCO3, PaCO2, pH, disorders; expected PaCO2 0.7 x HCO3 + 21 +/- 2 (Berend 2014)
    [
      48,
      51,
      7.59,
      [['metabolic_alkalosis', null]],
      true,
      'expects 52.6-56.6: 1.6 short, near the ceiling',
    ],
    [
      48,
      44,
      7.66,
      [
        ['metabolic_alkalosis', null],
        ['respiratory_alkalosis', null],
      ],
      false,
      '8.6 short: more than the ceiling explains',
    ],
    [
      36,
      40,
      7.57,
      [
        ['metabolic_alkalosis', null],
        ['respiratory_alkalosis', null],
      ],
      false,
      'expects 44.2-48.2, far from the ceiling: the rule as before',
    ],
    [
      48,
      62,
      7.51,
      [
        ['metabolic_alkalosis', null],
        ['respiratory_acidosis', null],
      ],
      false,
      'above the band: beyond what compensation reaches',
    ],
  ] as const)('HCO3 %s, PaCO2 %s: %j', (hco3, pco2, ph, disorders, nearCeiling, _why) => {
    const f = read({ gas: { ph, pco2, hco3 } });
    expect(disorderList(f)).toEqual(disorders);
    expect(f.compensation?.nearCeiling).toBe(nearCeiling);
  });

  it('an 80-year-old vomiting for a week, HCO3 48: the expected band is still the rule (52.6-56.6, Berend 2014)', () => {
    const f = read({ gas: { ph: 7.59, pco2: 51, hco3: 48 } });
    expect(f.derived.expectedPco2).toEqual({ low: 52.6, high: 56.6 });
  });
});

describe('urine tests read only where they mean something (common practice)', () => {
  it('metabolic alkalosis: urine chloride read, urine anion gap not', () => {
    const f = read({
      gas: { ph: 7.59, pco2: 51, hco3: 48 },
      chemistry: { na: 133, cl: 74, k: 2.6 },
      urine: { na: 25, k: 45, cl: 8 },
    });
    expect(f.metabolic.urineChlorideResponsive).toBe(true); // 8 < 20
    expect(f.derived.urineAnionGap).toBeNull();
    expect(f.metabolic.urineNotRead).toEqual({ anionGap: true, chloride: false });
  });

  it('normal-AG acidosis from diarrhoea: urine anion gap read (30 + 25 - 70 = -15), urine chloride not', () => {
    const f = read({
      gas: { ph: 7.28, pco2: 29, hco3: 13.3 },
      chemistry: { na: 137, cl: 114, albumin: 4.0 },
      urine: { na: 30, k: 25, cl: 70 },
    });
    expect(f.derived.urineAnionGap).toBe(-15);
    expect(f.metabolic.urineAnionGapNegative).toBe(true);
    expect(f.metabolic.urineChlorideResponsive).toBeNull();
    expect(f.metabolic.urineNotRead).toEqual({ anionGap: false, chloride: true });
  });

  it('a raised-AG and a normal-AG acidosis together: the urine anion gap is not read (ketoacids and other urinary anions)', () => {
    const f = read({
      gas: { ph: 7.29, pco2: 28, hco3: 13 },
      chemistry: { na: 138, cl: 107 },
      urine: { na: 30, k: 25, cl: 70 },
    });
    // AG 18, delta ratio 6 / 11 = 0.55 (Wrenn 1990): both acidoses named
    expect(disorderList(f)).toEqual([
      ['metabolic_acidosis', 'high_anion_gap'],
      ['metabolic_acidosis', 'normal_anion_gap'],
    ]);
    expect(f.derived.urineAnionGap).toBeNull();
  });
});

describe('altitude (ARDS Definition Task Force, JAMA 2012; ICAO standard atmosphere, ISO 2533)', () => {
  it('a 45-year-old resident at 3,600 m on room air: a low inspired PO2, not type 1 respiratory failure', () => {
    const f = read({
      gas: { ph: 7.44, pco2: 28, po2: 52, hco3: 18.5 },
      oxygen: { fio2: 0.21 },
      context: { altitudeM: 3600 },
      patient: { ageYears: 45, sex: 'male' },
    });
    // PB = 760 x (1 - 2.25577e-5 x 3600)^5.25588 = 486.95; PAO2 = 0.21 x 439.95 - 28 / 0.8 = 57.4; A-a 5.4,
    // under 45 / 4 + 4 = 15 (common practice)
    expect(f.derived).toMatchObject({
      barometricPressure: 487,
      alveolarPo2: 57.4,
      aaGradient: 5.4,
    });
    expect(f.oxygenation).toMatchObject({
      level: 'respiratory_failure',
      aaRaised: false,
      lowInspiredPo2: true,
      failureType: null,
    });
    // P/F 52 / 0.21 = 247.6; adjusted 247.6 x 486.95 / 760 = 158.7 (Berlin definition)
    expect(f.derived.pfRatio).toBe(248);
    expect(f.derived.pfRatioAdjusted).toBe(159);
    expect(f.explain.pfRatioAdjusted?.source).toMatch(/Berlin/);
    expect(codes(f)).toEqual(
      expect.arrayContaining(['low_inspired_po2', 'pf_adjusted_for_altitude']),
    );
  });

  it('ventilated at 2,400 m with PB measured 565 mmHg: the Berlin band is that of the adjusted ratio', () => {
    const f = read({
      gas: { ph: 7.36, pco2: 41, po2: 110, hco3: 22.6 },
      oxygen: { fio2: 0.5, peep: 10 },
      context: { barometricPressure: 565 },
    });
    // P/F 220 (mild at sea level); 220 x 565 / 760 = 163.6, moderate (<= 200)
    expect(f.derived.pfRatio).toBe(220);
    expect(f.derived.pfRatioAdjusted).toBe(164);
    expect(f.oxygenation).toMatchObject({ pfBand: 'moderate', pfBandFrom: 'altitude_adjusted' });
  });

  it('hypercapnia at altitude stays type 2; at sea level nothing is adjusted', () => {
    const high = read({
      gas: { ph: 7.33, pco2: 48, po2: 30, hco3: 24.6 },
      oxygen: { fio2: 0.21 },
      context: { altitudeM: 3600 },
      patient: { ageYears: 45 },
    });
    // PAO2 = 0.21 x 439.95 - 48 / 0.8 = 32.4: A-a 2.4, normal, but the PaCO2 of 48 makes it hypoventilation too
    expect(high.oxygenation).toMatchObject({ failureType: 2, lowInspiredPo2: false });
    const sea = read({
      gas: { ph: 7.36, pco2: 41, po2: 110, hco3: 22.6 },
      oxygen: { fio2: 0.5, peep: 10 },
    });
    expect(sea.derived.pfRatioAdjusted).toBeNull();
    expect(sea.oxygenation.pfBandFrom).toBe('measured');
  });

  it('the page asks altitude or barometric pressure in the oxygen step, optionally (the table of fields)', () => {
    for (const path of ['context.altitudeM', 'context.barometricPressure'] as const)
      expect(FIELD[path]).toMatchObject({ step: 'oxygen', optional: true });
  });
});

describe('glucose and ketoacidosis (Katz 1973; Kitabchi 2009; JBDS, from memory)', () => {
  it('a 19-year-old with type 1 diabetes, glucose 612 mg/dL: the ketoacidosis pattern, K high', () => {
    const f = read({
      units: { glucose: 'mg/dL' },
      gas: { ph: 7.08, pco2: 16, hco3: 4.6 },
      chemistry: { na: 129, k: 5.9, cl: 95, glucose: 612 },
      context: { conditions: ['diabetes'] },
    });
    // corrected Na 129 + 1.6 x 5.12 = 137.2 (Katz); effective 2 x 129 + 33.97 = 292.0 (Kitabchi 2009)
    expect(f.derived.correctedSodium).toBe(137);
    expect(f.derived.effectiveOsmolality).toBe(292);
    expect(f.explain.correctedSodium?.source).toMatch(/Katz/);
    expect(f.metabolic.glucose).toMatchObject({
      ketoacidosisPattern: true,
      hyperosmolar: false,
      potassium: 'high',
    });
    expect(flagValues(f, 'potassium_before_insulin')).toEqual([{ k: 5.9, status: 'high' }]);
    expect(codes(f)).toContain('ketoacidosis_pattern');
  });

  it('a 74-year-old with glucose 52 mmol/L and Na 148: hyperosmolar, K 3.1 to replace before insulin', () => {
    const f = read({
      units: { glucose: 'mmol/L' },
      gas: { ph: 7.34, pco2: 38, hco3: 20.1 },
      chemistry: { na: 148, k: 3.1, cl: 110, glucose: 52 },
    });
    // corrected Na 148 + 1.6 x 8.37 = 161.4 (Katz); effective 2 x 148 + 52 = 348 >= 320 with glucose >= 30 (Kitabchi)
    expect(f.derived.correctedSodium).toBe(161);
    expect(flagValues(f, 'hyperosmolar_state')).toEqual([
      { effectiveOsmolality: 348, glucose: 52 },
    ]);
    expect(flagValues(f, 'potassium_before_insulin')).toEqual([{ k: 3.1, status: 'low' }]);
  });

  it('known diabetes with a glucose of 8 mmol/L and a raised gap is still the pattern (euglycaemic ketoacidosis)', () => {
    const f = read({
      units: { glucose: 'mmol/L' },
      gas: { ph: 7.22, pco2: 24, hco3: 9.6 },
      chemistry: { na: 138, cl: 104, glucose: 8, k: 4.2 },
      context: { conditions: ['diabetes'] },
    });
    expect(f.metabolic.glucose).toMatchObject({ ketoacidosisPattern: true, potassium: 'within' });
    // no hyperglycaemia, so no corrected sodium
    expect(f.derived.correctedSodium).toBeNull();
  });

  it('a raised gap with a normal glucose and no diabetes is not the ketoacidosis pattern', () => {
    const f = read({
      units: { glucose: 'mmol/L' },
      gas: { ph: 7.22, pco2: 24, hco3: 9.6 },
      chemistry: { na: 138, cl: 104, glucose: 6 },
    });
    expect(f.metabolic.glucose?.ketoacidosisPattern).toBe(false);
    expect(codes(f)).not.toContain('ketoacidosis_pattern');
  });
});

describe('osmolar gap with a measured ethanol (Purssell RA et al., Ann Emerg Med 2001)', () => {
  it('ethanol 22 mmol/L is counted in the calculated osmolality; a gap is left, with a raised anion gap', () => {
    const f = read({
      units: { glucose: 'mmol/L', urea: 'urea-mmol/L', ethanol: 'mmol/L' },
      gas: { ph: 7.22, pco2: 24, hco3: 9.6 },
      chemistry: { na: 138, cl: 104, glucose: 5.5, urea: 5, osmolality: 330, ethanol: 22 },
    });
    // 22 mmol/L x 4.607 = 101.4 mg/dL, / 3.7 = 27.4; 2 x 138 + 5.5 + 5 + 27.4 = 313.9; gap 16.1 (> 10, common practice)
    expect(f.derived.calculatedOsmolality).toBe(313.9);
    expect(f.derived.osmolarGap).toBe(16.1);
    expect(flagValues(f, 'osmolar_gap_raised')).toEqual([
      { osmolarGap: 16.1, ethanolMeasured: true, anionGapRaised: true },
    ]);
  });
});

describe('a "normal" PaCO2 that is not normal (clinical-scope section 10)', () => {
  it('a 23-year-old in an asthma attack with PaCO2 42: no acid-base disorder, but a life-threatening sign', () => {
    const f = read({
      gas: { ph: 7.36, pco2: 42, po2: 68, hco3: 23.1 },
      oxygen: { fio2: 0.4 },
      context: { conditions: ['asthma'] },
    });
    expect(f.disorders).toEqual([]);
    // a normal PaCO2 (4.6-6.0 kPa) in acute asthma is life-threatening (BTS/SIGN guideline, from memory)
    expect(flagValues(f, 'relative_hypoventilation')).toEqual([
      { reason: 'asthma', pco2: 42, limit: 35 },
    ]);
  });

  it('a ketoacidosis with PaCO2 40: far above the Winters band 20.4-24.4 (Albert, Dell and Winters 1967)', () => {
    const f = read({ gas: { ph: 7.0, pco2: 40, hco3: 9.6 }, chemistry: { na: 134, cl: 98 } });
    expect(flagValues(f, 'relative_hypoventilation')).toEqual([
      { reason: 'metabolic_acidosis', pco2: 40, limit: 24.4 },
    ]);
  });

  it('a pregnant woman with asthma and PaCO2 40: both reasons (pregnancy 28-32, textbook common practice)', () => {
    const f = read({
      gas: { ph: 7.32, pco2: 40, hco3: 20 },
      patient: { sex: 'female', pregnant: true },
      context: { conditions: ['asthma'] },
    });
    expect(flagValues(f, 'relative_hypoventilation').map((v) => v.reason)).toEqual([
      'pregnancy',
      'asthma',
    ]);
  });

  it.each([
    ['a low PaCO2 in an asthma attack', { gas: { ph: 7.47, pco2: 32, hco3: 23 } }],
    [
      'a ventilated patient (the ventilation checks judge the PaCO2 there)',
      { gas: { ph: 7.36, pco2: 42, hco3: 23.1 }, ventilator: { vt: 450, rr: 16 } },
    ],
  ])('no warning for %s', (_story, c) => {
    const f = read({ ...c, context: { conditions: ['asthma'] } });
    expect(codes(f)).not.toContain('relative_hypoventilation');
  });

  it('a venous PCO2 of 44 stands for an arterial one from 38 (Byrne et al. 2014, from memory): still not low', () => {
    const f = read({
      sample: 'venous',
      gas: { ph: 7.34, pco2: 44, hco3: 23.4 },
      context: { conditions: ['asthma'] },
    });
    expectNear(flagValues(f, 'relative_hypoventilation')[0]?.pco2 as number, 44, 0);
  });
});
