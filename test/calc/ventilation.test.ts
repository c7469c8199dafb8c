// Predicted body weight, dead space, alveolar ventilation, target PaCO2 and the settings to reach it (calc/ventilation.ts).
import { describe, expect, it } from 'vitest';
import { acidBase, ventilation } from '../../calc/index.ts';

const {
  alveolarVentilation,
  co2ProductionEstimate,
  drivingPressure,
  estimatedDeadSpace,
  minuteVentilation,
  pco2FromVentilation,
  predictedBodyWeight,
  predictedPco2AfterChange,
  rrForTarget,
  targetPco2Buffered,
  targetPco2Simple,
  ventilatoryRatio,
  vtForTarget,
  vtPerKg,
} = ventilation;
const { hydrogenIon } = acidBase;

describe('predicted body weight (ARDS Network 2000): male 50, female 45.5, + 0.91 x (height cm - 152.4)', () => {
  it.each([
    ['male', 152.4, 50],
    ['female', 152.4, 45.5],
    ['male', 175, 70.566],
    ['female', 160, 52.416],
    ['male', 183, 77.846],
    ['female', 162, 54.236],
  ] as const)('%s, %s cm: %s kg (by hand)', (sex, height, pbw) => {
    expect(predictedBodyWeight(sex, height)).toBeCloseTo(pbw, 3);
  });

  it.each([
    [420, 70, 6],
    [600, 70.566, 8.5],
    [320, 52.416, 6.1],
  ])(
    'VT %s mL / PBW %s kg = %s mL/kg (target 6, range 4-8, ARDS Network 2000)',
    (vt, pbw, perKg) => {
      expect(vtPerKg(vt, pbw)).toBeCloseTo(perKg, 1);
    },
  );

  it.each([
    [28, 10, 18],
    [24, 8, 16],
    [22, 10, 12],
  ])(
    'driving pressure = Pplat - PEEP: %s - %s = %s cmH2O (Amato et al. 2015)',
    (pplat, peep, dp) => {
      expect(drivingPressure(pplat, peep)).toBe(dp);
    },
  );
});

describe('dead space and alveolar ventilation', () => {
  it.each([
    [70, 0, 154],
    [70, 50, 204],
    [52.416, 0, 115.3],
  ])(
    'PBW %s kg with %s mL apparatus: VD %s mL (anatomic 2.2 mL/kg, Radford 1955, from memory)',
    (pbw, apparatus, vd) => {
      expect(estimatedDeadSpace(pbw, apparatus)).toBeCloseTo(vd, 1);
    },
  );

  it.each([
    [20, 500, 150, 10, 7],
    [12, 500, 150, 6, 4.2],
    [30, 320, 115.3, 9.6, 6.141],
  ])(
    'RR %s, VT %s, VD %s: VE %s, VA %s L/min (VA = RR x (VT - VD); West)',
    (rr, vt, vd, ve, va) => {
      expect(minuteVentilation(rr, vt)).toBeCloseTo(ve, 6);
      expect(alveolarVentilation(rr, vt, vd)).toBeCloseTo(va, 3);
    },
  );

  it.each([
    [
      200,
      4.315,
      40,
      'typical VCO2 200 mL/min (common practice) with VA 4.3 L/min gives the normal 40',
    ],
    [200, 2.877, 60, 'a third less alveolar ventilation: 60'],
    [300, 4.315, 60, 'fever or sepsis, VCO2 300 at the same VA: 60'],
  ])(
    'PaCO2 = 0.863 x VCO2 / VA: VCO2 %s, VA %s gives %s (West, Respiratory Physiology; %s)',
    (vco2, va, pco2) => {
      expect(pco2FromVentilation(vco2, va)).toBeCloseTo(pco2, 0);
      expect(co2ProductionEstimate(pco2FromVentilation(vco2, va), va)).toBeCloseTo(vco2, 6);
    },
  );

  it.each([
    [60, 4, 6, 40],
    [40, 6, 3, 80],
    [50, 5, 5, 50],
  ])(
    'at constant VCO2, VA1 x PaCO2_1 = VA2 x PaCO2_2: PaCO2 %s at VA %s L/min, then VA %s L/min gives %s (West)',
    (pco2, va1, va2, expected) => {
      expect(predictedPco2AfterChange(pco2, va1, va2)).toBeCloseTo(expected, 9);
    },
  );

  it.each([
    [7000, 37.5, 70, 1.0, 'VE 100 mL/kg/min at PaCO2 37.5 is 1 by definition'],
    [10000, 40, 70, 1.524, 'by hand: 400000 / 262500'],
    [14000, 60, 52.4, 4.27, 'high dead space ARDS, by hand: 840000 / 196500'],
  ])(
    'ventilatory ratio: VE %s mL/min, PaCO2 %s, PBW %s gives %s (Sinha et al. 2009, from memory; %s)',
    (ve, pco2, pbw, ratio) => {
      expect(ventilatoryRatio(ve, pco2, pbw)).toBeCloseTo(ratio, 2);
    },
  );
});

describe('target PaCO2 for a target pH (clinical-scope section 8)', () => {
  // [H+] at pH 7.35 = 10^1.65 = 44.67; at 7.40 = 39.81; at 7.30 = 50.12 (definition of pH)
  it.each([
    [7.35, 26, 48.39, 'by hand: 44.67 x 26 / 24'],
    [7.4, 36, 59.72, 'by hand: 39.81 x 36 / 24'],
    [7.3, 12, 25.06, 'by hand: 50.12 x 12 / 24'],
  ])(
    'simple form, HCO3 held: target pH %s with HCO3 %s gives %s (Henderson; %s)',
    (ph, hco3, target) => {
      expect(targetPco2Simple(hydrogenIon(ph), hco3)).toBeCloseTo(target, 1);
    },
  );

  it.each([
    // target pH, HCO3, PaCO2 now, target, by hand: [H+]t x (HCO3 - 0.1 PaCO2) / (24 - 0.1 [H+]t)
    [7.35, 26, 65, 44.59, '44.67 x 19.5 / 19.533'],
    [7.4, 36, 75, 56.68, '39.81 x 28.5 / 20.019'],
    [7.35, 23.5, 48, 42.76, '44.67 x 18.7 / 19.533'],
  ])(
    'acute-buffering form: target pH %s, HCO3 %s, PaCO2 now %s gives %s (%s)',
    (ph, hco3, pco2, target) => {
      const t = targetPco2Buffered(hydrogenIon(ph), hco3, pco2) as number;
      expect(t).toBeCloseTo(target, 1);
      // the point of the form: with HCO3 moving 0.1 per mmHg (Berend 2014 acute rule) the target pH is reached exactly
      const hco3AtTarget = hco3 + 0.1 * (t - pco2);
      expect(9 - Math.log10((24 * t) / hco3AtTarget)).toBeCloseTo(ph, 9);
    },
  );

  it('is null where no positive PaCO2 gives the pH (HCO3 below 0.1 x PaCO2)', () => {
    expect(targetPco2Buffered(hydrogenIon(7.35), 4, 45)).toBeNull();
  });

  it.each([
    [20, 65, 44.59, 29.15, 'RR = 1300 / 44.59'],
    [16, 48, 42.76, 17.96, 'RR = 16 x 48 / 42.76'],
  ])('at fixed VT: RR %s, PaCO2 %s to %s gives RR %s (%s)', (rr, now, target, expected) => {
    expect(rrForTarget(rr, now, target)).toBeCloseTo(expected, 2);
  });

  it.each([
    [400, 150, 65, 44.59, 514.4, '150 + 250 x 65 / 44.59'],
    [320, 115.3, 65, 44.59, 413.7, '115.3 + 204.7 x 65 / 44.59'],
  ])(
    'at fixed RR: VT %s, VD %s, PaCO2 %s to %s gives VT %s (%s)',
    (vt, vd, now, target, expected) => {
      expect(vtForTarget(vt, vd, now, target)).toBeCloseTo(expected, 1);
    },
  );
});
