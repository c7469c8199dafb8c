// The LOINC codes the FHIR reader takes from calc's table, and their UCUM units, checked against outside rules:
// the LOINC check digit and a UCUM library.
import { createRequire } from 'node:module';
import { describe, expect, it } from 'vitest';
import { LOINC_CODES, LOINC_NOT_READ, ucumCodes } from '../../../server/intake/index.ts';
import { FIELDS, units } from '../../../calc/index.ts';

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
  const codes = [...new Set(LOINC_CODES.flatMap((e) => ucumCodes(e)))];
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
    // the UCUM property as ucum-lhc names it: 'mass' or 'amount of substance'; the code's property is in its
    // LOINC long common name ([Mass/volume] or [Moles/volume])
    const property = (code: string): string => {
      const unit = ucum.getSpecifiedUnit(code, 'validate').unit;
      if (!unit) throw new Error(`ucum-lhc does not know ${code}`);
      return String(unit.property_);
    };
    const checked = LOINC_CODES.filter((e) => e.unit !== undefined);
    expect(checked.map((e) => e.code).sort()).toEqual(
      ['2345-7', '2339-0', '14749-6', '15074-8', '3094-0', '6299-2', '22664-7']
        .concat(['2160-0', '38483-4', '14682-9', '59826-8'])
        .sort(),
    );
    for (const e of checked) {
      const expected = e.name.includes('[Mass/volume]') ? 'mass' : 'amount of substance';
      expect(e.name).toMatch(/\[(?:Mass|Moles)\/volume\]/);
      for (const code of ucumCodes(e)) expect(property(code)).toBe(expected);
    }
    for (const e of LOINC_CODES.filter(
      (x) => x.path === 'gas.hb' || x.path === 'chemistry.albumin',
    ))
      for (const code of ucumCodes(e)) expect(property(code)).toBe('mass');
  });

  it('mEq/L (UCUM meq/L) is taken for an ion of known charge, never for phosphate (a mix of valences)', () => {
    const takes = (path: string) => ucumCodes(LOINC_CODES.find((e) => e.path === path)!);
    for (const path of [
      'chemistry.na',
      'chemistry.k',
      'chemistry.ionisedCalcium',
      'chemistry.magnesium',
    ])
      expect(takes(path)).toContain('meq/L');
    expect(takes('chemistry.phosphate')).not.toContain('meq/L');
    // the charge of each ion is the table's; ucum-lhc converts meq/L with the charge given (eq = mol / charge)
    const charge = (path: string) => FIELDS.find((f) => f.path === path)!;
    expect(charge('chemistry.ionisedCalcium')).toMatchObject({ charge: 2 });
    expect(charge('chemistry.magnesium')).toMatchObject({ charge: 2 });
    expect(charge('chemistry.k')).toMatchObject({ charge: 1 });
    expect(ucum.convertUnitTo('meq/L', 2.3, 'mmol/L', { charge: 2 }).toVal).toBeCloseTo(1.15, 10);
  });

  it('every code the FHIR reader reads is a code of the table (the reader keeps no list of its own)', () => {
    const table = FIELDS.flatMap((f) => ('loinc' in f ? f.loinc.map((l) => l.code) : []));
    expect(LOINC_CODES.map((e) => e.code)).toEqual(table);
  });
});
