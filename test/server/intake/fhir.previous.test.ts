// Earlier gases in a FHIR payload become the case's previous gases: results grouped into gases by effective time,
// the newest the case's gas, the earlier ones in time order with their FiO2 and PEEP, at most calc's
// MAX_PREVIOUS_GASES. Codes as in fhir.test.ts (2744-1, 2019-8, 2703-7, 1960-4: DICOM PS3.16 CID 3528/3524, VSAC);
// 3150-0 Inhaled oxygen concentration (GECCO FiO2 profile); 20077-4 Positive end expiratory pressure setting
// Ventilator (HL7 SANER ventilator observations value set); 2951-2 Sodium, 2823-3 Potassium (VSAC, HL7 example).
// Every patient and number is invented.
import { createRequire } from 'node:module';
import { describe, expect, it } from 'vitest';
import { caseFromFhir } from '../../../server/intake/index.ts';
import { readIntake } from '../../../server/page.ts';
import { MAX_PREVIOUS_GASES, interpret, parseCase } from '../../../calc/index.ts';

const ucum = createRequire(import.meta.url)('@lhncbc/ucum-lhc').UcumLhcUtils.getInstance();

const at = (hh: number, mm = 0) =>
  `2026-03-02T${String(hh).padStart(2, '0')}:${String(mm).padStart(2, '0')}:00Z`;
const obs = (code: string, value: number, unit: string | null, time: string | null) => ({
  resourceType: 'Observation',
  status: 'final',
  code: { coding: [{ system: 'http://loinc.org', code }] },
  ...(time ? { effectiveDateTime: time } : {}),
  valueQuantity:
    unit === null ? { value } : { value, unit, code: unit, system: 'http://unitsofmeasure.org' },
});
const gas = (time: string, ph: number, pco2: number, hco3: number, pressure = 'mm[Hg]') => [
  obs('2744-1', ph, '[pH]', time),
  obs('2019-8', pco2, pressure, time),
  obs('1960-4', hco3, 'mmol/L', time),
];
const bundle = (...resources: unknown[]) => ({
  resourceType: 'Bundle',
  type: 'searchset',
  entry: resources.map((resource) => ({ resource })),
});

describe('gases by time', () => {
  // an invented 66-year-old ventilated overnight for a COPD exacerbation: three arterial gases
  const r = caseFromFhir(
    bundle(
      ...gas(at(4, 10), 7.33, 52, 27),
      obs('2951-2', 138, 'mmol/L', at(4, 10)),
      obs('3150-0', 35, '%', at(4, 9)),
      ...gas(at(0, 5), 7.21, 71, 27.5),
      obs('3150-0', 0.6, '1', at(0, 5)),
      obs('20077-4', 8, 'cm[H2O]', at(0, 3)),
      obs('2951-2', 141, 'mmol/L', at(0, 5)),
      ...gas(at(2, 0), 7.27, 61, 27.2),
      obs('3150-0', 40, '%', at(2, 0)),
    ),
  );

  it("the newest gas is the case's gas, with the chemistry and FiO2 of its time", () => {
    expect(r.takenAt).toBe(at(4, 10));
    expect(r.case.gas).toEqual({ ph: 7.33, pco2: 52, hco3: 27 });
    expect(r.case.chemistry).toEqual({ na: 138 });
    expect(r.case.oxygen).toEqual({ fio2: 35 });
    expect(r.read.every((x) => x.effective === at(4, 10) || x.effective === at(4, 9))).toBe(true);
  });

  it('the earlier gases are previous gases, oldest first, each with its time, FiO2 and PEEP', () => {
    expect(r.case.previous).toEqual([
      {
        takenAt: at(0, 5),
        gas: { ph: 7.21, pco2: 71, hco3: 27.5 },
        oxygen: { fio2: 0.6, peep: 8 },
      },
      { takenAt: at(2, 0), gas: { ph: 7.27, pco2: 61, hco3: 27.2 }, oxygen: { fio2: 40 } },
    ]);
    expect(r.previous.map((p) => [p.index, p.takenAt, p.read.length])).toEqual([
      [0, at(0, 5), 5],
      [1, at(2, 0), 4],
    ]);
    expect(r.notes).toEqual([
      `The newest gas (${at(4, 10)}) is the case's gas; 2 earlier gases are kept as previous: ${at(0, 5)}, ${at(2, 0)}`,
    ]);
  });

  it('chemistry of an earlier gas is not kept with it, and says so', () => {
    expect(r.earlier).toEqual([
      expect.objectContaining({
        path: 'chemistry.na',
        value: 141,
        effective: at(0, 5),
        reason: `of the earlier gas of ${at(0, 5)}: an earlier gas keeps its gas values, FiO2, PEEP, VT and RR only`,
      }),
    ]);
  });

  it('the case passes the schema, and calc reads the earlier gases in time order', () => {
    expect(r.ok).toBe(true);
    expect(parseCase(r.case).ok).toBe(true);
    const findings = interpret(r.case);
    if (!findings.ok) throw new Error(JSON.stringify(findings.errors));
    expect(findings.previous.map((p) => [p.takenAt, p.fio2, p.peep])).toEqual([
      [at(0, 5), 0.6, 8],
      [at(2, 0), 0.4, null],
    ]);
  });

  // the same-sample window is 5 minutes (our own limit, justified in the reader): [minutes apart, one gas?]
  it.each([
    [0, true],
    [4, true],
    [5, true],
    [6, false],
    [30, false],
  ])('gas values %i minutes apart are one gas: %s', (minutes, one) => {
    const s = caseFromFhir(
      bundle(...gas(at(4, 10), 7.33, 52, 27), obs('2703-7', 81, 'mm[Hg]', at(4, 10 - minutes))),
    );
    expect(s.case.gas.po2 === 81).toBe(one);
    expect(s.case.previous).toBeUndefined(); // a PaO2 alone is no earlier gas
    if (!one)
      expect(s.earlier).toEqual([
        expect.objectContaining({
          path: 'gas.po2',
          reason:
            'an older result, of no gas the case keeps (its time has no gas of two of pH, PaCO2 and HCO3 to keep as an earlier one)',
        }),
      ]);
  });

  it('chemistry a few minutes from the gas joins it; an hour after the newest gas it is set aside', () => {
    const s = caseFromFhir(
      bundle(
        ...gas(at(4, 10), 7.33, 52, 27),
        obs('2951-2', 138, 'mmol/L', at(4, 12)),
        obs('2823-3', 4.4, 'mmol/L', at(5, 10)),
      ),
    );
    expect(s.case.chemistry).toEqual({ na: 138 });
    expect(s.earlier).toEqual([
      expect.objectContaining({
        path: 'chemistry.k',
        reason: `a result after the newest gas (${at(4, 10)}): not read with that gas`,
      }),
    ]);
  });
});

describe('what an earlier gas must be', () => {
  it(`at most MAX_PREVIOUS_GASES (${MAX_PREVIOUS_GASES}) earlier gases, the most recent; the oldest are set aside`, () => {
    const earlier = Array.from({ length: MAX_PREVIOUS_GASES + 1 }, (_, i) =>
      gas(`2026-03-01T${String(i + 1).padStart(2, '0')}:00:00Z`, 7.3, 50, 24),
    ).flat();
    const r = caseFromFhir(bundle(...earlier, ...gas(at(4, 10), 7.33, 52, 27)));
    expect(r.case.previous).toHaveLength(MAX_PREVIOUS_GASES);
    expect(r.case.previous![0]!.takenAt).toBe('2026-03-01T02:00:00Z');
    expect(r.earlier.map((e) => [e.effective, e.reason])).toEqual(
      ['gas.ph', 'gas.pco2', 'gas.hco3'].map(() => [
        '2026-03-01T01:00:00Z',
        `an earlier gas beyond the ${MAX_PREVIOUS_GASES} most recent: not kept`,
      ]),
    );
    expect(parseCase(r.case).ok).toBe(true);
  });

  it('an earlier venous gas is not compared with an arterial one (2746-6, 2021-4: DICOM CID 3528/3524)', () => {
    const r = caseFromFhir(
      bundle(
        obs('2746-6', 7.3, '[pH]', at(1)),
        obs('2021-4', 55, 'mm[Hg]', at(1)),
        ...gas(at(4, 10), 7.33, 52, 27),
      ),
    );
    expect(r.case.sample).toBe('arterial');
    expect(r.case.previous).toBeUndefined();
    expect(r.earlier.map((e) => e.reason)).toEqual([
      `of an earlier venous gas (${at(1)}), and the newest gas is arterial: not compared`,
      `of an earlier venous gas (${at(1)}), and the newest gas is arterial: not compared`,
    ]);
  });

  it('an earlier value outside the schema range is left out of its gas, with the range', () => {
    const r = caseFromFhir(bundle(...gas(at(1), 9.1, 50, 24), ...gas(at(4, 10), 7.33, 52, 27)));
    expect(r.case.previous).toEqual([{ takenAt: at(1), gas: { pco2: 50, hco3: 24 } }]);
    expect(r.earlier).toEqual([
      expect.objectContaining({
        path: 'gas.ph',
        reason: `pH 9.1 is outside 6.50-8.00: left out of the earlier gas of ${at(1)}`,
      }),
    ]);
    expect(r.ok).toBe(true);
  });

  it('an earlier gas in kPa is converted to the unit of the case, and the conversion names the earlier gas', () => {
    const r = caseFromFhir(
      bundle(
        ...gas(at(1), 7.25, 8.1, 26, 'kPa'),
        ...gas(at(4, 10), 7.33, 52, 27),
        obs('2703-7', 78, 'mm[Hg]', at(4, 10)),
      ),
    );
    expect(r.case.units).toEqual({ pressure: 'mmHg' });
    // 8.1 kPa in mm[Hg] by ucum-lhc (1 mm[Hg] = 133.322 Pa)
    expect(r.case.previous![0]!.gas.pco2).toBeCloseTo(
      ucum.convertUnitTo('kPa', 8.1, 'mm[Hg]').toVal,
      3,
    );
    expect(r.conversions).toEqual([
      expect.objectContaining({
        path: 'gas.pco2',
        previous: 0,
        from: { value: 8.1, unit: 'kPa' },
      }),
    ]);
  });

  it('earlier gases alone in kPa set the case to kPa even when the newest gas has no pressure', () => {
    const r = caseFromFhir(
      bundle(
        ...gas(at(1), 7.25, 8.1, 26, 'kPa'),
        obs('2744-1', 7.31, '[pH]', at(4, 10)),
        obs('1960-4', 27, 'mmol/L', at(4, 10)),
      ),
    );
    expect(r.case.units).toEqual({ pressure: 'kPa' });
    expect(r.case.previous).toEqual([{ takenAt: at(1), gas: { ph: 7.25, pco2: 8.1, hco3: 26 } }]);
  });

  it('a result without a time cannot be placed among several gases; with one gas it joins it', () => {
    const two = caseFromFhir(
      bundle(
        ...gas(at(1), 7.25, 61, 26),
        ...gas(at(4, 10), 7.33, 52, 27),
        obs('2951-2', 139, 'mmol/L', null),
      ),
    );
    expect(two.case.chemistry).toBeUndefined();
    expect(two.earlier[0]!.reason).toBe(
      'no effective time, and the payload holds gases of 2 times: it cannot be placed with one of them',
    );
    const one = caseFromFhir(
      bundle(...gas(at(4, 10), 7.33, 52, 27), obs('2951-2', 139, 'mmol/L', null)),
    );
    expect(one.case.chemistry).toEqual({ na: 139 });
  });

  it('times written in different zones are read as written, with a note', () => {
    const r = caseFromFhir(
      bundle(...gas('2026-03-02T01:00:00+01:00', 7.25, 61, 26), ...gas(at(4, 10), 7.33, 52, 27)),
    );
    expect(r.notes[0]).toBe(
      'The results carry times in different zones (+01:00, Z): times are read as written, so check which gas is the newest',
    );
  });
});

describe('pasted FHIR goes through the same reader', () => {
  it("the page's paste of a bundle gives the earlier gases as previous gases", () => {
    const raw = readIntake(
      JSON.stringify(bundle(...gas(at(1), 7.25, 61, 26), ...gas(at(4, 10), 7.33, 52, 27))),
    );
    if (raw.kind !== 'fhir') throw new Error(`read as ${raw.kind}`);
    expect(raw.result.case.previous).toEqual([
      { takenAt: at(1), gas: { ph: 7.25, pco2: 61, hco3: 26 } },
    ]);
  });
});
