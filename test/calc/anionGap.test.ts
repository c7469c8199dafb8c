// Anion gap, albumin correction, delta ratio and urine indices (calc/anionGap.ts).
import { describe, expect, it } from 'vitest';
import { anionGap as gapFormulas } from '../../calc/index.ts';

const {
  albuminCorrectedAnionGap,
  anionGap,
  chlorideResponsive,
  deltaRatio,
  deltaRatioBand,
  urineAnionGap,
} = gapFormulas;

describe('anion gap = Na - (Cl + HCO3), with K where the laboratory adds it (Kraut and Madias 2007)', () => {
  it.each([
    [140, 104, 24, null, 12, 'the usual normal 12 (by hand)'],
    [134, 98, 6.5, null, 29.5, 'ketoacidosis (by hand)'],
    [138, 115, 13, null, 10, 'diarrhoea: normal gap (by hand)'],
    [140, 104, 24, 4, 16, 'with K: 140 + 4 - 128 (by hand)'],
  ])('Na %s, Cl %s, HCO3 %s, K %s: %s mmol/L (%s)', (na, cl, hco3, k, gap, _why) => {
    expect(anionGap(na, cl, hco3, k)).toBeCloseTo(gap, 9);
  });
});

describe('albumin-corrected AG = AG + 2.5 x (4.0 - albumin g/dL) (Figge et al. 1998)', () => {
  it.each([
    [12, 4.0, 12],
    [10, 2.0, 15],
    [13, 1.5, 19.25],
    [10.5, 3.1, 12.75],
    [12, 5.0, 9.5],
  ])('AG %s with albumin %s g/dL: %s (by hand)', (ag, albumin, corrected) => {
    expect(albuminCorrectedAnionGap(ag, albumin)).toBeCloseTo(corrected, 9);
  });
});

describe('delta ratio = (AG - 12) / (24 - HCO3) and its bands (Wrenn 1990)', () => {
  it.each([
    [26, 10, 1.0],
    [20, 10, 0.571],
    [30, 18, 3.0],
    [10, 14, -0.2],
    [29.5, 6.5, 1.0],
  ])('AG %s, HCO3 %s: %s (by hand)', (ag, hco3, ratio) => {
    expect(deltaRatio(ag, hco3)).toBeCloseTo(ratio, 3);
  });

  it.each([[24], [26], [40]])(
    'undefined when HCO3 %s is not below 24 (no fall to compare with)',
    (hco3) => {
      expect(deltaRatio(20, hco3)).toBeNull();
    },
  );

  it('uses the laboratory normal gap when given (Kraut and Madias 2007: modern analysers 3-11, mid 7)', () => {
    expect(deltaRatio(19, 10, 7)).toBeCloseTo(12 / 14, 9);
  });

  it.each([
    [-0.2, 'normal_gap'],
    [0.39, 'normal_gap'],
    [0.4, 'mixed_high_and_normal_gap'],
    [0.79, 'mixed_high_and_normal_gap'],
    [0.8, 'high_gap'],
    [1.5, 'high_gap'],
    [2.0, 'high_gap'],
    [2.01, 'added_alkalosis'],
  ] as const)(
    'ratio %s is in band %s (Wrenn 1990 as in clinical-scope section 5)',
    (ratio, band) => {
      expect(deltaRatioBand(ratio)).toBe(band);
    },
  );
});

describe('urine indices (common practice)', () => {
  it.each([
    [50, 30, 100, -20, 'negative: GI bicarbonate loss'],
    [40, 40, 50, 30, 'positive: renal (distal) acidification defect'],
  ])('urine Na %s, K %s, Cl %s: gap %s (%s)', (na, k, cl, gap) => {
    expect(urineAnionGap(na, k, cl)).toBe(gap);
  });

  it.each([
    [10, true],
    [19, true],
    [20, false],
    [45, false],
  ])('urine Cl %s: chloride-responsive %s (below 20 mmol/L)', (cl, responsive) => {
    expect(chlorideResponsive(cl)).toBe(responsive);
  });
});
