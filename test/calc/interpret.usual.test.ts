// The hard cases of usual values, mixed disorders and timing (clinical-scope section 10), through interpret():
// invented patients in scenarios of our own. Every gas is Henderson-consistent (24 x PaCO2 / [H+] within 3 mmol/L
// of the HCO3). Sources beside each check value: Berend 2014 (compensation rules), Wrenn 1990 (delta ratio),
// Kraut and Madias 2007 (anion gap), the Henderson equation.
import { describe, expect, it } from 'vitest';
import { codes, disorderList, expectNear, read } from './helpers.ts';

const ventilator = { vt: 500, rr: 14, targetPco2: 45 };

describe('usual values: one usual PaCO2 for every check, however it was obtained (clinical-scope section 10)', () => {
  it("a 72-year-old with COPD and only a usual pH of 7.37: today's HCO3 is the chronic part", () => {
    const f = read({
      gas: { ph: 7.3, pco2: 54, po2: 78, hco3: 25.9 },
      patient: { ageYears: 72, sex: 'male', heightCm: 175 },
      context: { baseline: { ph: 7.37 } },
      oxygen: { fio2: 0.35, peep: 5 },
      ventilator: { vt: 480, rr: 14, targetPh: 7.4 },
    });
    // usual PaCO2 = [H+] at 7.37 (10^1.63 = 42.66) x 25.9 / 24 = 46.0 (Henderson); taking acute buffering out of the
    // HCO3 first would have given 44.2, "not hypercapnic", and called this simply acute
    expectNear(f.reference.pco2, 46.04, 0.01);
    expect(f.reference).toMatchObject({
      kind: 'baseline',
      hco3: 25.9,
      estimated: { pco2: true, hco3: false },
    });
    expect(f.reference.usual?.source).toBe('usual_ph');
    expect(f.derived.usualPco2).toBe(46);
    // 54 is above the usual 46 by more than its +/- 5: acute-on-chronic
    expect(disorderList(f)).toEqual([['respiratory_acidosis', 'acute_on_chronic']]);
    // target for pH 7.40: 39.81 x (25.9 - 5.4) / (24 - 3.981) = 40.8 (acute-buffering form), below the usual 46
    expect(f.flags.find((x) => x.code === 'target_pco2_below_baseline')?.values).toEqual({
      target: 40.8,
      usual: 46,
      estimated: true,
    });
    // today's HCO3 was taken as the chronic part, so no metabolic process is made up from it
    expect(f.compensation).toMatchObject({ fromUsualPh: true, verdict: 'within' });
  });

  it.each([
    [
      'stated usual PaCO2 60 and HCO3 31',
      { baseline: { pco2: 60, hco3: 31 } },
      'stated',
      false,
      'as stated',
    ],
    [
      'a usual pH of 7.36 only',
      { baseline: { ph: 7.36 } },
      'usual_ph',
      true,
      'Henderson: 43.65 x 33 / 24 = 60.0',
    ],
    [
      'no usual values',
      {},
      'chronic_line',
      true,
      'chronic line: (33 - 10 - 0.1 x 80) / 0.25 = 60, HCO3 24 + 0.35 x 20 = 31 (Berend 2014 rates)',
    ],
  ])(
    'COPD with a chest infection, PaCO2 80, HCO3 33, %s: usual PaCO2 60, acute-on-chronic, target 45 flagged',
    (_how, context, source, estimated, _byHand) => {
      const f = read({ gas: { ph: 7.24, pco2: 80, hco3: 33 }, context, ventilator });
      expect(f.reference.usual?.source).toBe(source);
      expectNear(f.reference.usual?.pco2, 60, 0.05);
      expect(disorderList(f)).toEqual([['respiratory_acidosis', 'acute_on_chronic']]);
      expect(f.ventilation?.usualPco2).toBeCloseTo(60, 1);
      expect(f.flags.find((x) => x.code === 'target_pco2_below_baseline')?.values).toEqual({
        target: 45,
        usual: 60,
        estimated,
      });
    },
  );

  it('without usual values the reading is still judged against textbook values, with the usual point beside it', () => {
    const f = read({ gas: { ph: 7.24, pco2: 80, hco3: 33 } });
    // between the acute band 26-30 and the chronic band 36-40 (Berend 2014)
    expect(f.compensation?.fit).toBe('between');
    expect(f.reference.kind).toBe('textbook');
    expect(f.derived).toMatchObject({ usualPco2: 60, usualHco3: 31 });
    expect(f.explain.usualPco2?.source).toMatch(/Berend/);
    expect(f.flags.find((x) => x.code === 'baseline_estimated')?.values.source).toBe(
      'chronic_line',
    );
  });

  it.each([
    // PaCO2, HCO3, pH, usual PaCO2 (or null), detail; chronic line P0 = (HCO3 - 10 - 0.1 PaCO2) / 0.25
    [
      60,
      31,
      7.33,
      60,
      'chronic',
      'on the chronic line (24 + 3.5 x 2 = 31): today is the usual point',
    ],
    [60, 26, 7.26, null, 'acute', 'on the acute line (24 + 1 x 2 = 26): no chronic part'],
  ] as const)(
    'PaCO2 %s with HCO3 %s: usual PaCO2 %s, %s',
    (pco2, hco3, ph, usual, detail, _byHand) => {
      const f = read({ gas: { ph, pco2, hco3 }, ventilator });
      expect(f.disorders[0]?.detail).toBe(detail);
      if (usual === null) expect(f.reference.usual).toBeNull();
      else expectNear(f.reference.usual?.pco2, usual, 0.05);
      expect(codes(f).includes('target_pco2_below_baseline')).toBe(usual !== null);
    },
  );
});

describe('the delta ratio against the HCO3 that applies (clinical-scope section 10; Wrenn 1990)', () => {
  it('a known CO2 retainer (timing chronic) with a lactic acidosis: no invented alkalosis, no urine work-up', () => {
    const f = read({
      gas: { ph: 7.28, pco2: 60, hco3: 27.4, lactate: 5.2 },
      chemistry: { na: 140, cl: 95, k: 4.4 },
      urine: { na: 40, k: 30, cl: 60 },
      context: { timing: 'chronic' },
    });
    // chronic rule: 24 + 3.5 x 2 = 31 (Berend 2014); AG 140 - 95 - 27.4 = 17.6; (17.6 - 12) / (31 - 27.4) = 1.56
    expect(f.derived.anionGap).toBe(17.6);
    expect(f.derived.deltaRatio).toBe(1.56);
    expect(f.metabolic.deltaBand).toBe('high_gap');
    expect(f.explain.deltaRatio?.inputs.find((i) => i.name.includes('chronic'))?.value).toBe(31);
    expect(disorderList(f)).toEqual([
      ['respiratory_acidosis', 'chronic'],
      ['metabolic_acidosis', 'high_anion_gap'],
    ]);
    // against 24 the HCO3 of 27.4 is "not low", which used to add a metabolic alkalosis and read the urine chloride
    expect(f.metabolic.urineChlorideResponsive).toBeNull();
    expect(f.derived.urineAnionGap).toBeNull();
  });

  it('a usual 50 / 30 stated, now 62 / 27 with a raised gap: measured from the usual HCO3 plus the acute rise', () => {
    const f = read({
      gas: { ph: 7.26, pco2: 62, hco3: 27 },
      chemistry: { na: 140, cl: 95 },
      context: { baseline: { pco2: 50, hco3: 30 } },
    });
    // reference 30 + 0.1 x 12 = 31.2 (Berend 2014 acute rule from the usual point); AG 18; 6 / 4.2 = 1.43
    expect(f.derived.deltaRatio).toBe(1.43);
    expect(disorderList(f)).toEqual([
      ['respiratory_acidosis', 'acute_on_chronic'],
      ['metabolic_acidosis', 'high_anion_gap'],
    ]);
  });

  it('a 29-year-old at 34 weeks with a lactic acidosis: measured from the pregnancy HCO3 of 20, one acidosis only', () => {
    const f = read({
      gas: { ph: 7.33, pco2: 26, hco3: 13.3, lactate: 4.6 },
      chemistry: { na: 136, cl: 103 },
      patient: { sex: 'female', ageYears: 29, pregnant: true },
    });
    // AG 19.7; (19.7 - 12) / (20 - 13.3) = 1.15 (pregnancy HCO3 18-22, textbook common practice); against 24 it would
    // be 0.72 and name a second, normal-AG acidosis
    expect(f.derived.deltaRatio).toBe(1.15);
    expect(disorderList(f)).toEqual([['metabolic_acidosis', 'high_anion_gap']]);
  });

  it('an overdose of unknown timing with a raised gap: acute and chronic ratios disagree, so nothing more is named', () => {
    const f = read({ gas: { ph: 7.2, pco2: 60, hco3: 22.8 }, chemistry: { na: 140, cl: 98 } });
    // AG 19.2; acute 24 + 2 = 26: 7.2 / 3.2 = 2.25; chronic 24 + 7 = 31: 7.2 / 8.2 = 0.88 (Berend 2014; Wrenn 1990)
    expect(f.derived).toMatchObject({
      deltaRatio: null,
      deltaRatioAcute: 2.25,
      deltaRatioChronic: 0.88,
    });
    expect(f.metabolic.delta?.implies).toBe('timing_decides');
    expect(disorderList(f)).toEqual([
      ['respiratory_acidosis', null],
      ['metabolic_acidosis', 'high_anion_gap'],
    ]);
  });

  it('an HCO3 that has hardly fallen gives no ratio (no "33.5"): the raised gap stands beside an alkalosis', () => {
    const f = read({ gas: { ph: 7.4, pco2: 39, hco3: 23.6 }, chemistry: { na: 140, cl: 91 } });
    // AG 25.4; a fall of 0.4 from 24 would give (25.4 - 12) / 0.4 = 33.5, a meaningless figure
    expect(f.derived.deltaRatio).toBeNull();
    expect(f.metabolic.delta?.points[0]?.verdict).toBe('hco3_not_lowered');
    expect(f.disorders.map((d) => d.basis)).toEqual([
      'raised_gap_hidden',
      'raised_gap_with_high_hco3',
    ]);
  });
});

describe('timing is not read from an HCO3 a metabolic acidosis has lowered (clinical-scope section 10)', () => {
  it('hypercapnia with an HCO3 on the acute line and a raised gap: timing not named', () => {
    const f = read({ gas: { ph: 7.26, pco2: 60, hco3: 26 }, chemistry: { na: 140, cl: 96 } });
    // the HCO3 of 26 fits the acute rule (24 + 1 x 2), but the gap of 18 says acid has lowered it
    expect(f.compensation).toMatchObject({ fit: 'acute', hco3LoweredBy: 'raised_anion_gap' });
    expect(f.disorders[0]).toMatchObject({ code: 'respiratory_acidosis', detail: null });
  });

  it('a usual pH is not turned into a usual PaCO2 when a raised gap has lowered the HCO3', () => {
    const f = read({
      gas: { ph: 7.26, pco2: 60, hco3: 26 },
      chemistry: { na: 140, cl: 96 },
      context: { baseline: { ph: 7.38 } },
    });
    expect(f.reference).toMatchObject({ kind: 'textbook', usualPhIgnored: true, usual: null });
  });

  it('a stated timing stays, but the low HCO3 is put down to the acidosis', () => {
    const f = read({
      gas: { ph: 7.28, pco2: 60, hco3: 27.4 },
      chemistry: { na: 140, cl: 95 },
      context: { timing: 'chronic' },
    });
    expect(f.compensation).toMatchObject({ verdict: 'below', hco3LoweredBy: 'raised_anion_gap' });
    expect(f.disorders[0]?.detail).toBe('chronic');
  });
});
