// FHIR R4 intake: bundles built from published LOINC codes (each named beside its use with the list it
// is published in) and UCUM units (checked with the general-purpose UCUM library @lhncbc/ucum-lhc).
// Every patient and number is invented.
import { createRequire } from 'node:module';
import { describe, expect, it } from 'vitest';
import { caseFromFhir, MAX_REPORTED } from '../../../server/intake/index.ts';
import { parseCase } from '../../../calc/index.ts';

const ucum = createRequire(import.meta.url)('@lhncbc/ucum-lhc').UcumLhcUtils.getInstance();
const ucumConvert = (from: string, value: number, to: string): number => {
  const r = ucum.convertUnitTo(from, value, to);
  if (r.status !== 'succeeded') throw new Error(`ucum-lhc could not convert ${from} to ${to}`);
  return r.toVal;
};

const UCUM_SYSTEM = 'http://unitsofmeasure.org';
const T1 = '2026-03-02T04:10:00Z';
const T0 = '2026-03-02T01:05:00Z';

interface ObsOptions {
  status?: string;
  at?: string | null;
  system?: string | null;
  unitText?: string;
  extra?: Record<string, unknown>;
}
/** An Observation with one LOINC coding and a UCUM valueQuantity (ucum = null: no unit at all). */
const obs = (code: string, value: number, ucumCode: string | null, o: ObsOptions = {}) => ({
  resourceType: 'Observation',
  status: o.status ?? 'final',
  code: { coding: [{ system: 'http://loinc.org', code }] },
  ...(o.at === null ? {} : { effectiveDateTime: o.at ?? T1 }),
  valueQuantity: {
    value,
    ...(ucumCode === null ? {} : { unit: o.unitText ?? ucumCode, code: ucumCode }),
    ...(ucumCode === null || o.system === null ? {} : { system: o.system ?? UCUM_SYSTEM }),
  },
  ...o.extra,
});
const bundle = (type: string, ...resources: unknown[]) => ({
  resourceType: 'Bundle',
  type,
  entry: resources.map((resource, i) => ({
    fullUrl: `urn:uuid:00000000-0000-4000-8000-${String(i).padStart(12, '0')}`,
    resource,
  })),
});

// Codes (LOINC long common names; the list each one is published in):
// 2744-1 pH of Arterial blood (DICOM PS3.16 CID 3528) · 2019-8 Carbon dioxide [Partial pressure] in Arterial blood (CID 3524)
// 2703-7 Oxygen [Partial pressure] in Arterial blood (CID 3524) · 1960-4 Bicarbonate [Moles/volume] in Arterial blood (VSAC 2.16.840.1.113762.1.4.1045.139)
// 1925-7 Base excess in Arterial blood (CID 3527) · 2708-6 Oxygen saturation in Arterial blood (CID 3526)
// 2518-9 Lactate [Moles/volume] in Arterial blood, 30313-1 Hemoglobin [Mass/volume] in Arterial blood (VSAC 2.16.840.1.113762.1.4.1248.219)
const arterialGas = (at = T1, p = { ph: 7.31, pco2: 48, po2: 72, hco3: 23.5 }) => [
  obs('2744-1', p.ph, '[pH]', { at }),
  obs('2019-8', p.pco2, 'mm[Hg]', { at }),
  obs('2703-7', p.po2, 'mm[Hg]', { at }),
  obs('1960-4', p.hco3, 'mmol/L', { at }),
];

describe('reading a gas', () => {
  it('an arterial gas in mmHg with Hb in g/dL: values, units, sample, and the schema accepts it', () => {
    const r = caseFromFhir(
      bundle(
        'collection',
        ...arterialGas(),
        obs('1925-7', -2.1, 'mmol/L'),
        obs('2708-6', 93, '%'),
        obs('2518-9', 1.1, 'mmol/L'),
        obs('30313-1', 12.1, 'g/dL'),
      ),
    );
    expect(r.case).toEqual({
      sample: 'arterial',
      units: { pressure: 'mmHg', hb: 'g/dL' },
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
    });
    expect(r).toMatchObject({
      ok: true,
      errors: [],
      questions: [],
      unused: [],
      previous: [],
      earlier: [],
      conversions: [],
      missing: [],
    });
    expect(r.read.find((x) => x.path === 'gas.pco2')).toMatchObject({
      code: '2019-8',
      unit: 'mmHg',
      source: 'entry[1].resource',
      effective: T1,
    });
    expect(parseCase(r.case).ok).toBe(true);
  });

  it('venous codes give a venous sample (2746-6, 2021-4, 2705-2 from DICOM CID 3528/3524; 14627-4 from VSAC ...1045.139)', () => {
    const r = caseFromFhir(
      bundle(
        'searchset',
        obs('2746-6', 7.33, '[pH]'),
        obs('2021-4', 52, 'mm[Hg]'),
        obs('2705-2', 38, 'mm[Hg]'),
        obs('14627-4', 27, 'mmol/L'),
        obs('2519-7', 1.9, 'mmol/L'),
      ),
    ); // 2519-7 Lactate [Moles/volume] in Venous blood (GECCO code list)
    expect(r.case.sample).toBe('venous');
    expect(r.case.gas).toEqual({ ph: 7.33, pco2: 52, po2: 38, hco3: 27, lactate: 1.9 });
    expect(r.ok).toBe(true);
    expect(parseCase(r.case).ok).toBe(true);
  });

  it('capillary codes give a capillary sample (2745-8, 2020-6, 2704-5 from the GECCO pH, PaCO2, PaO2 profiles)', () => {
    const r = caseFromFhir(
      bundle(
        'transaction',
        obs('2745-8', 7.36, '[pH]'),
        obs('2020-6', 5.6, 'kPa'),
        obs('2704-5', 8.4, 'kPa'),
      ),
    );
    expect(r.case).toMatchObject({
      sample: 'capillary',
      units: { pressure: 'kPa' },
      gas: { ph: 7.36, pco2: 5.6, po2: 8.4 },
    });
  });

  it('arterial and venous gas values together are an error, and no sample type is set', () => {
    const r = caseFromFhir(
      bundle('collection', obs('2744-1', 7.31, '[pH]'), obs('2021-4', 52, 'mm[Hg]')),
    );
    expect(r.ok).toBe(false);
    expect(r.case.sample).toBeUndefined();
    expect(r.errors).toEqual([expect.objectContaining({ path: 'sample' })]);
    expect(r.errors[0]!.message).toContain('2021-4 (venous)');
  });

  it('codes that do not say the specimen (11558-4 pH of Blood, 11557-6 pCO2 in Blood: DICOM CID 3528/3524) leave the sample type to ask', () => {
    const r = caseFromFhir(
      bundle('collection', obs('11558-4', 7.38, '[pH]'), obs('11557-6', 41, 'mm[Hg]')),
    );
    expect(r.case.sample).toBeUndefined();
    expect(r.questions).toEqual([
      expect.objectContaining({ path: 'sample', options: ['arterial', 'venous', 'capillary'] }),
    ]);
    expect(r.ok).toBe(false);
  });
});

describe('units', () => {
  it('mixed kPa and mm[Hg]: one unit in the case (mmHg on a tie, the project default), the conversion reported and equal to UCUM', () => {
    const r = caseFromFhir(
      bundle(
        'collection',
        obs('2744-1', 7.31, '[pH]'),
        obs('2019-8', 6.4, 'kPa'),
        obs('2703-7', 72, 'mm[Hg]'),
      ),
    );
    expect(r.case.units).toEqual({ pressure: 'mmHg' });
    expect(r.case.gas.pco2).toBeCloseTo(ucumConvert('kPa', 6.4, 'mm[Hg]'), 2); // 48.00 mmHg (UCUM: 1 mm[Hg] = 133.322 Pa)
    expect(r.case.gas.po2).toBe(72);
    expect(r.conversions).toEqual([
      expect.objectContaining({
        path: 'gas.pco2',
        source: 'entry[1].resource',
        from: { value: 6.4, unit: 'kPa' },
        to: { value: r.case.gas.pco2, unit: 'mmHg' },
      }),
    ]);
    expect(r.ok).toBe(true);
  });

  it('both pressures in kPa: the case keeps kPa and nothing is converted', () => {
    const r = caseFromFhir(
      bundle(
        'collection',
        obs('2744-1', 7.28, '[pH]'),
        obs('2019-8', 7.9, 'kPa'),
        obs('2703-7', 8.1, 'kPa'),
        obs('1960-4', 27.4, 'mmol/L'),
      ),
    );
    expect(r.case).toMatchObject({ units: { pressure: 'kPa' }, gas: { pco2: 7.9, po2: 8.1 } });
    expect(r.conversions).toEqual([]);
    expect(parseCase(r.case).ok).toBe(true);
  });

  it('SI chemistry sets g/L, mmol/L, urea mmol/L and µmol/L', () => {
    // 1751-7 Albumin (HL7 ObservationDefinition example), 14749-6 Glucose [Moles/volume] (from memory),
    // 22664-7 Urea [Moles/volume] (from memory), 14682-9 Creatinine [Moles/volume] (VSAC 2.16.840.1.113883.3.666.5.2363)
    const r = caseFromFhir(
      bundle(
        'collection',
        ...arterialGas(),
        obs('1751-7', 31, 'g/L'),
        obs('14749-6', 7.4, 'mmol/L'),
        obs('22664-7', 9.2, 'mmol/L'),
        obs('14682-9', 104, 'umol/L'),
      ),
    );
    expect(r.case.units).toEqual({
      pressure: 'mmHg',
      albumin: 'g/L',
      glucose: 'mmol/L',
      urea: 'urea-mmol/L',
      creatinine: 'umol/L',
    });
    expect(r.case.chemistry).toEqual({ albumin: 31, glucose: 7.4, urea: 9.2, creatinine: 104 });
    expect(parseCase(r.case).ok).toBe(true);
  });

  it('US chemistry sets g/dL, mg/dL and BUN', () => {
    // 2345-7 Glucose [Mass/volume], 3094-0 Urea nitrogen [Mass/volume] (VSAC ...1248.218), 2160-0 Creatinine [Mass/volume] (VSAC ...666.5.2363)
    const r = caseFromFhir(
      bundle(
        'collection',
        ...arterialGas(),
        obs('1751-7', 3.1, 'g/dL'),
        obs('2345-7', 110, 'mg/dL'),
        obs('3094-0', 18, 'mg/dL'),
        obs('2160-0', 1.0, 'mg/dL'),
        obs('2951-2', 138, 'mmol/L'),
        obs('2823-3', 4.1, 'meq/L'),
        obs('2075-0', 104, 'mmol/L'),
        obs('2692-2', 290, 'mosm/kg'),
      ),
    );
    expect(r.case.units).toEqual({
      pressure: 'mmHg',
      albumin: 'g/dL',
      glucose: 'mg/dL',
      urea: 'bun-mg/dL',
      creatinine: 'mg/dL',
    });
    expect(r.case.chemistry).toEqual({
      albumin: 3.1,
      glucose: 110,
      urea: 18,
      creatinine: 1.0,
      na: 138,
      k: 4.1,
      cl: 104,
      osmolality: 290,
    });
    expect(r.ok).toBe(true);
    expect(parseCase(r.case).ok).toBe(true);
  });

  it('a mass unit on a moles code (mg/dL on 14749-6) is an error, not a conversion', () => {
    const r = caseFromFhir(bundle('collection', obs('14749-6', 110, 'mg/dL')));
    expect(r.errors).toEqual([
      expect.objectContaining({ path: 'entry[0].resource.valueQuantity.code' }),
    ]);
    expect(r.case.chemistry).toBeUndefined();
  });

  it('a missing unit, a unit not marked UCUM, and a non-UCUM code are errors at the unit', () => {
    const r = caseFromFhir(
      bundle(
        'collection',
        obs('2744-1', 7.31, '[pH]'),
        obs('2019-8', 48, null),
        obs('2703-7', 72, 'mmHg', { system: null }),
        obs('1960-4', 23.5, 'mEq/L'),
        obs('2708-6', 93, 'mmHg'),
      ),
    );
    expect(r.errors.map((e) => e.path)).toEqual([
      'entry[1].resource.valueQuantity.unit',
      'entry[2].resource.valueQuantity.system',
      'entry[3].resource.valueQuantity.code',
      'entry[4].resource.valueQuantity.code',
    ]);
    expect(r.errors[2]!.message).toContain('UCUM writes "meq/L"');
    expect(r.case.gas).toEqual({ ph: 7.31 });
    expect(r.ok).toBe(false);
  });

  it('UCUM "mmHg" is not the UCUM code mm[Hg] (ucum-lhc agrees) and is refused with a hint', () => {
    expect(ucum.validateUnitString('mmHg', true).status).toBe('invalid');
    const r = caseFromFhir(bundle('collection', obs('2019-8', 48, 'mmHg')));
    expect(r.errors[0]!.message).toContain('UCUM writes "mm[Hg]"');
  });

  it('pH may come without a unit; with a unit of concentration it is an error', () => {
    expect(caseFromFhir(bundle('collection', obs('2744-1', 7.31, null))).case.gas).toEqual({
      ph: 7.31,
    });
    expect(caseFromFhir(bundle('collection', obs('2744-1', 49, 'nmol/L'))).errors[0]!.path).toBe(
      'entry[0].resource.valueQuantity.code',
    );
  });

  it('a saturation as a UCUM fraction "1" becomes a percent, reported; FiO2 3150-0 (GECCO FiO2 profile) is kept as sent', () => {
    const r = caseFromFhir(
      bundle('collection', ...arterialGas(), obs('2708-6', 0.95, '1'), obs('3150-0', 40, '%')),
    );
    expect(r.case.gas.sao2).toBeCloseTo(95, 10);
    expect(r.case.oxygen).toEqual({ fio2: 40 });
    expect(r.conversions).toEqual([
      expect.objectContaining({ path: 'gas.sao2', from: { value: 0.95, unit: '1' } }),
    ]);
  });
});

describe('what is not used is reported', () => {
  it('unknown codes, codes deliberately not read, and resources that are not Observations', () => {
    const r = caseFromFhir(
      bundle(
        'collection',
        ...arterialGas(),
        obs('4544-3', 41, '%'), // Hematocrit [Volume Fraction] of Blood by Automated count (VSAC 2.16.840.1.113762.1.4.1045.114)
        obs('19230-2', 22.1, 'mmol/L'), // Bicarbonate [Moles/volume] standard in Arterial blood (VSAC ...1045.139)
        obs('33254-4', 7.29, '[pH]'), // pH of Arterial blood adjusted to patient's actual temperature (VSAC ...1248.96)
        obs('2028-9', 25, 'mmol/L'), // Carbon dioxide, total [Moles/volume] in Serum or Plasma (VSAC ...1045.139)
        {
          resourceType: 'Observation',
          status: 'final',
          code: {
            coding: [{ system: 'urn:oid:1.2.3.4', code: 'LOCAL-GAS-7' }],
            text: 'Local gas item',
          },
          valueQuantity: { value: 3 },
        },
        { resourceType: 'Patient', id: 'invented-1' },
      ),
    );
    expect(r.unused.map((u) => [u.code, u.reason])).toEqual([
      ['4544-3', 'a LOINC code Gasline does not read'],
      ['19230-2', 'standard bicarbonate is not the actual HCO3'],
      ['33254-4', 'temperature-corrected value; the 37 °C value is the one read'],
      ['2028-9', 'total CO2 is not the blood-gas HCO3 (it runs about 1-2 mmol/L higher)'],
      ['LOCAL-GAS-7', 'no LOINC code: not read'],
      [null, 'not an Observation: not read'],
    ]);
    expect(r.case.gas).toEqual({ ph: 7.31, pco2: 48, po2: 72, hco3: 23.5 });
    expect(r.ok).toBe(true);
  });

  it('a long list is cut at 20 entries, the rest counted in one note (a 64 KiB payload of other resources)', () => {
    const others = Array.from({ length: 900 }, (_, i) => ({
      resourceType: 'Patient',
      id: `p${i}`,
    }));
    const r = caseFromFhir(bundle('collection', ...arterialGas(), ...others));
    expect(r.unused).toHaveLength(MAX_REPORTED);
    expect(r.notes.at(-1)).toBe(`Not listed here: ${900 - MAX_REPORTED} more results not used.`);
    expect(r.case.gas).toEqual({ ph: 7.31, pco2: 48, po2: 72, hco3: 23.5 });
    expect(r.ok).toBe(true);
    // one more than the limit: "1 more result", and nothing is cut at the limit itself
    const over = caseFromFhir(bundle('collection', ...arterialGas(), ...others.slice(0, 21)));
    expect(over.notes.at(-1)).toBe('Not listed here: 1 more result not used.');
    const at = caseFromFhir(bundle('collection', ...arterialGas(), ...others.slice(0, 20)));
    expect(at.unused).toHaveLength(20);
    expect(at.notes.some((n) => n.startsWith('Not listed here'))).toBe(false);
  });

  it('entered-in-error, cancelled and registered results are skipped and reported, even when newer', () => {
    const r = caseFromFhir(
      bundle(
        'collection',
        ...arterialGas(),
        obs('2744-1', 6.95, '[pH]', { status: 'entered-in-error', at: '2026-03-02T05:00:00Z' }),
        obs('2019-8', 80, 'mm[Hg]', { status: 'cancelled', at: '2026-03-02T05:00:00Z' }),
        obs('1960-4', 10, 'mmol/L', { status: 'registered' }),
      ),
    );
    expect(r.case.gas).toEqual({ ph: 7.31, pco2: 48, po2: 72, hco3: 23.5 });
    expect(r.unused.map((u) => u.reason)).toEqual([
      'status "entered-in-error": not a result to use',
      'status "cancelled": not a result to use',
      'status "registered": not a result to use',
    ]);
    expect(r.earlier).toEqual([]);
    expect(r.case.previous).toBeUndefined();
  });

  it('a value given as a bound ("<0.5") is reported, not used', () => {
    const lactate = obs('2518-9', 0.5, 'mmol/L', { extra: {} });
    (lactate.valueQuantity as Record<string, unknown>).comparator = '<';
    const r = caseFromFhir(bundle('collection', ...arterialGas(), lactate));
    expect(r.case.gas.lactate).toBeUndefined();
    expect(r.unused[0]).toMatchObject({ code: '2518-9', source: 'entry[4].resource' });
  });

  it('a preliminary result is used with a note', () => {
    const r = caseFromFhir(
      bundle('collection', ...arterialGas().map((o) => ({ ...o, status: 'preliminary' }))),
    );
    expect(r.case.gas.ph).toBe(7.31);
    expect(r.notes).toHaveLength(4);
  });
});

describe('several results for one value', () => {
  it("the latest gas is the case's gas, and the older gas is reported as a previous gas with its time", () => {
    const r = caseFromFhir(
      bundle(
        'collection',
        ...arterialGas(T0, { ph: 7.22, pco2: 61, po2: 65, hco3: 24.3 }),
        ...arterialGas(T1),
      ),
    );
    expect(r.case.gas).toEqual({ ph: 7.31, pco2: 48, po2: 72, hco3: 23.5 });
    expect(r.takenAt).toBe(T1);
    expect(r.case.previous).toEqual([
      { takenAt: T0, gas: { ph: 7.22, pco2: 61, po2: 65, hco3: 24.3 } },
    ]);
    expect(
      r.previous.map((p) => [p.index, p.takenAt, p.read.map((x) => [x.path, x.source])]),
    ).toEqual([
      [
        0,
        T0,
        [
          ['gas.ph', 'entry[0].resource'],
          ['gas.pco2', 'entry[1].resource'],
          ['gas.po2', 'entry[2].resource'],
          ['gas.hco3', 'entry[3].resource'],
        ],
      ],
    ]);
    expect(r.read.map((x) => x.source)).toEqual([
      'entry[4].resource',
      'entry[5].resource',
      'entry[6].resource',
      'entry[7].resource',
    ]);
    expect(r.earlier).toEqual([]);
    expect(r.ok).toBe(true);
    expect(parseCase(r.case).ok).toBe(true);
  });

  it('latest values from different times are asked about: they may not be one sample', () => {
    const r = caseFromFhir(
      bundle('collection', ...arterialGas(T0), obs('2744-1', 7.35, '[pH]', { at: T1 })),
    );
    expect(r.case.gas.ph).toBe(7.35);
    expect(r.questions).toEqual([expect.objectContaining({ path: 'gas' })]);
    expect(r.ok).toBe(false);
  });

  it('two different results at the same time, or without a time, are an error and neither is used', () => {
    const same = caseFromFhir(
      bundle('collection', obs('2744-1', 7.31, '[pH]'), obs('2744-1', 7.26, '[pH]')),
    );
    expect(same.case.gas.ph).toBeUndefined();
    expect(same.errors).toEqual([expect.objectContaining({ path: 'gas.ph' })]);
    const untimed = caseFromFhir(
      bundle('collection', obs('2744-1', 7.31, '[pH]', { at: null }), obs('2744-1', 7.26, '[pH]')),
    );
    expect(untimed.case.gas.ph).toBeUndefined();
    expect(untimed.errors[0]!.message).toContain('no effective time');
  });
});

describe('payload shapes', () => {
  it('a plain list of Observations, and a single Observation', () => {
    const list = caseFromFhir(arterialGas());
    expect(list.case.gas).toEqual({ ph: 7.31, pco2: 48, po2: 72, hco3: 23.5 });
    expect(list.read[0]!.source).toBe('[0]');
    const one = caseFromFhir(obs('2019-8', 48, null));
    expect(one.errors[0]!.path).toBe('Observation.valueQuantity.unit');
  });

  it('a JSON string is read like the object', () => {
    expect(caseFromFhir(JSON.stringify(bundle('collection', ...arterialGas()))).case.gas.ph).toBe(
      7.31,
    );
  });

  it('a panel with components is read component by component; the panel itself is reported', () => {
    // 24336-0 Gas panel - Arterial blood (from memory; seen as the arterial blood gas panel code in an HL7 example)
    const panel = {
      resourceType: 'Observation',
      status: 'final',
      effectiveDateTime: T1,
      code: { coding: [{ system: 'http://loinc.org', code: '24336-0' }] },
      component: arterialGas().map((o) => ({ code: o.code, valueQuantity: o.valueQuantity })),
    };
    const r = caseFromFhir(bundle('collection', panel));
    expect(r.case.gas).toEqual({ ph: 7.31, pco2: 48, po2: 72, hco3: 23.5 });
    expect(r.read[1]!.source).toBe('entry[0].resource.component[1]');
    expect(r.unused).toEqual([
      expect.objectContaining({
        code: '24336-0',
        reason: 'a panel: its results are read one by one',
      }),
    ]);
  });

  it('a panel whose members are not in the payload says so', () => {
    const panel = {
      resourceType: 'Observation',
      status: 'final',
      code: { coding: [{ system: 'http://loinc.org', code: '24336-0' }] },
      hasMember: [{ reference: 'Observation/abc' }, { reference: 'Observation/def' }],
    };
    const r = caseFromFhir(
      bundle('collection', panel, { ...obs('2744-1', 7.31, '[pH]'), id: 'abc' }),
    );
    expect(r.notes).toEqual([
      'entry[0].resource: the panel lists 1 result(s) that are not in this payload',
    ]);
  });

  it('refuses what it cannot read, with a path', () => {
    expect(
      caseFromFhir({ resourceType: 'Bundle', type: 'document', entry: [] }).errors[0],
    ).toMatchObject({ path: 'type' });
    expect(caseFromFhir('{not json').errors[0]).toMatchObject({ path: '(body)' });
    expect(caseFromFhir({ resourceType: 'Patient' }).errors[0]).toMatchObject({
      path: 'resourceType',
    });
    expect(caseFromFhir(42).errors[0]).toMatchObject({ path: '(body)' });
    expect(
      caseFromFhir({ resourceType: 'Bundle', type: 'collection', entry: [{ fullUrl: 'x' }] })
        .errors[0],
    ).toMatchObject({ path: 'entry[0].resource' });
  });

  it('a value out of the schema range is an error pointing at the Observation', () => {
    const r = caseFromFhir(
      bundle('collection', obs('2744-1', 9.1, '[pH]'), obs('2019-8', 40, 'mm[Hg]')),
    );
    expect(r.errors).toEqual([
      expect.objectContaining({ path: 'entry[0].resource.valueQuantity.value' }),
    ]);
    expect(r.errors[0]!.message).toContain('outside 6.50-8.00');
  });

  it('a value that is not a number is an error', () => {
    const bad = obs('2744-1', 7.31, '[pH]');
    (bad.valueQuantity as Record<string, unknown>).value = '7.31';
    expect(caseFromFhir(bad).errors[0]!.path).toBe('Observation.valueQuantity.value');
  });
});

describe('pulse oximetry is SpO2, not SaO2', () => {
  it('59408-5 with 2708-6 (the FHIR pulse oximetry pairing) goes to oxygen.spo2 and says nothing about the sample', () => {
    const spo2 = {
      ...obs('59408-5', 94, '%'),
      code: {
        coding: [
          { system: 'http://loinc.org', code: '2708-6' },
          { system: 'http://loinc.org', code: '59408-5' },
        ],
      },
    };
    const r = caseFromFhir(
      bundle('collection', obs('2746-6', 7.33, '[pH]'), obs('2021-4', 52, 'mm[Hg]'), spo2),
    );
    expect(r.case).toMatchObject({ sample: 'venous', oxygen: { spo2: 94 } });
    expect(r.case.gas.sao2).toBeUndefined();
  });

  it('2708-6 alone in a vital-signs Observation is read as SpO2, with a note', () => {
    const vital = {
      ...obs('2708-6', 96, '%'),
      category: [
        {
          coding: [
            {
              system: 'http://terminology.hl7.org/CodeSystem/observation-category',
              code: 'vital-signs',
            },
          ],
        },
      ],
    };
    const r = caseFromFhir(bundle('collection', vital));
    expect(r.case).toEqual({ gas: {}, oxygen: { spo2: 96 } });
    expect(r.notes[0]).toContain('read as SpO2');
  });
});
