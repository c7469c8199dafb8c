// pH, [H+] and the Henderson equation (calc/acidBase.ts).
import { describe, expect, it } from 'vitest';
import { acidBase } from '../../calc/index.ts';

const {
  hendersonBicarbonate,
  hendersonConsistency,
  hendersonHasselbalchPh,
  hendersonHydrogenIon,
  hendersonHydrogenIonKpa,
  hendersonPco2,
  hydrogenIon,
  phFromHydrogenIon,
} = acidBase;

describe('[H+] nmol/L = 10^(9 - pH) (definition of pH)', () => {
  it.each([
    [7.4, 39.8, 'clinical-scope section 2 figure'],
    [7.0, 100, 'clinical-scope section 2 figure'],
    [8.0, 10, 'clinical-scope section 2 figure'],
    [7.1, 79.4, 'by hand: 10^1.90'],
    [7.7, 19.95, 'by hand: 10^1.30'],
    [6.5, 316.2, 'by hand: 10^2.50'],
  ])('pH %s gives %s nmol/L (%s)', (ph, hPlus) => {
    expect(Math.abs(hydrogenIon(ph) - hPlus) / hPlus).toBeLessThan(0.002);
  });

  it.each([
    [39.8, 7.4],
    [100, 7.0],
    [10, 8.0],
    [63.1, 7.2],
  ])('the inverse: [H+] %s is pH %s', (hPlus, ph) => {
    expect(phFromHydrogenIon(hPlus)).toBeCloseTo(ph, 2);
  });

  it.each([[7.4], [7.1], [7.25]])(
    'rule of thumb from pH %s: +0.30 halves [H+], -0.30 doubles it (common practice; log10 2 = 0.301)',
    (ph) => {
      expect(hydrogenIon(ph - 0.3) / hydrogenIon(ph)).toBeCloseTo(2, 1);
      expect(hydrogenIon(ph + 0.3) / hydrogenIon(ph)).toBeCloseTo(0.5, 2);
    },
  );
});

describe('Henderson equation [H+] = 24 x PaCO2 / HCO3 (clinical-scope section 2)', () => {
  it.each([
    [40, 24, 40, 'the normal 40 / 40 / 24 (common practice)'],
    [80, 24, 80, 'by hand: PaCO2 doubled, [H+] doubled'],
    [20, 12, 40, 'by hand: both halved, pH unchanged'],
    [60, 30, 48, 'by hand: 24 x 60 / 30'],
  ])('PaCO2 %s mmHg, HCO3 %s gives [H+] %s (%s)', (pco2, hco3, hPlus) => {
    expect(hendersonHydrogenIon(pco2, hco3)).toBeCloseTo(hPlus, 6);
    expect(hendersonBicarbonate(hPlus, pco2)).toBeCloseTo(hco3, 6);
    expect(hendersonPco2(hPlus, hco3)).toBeCloseTo(pco2, 6);
  });

  it('with PaCO2 in kPa the constant is 180 (clinical-scope section 2): 5.33 kPa, HCO3 24 gives 40', () => {
    expect(hendersonHydrogenIonKpa(5.33, 24)).toBeCloseTo(40, 0);
    expect(hendersonHydrogenIonKpa(5.33, 24)).toBeCloseTo(
      hendersonHydrogenIon(5.33 * 7.50062, 24),
      1,
    );
  });

  it.each([
    [40, 24],
    [80, 12],
    [25, 15],
    [60, 36],
    [20, 6],
  ])(
    'Henderson-Hasselbalch with PaCO2 %s, HCO3 %s agrees with Henderson within about 2%% of [H+] (clinical-scope section 2)',
    (pco2, hco3) => {
      const fromHH = hydrogenIon(hendersonHasselbalchPh(pco2, hco3));
      const fromHenderson = hendersonHydrogenIon(pco2, hco3);
      expect(Math.abs(fromHH - fromHenderson) / fromHenderson).toBeLessThan(0.02);
    },
  );

  it('Henderson-Hasselbalch at 40 / 24: pH = 6.1 + log10(24 / 1.228) = 7.39 (by hand)', () => {
    expect(hendersonHasselbalchPh(40, 24)).toBeCloseTo(7.391, 3);
  });
});

describe('consistency of a reported HCO3: beyond 3 mmol/L or 10% is flagged (clinical-scope section 2)', () => {
  it.each([
    // pH, PaCO2, reported HCO3, consistent?, why (calculated HCO3 by hand: 24 x PaCO2 / [H+])
    [7.4, 40, 24, true, 'calculated 24.1: the normal gas'],
    [7.4, 40, 26.5, true, 'difference 2.4, 10%: inside both limits'],
    [7.4, 40, 28, false, 'difference 3.9 > 3 mmol/L'],
    [7.1, 20, 5.0, false, 'calculated 6.05: difference 1.05 but 17% > 10%'],
    [7.4, 80, 50, true, 'calculated 48.2: difference 1.8, 3.7%'],
    [7.4, 80, 52, false, 'difference 3.8 > 3 mmol/L though only 7.9%'],
  ])('pH %s, PaCO2 %s, HCO3 %s: consistent %s (%s)', (ph, pco2, hco3, consistent) => {
    const c = hendersonConsistency(ph, pco2, hco3);
    expect(c.consistent).toBe(consistent);
    expect(c.calculated).toBeCloseTo((24 * pco2) / 10 ** (9 - ph), 9);
    expect(c.difference).toBeCloseTo(hco3 - c.calculated, 9);
  });
});
