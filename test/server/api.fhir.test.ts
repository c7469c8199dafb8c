// FHIR R4 through the API: POST /api/interpret with Content-Type application/fhir+json.
// LOINC codes (LOINC long common names; published in DICOM PS3.16 CID 3524/3528 and VSAC value sets):
// 2744-1 pH of Arterial blood; 2019-8 Carbon dioxide [Partial pressure] in Arterial blood;
// 2703-7 Oxygen [Partial pressure] in Arterial blood; 1960-4 Bicarbonate [Moles/volume] in Arterial blood;
// 2746-6 pH of Venous blood; 2021-4 Carbon dioxide [Partial pressure] in Venous blood; 2951-2 Sodium [Moles/volume]
// in Serum or Plasma; 2075-0 Chloride [Moles/volume] in Serum or Plasma. Units are UCUM codes. Values invented.
import { describe, expect, it } from 'vitest';
import { createApp } from '../../server/app.ts';

const app = createApp();
const UCUM = 'http://unitsofmeasure.org';
const obs = (code: string, value: number, unit: string, extra: Record<string, unknown> = {}) => ({
  resourceType: 'Observation',
  status: 'final',
  effectiveDateTime: '2026-04-11T03:20:00Z',
  code: { coding: [{ system: 'http://loinc.org', code }] },
  valueQuantity: { value, unit, code: unit, system: UCUM },
  ...extra,
});
const bundle = (...resources: unknown[]) => ({
  resourceType: 'Bundle',
  type: 'collection',
  entry: resources.map((resource) => ({ resource })),
});
const post = (body: unknown, query = '') =>
  app.request(`/api/interpret${query}`, {
    method: 'POST',
    headers: { 'content-type': 'application/fhir+json' },
    body: typeof body === 'string' ? body : JSON.stringify(body),
  });

// Invented: a ward patient with diabetic ketoacidosis, arterial gas and chemistry from the lab feed.
const arterial = bundle(
  obs('2744-1', 7.19, '[pH]'),
  obs('2019-8', 23, 'mm[Hg]'),
  obs('2703-7', 96, 'mm[Hg]'),
  obs('1960-4', 8.6, 'mmol/L'),
  obs('2951-2', 135, 'mmol/L'),
  obs('2075-0', 99, 'mmol/L'),
);

describe('FHIR R4 through the API', () => {
  it('a bundle of arterial Observations becomes a note', async () => {
    const res = await post(arterial);
    expect(res.status).toBe(200);
    const body = await res.json();
    expect(body.ok).toBe(true);
    // AG = 135 - (99 + 8.6) = 27.4 (Kraut and Madias 2007); Winters 1.5 x 8.6 + 8 = 20.9 +/- 2
    expect(body.derived.anionGap).toBeCloseTo(27.4, 1);
    expect(body.disorders[0]).toMatchObject({
      code: 'metabolic_acidosis',
      detail: 'high_anion_gap',
    });
    expect(body.note.text).toContain('7.19');
    expect(body.fhir.read.length).toBeGreaterThanOrEqual(6);
  });

  it('a code it does not use is reported, not dropped', async () => {
    // 8867-4 Heart rate (LOINC vital signs; from memory): not a field of the case
    const res = await post(
      bundle(...arterial.entry.map((e) => e.resource), obs('8867-4', 112, '/min')),
    );
    const body = await res.json();
    expect(res.status).toBe(200);
    expect(body.fhir.unused.map((u: { code: string }) => u.code)).toContain('8867-4');
  });

  it('venous codes give a venous sample', async () => {
    const res = await post(
      bundle(
        obs('2746-6', 7.31, '[pH]'),
        obs('2021-4', 52, 'mm[Hg]'),
        obs('1960-4', 25.7, 'mmol/L'),
      ),
    );
    const body = await res.json();
    // 2746-6 and 2021-4 are venous; 1960-4 is arterial: conflicting sample types are refused
    expect(res.status).toBe(422);
    expect(body.ok).toBe(false);
    expect(body.errors.length).toBeGreaterThan(0);
  });

  it('a venous bundle without conflict reads as venous', async () => {
    const res = await post([obs('2746-6', 7.31, '[pH]'), obs('2021-4', 52, 'mm[Hg]')]);
    const body = await res.json();
    expect(res.status).toBe(200);
    expect(body.flags.map((f: { code: string }) => f.code)).toContain('venous_sample');
  });

  it('a unit that is not UCUM is a 422 naming the path', async () => {
    const res = await post(
      bundle(obs('2744-1', 7.3, '[pH]'), {
        ...obs('2019-8', 45, 'mm[Hg]'),
        valueQuantity: { value: 45, unit: 'mmHg', code: 'mmHg', system: UCUM },
      }),
    );
    expect(res.status).toBe(422);
    const body = await res.json();
    expect(
      body.errors.some((e: { path: string }) =>
        e.path.startsWith('entry[1].resource.valueQuantity'),
      ),
    ).toBe(true);
  });

  it('a body that is not JSON is a 400', async () => {
    expect((await post('{"resourceType":')).status).toBe(400);
  });

  it('an unknown ?sample is a 422', async () => {
    expect((await post(arterial, '?sample=arterialised')).status).toBe(422);
  });

  it('hostile shapes are answered, never a 500 (found by the HTTP fuzz)', async () => {
    const deep = `${'['.repeat(12000)}1${']'.repeat(12000)}`;
    for (const payload of [
      '{"resourceType":{"toString":1}}',
      '{"resourceType":"Observation","id":{"valueOf":1},"code":{"coding":[{"system":"http://loinc.org","code":"2744-1"}]},"valueQuantity":{"comparator":{"toString":1},"value":7.3}}',
      `{"resourceType":"Observation","status":"final","id":${deep}}`,
    ]) {
      const res = await post(payload);
      expect(res.status, payload.slice(0, 60)).toBeLessThan(500);
    }
  });
});
