// The LOINC table and its UCUM units, checked against outside rules: the LOINC check digit and a UCUM library.
import { createRequire } from 'node:module';
import { describe, expect, it } from 'vitest';
import { LOINC_CODES, LOINC_NOT_READ, UCUM } from '../../../server/intake/index.ts';
import { units } from '../../../calc/index.ts';

const { toCanonical, DEFAULT_UNITS } = units;

const ucum = createRequire(import.meta.url)('@lhncbc/ucum-lhc').UcumLhcUtils.getInstance();

// LOINC codes end in a mod-10 check digit (LOINC Users' Guide, "Calculating Mod 10 check digits"; from memory
// it is the Luhn scheme: double every second digit from the right, sum the digits, the check digit makes the sum a multiple of 10).
function loincCheckDigit(base: string): number {
  let sum = 0;
  [...base].reverse().forEach((ch, i) => {
    let d = Number(ch);
    if (i % 2 === 0) {
      d *= 2;
      if (d > 9) d -= 9;
    }
    sum += d;
  });
  return (10 - (sum % 10)) % 10;
}

const allCodes = [...LOINC_CODES.map((e) => e.code), ...Object.keys(LOINC_NOT_READ)];

describe('LOINC codes', () => {
  it('the check digit works on codes published with it (2744-1, 2019-8, 1960-4: DICOM PS3.16 CID 3528/3524, VSAC)', () => {
    expect(loincCheckDigit('2744')).toBe(1);
    expect(loincCheckDigit('2019')).toBe(8);
    expect(loincCheckDigit('1960')).toBe(4);
    expect(loincCheckDigit('2745')).not.toBe(1); // a typo is caught
  });

  it.each(allCodes)('%s has a valid check digit', (code) => {
    const m = /^(\d{1,7})-(\d)$/.exec(code);
    expect(m).not.toBeNull();
    expect(loincCheckDigit(m![1]!)).toBe(Number(m![2]));
  });

  it('every code appears once, and none is both read and not read', () => {
    expect(new Set(allCodes).size).toBe(allCodes.length);
  });

  it('every gas value has an arterial and a venous code', () => {
    for (const path of [
      'gas.ph',
      'gas.pco2',
      'gas.po2',
      'gas.hco3',
      'gas.baseExcess',
      'gas.sao2',
    ]) {
      const specimens = LOINC_CODES.filter((e) => e.path === path).map((e) => e.specimen);
      expect(specimens).toContain('arterial');
      expect(specimens).toContain('venous');
    }
  });
});

describe('UCUM units', () => {
  const codes = [...new Set(Object.values(UCUM).flatMap((m) => Object.keys(m)))];
  it.each(codes)('"%s" is a valid UCUM code (ucum-lhc)', (code) => {
    expect(ucum.validateUnitString(code, true).status).toBe('valid');
  });

  it('the unit pairs the case can hold convert as UCUM says (g/L and g/dL for albumin and Hb; kPa and mm[Hg])', () => {
    // calc/units.ts against ucum-lhc: 31 g/L in g/dL, 6.4 kPa in mm[Hg]
    expect(toCanonical('albumin', 31, { ...DEFAULT_UNITS, albumin: 'g/L' })).toBeCloseTo(
      ucum.convertUnitTo('g/L', 31, 'g/dL').toVal,
      10,
    );
    expect(toCanonical('hb', 121, { ...DEFAULT_UNITS, hb: 'g/L' })).toBeCloseTo(
      ucum.convertUnitTo('g/L', 121, 'g/dL').toVal,
      10,
    );
    expect(toCanonical('pressure', 6.4, { ...DEFAULT_UNITS, pressure: 'kPa' })).toBeCloseTo(
      ucum.convertUnitTo('kPa', 6.4, 'mm[Hg]').toVal,
      3,
    );
  });

  it('each accepted code means the unit the case is told (mass codes take mass units, moles codes take mole units)', () => {
    // the UCUM property as ucum-lhc names it: 'mass' or 'amount of substance'
    const property = (code: string): string => {
      const unit = ucum.getSpecifiedUnit(code, 'validate').unit;
      if (!unit) throw new Error(`ucum-lhc does not know ${code}`);
      return String(unit.property_);
    };
    for (const kind of ['glucoseMass', 'bun', 'creatinineMass', 'albumin', 'hb'] as const)
      for (const code of Object.keys(UCUM[kind])) expect(property(code)).toBe('mass');
    for (const kind of ['glucoseMolar', 'ureaMolar', 'creatinineMolar'] as const)
      for (const code of Object.keys(UCUM[kind]))
        expect(property(code)).toBe('amount of substance');
  });
});
