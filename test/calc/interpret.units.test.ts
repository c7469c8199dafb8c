// kPa and SI twins: the same patient entered in conventional and in SI units gives the same findings.
// The SI twin is made with the UCUM library (@lhncbc/ucum-lhc), not with calc's own constants.
import { describe, expect, it } from 'vitest';
import { codes, MOLAR_MASS, read, ucum } from './helpers.ts';
import type { Findings } from '../../calc/index.ts';

type Case = Record<string, any>;

/** The SI twin of a conventional case, converted value by value with UCUM. */
function siTwin(c: Case): Case {
  const kPa = (v: number | undefined | null) =>
    v === undefined || v === null ? v : ucum('mm[Hg]', v, 'kPa');
  const twin: Case = structuredClone(c);
  twin.units = {
    pressure: 'kPa',
    albumin: 'g/L',
    hb: 'g/L',
    glucose: 'mmol/L',
    urea: 'urea-mmol/L',
    creatinine: 'umol/L',
    ethanol: 'mmol/L',
  };
  twin.gas = {
    ...c.gas,
    pco2: kPa(c.gas.pco2),
    po2: kPa(c.gas.po2),
    hb: c.gas.hb === undefined ? undefined : ucum('g/dL', c.gas.hb, 'g/L'),
  };
  const ch = c.chemistry;
  if (ch) {
    twin.chemistry = {
      ...ch,
      albumin: ch.albumin === undefined ? undefined : ucum('g/dL', ch.albumin, 'g/L'),
      glucose:
        ch.glucose === undefined
          ? undefined
          : ucum('mg/dL', ch.glucose, 'mmol/L', MOLAR_MASS.glucose),
      urea:
        ch.urea === undefined
          ? undefined
          : ucum('mg/dL', ch.urea, 'mmol/L', MOLAR_MASS.ureaNitrogen),
      creatinine:
        ch.creatinine === undefined
          ? undefined
          : ucum('mg/dL', ch.creatinine, 'umol/L', MOLAR_MASS.creatinine),
      ethanol:
        ch.ethanol === undefined
          ? undefined
          : ucum('mg/dL', ch.ethanol, 'mmol/L', MOLAR_MASS.ethanol),
    };
  }
  if (c.context) {
    twin.context = { ...c.context, barometricPressure: kPa(c.context.barometricPressure) };
    if (c.context.baseline)
      twin.context.baseline = { ...c.context.baseline, pco2: kPa(c.context.baseline.pco2) };
  }
  if (c.ventilator) twin.ventilator = { ...c.ventilator, targetPco2: kPa(c.ventilator.targetPco2) };
  if (c.previous)
    twin.previous = c.previous.map((p: Case) => ({
      ...p,
      gas: { ...p.gas, pco2: kPa(p.gas.pco2), po2: kPa(p.gas.po2) },
    }));
  return twin;
}

function expectSameFindings(a: Findings, b: Findings) {
  expect(b.disorders).toEqual(a.disorders);
  expect(b.phStatus).toBe(a.phStatus);
  expect([...codes(b)].sort()).toEqual([...codes(a)].sort());
  expect(b.metabolic).toEqual(a.metabolic);
  expect(b.oxygenation).toEqual(a.oxygenation);
  for (const [key, value] of Object.entries(a.derived)) {
    const other = (b.derived as unknown as Record<string, unknown>)[key];
    if (typeof value === 'number') {
      expect(typeof other, key).toBe('number');
      // derived values are reported rounded; a twin may differ by the last reported digit only
      expect(Math.abs((other as number) - value), key).toBeLessThanOrEqual(
        Math.max(0.11, Math.abs(value) * 0.002),
      );
    } else expect(other, key).toEqual(value);
  }
}

const cases: [string, Case][] = [
  [
    'a 64-year-old woman on a ventilator after abdominal surgery (the interface-contract example values)',
    {
      sample: 'arterial',
      gas: {
        ph: 7.31,
        pco2: 48,
        po2: 72,
        hco3: 23.5,
        baseExcess: -2.1,
        sao2: 93,
        lactate: 1.1,
        hb: 12.1,
      },
      chemistry: {
        na: 138,
        k: 4.1,
        cl: 104,
        albumin: 3.1,
        glucose: 110,
        urea: 18,
        creatinine: 1.0,
        osmolality: 290,
      },
      patient: { ageYears: 64, sex: 'female', heightCm: 162, pregnant: false },
      context: { timing: 'acute', temperatureC: 37 },
      oxygen: { fio2: 0.4, peep: 8 },
      ventilator: { vt: 450, rr: 16, pplat: 24, targetPh: 7.35 },
      previous: [{ takenAt: '2026-03-02T04:10', gas: { ph: 7.22, pco2: 61, hco3: 24.3 } }],
    },
  ],
  [
    'a 71-year-old man with COPD in a mountain town hospital, usual PaCO2 58, ventilated to a stated PaCO2',
    {
      gas: { ph: 7.27, pco2: 78, po2: 58, hco3: 35 },
      context: { timing: 'unknown', baseline: { pco2: 58 }, barometricPressure: 640 },
      patient: { ageYears: 71, sex: 'male', heightCm: 170 },
      oxygen: { fio2: 0.28, peep: 5 },
      ventilator: { vt: 480, rr: 14, targetPco2: 55 },
    },
  ],
  [
    'a 45-year-old man brought in drowsy after drinking: ketoacidosis with an osmolar gap',
    {
      gas: { ph: 7.16, pco2: 21, po2: 98, hco3: 7.4, sao2: 97, hb: 14.2, lactate: 3.1 },
      chemistry: {
        na: 136,
        k: 5.4,
        cl: 99,
        albumin: 3.9,
        glucose: 95,
        urea: 22,
        creatinine: 1.4,
        osmolality: 335,
        ethanol: 80,
        ionisedCalcium: 1.1,
        magnesium: 0.8,
        phosphate: 1.6,
      },
      patient: { ageYears: 45, sex: 'male' },
      oxygen: { fio2: 0.21 },
    },
  ],
];

describe.each(cases)('%s', (_story, conventional) => {
  it('gives the same findings in kPa and SI units as in mmHg and conventional units', () => {
    const a = read(conventional);
    const b = read(siTwin(conventional));
    expect(b.units.pressure).toBe('kPa');
    expectSameFindings(a, b);
  });
});

describe('canonical units in the output whatever was entered (interface contract)', () => {
  it('a kPa case reports mmHg: PaCO2 6.4 kPa is 48 mmHg and PAO2 is 225 mmHg', () => {
    const f = read(siTwin(cases[0]![1]));
    expect(f.case.gas.pco2).toBeCloseTo(48, 3);
    expect(f.derived.alveolarPo2).toBeCloseTo(225.2, 0);
  });

  it('the osmolar gap of the drinking case, by hand: 2 x 136 + 95 / 18 + 22 / 2.8 + 80 / 3.7 = 306.7; gap 28.3 (Purssell 2001)', () => {
    const f = read(cases[2]![1]);
    expect(Math.abs((f.derived.calculatedOsmolality as number) - 306.7)).toBeLessThan(0.3);
    expect(codes(f)).toContain('osmolar_gap_raised');
  });
});
