// The formulas of the second-round ventilator and oxygen rules, each against a value worked by hand from its
// published form (clinical-scope section 10).
import { describe, expect, it } from 'vitest';
import { coOximetry, deadSpace, mechanics, oxygenTargets } from '../../calc/index.ts';

describe('mechanics', () => {
  it.each([
    // Crs = VT / (Pplat - PEEP) (clinical-scope section 10): 360 / (26 - 12) = 25.71
    [360, 26, 12, 25.71],
    [420, 28, 14, 30],
    [500, 20, 5, 33.33],
  ])('compliance VT %d, Pplat %d, PEEP %d = %d mL/cmH2O', (vt, pplat, peep, expected) => {
    expect(mechanics.compliance(vt, pplat, peep)).toBeCloseTo(expected, 2);
  });

  it('no compliance without a positive driving pressure', () => {
    expect(mechanics.compliance(400, 10, 10)).toBeNull();
  });

  it('predicted plateau = PEEP + VT / Crs: 12 + 400 / 25.71 = 27.56 (clinical-scope section 10)', () => {
    expect(mechanics.predictedPlateau(400, 360 / 14, 12)).toBeCloseTo(27.56, 2);
  });

  it.each([
    // Te = 60 / RR - Ti (common practice): 60 / 14 - 1.0 = 3.29 s; 60 / 19 - 1.0 = 2.16 s; 60 / 30 - 1.2 = 0.8 s
    [14, 1.0, 3.29],
    [19, 1.0, 2.16],
    [30, 1.2, 0.8],
  ])('expiratory time at RR %d, Ti %d s = %d s', (rr, ti, expected) => {
    expect(mechanics.expiratoryTime(rr, ti)).toBeCloseTo(expected, 2);
  });

  it.each([
    // PBW 70.57 kg (ARDS Network 2000: 50 + 0.91 x 22.6); 8 mL/kg = 564.6 mL (ARDS Network 2000)
    [70.57, null, null, 564.6, 'per_kg'],
    // Crs 28, PEEP 14: plateau 30 at (30 - 14) x 28 = 448, driving pressure 15 at 15 x 28 = 420 (Amato 2015)
    [70.57, 28, 14, 420, 'driving_pressure'],
    // Crs 40, PEEP 18: plateau 30 at (30 - 18) x 40 = 480, driving pressure 15 at 600, per kg 564.6
    [70.57, 40, 18, 480, 'plateau'],
  ] as const)('largest safe VT, PBW %d, Crs %s, PEEP %s = %d (%s)', (pbw, crs, peep, vt, by) => {
    const safe = mechanics.largestSafeVt(pbw, crs, peep);
    expect(safe.vt).toBeCloseTo(vt, 1);
    expect(safe.limitedBy).toBe(by);
  });

  it('pH after an acute fall of PaCO2 from 68 to 58.29 at HCO3 24.9: HCO3 23.93, [H+] 58.46, pH 7.23 (Berend 2014 acute rule, Henderson)', () => {
    expect(mechanics.phAfterAcuteChange(24.9, 68, 58.29, 0.1)).toBeCloseTo(7.233, 3);
  });
});

describe('dead space', () => {
  it("Enghoff's modification of Bohr with a mixed-expired PCO2 of 28 and PaCO2 40: VD/VT 0.30", () => {
    expect(deadSpace.deadSpaceFraction(40, 28)).toBeCloseTo(0.3, 3);
  });

  it('alveolar dead-space fraction with PetCO2 29 and PaCO2 52: (52 - 29) / 52 = 0.442', () => {
    expect(deadSpace.alveolarDeadSpaceFraction(52, 29)).toBeCloseTo(0.4423, 4);
  });

  it('physiological dead space = anatomic 111.3 + (380 - 111.3) x 0.4423 = 230.2 mL', () => {
    expect(deadSpace.physiologicalDeadSpace(380, 111.3, 52, 29)).toBeCloseTo(230.15, 1);
  });
});

describe("oxygen targets (BTS guideline, O'Driscoll 2017)", () => {
  it.each([
    [['copd'], null, false, 88, 92, 'hypercapnic_risk'],
    [['obesity_hypoventilation'], null, false, 88, 92, 'hypercapnic_risk'],
    [['neuromuscular'], null, false, 88, 92, 'hypercapnic_risk'],
    [[], 58, false, 88, 92, 'hypercapnic_risk'], // a usual PaCO2 above 45 mmHg: chronic hypercapnia
    [['asthma'], null, false, 94, 98, 'standard'],
    [[], null, false, 94, 98, 'standard'],
    [['copd'], null, true, 95, 98, 'pregnancy'], // pregnancy 95% or more (from memory)
  ] as const)(
    '%j, usual PaCO2 %s, pregnant %s: %d-%d%% (%s)',
    (conditions, usual, pregnant, low, high, basis) => {
      expect(oxygenTargets.spo2Target({ conditions, usualPco2: usual, pregnant })).toEqual({
        low,
        high,
        basis,
      });
    },
  );

  it('too much oxygen only on supplemental oxygen: SpO2 99% on FiO2 0.60 above 92%, on room air not flagged', () => {
    const target = { low: 88, high: 92, basis: 'hypercapnic_risk' as const };
    expect(oxygenTargets.aboveTarget(99, 0.6, target)).toBe(true);
    expect(oxygenTargets.aboveTarget(99, 0.21, target)).toBe(false);
  });
});

describe('CO-oximetry (common practice thresholds)', () => {
  it.each([
    [2.5, 'normal'],
    [6, 'raised_for_non_smoker'],
    [24, 'raised'],
  ] as const)('COHb %d%%: %s', (cohb, band) => {
    expect(coOximetry.cohbBand(cohb)).toBe(band);
  });

  it('MetHb above 2% is raised; the saturation gap is SpO2 - SaO2 (98 - 74 = 24)', () => {
    expect(coOximetry.methbRaised(12)).toBe(true);
    expect(coOximetry.methbRaised(1.5)).toBe(false);
    expect(coOximetry.saturationGap(98, 74)).toBe(24);
  });
});
