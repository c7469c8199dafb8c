// The JSON API end to end with app.request, against ../shared/interface-contract.md.
import { describe, expect, it } from 'vitest';
import { createApp } from '../../server/app.ts';
import { TemplateError } from '../../templates/index.ts';
import { units } from '../../calc/index.ts';

const { MMHG_PER_KPA } = units;

const app = createApp();

const post = (body: unknown, contentType = 'application/json', query = '') =>
  app.request(`/api/interpret${query}`, {
    method: 'POST',
    headers: { 'content-type': contentType },
    body: typeof body === 'string' ? body : JSON.stringify(body),
  });

// An invented ICU patient: 64-year-old woman, 162 cm, ventilated, mild acute hypercapnia.
const ventilatedMmHg = {
  sample: 'arterial',
  units: { pressure: 'mmHg', albumin: 'g/dL', glucose: 'mg/dL', urea: 'bun-mg/dL' },
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
    ethanol: null,
  },
  patient: { ageYears: 64, sex: 'female', heightCm: 162, pregnant: false },
  context: { timing: 'acute', barometricPressure: 760, altitudeM: null, temperatureC: 37 },
  oxygen: { fio2: 0.4, peep: 8 },
  ventilator: { vt: 450, rr: 16, pplat: 24, deadSpaceMl: null, targetPh: 7.35, targetPco2: null },
};

// The same patient in SI units and kPa (albumin g/L, glucose and urea mmol/L).
const ventilatedKpa = {
  ...ventilatedMmHg,
  units: { pressure: 'kPa', albumin: 'g/L', glucose: 'mmol/L', urea: 'urea-mmol/L' },
  gas: { ...ventilatedMmHg.gas, pco2: 48 / MMHG_PER_KPA, po2: 72 / MMHG_PER_KPA },
  chemistry: { ...ventilatedMmHg.chemistry, albumin: 31, glucose: 110 / 18.016, urea: 18 / 2.801 },
  context: { ...ventilatedMmHg.context, barometricPressure: 760 / MMHG_PER_KPA },
};

describe('GET /healthz', () => {
  it('answers 200 {"ok":true} (contract)', async () => {
    const res = await app.request('/healthz');
    expect(res.status).toBe(200);
    expect(await res.json()).toEqual({ ok: true });
  });
});

describe('POST /api/interpret: a full ventilated case', () => {
  it('returns every field of the contract', async () => {
    const res = await post(ventilatedMmHg);
    expect(res.status).toBe(200);
    const body = await res.json();
    expect(body.ok).toBe(true);
    for (const key of [
      'hPlus',
      'hco3Henderson',
      'anionGap',
      'anionGapCorrected',
      'deltaRatio',
      'expectedPco2',
      'expectedHco3',
      'standardBaseExcess',
      'osmolarGap',
      'alveolarPo2',
      'aaGradient',
      'aaGradientExpected',
      'pfRatio',
      'predictedBodyWeightKg',
      'vtPerKgPbw',
      'targetPco2',
      'suggestedRr',
      'suggestedVt',
    ]) {
      expect(body.derived, key).toHaveProperty(key);
    }
    // [H+] = 10^(9 - 7.31) = 48.98 nmol/L (definition of pH)
    expect(body.derived.hPlus).toBeCloseTo(49.0, 1);
    // AG = 138 - (104 + 23.5) = 10.5; corrected + 2.5 x (4.0 - 3.1) = 12.75 (Figge 1998)
    expect(body.derived.anionGap).toBeCloseTo(10.5, 1);
    expect(body.derived.anionGapCorrected).toBeCloseTo(12.8, 1);
    // PAO2 = 0.4 x (760 - 47) - 48 / 0.8 = 225.2 (alveolar gas equation); A-a = 153.2; P/F = 72 / 0.4 = 180
    expect(body.derived.alveolarPo2).toBeCloseTo(225.2, 1);
    expect(body.derived.aaGradient).toBeCloseTo(153.2, 1);
    expect(body.derived.pfRatio).toBe(180);
    // PBW female 45.5 + 0.91 x (162 - 152.4) = 54.24 kg (ARDS Network 2000); VT/kg = 450 / 54.24 = 8.3
    expect(body.derived.predictedBodyWeightKg).toBeCloseTo(54.2, 1);
    expect(body.derived.vtPerKgPbw).toBeCloseTo(8.3, 1);
    // acute respiratory acidosis: expected HCO3 = 24 + (48 - 40) / 10 = 24.8 +/- 2 (Berend 2014)
    expect(body.derived.expectedHco3).toEqual({ low: 22.8, high: 26.8 });
    expect(body.derived.expectedPco2).toBeNull();
    expect(body.disorders[0]).toMatchObject({ code: 'respiratory_acidosis', detail: 'acute' });
    const codes = body.flags.map((f: { code: string }) => f.code);
    expect(codes).toContain('vt_above_8_ml_per_kg');
    for (const f of body.flags) expect(typeof f.message).toBe('string');
    for (const f of body.flags) expect(f.message.length).toBeGreaterThan(10);
    expect(typeof body.note.line).toBe('string');
    expect(body.note.text).toContain('7.31');
    expect(body.explain.anionGapCorrected.source).toMatch(/Figge/);
  });

  it('target PaCO2 uses the acute-buffering form and RR follows (clinical-scope section 8)', async () => {
    const body = await (await post(ventilatedMmHg)).json();
    // [H+]t = 10^(9 - 7.35) = 44.67; PaCO2_t = 44.67 x (23.5 - 4.8) / (24 - 4.467) = 42.8 mmHg
    expect(body.derived.targetPco2).toBeCloseTo(42.8, 1);
    // RR = 16 x 48 / 42.8 = 17.9 -> 18 /min
    expect(body.derived.suggestedRr).toBe(18);
    expect(body.ventilation.targetForm).toBe('acute_buffering');
  });

  it('kPa and SI units give the same canonical derived values', async () => {
    const a = await (await post(ventilatedMmHg)).json();
    const b = await (await post(ventilatedKpa)).json();
    expect(b.ok).toBe(true);
    for (const key of [
      'hPlus',
      'anionGap',
      'anionGapCorrected',
      'osmolarGap',
      'alveolarPo2',
      'aaGradient',
      'pfRatio',
      'targetPco2',
      'suggestedRr',
    ]) {
      expect(b.derived[key], key).toBeCloseTo(a.derived[key], 0);
    }
    expect(b.disorders).toEqual(a.disorders);
    expect(b.units.pressure).toBe('kPa');
    expect(b.note.text).toMatch(/kPa/);
  });

  it('markdown note on request', async () => {
    const body = await (await post(ventilatedMmHg, 'application/json', '?format=markdown')).json();
    expect(body.note.format).toBe('markdown');
    expect(body.note.text).toMatch(/^#+ /m);
  });
});

describe('POST /api/interpret: each sample and disorder through the wire', () => {
  it('a venous sample: no oxygenation, flagged', async () => {
    const body = await (
      await post({
        sample: 'venous',
        gas: { ph: 7.36, pco2: 46, po2: 38, hco3: 25 },
        oxygen: { fio2: 0.21 },
      })
    ).json();
    expect(body.ok).toBe(true);
    expect(body.derived.alveolarPo2).toBeNull();
    expect(body.derived.pfRatio).toBeNull();
    expect(body.flags.map((f: { code: string }) => f.code)).toContain('oxygenation_not_assessable');
  });

  it('metabolic acidosis: Winters band as expectedPco2', async () => {
    const body = await (
      await post({
        gas: { ph: 7.21, pco2: 24, hco3: 9.4 },
        chemistry: { na: 139, cl: 101, albumin: 4.0 },
      })
    ).json();
    // Winters: 1.5 x 9.4 + 8 = 22.1 +/- 2 (Albert, Dell and Winters 1967)
    expect(body.derived.expectedPco2).toEqual({ low: 20.1, high: 24.1 });
    expect(body.disorders[0]).toMatchObject({
      code: 'metabolic_acidosis',
      detail: 'high_anion_gap',
    });
  });

  it('a normal gas returns an empty disorder list', async () => {
    const body = await (await post({ gas: { ph: 7.4, pco2: 40, hco3: 24.2 } })).json();
    expect(body.disorders).toEqual([]);
  });

  it('a probable unit mix-up is asked, not guessed', async () => {
    const body = await (await post({ gas: { ph: 7.4, pco2: 5.3, po2: 12 } })).json();
    expect(body.ok).toBe(true);
    expect(body.withheld).toBe(true);
    expect(body.flags[0].code).toBe('unit_ambiguous');
    expect(body.disorders).toEqual([]);
    expect(body.derived.alveolarPo2).toBeNull();
  });
});

describe('POST /api/interpret: errors', () => {
  it('422 names the path, the value and the range', async () => {
    const res = await post({ gas: { ph: 9.1, pco2: 40, hco3: 24 } });
    expect(res.status).toBe(422);
    const body = await res.json();
    expect(body.ok).toBe(false);
    expect(body.errors).toEqual([
      { path: 'gas.ph', message: 'pH 9.1 is outside 6.50-8.00: check the value' },
    ]);
  });

  it('422 for a range in kPa is stated in kPa', async () => {
    const body = await (
      await post({ units: { pressure: 'kPa' }, gas: { ph: 7.3, pco2: 40, hco3: 24 } })
    ).json();
    expect(body.errors[0].path).toBe('gas.pco2');
    expect(body.errors[0].message).toMatch(/kPa/);
  });

  it.each([
    ['a wrong type', { gas: { ph: '7.3', pco2: 40, hco3: 24 } }, 'gas.ph'],
    ['an unknown enum', { sample: 'arterialised', gas: { ph: 7.3, pco2: 40, hco3: 24 } }, 'sample'],
    [
      'an unknown unit',
      { units: { pressure: 'torr' }, gas: { ph: 7.3, pco2: 40, hco3: 24 } },
      'units.pressure',
    ],
    ['an unknown field', { gas: { ph: 7.3, pco2: 40, hco3: 24, pc02: 1 } }, 'gas.pc02'],
    ['a missing gas', { sample: 'arterial' }, 'gas'],
    ['too few gas values', { gas: { ph: 7.3 } }, 'gas'],
    [
      'a nested previous gas',
      { gas: { ph: 7.3, pco2: 40, hco3: 24 }, previous: [{ gas: { ph: 5, pco2: 40 } }] },
      'previous.0.gas.ph',
    ],
    [
      'FiO2 between fraction and percent',
      { gas: { ph: 7.3, pco2: 40, hco3: 24 }, oxygen: { fio2: 5 } },
      'oxygen.fio2',
    ],
  ])('422 for %s', async (_name, body, path) => {
    const res = await post(body);
    expect(res.status).toBe(422);
    const json = await res.json();
    expect(json.errors.map((e: { path: string }) => e.path)).toContain(path);
    for (const e of json.errors) expect(e.message.length).toBeGreaterThan(5);
  });

  it('422 for a JSON body that is not an object', async () => {
    for (const body of ['null', '[]', '"gas"', '42']) {
      const res = await post(body);
      expect(res.status, body).toBe(422);
    }
  });

  it('400 for a body that is not JSON', async () => {
    const res = await post('{"gas": {"ph": 7.3,');
    expect(res.status).toBe(400);
    expect((await res.json()).ok).toBe(false);
  });

  it('413 for a body over 64 KiB', async () => {
    const big = JSON.stringify({
      gas: { ph: 7.3, pco2: 40, hco3: 24 },
      padding: 'x'.repeat(70 * 1024),
    });
    const res = await post(big);
    expect(res.status).toBe(413);
  });

  it('415 for another content type', async () => {
    for (const type of ['text/plain', 'application/x-www-form-urlencoded', 'application/xml']) {
      const res = await post(JSON.stringify({ gas: { ph: 7.3, pco2: 40, hco3: 24 } }), type);
      expect(res.status, type).toBe(415);
    }
  });

  it('404 in the same error shape for an unknown route', async () => {
    const res = await app.request('/api/nothing');
    expect(res.status).toBe(404);
    expect((await res.json()).ok).toBe(false);
  });
});

describe('a note template that fails while serving', () => {
  it('is answered 500 without echoing the case, and logged as its class and file name only', async () => {
    const logged: string[] = [];
    const failing = createApp({
      renderer: {
        render: () => {
          throw new TemplateError('plan.njk', 'Template render error');
        },
        flagMessage: () => '',
      },
      errorLog: (line) => logged.push(line),
    });
    const res = await failing.request('/api/interpret', {
      method: 'POST',
      headers: { 'content-type': 'application/json' },
      body: JSON.stringify(ventilatedMmHg),
    });
    expect(res.status).toBe(500);
    expect(await res.text()).not.toContain('7.31');
    expect(logged).toEqual(['note template error: Template render error in plan.njk']);
  });
});
