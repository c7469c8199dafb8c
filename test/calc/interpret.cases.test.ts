// Worked cases through interpret(): invented patients in scenarios of our own. The expected readings follow
// from the rules named beside each (Berend 2014 table; Winters 1967; Wrenn 1990; clinical-scope sections 2-7);
// every gas is Henderson-consistent (24 x PaCO2 / [H+] within 3 mmol/L and 10% of the HCO3) unless it says otherwise.
import { describe, expect, it } from 'vitest';
import { codes, disorderList, expectNear, read } from './helpers.ts';

describe('the four simple disorders', () => {
  it.each([
    [
      'a 24-year-old with type 1 diabetes, vomiting and breathless: ketoacidosis',
      { gas: { ph: 7.18, pco2: 18, hco3: 6.5 }, chemistry: { na: 134, cl: 98 } },
      [['metabolic_acidosis', 'high_anion_gap']],
      'Winters 1.5 x 6.5 + 8 = 17.75 +/- 2 (Albert 1967); AG 29.5 (Kraut 2007)',
    ],
    [
      'a 58-year-old with pyloric obstruction, vomiting for days',
      {
        gas: { ph: 7.51, pco2: 46, hco3: 36 },
        chemistry: { na: 138, cl: 88, k: 3.1 },
        urine: { na: 30, k: 40, cl: 12 },
      },
      [['metabolic_alkalosis', null]],
      'expected PaCO2 0.7 x 36 + 21 = 46.2 +/- 2 (Berend 2014 as in clinical-scope)',
    ],
    [
      'a 31-year-old found drowsy after an opioid overdose',
      { gas: { ph: 7.25, pco2: 60, hco3: 26 }, context: { timing: 'acute' } },
      [['respiratory_acidosis', 'acute']],
      'acute rule 24 + 1 x 2 = 26 +/- 2 (Berend 2014)',
    ],
    [
      'a 27-year-old hyperventilating with acute pain',
      { gas: { ph: 7.53, pco2: 28, hco3: 22.5 }, context: { timing: 'acute' } },
      [['respiratory_alkalosis', 'acute']],
      'acute rule 24 - 2 x 1.2 = 21.6 +/- 2 (Berend 2014)',
    ],
  ])('%s', (_story, c, disorders, _rule) => {
    const f = read(c);
    expect(disorderList(f)).toEqual(disorders);
    expect(f.disorders[0]?.role).toBe('primary');
    expect(f.disorders[0]?.basis).toBe('explains_ph');
    expect(codes(f)).not.toContain('values_inconsistent');
  });

  it('the ketoacidosis: expected PaCO2 15.75-19.75, AG 29.5, delta ratio 1.0 (Winters 1967; Wrenn 1990)', () => {
    const f = read({ gas: { ph: 7.18, pco2: 18, hco3: 6.5 }, chemistry: { na: 134, cl: 98 } });
    expect(f.derived.expectedPco2).toEqual({ low: 15.8, high: 19.8 });
    expect(f.derived.expectedHco3).toBeNull();
    expect(f.derived.anionGap).toBe(29.5);
    expect(f.derived.deltaRatio).toBe(1);
    expect(f.metabolic.deltaBand).toBe('high_gap');
    expect(f.compensation).toMatchObject({ rule: 'winters', verdict: 'within' });
  });

  it('the pyloric obstruction: urine chloride 12 says chloride-responsive (common practice)', () => {
    const f = read({
      gas: { ph: 7.51, pco2: 46, hco3: 36 },
      chemistry: { na: 138, cl: 88, k: 3.1 },
      urine: { na: 30, k: 40, cl: 12 },
    });
    expect(f.metabolic.urineChlorideResponsive).toBe(true);
    expect(f.derived.expectedPco2).toEqual({ low: 44.2, high: 48.2 });
  });
});

describe('respiratory timing: stated, or worked out from the numbers (clinical-scope section 4)', () => {
  it.each([
    // story, gas, timing, detail, fit, expected HCO3 band (acute 1 per 10, chronic 3.5 per 10, Berend 2014)
    [
      'opioid overdose, timing not given: fits acute',
      { ph: 7.25, pco2: 60, hco3: 26 },
      'unknown',
      'acute',
      'acute',
      { low: 24, high: 33 },
    ],
    [
      'long-standing COPD, timing not given: fits chronic',
      { ph: 7.33, pco2: 60, hco3: 31 },
      'unknown',
      'chronic',
      'chronic',
      { low: 24, high: 33 },
    ],
    [
      'COPD with a chest infection: HCO3 between the two rules',
      { ph: 7.24, pco2: 80, hco3: 33 },
      'unknown',
      'acute_on_chronic',
      'between',
      { low: 26, high: 40 },
    ],
    [
      'the same COPD patient, said to be chronic',
      { ph: 7.33, pco2: 60, hco3: 31 },
      'chronic',
      'chronic',
      'chronic',
      { low: 29, high: 33 },
    ],
    [
      'living at altitude for years: chronic respiratory alkalosis',
      { ph: 7.5, pco2: 20, hco3: 15 },
      'unknown',
      'chronic',
      'chronic',
      { low: 12, high: 22 },
    ],
    [
      'acute pain, timing not given: fits acute',
      { ph: 7.53, pco2: 28, hco3: 22.5 },
      'unknown',
      'acute',
      'acute',
      { low: 16, high: 23.6 },
    ],
  ] as const)('%s', (_story, gas, timing, detail, fit, band) => {
    const f = read({ gas, context: { timing } });
    expect(f.disorders).toHaveLength(1);
    expect(f.disorders[0]?.detail).toBe(detail);
    expect(f.compensation?.fit).toBe(fit);
    expect(f.derived.expectedHco3).toEqual(band);
    expect(f.derived.expectedPco2).toBeNull();
  });
});

describe('mixed and triple disorders', () => {
  it.each([
    [
      'cardiac arrest: lactic acidosis with no effective breathing',
      { gas: { ph: 6.95, pco2: 60, hco3: 13, lactate: 12 } },
      [
        ['metabolic_acidosis', null],
        ['respiratory_acidosis', null],
      ],
      'PaCO2 60 above Winters 25.5-29.5',
    ],
    [
      'septic shock with a normal pH: lactic acidosis and tachypnoea',
      { gas: { ph: 7.38, pco2: 20, hco3: 11.6, lactate: 6.1 }, chemistry: { na: 139, cl: 103 } },
      [
        ['metabolic_acidosis', 'high_anion_gap'],
        ['respiratory_alkalosis', null],
      ],
      'PaCO2 20 below Winters 23.4-27.4',
    ],
    [
      'COPD on diuretics, pH normal: hypercapnia with too high an HCO3',
      { gas: { ph: 7.39, pco2: 60, hco3: 36 } },
      [
        ['respiratory_acidosis', null],
        ['metabolic_alkalosis', null],
      ],
      'HCO3 36 above the chronic rule 31 +/- 2',
    ],
    [
      'salicylate poisoning with vomiting: respiratory alkalosis, high-AG acidosis, metabolic alkalosis',
      { gas: { ph: 7.48, pco2: 28, hco3: 20.3 }, chemistry: { na: 140, cl: 95 } },
      [
        ['respiratory_alkalosis', null],
        ['metabolic_acidosis', 'high_anion_gap'],
        ['metabolic_alkalosis', null],
      ],
      'AG 24.7; delta ratio 12.7 / 3.7 = 3.4 > 2',
    ],
    [
      'ketoacidosis with vomiting and pneumonia: high-AG acidosis, respiratory alkalosis, metabolic alkalosis',
      { gas: { ph: 7.38, pco2: 30, hco3: 17.4 }, chemistry: { na: 138, cl: 86 } },
      [
        ['metabolic_acidosis', 'high_anion_gap'],
        ['respiratory_alkalosis', null],
        ['metabolic_alkalosis', null],
      ],
      'Winters 34.1 +/- 2; AG 34.6, delta ratio 3.4',
    ],
  ])('%s', (_story, c, disorders, _rule) => {
    const f = read(c);
    expect(disorderList(f)).toEqual(disorders);
    expect(f.disorders.map((d) => d.role)).toEqual([
      'primary',
      ...disorders.slice(1).map(() => 'added'),
    ]);
  });

  it('a normal pH with abnormal PaCO2 and HCO3 is named a mixed disorder (clinical-scope section 4)', () => {
    const f = read({ gas: { ph: 7.38, pco2: 20, hco3: 11.6 } });
    expect(f.phStatus).toBe('normal');
    expect(f.disorders[0]?.basis).toBe('normal_ph_mixed');
    expect(f.disorders.length).toBeGreaterThan(1);
  });
});

describe('delta ratio bands (Wrenn 1990): one gas, pH 7.29, PaCO2 28, HCO3 13, with Na 138 and the chloride varied', () => {
  it.each([
    // Cl, AG, delta ratio (AG - 12) / 11, band, disorders; a gap that is not raised gives no ratio (clinical-scope
    // section 10: the ratio means something only with a raised gap)
    [115, 10, null, null, [['metabolic_acidosis', 'normal_anion_gap']], 'diarrhoea'],
    [
      107,
      18,
      0.55,
      'mixed_high_and_normal_gap',
      [
        ['metabolic_acidosis', 'high_anion_gap'],
        ['metabolic_acidosis', 'normal_anion_gap'],
      ],
      'ketoacidosis treated with saline',
    ],
    [101, 24, 1.09, 'high_gap', [['metabolic_acidosis', 'high_anion_gap']], 'lactic acidosis'],
    [
      88,
      37,
      2.27,
      'added_alkalosis',
      [
        ['metabolic_acidosis', 'high_anion_gap'],
        ['metabolic_alkalosis', null],
      ],
      'ketoacidosis after days of vomiting',
    ],
  ] as const)(
    'Cl %s: AG %s, delta ratio %s, %s (%s)',
    (cl, gap, ratio, band, disorders, _story) => {
      const f = read({ gas: { ph: 7.29, pco2: 28, hco3: 13 }, chemistry: { na: 138, cl } });
      expect(f.derived.anionGap).toBe(gap);
      expect(f.derived.deltaRatio).toBe(ratio);
      expect(f.metabolic.deltaBand).toBe(band);
      expect(disorderList(f)).toEqual(disorders);
    },
  );

  it('the corrected gap is used when albumin is known, and it says so (Figge 1998; clinical-scope section 5)', () => {
    const f = read({
      gas: { ph: 7.29, pco2: 28, hco3: 13 },
      chemistry: { na: 138, cl: 112, albumin: 1.6 },
    });
    expect(f.derived.anionGap).toBe(13); // 138 - (112 + 13): not raised uncorrected
    expect(f.derived.anionGapCorrected).toBe(19); // 13 + 2.5 x 2.4
    expect(f.metabolic.anionGapUsed).toBe('corrected');
    expect(f.derived.deltaRatio).toBe(0.64); // (19 - 12) / 11 (Wrenn 1990)
    expect(f.explain.deltaRatio?.inputs.map((i) => i.name)).toContain('AGc');
  });

  it('an uncorrected gap within the limit gives no delta ratio, whatever the HCO3 (clinical-scope section 10)', () => {
    const f = read({ gas: { ph: 7.29, pco2: 28, hco3: 13 }, chemistry: { na: 138, cl: 115 } });
    expect(f.metabolic.anionGapRaised).toBe(false);
    expect(f.derived.deltaRatio).toBeNull();
    expect(f.metabolic.delta).toBeNull();
  });

  it('a laboratory reference of 7 +/- 4 (modern analysers 3-11, Kraut and Madias 2007) makes a gap of 13 raised', () => {
    const f = read({
      gas: { ph: 7.29, pco2: 28, hco3: 13 },
      chemistry: { na: 138, cl: 112 },
      settings: { anionGapNormal: 7, anionGapHalfWidth: 4 },
    });
    expect(f.metabolic.anionGapUpperLimit).toBe(11);
    expect(f.metabolic.anionGapRaised).toBe(true);
    expect(f.derived.deltaRatio).toBe(0.55); // (13 - 7) / 11
  });

  it('the gap includes K when the laboratory adds it', () => {
    const f = read({
      gas: { ph: 7.29, pco2: 28, hco3: 13 },
      chemistry: { na: 138, k: 5, cl: 112 },
      settings: { anionGapIncludesK: true },
    });
    expect(f.derived.anionGap).toBe(18);
    expect(f.metabolic.anionGapIncludesK).toBe(true);
  });
});

describe('a raised gap hidden behind a normal pH (Kraut and Madias 2007; Wrenn 1990)', () => {
  it.each([
    ['ketoacidosis and vomiting that cancel in the gas', { na: 145, cl: 100 }, 21, null],
    [
      'the same, with the gap hidden by a low albumin of 1.5',
      { na: 137, cl: 100, albumin: 1.5 },
      13,
      19.3,
    ],
  ])('%s', (_story, chemistry, gap, corrected) => {
    const f = read({ gas: { ph: 7.4, pco2: 40, hco3: 24 }, chemistry });
    expect(f.phStatus).toBe('normal');
    expect(f.derived.anionGap).toBe(gap);
    expect(f.derived.anionGapCorrected).toBe(corrected);
    expect(disorderList(f)).toEqual([
      ['metabolic_acidosis', 'high_anion_gap'],
      ['metabolic_alkalosis', null],
    ]);
    expect(f.disorders.map((d) => d.basis)).toEqual([
      'raised_gap_hidden',
      'raised_gap_with_high_hco3',
    ]);
  });

  it('a normal gap with a normal gas names no disorder', () => {
    expect(
      read({ gas: { ph: 7.4, pco2: 40, hco3: 24 }, chemistry: { na: 140, cl: 104, albumin: 4 } })
        .disorders,
    ).toEqual([]);
  });
});

describe('a stated or estimated baseline (clinical-scope section 4)', () => {
  it.each([['acute'], ['unknown']] as const)(
    'COPD with usual PaCO2 60 / HCO3 32, now 80 / 34, timing %s: acute-on-chronic',
    (timing) => {
      const f = read({
        gas: { ph: 7.25, pco2: 80, hco3: 34 },
        context: { timing, baseline: { pco2: 60, hco3: 32 } },
      });
      expect(disorderList(f)).toEqual([['respiratory_acidosis', 'acute_on_chronic']]);
      expect(f.reference).toMatchObject({ kind: 'baseline', pco2: 60, hco3: 32 });
      // acute rule from the baseline: 32 + 1 x 20 / 10 = 34 +/- 2 (Berend 2014)
      expect(f.compensation?.acute).toEqual({ low: 32, high: 36 });
      expect(codes(f)).not.toContain('baseline_estimated');
    },
  );

  it('without the baseline the same gas would be read against 40 / 24', () => {
    const f = read({ gas: { ph: 7.25, pco2: 80, hco3: 34 } });
    expect(f.reference.kind).toBe('textbook');
    expect(f.compensation?.fit).toBe('between');
  });

  it('COPD with only a usual pH of 7.38: the usual PaCO2 is estimated, about 63, and flagged as an estimate', () => {
    // pH 7.25, PaCO2 85, HCO3 worked out 24 x 85 / 56.23 = 36.3, which is the chronic part (clinical-scope section 10):
    // usual PaCO2 = 41.69 x 36.3 / 24 = 63.0 (Henderson)
    const f = read({ gas: { ph: 7.25, pco2: 85 }, context: { baseline: { ph: 7.38 } } });
    expectNear(f.reference.pco2, 63.0, 0.1);
    expectNear(f.reference.hco3, 36.3, 0.1);
    expect(f.reference.estimated).toEqual({ pco2: true, hco3: false });
    expect(f.flags.find((x) => x.code === 'baseline_estimated')?.values).toMatchObject({
      pco2: 63,
      hco3: 36.3,
      pco2Estimated: true,
      source: 'usual_ph',
    });
    // only the acute-on-chronic respiratory acidosis: no metabolic process made up from the estimate itself
    expect(disorderList(f)).toEqual([['respiratory_acidosis', 'acute_on_chronic']]);
  });

  it('a usual pH is not turned into a baseline when the HCO3 itself has fallen (ketoacidosis, usual pH 7.40)', () => {
    const f = read({
      gas: { ph: 7.18, pco2: 18, hco3: 6.5 },
      chemistry: { na: 134, cl: 98 },
      context: { baseline: { ph: 7.4 } },
    });
    expect(f.reference).toMatchObject({ kind: 'textbook', usualPhIgnored: true });
    expect(disorderList(f)).toEqual([['metabolic_acidosis', 'high_anion_gap']]);
  });
});

describe('pregnancy reference: PaCO2 28-32, HCO3 18-22 (textbook common practice, clinical-scope section 4)', () => {
  const gas = { ph: 7.44, pco2: 30, hco3: 20 };
  it('a normal third-trimester gas is no disorder in pregnancy, with the reference flagged', () => {
    const f = read({ gas, patient: { sex: 'female', ageYears: 30, pregnant: true } });
    expect(f.disorders).toEqual([]);
    expect(f.reference.kind).toBe('pregnancy');
    expect(codes(f)).toContain('pregnancy_reference');
  });

  it('the same gas outside pregnancy is a respiratory alkalosis', () => {
    expect(read({ gas, patient: { sex: 'female', ageYears: 30 } }).disorders[0]?.code).toBe(
      'respiratory_alkalosis',
    );
  });

  it('a "normal" PaCO2 of 40 in a pregnant woman with asthma is a respiratory acidosis', () => {
    const f = read({
      gas: { ph: 7.32, pco2: 40, hco3: 20 },
      patient: { sex: 'female', pregnant: true },
    });
    expect(disorderList(f)).toEqual([['respiratory_acidosis', 'acute']]);
    // acute rule from 30 / 20: 20 + 1 x 10 / 10 = 21 +/- 2 (Berend 2014)
    expect(f.compensation?.acute).toEqual({ low: 19, high: 23 });
  });
});

describe('venous and capillary samples (clinical-scope section 7; Byrne et al. 2014, from memory)', () => {
  const venous = {
    sample: 'venous',
    gas: { ph: 7.18, pco2: 22, po2: 40, hco3: 8 },
    chemistry: { na: 135, cl: 100 },
    oxygen: { fio2: 0.21 },
    patient: { ageYears: 40 },
  };

  it('a venous gas in ketoacidosis: no A-a, no P/F, oxygenation not assessable', () => {
    const f = read(venous);
    expect(codes(f)).toEqual(
      expect.arrayContaining(['venous_sample', 'oxygenation_not_assessable']),
    );
    expect(f.oxygenation).toMatchObject({ assessable: false, reason: 'venous', level: null });
    for (const key of [
      'alveolarPo2',
      'aaGradient',
      'aaGradientExpected',
      'pfRatio',
      'sfRatio',
    ] as const)
      expect(f.derived[key]).toBeNull();
    // a venous PO2 of 40 is not hypoxaemia: no critical PaO2
    expect(f.flags.filter((x) => x.code === 'critical_value').map((x) => x.values.field)).toEqual([
      'ph',
    ]);
    expect(disorderList(f)).toEqual([['metabolic_acidosis', 'high_anion_gap']]);
  });

  it('the venous offsets: pH about 0.03 lower, HCO3 about 1 higher, PCO2 about 4-6 higher; below 45 arterial hypercapnia is unlikely', () => {
    expect(read(venous).venous).toEqual({
      sample: 'venous',
      hypercapniaUnlikely: true,
      arterialEstimate: { ph: 7.21, pco2Low: 16, pco2High: 18, hco3: 7 },
    });
    expect(
      read({ ...venous, gas: { ph: 7.3, pco2: 58, hco3: 27.7 } }).venous?.hypercapniaUnlikely,
    ).toBe(false);
  });

  it('a capillary gas: oxygenation not assessable, and no venous offsets', () => {
    const f = read({
      sample: 'capillary',
      gas: { ph: 7.36, pco2: 47, po2: 55, hco3: 26 },
      oxygen: { fio2: 0.28 },
    });
    expect(codes(f)).toEqual(
      expect.arrayContaining(['capillary_sample', 'oxygenation_not_assessable']),
    );
    expect(f.venous).toEqual({
      sample: 'capillary',
      hypercapniaUnlikely: false,
      arterialEstimate: null,
    });
    expect(f.derived.pfRatio).toBeNull();
    expect(f.derived.aaGradient).toBeNull();
  });
});

describe('oxygenation on an arterial sample', () => {
  it('the interface-contract example: PAO2 225.2, A-a 153.2, expected 20, P/F 180 (alveolar gas equation; age / 4 + 4)', () => {
    const f = read({
      gas: { ph: 7.31, pco2: 48, po2: 72, hco3: 23.5 },
      patient: { ageYears: 64, sex: 'female' },
      oxygen: { fio2: 0.4, peep: 8 },
    });
    expect(f.derived).toMatchObject({
      alveolarPo2: 225.2,
      aaGradient: 153.2,
      aaGradientExpected: 20,
      pfRatio: 180,
      barometricPressure: 760,
    });
    expect(f.oxygenation).toMatchObject({
      assessable: true,
      pfBand: 'moderate',
      pfBandApplies: true,
      level: 'hypoxaemia',
    });
    expect(codes(f)).toContain('aa_reference_room_air_only');
  });

  it('P/F bands do not apply without PEEP or CPAP of at least 5 (Berlin 2012)', () => {
    const f = read({ gas: { ph: 7.31, pco2: 48, po2: 72, hco3: 23.5 }, oxygen: { fio2: 0.4 } });
    expect(f.oxygenation.pfBandApplies).toBe(false);
  });

  it('a trekker at 3000 m: PB 525.9 by ISO 2533, PAO2 63.1, a normal A-a gradient with hypoxaemia (low inspired PO2)', () => {
    const f = read({
      gas: { ph: 7.46, pco2: 30, po2: 60, hco3: 21 },
      oxygen: { fio2: 0.21 },
      context: { altitudeM: 3000 },
      patient: { ageYears: 40 },
    });
    expect(f.derived.barometricPressure).toBe(526);
    expect(f.derived.alveolarPo2).toBe(63.1); // 0.21 x (525.86 - 47) - 30 / 0.8
    expect(f.derived.aaGradient).toBe(3.1);
    expect(f.oxygenation).toMatchObject({
      barometricSource: 'altitude',
      level: 'hypoxaemia',
      aaRaised: false,
      lowInspiredOrHypoventilation: true,
    });
    expect(f.explain.barometricPressure?.source).toMatch(/ISO 2533/);
  });

  it('an entered barometric pressure wins over the altitude', () => {
    const f = read({
      gas: { ph: 7.46, pco2: 30, po2: 60, hco3: 21 },
      oxygen: { fio2: 0.21 },
      context: { altitudeM: 3000, barometricPressure: 540 },
    });
    expect(f.derived.barometricPressure).toBe(540);
    expect(f.oxygenation.barometricSource).toBe('entered');
  });

  it('PaO2 above the alveolar PO2 on "room air" is physically impossible: po2_above_alveolar (clinical-scope section 3)', () => {
    const f = read({ gas: { ph: 7.41, pco2: 39, po2: 130, hco3: 24.4 }, oxygen: { fio2: 0.21 } });
    expect(f.flags.find((x) => x.code === 'po2_above_alveolar')?.values).toEqual({
      po2: 130,
      alveolarPo2: 101,
      fio2: 0.21,
    });
  });

  it('hypoxaemic respiratory failure type 1 and type 2 (PaO2 < 60; PaCO2 > 45 for type 2, common practice)', () => {
    expect(
      read({ gas: { ph: 7.46, pco2: 32, po2: 52, hco3: 22.6 }, oxygen: { fio2: 0.21 } }).oxygenation
        .failureType,
    ).toBe(1);
    expect(
      read({ gas: { ph: 7.25, pco2: 60, po2: 52, hco3: 26 }, oxygen: { fio2: 0.21 } }).oxygenation
        .failureType,
    ).toBe(2);
  });
});

describe('the cautions the data must carry', () => {
  it.each([
    [14, true],
    [15.9, true],
    [16, false],
    [64, false],
  ])('age %s: adult_rules_only %s (clinical-scope section 3)', (ageYears, flagged) => {
    const f = read({ gas: { ph: 7.3, pco2: 30, hco3: 14.4 }, patient: { ageYears } });
    expect(codes(f).includes('adult_rules_only')).toBe(flagged);
  });

  it('a reported HCO3 that the Henderson equation does not support: values_inconsistent, shown not hidden', () => {
    const f = read({ gas: { ph: 7.4, pco2: 40, hco3: 30 } });
    expect(f.flags.find((x) => x.code === 'values_inconsistent')?.values).toEqual({
      reported: 30,
      calculated: 24.1,
      difference: 5.9,
    });
    expect(f.consistency?.consistent).toBe(false);
  });

  it('PaCO2 5.3 "mmHg" with pH 7.40 is probably kPa: unit_ambiguous, and nothing is computed from it', () => {
    const f = read({
      gas: { ph: 7.4, pco2: 5.3, po2: 12.8 },
      oxygen: { fio2: 0.21 },
      chemistry: { na: 140, cl: 104 },
      ventilator: { vt: 450, rr: 14, targetPh: 7.4 },
    });
    expect(f.withheld).toBe(true);
    expect(f.flags.find((x) => x.code === 'unit_ambiguous')?.values).toMatchObject({
      field: 'gas.pco2',
      entered: 'mmHg',
      pco2: 5.3,
    });
    expect(f.disorders).toEqual([]);
    expect(f.compensation).toBeNull();
    expect(f.ventilation).toBeNull();
    const { hPlus, ...rest } = f.derived;
    expect(hPlus).toBe(39.8);
    expect(Object.values(rest).every((v) => v === null)).toBe(true);
    expect(Object.keys(f.explain)).toEqual(['hPlus']);
    // neither the HCO3 worked out from it nor a "critical" PaO2 of 12.8 is reported
    expect(codes(f)).not.toContain('gas_value_computed');
    expect(codes(f)).not.toContain('critical_value');
  });

  it('the same numbers entered as kPa are a normal gas', () => {
    const f = read({
      units: { pressure: 'kPa' },
      gas: { ph: 7.4, pco2: 5.3, po2: 12.8 },
      oxygen: { fio2: 0.21 },
    });
    expect(f.withheld).toBe(false);
    expect(codes(f)).not.toContain('unit_ambiguous');
    expect(f.disorders).toEqual([]);
  });

  it('an entered HCO3 that agrees with the low PaCO2 settles it: a real, extreme value, not a unit slip', () => {
    const f = read({ gas: { ph: 7.39, pco2: 12, hco3: 7.1 } });
    expect(codes(f)).not.toContain('unit_ambiguous');
    expect(f.disorders[0]?.code).toBe('metabolic_acidosis');
  });

  it('a PaCO2 worked out from pH and HCO3 was entered in no unit, so it is not called ambiguous', () => {
    const f = read({ gas: { ph: 7.4, hco3: 8 } });
    expect(f.case.gas.computed).toBe('pco2');
    expect(codes(f)).not.toContain('unit_ambiguous');
    expect(codes(f)).toContain('gas_value_computed');
  });

  it.each([
    // default critical values (common practice, clinical-scope section 9)
    [{ gas: { ph: 7.15, pco2: 30, hco3: 10.5 } }, 'ph', 'below'],
    [{ gas: { ph: 7.65, pco2: 25, hco3: 26.7 } }, 'ph', 'above'],
    [{ gas: { ph: 7.28, pco2: 75, hco3: 34.4 } }, 'pco2', 'above'],
    [{ gas: { ph: 7.44, pco2: 34, po2: 55, hco3: 22.6 } }, 'po2', 'below'],
    [{ gas: { ph: 7.4, pco2: 40, hco3: 24 }, chemistry: { k: 2.5 } }, 'k', 'below'],
    [{ gas: { ph: 7.4, pco2: 40, hco3: 24 }, chemistry: { k: 6.5 } }, 'k', 'above'],
    [{ gas: { ph: 7.4, pco2: 40, hco3: 24, lactate: 4 } }, 'lactate', 'above'],
  ])('%j raises critical_value for %s (%s the limit), listed first', (c, field, direction) => {
    const f = read(c);
    expect(f.flags[0]).toMatchObject({
      code: 'critical_value',
      severity: 'critical',
      values: { field, direction },
    });
  });

  it('no critical value for a normal gas', () => {
    expect(
      codes(
        read({
          gas: { ph: 7.4, pco2: 40, po2: 95, hco3: 24, lactate: 1.0 },
          chemistry: { k: 4.2 },
        }),
      ),
    ).not.toContain('critical_value');
  });

  it('a department may change the critical limits (configurable, clinical-scope section 9)', async () => {
    const { interpret } = await import('../../calc/index.ts');
    const f = interpret(
      { gas: { ph: 7.4, pco2: 40, hco3: 24 }, chemistry: { k: 5.9 } },
      {
        settings: {
          critical: {
            phLow: 7.2,
            phHigh: 7.6,
            pco2High: 70,
            po2Low: 60,
            kLow: 3,
            kHigh: 5.5,
            lactateHigh: 4,
          },
        },
      },
    );
    expect(f.ok && f.flags.some((x) => x.code === 'critical_value' && x.values.field === 'k')).toBe(
      true,
    );
  });
});

describe('SpO2/FiO2 needs no arterial PO2 (Matthay et al. 2024 global definition)', () => {
  it.each([
    [
      'a venous gas with SpO2 94% on FiO2 0.5',
      { sample: 'venous', gas: { ph: 7.36, pco2: 46, hco3: 25.3 } },
      188,
      true,
    ],
    [
      'an arterial gas sent without its PO2, SpO2 96% on FiO2 0.28',
      { gas: { ph: 7.42, pco2: 38, hco3: 24.2 } },
      343,
      false,
    ],
  ])('%s: S/F %s, criterion (<= 315) %s', (_story, c, sf, meets) => {
    const spo2 = sf === 188 ? 94 : 96,
      fio2 = sf === 188 ? 0.5 : 0.28;
    const f = read({ ...c, oxygen: { spo2, fio2 } });
    expect(f.derived.sfRatio).toBe(sf);
    expect(f.oxygenation.sfMeetsCriterion).toBe(meets);
    expect(f.derived.pfRatio).toBeNull();
  });
});

describe('earlier gases and the sample conditions', () => {
  it('the change since the last earlier gas, field by field', () => {
    const f = read({
      gas: { ph: 7.31, pco2: 48, hco3: 23.5 },
      previous: [
        { takenAt: 'day 1 22:00', gas: { ph: 7.1, pco2: 80, hco3: 24.1 } },
        { takenAt: 'day 2 04:10', gas: { ph: 7.22, pco2: 61, hco3: 24.3 } },
      ],
    });
    expect(f.previous).toHaveLength(2);
    expect(f.previous[1]?.hPlus).toBeCloseTo(60.26, 1); // 10^(9 - 7.22)
    expect(f.changes.map((x) => [x.field, x.from, x.to])).toEqual([
      ['ph', 7.22, 7.31],
      ['pco2', 61, 48],
      ['hco3', 24.3, 23.5],
    ]);
    expect(f.changes[1]?.change).toBeCloseTo(-13, 9);
  });

  it('a gas not measured at 37 C is flagged (temperature correction, clinical-scope section 9)', () => {
    expect(
      codes(read({ gas: { ph: 7.4, pco2: 40, hco3: 24 }, context: { temperatureC: 33 } })),
    ).toContain('temperature_not_37');
    expect(
      codes(read({ gas: { ph: 7.4, pco2: 40, hco3: 24 }, context: { temperatureC: 37.5 } })),
    ).not.toContain('temperature_not_37');
  });
});

describe('explanations report their inputs as a reader would write them', () => {
  it('a kPa gas: PaCO2 7.6 kPa is shown as 57 mmHg (7.6 x 7.50062 = 57.0047; UCUM kPa to mm[Hg]), not with the conversion noise', () => {
    const f = read({
      units: { pressure: 'kPa', albumin: 'g/L', glucose: 'mmol/L', urea: 'urea-mmol/L' },
      gas: { ph: 7.28, pco2: 7.6, hco3: 26.1 },
      chemistry: { na: 139, cl: 101, albumin: 31, glucose: 7.3, urea: 9.4, osmolality: 300 },
    });
    const pco2 = f.explain.hco3Henderson?.inputs.find((i) => i.name === 'PaCO2');
    expect(pco2?.value).toBe(57);
    for (const e of Object.values(f.explain)) {
      for (const i of e.inputs) {
        // no input carries more decimals than its unit is read with (3 at most, for pH and fractions)
        const decimals = (String(i.value).split('.')[1] ?? '').length;
        expect(decimals, `${e.key} ${i.name} ${i.value}`).toBeLessThanOrEqual(3);
        if (i.unit === 'mmHg') expect(decimals, `${e.key} ${i.name}`).toBeLessThanOrEqual(1);
      }
    }
    // the arithmetic itself used the unrounded value: HCO3 = 24 x 57.0047 / [H+] 52.48 (Henderson)
    expect(f.derived.hco3Henderson).toBe(26.1);
  });
});
