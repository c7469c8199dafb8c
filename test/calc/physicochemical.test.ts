// Standard base excess, the physicochemical partition and the strong ion gap (calc/physicochemical.ts).
import { describe, expect, it } from 'vitest';
import { physicochemical } from '../../calc/index.ts';

const {
  apparentStrongIonDifference,
  effectiveStrongIonDifference,
  physicochemicalPartition,
  standardBaseExcess,
  strongIonGap,
} = physicochemical;

describe('standard base excess = 0.93 x (HCO3 - 24.4 + 14.8 x (pH - 7.40)) (Van Slyke equation, CLSI C46-A2 2009)', () => {
  it.each([
    [7.4, 24.4, 0, 'zero at the reference point'],
    [7.2, 12, -14.28, 'by hand: 0.93 x (12 - 24.4 - 2.96)'],
    [7.5, 30, 6.58, 'by hand: 0.93 x (5.6 + 1.48)'],
    [7.31, 23.5, -2.08, 'by hand: 0.93 x (-0.9 - 1.332)'],
    [7.0, 5, -23.55, 'by hand: 0.93 x (-19.4 - 5.92)'],
  ])('pH %s, HCO3 %s: SBE %s mmol/L (%s)', (ph, hco3, sbe) => {
    expect(standardBaseExcess(ph, hco3)).toBeCloseTo(sbe, 2);
  });
});

describe('simplified partition (Story, Morimatsu, Bellomo 2004)', () => {
  it.each([
    // SBE, Na, Cl, albumin g/dL, Na-Cl effect, albumin effect, unmeasured (by hand)
    [-10, 140, 110, 2.0, -8, 5.5, -7.5],
    [0, 140, 102, 4.2, 0, 0, 0],
    [-14.28, 134, 98, 4.0, -2, 0.5, -12.78],
  ])(
    'SBE %s, Na %s, Cl %s, albumin %s g/dL: %s, %s, %s',
    (sbe, na, cl, albumin, nacl, alb, unmeasured) => {
      const p = physicochemicalPartition(sbe, na, cl, albumin);
      expect(p.sodiumChloride).toBeCloseTo(nacl, 9);
      expect(p.albumin).toBeCloseTo(alb, 9);
      expect(p.unmeasured).toBeCloseTo(unmeasured, 9);
    },
  );
});

describe('strong ion gap (Figge-Fencl, as summarised in Kellum 2005)', () => {
  it('SIDa = Na + K + 2 iCa + 2 Mg - Cl - lactate: 140 + 4 + 2.2 + 1.8 - 102 - 1 = 45.0 (by hand)', () => {
    expect(
      apparentStrongIonDifference({
        na: 140,
        k: 4,
        ionisedCalcium: 1.1,
        magnesium: 0.9,
        cl: 102,
        lactate: 1,
      }),
    ).toBeCloseTo(45, 9);
  });

  it.each([
    // HCO3, albumin g/dL, phosphate, pH, SIDe, the arithmetic by hand
    [24, 4.0, 1.0, 7.4, 36.9856, '24 + 40 x 0.2792 + 1 x 1.8176'],
    [12, 2.0, 2.0, 7.2, 20.6036, '12 + 20 x 0.2546 + 2 x 1.7558'],
  ])(
    'SIDe = HCO3 + albumin g/L x (0.123 pH - 0.631) + phosphate x (0.309 pH - 0.469): HCO3 %s, albumin %s g/dL, phosphate %s, pH %s gives %s (%s)',
    (hco3, albumin, phosphate, ph, side) => {
      expect(effectiveStrongIonDifference(hco3, albumin, phosphate, ph)).toBeCloseTo(side, 6);
    },
  );

  it('SIG = SIDa - SIDe: 45.0 - 36.99 = 8.01 mmol/L (by hand)', () => {
    expect(strongIonGap(45, 36.9856)).toBeCloseTo(8.0144, 9);
  });
});
