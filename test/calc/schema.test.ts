// Validation (calc/schema.ts through interpret): 422-style errors with the path, the value and the range in the
// clinician's unit; wrong types, unknown enums and keys; FiO2 as fraction or percent; a rejected case computes nothing.
// Plausibility ranges are clinical-scope section 3 unless schema.ts marks them "common practice".
import { describe, expect, it } from 'vitest';
import { caseSchema, interpret, parseCase, toFieldErrors } from '../../calc/index.ts';
import { read, reject } from './helpers.ts';

const gas = { ph: 7.4, pco2: 40, hco3: 24 };

describe('out-of-range values: the path, the value as entered and the range in the same unit', () => {
  it.each([
    [{ gas: { ph: 9.1, pco2: 40 } }, 'gas.ph', 'pH 9.1 is outside 6.50-8.00: check the value'], // interface-contract example
    [
      { gas: { ph: 7.4, pco2: 250 } },
      'gas.pco2',
      'PaCO2 250 mmHg is outside 5-200 mmHg: check the value',
    ],
    [
      { gas: { ph: 7.4, pco2: 4 } },
      'gas.pco2',
      'PaCO2 4 mmHg is outside 5-200 mmHg: check the value (was it entered in kPa?)',
    ],
    [
      { units: { pressure: 'kPa' }, gas: { ph: 7.4, pco2: 30 } },
      'gas.pco2',
      'PaCO2 30 kPa is outside 0.67-26.7 kPa: check the value (was it entered in mmHg?)',
    ],
    [
      { units: { pressure: 'kPa' }, gas: { ph: 7.4, pco2: 5.3, po2: 0.5 } },
      'gas.po2',
      'PaO2 0.5 kPa is outside 1.33-101.3 kPa: check the value',
    ],
    [
      {
        units: { pressure: 'kPa' },
        gas: { ph: 7.4, pco2: 5.3 },
        context: { barometricPressure: 760 },
      },
      'context.barometricPressure',
      'Barometric pressure 760 kPa is outside 53.3-106.7 kPa: check the value (was it entered in mmHg?)',
    ],
    [
      { units: { pressure: 'kPa' }, gas: { ph: 7.4, pco2: 5.3 }, ventilator: { targetPco2: 1 } },
      'ventilator.targetPco2',
      'Target PaCO2 1 kPa is outside 2.67-16.0 kPa: check the value',
    ],
    [
      { gas, chemistry: { na: 250 } },
      'chemistry.na',
      'Na 250 mmol/L is outside 90-200 mmol/L: check the value',
    ],
    [
      { gas, chemistry: { k: 12 } },
      'chemistry.k',
      'K 12 mmol/L is outside 1-10 mmol/L: check the value',
    ],
    [
      { gas, chemistry: { cl: 40 } },
      'chemistry.cl',
      'Cl 40 mmol/L is outside 50-160 mmol/L: check the value',
    ],
    [
      { gas, chemistry: { albumin: 8 } },
      'chemistry.albumin',
      'Albumin 8 g/dL is outside 0.5-7.0 g/dL: check the value',
    ],
    [
      { units: { albumin: 'g/L' }, gas, chemistry: { albumin: 80 } },
      'chemistry.albumin',
      'Albumin 80 g/L is outside 5-70 g/L: check the value',
    ],
    [
      { gas, chemistry: { glucose: 2500 } },
      'chemistry.glucose',
      'Glucose 2500 mg/dL is outside 0-2161.9 mg/dL: check the value',
    ],
    [
      { gas: { ...gas, lactate: 45 } },
      'gas.lactate',
      'Lactate 45 mmol/L is outside 0-40 mmol/L: check the value',
    ],
    [
      { gas, oxygen: { peep: 35 } },
      'oxygen.peep',
      'PEEP 35 cmH2O is outside 0-30 cmH2O: check the value',
    ],
    [
      { gas, ventilator: { vt: 50 } },
      'ventilator.vt',
      'VT 50 mL is outside 100-2000 mL: check the value',
    ],
    [
      { gas, ventilator: { rr: 90 } },
      'ventilator.rr',
      'RR 90 /min is outside 1-80 /min: check the value',
    ],
    [
      { gas, patient: { ageYears: 130 } },
      'patient.ageYears',
      'Age 130 years is outside 0-120 years: check the value',
    ],
    [
      { gas, patient: { heightCm: 90 } },
      'patient.heightCm',
      'Height 90 cm is outside 100-250 cm: check the value',
    ],
    [
      { gas, context: { baseline: { pco2: 300 } } },
      'context.baseline.pco2',
      'Usual PaCO2 300 mmHg is outside 5-200 mmHg: check the value',
    ],
    [
      { gas, previous: [{ gas: { ph: 6.2, pco2: 40 } }] },
      'previous.0.gas.ph',
      'pH 6.2 is outside 6.50-8.00: check the value',
    ],
  ])('%j is rejected at %s', (c, path, message) => {
    expect(reject(c).errors).toEqual([{ path, message }]);
  });

  it('every bad field is named, not only the first', () => {
    const errors = reject({
      gas: { ph: 9, pco2: 300, hco3: 0 },
      chemistry: { na: 300, k: 0 },
    }).errors;
    expect(errors.map((e) => e.path)).toEqual([
      'gas.ph',
      'gas.pco2',
      'gas.hco3',
      'chemistry.na',
      'chemistry.k',
    ]);
  });

  it('a worked-out third value must itself be plausible: pH 7.40 with PaCO2 150 would need HCO3 90 (Henderson)', () => {
    const [error] = reject({ gas: { ph: 7.4, pco2: 150 } }).errors;
    expect(error?.path).toBe('gas.hco3');
    expect(error?.message).toMatch(/90\.4.*outside 1-70 mmol\/L/);
  });

  it('fewer than two of pH, PaCO2, HCO3 is rejected at gas', () => {
    expect(reject({ gas: { ph: 7.4, po2: 90 } }).errors[0]?.path).toBe('gas');
  });

  it('pregnancy in a male patient is questioned, not guessed', () => {
    expect(reject({ gas, patient: { sex: 'male', pregnant: true } }).errors).toEqual([
      {
        path: 'patient.pregnant',
        message: 'Pregnant is set for a male patient: check sex and pregnancy',
      },
    ]);
  });
});

describe('wrong types, unknown enums and unknown keys', () => {
  it.each([
    [{ gas: { ph: '7.4', pco2: 40 } }, 'gas.ph', 'pH must be a number'],
    [{ gas: { ph: Number.NaN, pco2: 40 } }, 'gas.ph', 'pH must be a number'],
    [{ gas: { ph: 7.4, pco2: Number.POSITIVE_INFINITY } }, 'gas.pco2', 'PaCO2 must be a number'],
    [{ gas, patient: { pregnant: 'yes' } }, 'patient.pregnant', 'pregnant must be true or false'],
    [{ gas, chemistry: 5 }, 'chemistry', 'chemistry must be an object of named values'],
    [{ gas, previous: 'x' }, 'previous', 'previous must be a list of earlier gases'],
    [{}, 'gas', 'gas is required: give at least two of pH, PaCO2 and HCO3'],
    [
      { sample: 'arterialised', gas },
      'sample',
      'Sample type must be one of: arterial, venous, capillary',
    ],
    [
      { units: { pressure: 'torr' }, gas },
      'units.pressure',
      'Pressure unit must be one of: mmHg, kPa',
    ],
    [
      { gas, context: { timing: 'subacute' } },
      'context.timing',
      'Timing must be one of: acute, chronic, unknown',
    ],
    [{ gas, patient: { sex: 'M' } }, 'patient.sex', 'Sex must be one of: male, female'],
    [
      { gas: { ...gas, paco2: 40 } },
      'gas.paco2',
      'Unknown field "paco2": check its spelling against the contract',
    ],
    [
      { gas, notes: 'x' },
      'notes',
      'Unknown field "notes": check its spelling against the contract',
    ],
    [
      { gas, ventilator: { tidalVolume: 450 } },
      'ventilator.tidalVolume',
      'Unknown field "tidalVolume": check its spelling against the contract',
    ],
  ])('%j: %s', (c, path, message) => {
    expect(reject(c).errors).toContainEqual({ path, message });
  });

  it.each([[null], ['a string'], [[]], [42]])(
    'a body that is not an object (%j) is rejected at (body)',
    (body) => {
      expect(reject(body).errors).toEqual([
        { path: '(body)', message: 'The case must be a JSON object with at least a gas' },
      ]);
    },
  );

  it('the schema used by the server gives the same errors as interpret', () => {
    const bad = { gas: { ph: 9.1, pco2: 40, foo: 1 } };
    const result = caseSchema.safeParse(bad);
    expect(result.success).toBe(false);
    if (!result.success) expect(toFieldErrors(result.error)).toEqual(reject(bad).errors);
    expect(parseCase(bad)).toEqual({ ok: false, errors: reject(bad).errors });
  });
});

describe('FiO2 as a fraction 0.21-1.00 or a percent 21-100 (clinical-scope section 1)', () => {
  const arterial = { gas: { ph: 7.44, pco2: 36, po2: 110, hco3: 24 }, patient: { ageYears: 50 } };
  it.each([
    [0.4, 40],
    [0.21, 21],
    [1, 100],
    [0.65, 65],
  ])('FiO2 %s and %s%% give the same reading', (fraction, percent) => {
    const a = read({ ...arterial, oxygen: { fio2: fraction } });
    const b = read({ ...arterial, oxygen: { fio2: percent } });
    expect(a.derived).toEqual(b.derived);
    expect(a.case.oxygen.fio2).toBeCloseTo(fraction, 12);
  });

  it.each([[0.15], [0.2], [15], [101], [1.5]])(
    'FiO2 %s is neither and is rejected with its path',
    (fio2) => {
      expect(reject({ ...arterial, oxygen: { fio2 } }).errors).toEqual([
        {
          path: 'oxygen.fio2',
          message: `FiO2 ${fio2} is neither a fraction (0.21-1.00) nor a percent (21-100): check the value`,
        },
      ]);
    },
  );
});

describe('a rejected case computes nothing', () => {
  it.each([
    [{ gas: { ph: 9.1, pco2: 40 }, chemistry: { na: 140, cl: 104 }, oxygen: { fio2: 0.21 } }],
    [{ gas: { ph: 7.4, pco2: 150 }, ventilator: { vt: 450, rr: 16, targetPh: 7.35 } }],
    [{ gas, unknownGroup: {} }],
  ])('%j returns only ok: false and the errors', (c) => {
    const result = interpret(c);
    expect(Object.keys(result).sort()).toEqual(['errors', 'ok']);
    expect(result.ok).toBe(false);
  });

  it('null and absent optional values are accepted as missing, never as zero', () => {
    const f = read({
      gas: { ph: 7.4, pco2: 40, hco3: null, po2: null },
      chemistry: { na: null, cl: 104 },
      ventilator: null,
    });
    expect(f.derived.anionGap).toBeNull();
    expect(f.case.gas.hco3).toBeCloseTo(24.1, 1);
    expect(f.ventilation).toBeNull();
  });
});

describe('known conditions (interface contract: context.conditions)', () => {
  it('the contract list is accepted, each once, and carried in the case', () => {
    const f = read({ gas, context: { conditions: ['copd', 'asthma', 'copd', 'diabetes'] } });
    expect(f.case.context.conditions).toEqual(['copd', 'asthma', 'diabetes']);
    expect(read({ gas }).case.context.conditions).toEqual([]);
  });

  it.each([
    [
      { conditions: ['asthma', 'gout'] },
      'context.conditions.1',
      /Condition must be one of: .*asthma/,
    ],
    [{ conditions: 'asthma' }, 'context.conditions', /must be a list/],
  ])('%j is rejected at %s', (context, path, message) => {
    const e = reject({ gas, context }).errors.find((x) => x.path === path);
    expect(e?.message).toMatch(message);
  });
});
