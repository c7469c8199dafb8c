// Unit conversions (calc/units.ts) against the UCUM library @lhncbc/ucum-lhc, not only against our own constants.
import { describe, expect, it } from 'vitest';
import * as u from '../../calc/units.ts';
import { MOLAR_MASS, ucum } from './helpers.ts';

const relative = (a: number, b: number) => Math.abs(a - b) / Math.abs(b);

describe('pressure: kPa and mmHg', () => {
  // UCUM defines mm[Hg] as 133.322 Pa; our 7.50062 is 760 / 101.325 (1 mmHg = 133.3224 Pa): they differ by 2.4e-6.
  it.each([
    [1, 'SI definition of the pascal and mmHg (clinical-scope section 1): 1 kPa = 7.50062 mmHg'],
    [5.3, 'normal PaCO2 in kPa (common practice)'],
    [13.3, 'normal PaO2 in kPa (common practice)'],
    [0.67, 'PaCO2 plausibility floor in kPa (5 mmHg, clinical-scope section 3)'],
  ])('%s kPa in mmHg agrees with UCUM (%s)', (kpa) => {
    expect(relative(u.kpaToMmHg(kpa), ucum('kPa', kpa, 'mm[Hg]'))).toBeLessThan(1e-5);
  });

  it.each([[40], [100], [760]])('%s mmHg in kPa agrees with UCUM', (mmHg) => {
    expect(relative(u.mmHgToKpa(mmHg), ucum('mm[Hg]', mmHg, 'kPa'))).toBeLessThan(1e-5);
  });

  it('1 kPa = 7.50062 mmHg and 760 mmHg = 101.325 kPa (SI definition; standard atmosphere)', () => {
    expect(u.kpaToMmHg(1)).toBeCloseTo(7.50062, 5);
    expect(u.mmHgToKpa(760)).toBeCloseTo(101.325, 3);
  });
});

describe('concentrations: mass to moles with the molar mass (UCUM with molecularWeight)', () => {
  it.each([
    [90, 'fasting glucose 90 mg/dL = 5.0 mmol/L (common practice)'],
    [180.16, 'one millimole of glucose per decilitre x 10'],
    [400, 'hyperglycaemia'],
  ])('glucose %s mg/dL to mmol/L (molar mass 180.16, clinical-scope section 1): %s', (mgDl) => {
    expect(
      relative(u.glucoseMgDlToMmolL(mgDl), ucum('mg/dL', mgDl, 'mmol/L', MOLAR_MASS.glucose)),
    ).toBeLessThan(1e-9);
  });

  it('glucose 90 mg/dL is 5.0 mmol/L (common practice)', () => {
    expect(u.glucoseMgDlToMmolL(90)).toBeCloseTo(5.0, 1);
  });

  it.each([
    [14, 'normal BUN 14 mg/dL = urea 5.0 mmol/L (common practice)'],
    [28.01, 'one mmol/L of urea carries 28.01 mg/dL of nitrogen'],
    [100, 'renal failure'],
  ])('BUN %s mg/dL to urea mmol/L (N2 28.01 g/mol, clinical-scope section 1): %s', (bun) => {
    // BUN is the nitrogen of urea: one mole of urea holds one mole of N2, so the molar mass of N2 converts it
    expect(
      relative(u.bunMgDlToUreaMmolL(bun), ucum('mg/dL', bun, 'mmol/L', MOLAR_MASS.ureaNitrogen)),
    ).toBeLessThan(1e-9);
  });

  it.each([[1.0], [0.7], [5.2]])(
    'creatinine %s mg/dL to umol/L (113.12 g/mol; 88.4 per mg/dL, clinical-scope section 1)',
    (mgDl) => {
      expect(
        relative(
          u.creatinineMgDlToUmolL(mgDl),
          ucum('mg/dL', mgDl, 'umol/L', MOLAR_MASS.creatinine),
        ),
      ).toBeLessThan(1e-4);
    },
  );

  it.each([[10], [21.7], [80]])(
    'ethanol %s mmol/L to mg/dL (46.07 g/mol, IUPAC atomic weights)',
    (mmolL) => {
      expect(
        relative(u.ethanolMmolLToMgDl(mmolL), ucum('mmol/L', mmolL, 'mg/dL', MOLAR_MASS.ethanol)),
      ).toBeLessThan(1e-9);
    },
  );

  it.each([[35], [42], [15]])(
    'albumin and Hb %s g/L to g/dL (g/L = 10 x g/dL, clinical-scope section 1)',
    (gL) => {
      expect(u.gPerLToGPerDl(gL)).toBeCloseTo(ucum('g/L', gL, 'g/dL'), 12);
    },
  );
});

describe('the edge conversion round-trips and labels', () => {
  const kinds = ['pressure', 'albumin', 'hb', 'glucose', 'urea', 'creatinine', 'ethanol'] as const;
  const other: u.Units = {
    pressure: 'kPa',
    albumin: 'g/L',
    hb: 'g/L',
    glucose: 'mmol/L',
    urea: 'urea-mmol/L',
    creatinine: 'umol/L',
    ethanol: 'mmol/L',
  };
  it.each(kinds)('%s: fromCanonical(toCanonical(x)) = x in both unit systems', (kind) => {
    for (const units of [u.DEFAULT_UNITS, other])
      expect(u.fromCanonical(kind, u.toCanonical(kind, 12.3, units), units)).toBeCloseTo(12.3, 9);
  });

  it('the canonical units are mmHg, g/dL, mmol/L and umol/L (clinical-scope: convert at the edge, once)', () => {
    expect(u.toCanonical('pressure', 5.3, other)).toBeCloseTo(ucum('kPa', 5.3, 'mm[Hg]'), 3);
    expect(u.toCanonical('albumin', 30, other)).toBe(3);
    expect(u.toCanonical('glucose', 7, other)).toBe(7);
    expect(u.toCanonical('creatinine', 1, u.DEFAULT_UNITS)).toBeCloseTo(88.4, 6);
    expect(u.unitLabel('urea', u.DEFAULT_UNITS)).toBe('mg/dL');
    expect(u.unitLabel('creatinine', other)).toBe('µmol/L');
  });
});

describe('FiO2: a fraction 0.21-1.00 or a percent 21-100 (clinical-scope section 1)', () => {
  it.each([
    [0.21, 0.21],
    [0.4, 0.4],
    [1, 1],
    [21, 0.21],
    [40, 0.4],
    [100, 1],
    [60.5, 0.605],
  ])('entered %s is the fraction %s', (entered, fraction) => {
    expect(u.fio2Fraction(entered)).toBeCloseTo(fraction, 12);
  });
});
