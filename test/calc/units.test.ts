// Unit conversions (calc/units.ts, through calc/index.ts) against the UCUM library @lhncbc/ucum-lhc, not only against our own constants.
import { describe, expect, it } from 'vitest';
import { FIELD, readUnit, units as u } from '../../calc/index.ts';
import { MOLAR_MASS, ucum } from './helpers.ts';

const relative = (a: number, b: number) => Math.abs(a - b) / Math.abs(b);

const all = (over: Partial<u.Units>): u.Units => ({ ...u.DEFAULT_UNITS, ...over });
const SI = all({
  pressure: 'kPa',
  albumin: 'g/L',
  hb: 'g/L',
  glucose: 'mmol/L',
  urea: 'urea-mmol/L',
  creatinine: 'umol/L',
  ethanol: 'mmol/L',
});
const CONVENTIONAL = all({
  glucose: 'mg/dL',
  urea: 'bun-mg/dL',
  creatinine: 'mg/dL',
  ethanol: 'mg/dL',
});
const kpaToMmHg = (kpa: number) => u.toCanonical('pressure', kpa, SI);
const mmHgToKpa = (mmHg: number) => u.fromCanonical('pressure', mmHg, SI);
const glucoseMgDlToMmolL = (mgDl: number) => u.toCanonical('glucose', mgDl, CONVENTIONAL);
const bunMgDlToUreaMmolL = (bun: number) => u.toCanonical('urea', bun, CONVENTIONAL);
const creatinineMgDlToUmolL = (mgDl: number) => u.toCanonical('creatinine', mgDl, CONVENTIONAL);
const ethanolMmolLToMgDl = (mmolL: number) => u.fromCanonical('ethanol', mmolL, CONVENTIONAL);
const gPerLToGPerDl = (gL: number) => u.toCanonical('albumin', gL, SI);

describe('pressure: kPa and mmHg', () => {
  // UCUM defines mm[Hg] as 133.322 Pa; our 7.50062 is 760 / 101.325 (1 mmHg = 133.3224 Pa): they differ by 2.4e-6.
  it.each([
    [1, 'SI definition of the pascal and mmHg (clinical-scope section 1): 1 kPa = 7.50062 mmHg'],
    [5.3, 'normal PaCO2 in kPa (common practice)'],
    [13.3, 'normal PaO2 in kPa (common practice)'],
    [0.67, 'PaCO2 plausibility floor in kPa (5 mmHg, clinical-scope section 3)'],
  ])('%s kPa in mmHg agrees with UCUM (%s)', (kpa) => {
    expect(relative(kpaToMmHg(kpa), ucum('kPa', kpa, 'mm[Hg]'))).toBeLessThan(1e-5);
  });

  it.each([[40], [100], [760]])('%s mmHg in kPa agrees with UCUM', (mmHg) => {
    expect(relative(mmHgToKpa(mmHg), ucum('mm[Hg]', mmHg, 'kPa'))).toBeLessThan(1e-5);
  });

  it('1 kPa = 7.50062 mmHg and 760 mmHg = 101.325 kPa (SI definition; standard atmosphere)', () => {
    expect(kpaToMmHg(1)).toBeCloseTo(7.50062, 5);
    expect(mmHgToKpa(760)).toBeCloseTo(101.325, 3);
  });
});

describe('concentrations: mass to moles with the molar mass (UCUM with molecularWeight)', () => {
  it.each([
    [90, 'fasting glucose 90 mg/dL = 5.0 mmol/L (common practice)'],
    [180.16, 'one millimole of glucose per decilitre x 10'],
    [400, 'hyperglycaemia'],
  ])('glucose %s mg/dL to mmol/L (molar mass 180.16, clinical-scope section 1): %s', (mgDl) => {
    expect(
      relative(glucoseMgDlToMmolL(mgDl), ucum('mg/dL', mgDl, 'mmol/L', MOLAR_MASS.glucose)),
    ).toBeLessThan(1e-9);
  });

  it('glucose 90 mg/dL is 5.0 mmol/L (common practice)', () => {
    expect(glucoseMgDlToMmolL(90)).toBeCloseTo(5.0, 1);
  });

  it.each([
    [14, 'normal BUN 14 mg/dL = urea 5.0 mmol/L (common practice)'],
    [28.01, 'one mmol/L of urea carries 28.01 mg/dL of nitrogen'],
    [100, 'renal failure'],
  ])('BUN %s mg/dL to urea mmol/L (N2 28.01 g/mol, clinical-scope section 1): %s', (bun) => {
    // BUN is the nitrogen of urea: one mole of urea holds one mole of N2, so the molar mass of N2 converts it
    expect(
      relative(bunMgDlToUreaMmolL(bun), ucum('mg/dL', bun, 'mmol/L', MOLAR_MASS.ureaNitrogen)),
    ).toBeLessThan(1e-9);
  });

  it.each([[1.0], [0.7], [5.2]])(
    'creatinine %s mg/dL to umol/L (113.12 g/mol; 88.4 per mg/dL, clinical-scope section 1)',
    (mgDl) => {
      expect(
        relative(creatinineMgDlToUmolL(mgDl), ucum('mg/dL', mgDl, 'umol/L', MOLAR_MASS.creatinine)),
      ).toBeLessThan(1e-4);
    },
  );

  it.each([[10], [21.7], [80]])(
    'ethanol %s mmol/L to mg/dL (46.07 g/mol, IUPAC atomic weights)',
    (mmolL) => {
      expect(
        relative(ethanolMmolLToMgDl(mmolL), ucum('mmol/L', mmolL, 'mg/dL', MOLAR_MASS.ethanol)),
      ).toBeLessThan(1e-9);
    },
  );

  it.each([[35], [42], [15]])(
    'albumin and Hb %s g/L to g/dL (g/L = 10 x g/dL, clinical-scope section 1)',
    (gL) => {
      expect(gPerLToGPerDl(gL)).toBeCloseTo(ucum('g/L', gL, 'g/dL'), 12);
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

describe('a value with its unit as a report writes it (readUnit)', () => {
  it('mEq/L is mmol/L times the charge: Ca2+ 2.3 mEq/L is 1.15 mmol/L (divalent ion, common practice)', () => {
    expect(readUnit(FIELD['chemistry.ionisedCalcium'], 'mEq/L', 2.3)).toEqual({
      ok: true,
      value: 1.15,
      setting: null,
    });
    expect(readUnit(FIELD['chemistry.magnesium'], 'meq/L', 1.6)).toEqual({
      ok: true,
      value: 0.8,
      setting: null,
    });
  });
  it('for a univalent ion mEq/L is the same number as mmol/L (common practice)', () => {
    expect(readUnit(FIELD['chemistry.na'], 'mEq/L', 140)).toEqual({
      ok: true,
      value: 140,
      setting: null,
    });
  });
  it('phosphate in mEq/L is refused: it is not a single ion (mixed valence; common practice)', () => {
    const r = readUnit(FIELD['chemistry.phosphate'], 'mEq/L', 2);
    expect(r.ok).toBe(false);
  });
  it('a unit choice is read as the setting it implies, the number unchanged', () => {
    expect(readUnit(FIELD['chemistry.creatinine'], 'mg/dL', 1.2)).toEqual({
      ok: true,
      value: 1.2,
      setting: { quantity: 'creatinine', unit: 'mg/dL' },
    });
    expect(readUnit(FIELD['gas.pco2'], 'mm[Hg]', 40)).toMatchObject({ setting: { unit: 'mmHg' } });
    expect(readUnit(FIELD['gas.pco2'], 'mmHg', 40)).toMatchObject({ setting: { unit: 'mmHg' } });
    expect(readUnit(FIELD['gas.pco2'], 'kPa', 5.3)).toMatchObject({ setting: { unit: 'kPa' } });
  });
  it('a saturation as a UCUM fraction ("1") becomes a percent; a wrong unit is refused, never guessed', () => {
    expect(readUnit(FIELD['gas.sao2'], '1', 0.95)).toEqual({ ok: true, value: 95, setting: null });
    expect(readUnit(FIELD['gas.sao2'], '%', 95)).toEqual({ ok: true, value: 95, setting: null });
    expect(readUnit(FIELD['chemistry.na'], 'mg/dL', 140).ok).toBe(false);
  });
});
