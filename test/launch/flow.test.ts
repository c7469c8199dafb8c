// The whole launch over HTTP against the test record: an EHR launch and a standalone launch, the authorization
// request as SMART App Launch 2 has it, the confirm view with the earlier gases, the case it gives, and the draft
// filed back as a DocumentReference that passes both validators. Every patient is invented.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { Agent, formFields, startLaunch, toDraft, type Running } from './harness.ts';
import { SCHEMA_ID, fhirErrors, schemaErrors } from './validators.ts';

const caseOf = (html: string) => JSON.parse(formFields(html, '/open').case!) as Record<string, any>;

describe('an EHR launch, read, confirmed and filed back', () => {
  let run: Running;
  const agent = new Agent();
  let confirmHtml = '';
  let draftHtml = '';
  beforeAll(async () => {
    // the server sends at most 4 results a page: the search must follow its next links
    run = await startLaunch({ autoApprove: {}, pageSize: 4 });
  });
  afterAll(() => run.close());

  it('sends the authorization request SMART App Launch 2 asks for, with the redirect URI from PUBLIC_URL', async () => {
    const response = await agent.get(
      `${run.record.origin}/ehr/launch?patient=pt-1&encounter=enc-1`,
    );
    confirmHtml = await response.text();
    expect(response.status).toBe(200);
    const authorize = new URL(agent.visited.find((u) => u.includes('/auth/authorize'))!);
    const q = authorize.searchParams;
    expect(q.get('response_type')).toBe('code');
    expect(q.get('client_id')).toBe('gasline-test-client');
    expect(q.get('redirect_uri')).toBe(`${run.origin}/callback`);
    expect(q.get('aud')).toBe(run.record.fhirBase);
    expect(q.get('code_challenge_method')).toBe('S256');
    expect(q.get('code_challenge')).toMatch(/^[A-Za-z0-9_-]{43}$/);
    expect(q.get('state')!.length).toBeGreaterThanOrEqual(22); // at least 128 bits of base64url
    expect(q.get('launch')).toBeTruthy();
    expect(q.get('scope')!.split(' ')).toEqual([
      'launch',
      'openid',
      'fhirUser',
      'patient/Observation.rs',
      'patient/Patient.rs',
      'patient/DocumentReference.c',
    ]);
  });

  it('reads every page of the search, within the last 48 hours, with the LOINC codes of the FHIR reader', () => {
    const searches = run.record.requests.filter((r) => r.startsWith('GET /fhir/Observation?'));
    const gasSearch = searches.filter((r) => r.includes('2744-1'));
    expect(gasSearch.length).toBeGreaterThan(2);
    expect(gasSearch.slice(1).every((r) => r.includes('_offset='))).toBe(true);
    const first = new URL(`http://x${gasSearch[0]!.slice(4)}`).searchParams;
    expect(first.get('patient')).toBe('pt-1');
    expect(first.get('_sort')).toBe('-date');
    const since = Date.parse(first.get('date')!.replace(/^ge/, ''));
    expect(Math.abs(Date.now() - 48 * 3600_000 - since)).toBeLessThan(60_000);
  });

  it('shows the newest gas to confirm, the patient, and the earlier gases of 48 hours (not the one of 60 hours ago)', () => {
    const text = confirmHtml.replace(/<[^>]+>/g, ' ').replace(/\s+/g, ' ');
    expect(text).toContain('Check what the record gave');
    for (const v of ['7.29', '62', '68', '29', '138', '97', '3.6', '35'])
      expect(text).toContain(` ${v} `);
    expect(text).toContain('64 years');
    expect(text).toContain('female');
    expect(text).toContain('height 162 cm');
    expect(text).toContain('Earlier gases of the last 48 hours (2)');
    expect(text).toMatch(/pH 7\.33, PCO2 58 mmHg, HCO3 30 mmol\/L/);
    expect(text).toMatch(/pH 7\.24, PCO2 71 mmHg, HCO3 29\.5 mmol\/L/);
    expect(text).not.toContain('pH 7.38');
  });

  it('on confirm, the case holds the newest gas, the patient and the earlier gases in time order', async () => {
    const form = formFields(confirmHtml, '/launch/confirm');
    const response = await agent.post(
      `${run.origin}/launch/confirm`,
      { ...form, action: 'confirm' },
      true,
    );
    expect(response.status).toBe(200);
    const html = await response.text();
    const c = caseOf(html);
    expect(c.sample).toBe('arterial');
    expect(c.gas).toMatchObject({
      ph: 7.29,
      pco2: 62,
      po2: 68,
      hco3: 29,
      baseExcess: 3,
      lactate: 1.4,
    });
    expect(c.chemistry).toMatchObject({ na: 138, k: 4.4, cl: 97, albumin: 3.6 });
    expect(c.oxygen).toMatchObject({ fio2: 35 });
    expect(c.patient).toEqual({ ageYears: 64, sex: 'female', heightCm: 162 });
    expect(c.previous.map((p: any) => p.gas.ph)).toEqual([7.33, 7.24]);
    expect(c.previous[0].takenAt < c.previous[1].takenAt).toBe(true);
    draftHtml = await toDraft(agent, run.origin, html);
    expect(draftHtml).toContain('File as a draft note in the record');
  });

  it('files the edited note as a preliminary DocumentReference that passes the R4 schema and the fhir validator', async () => {
    const form = formFields(draftHtml, '/preview');
    const note = `${form.note}\n\nReviewed at the bedside (an edit of the clinician's own).`;
    const response = await agent.post(`${run.origin}/launch/file`, { ...form, note });
    const html = await response.text();
    expect(response.status).toBe(200);
    expect(html).toContain('Filed in the record as a draft note (DocumentReference/doc-1)');
    expect(run.record.documents).toHaveLength(1);
    const { id: _id, meta: _meta, ...doc } = run.record.documents[0] as Record<string, any>;
    expect(SCHEMA_ID).toBe('http://hl7.org/fhir/json-schema/4.0');
    expect(schemaErrors(doc)).toEqual([]);
    expect(fhirErrors(doc)).toEqual([]);
    expect(doc).toMatchObject({
      status: 'current',
      docStatus: 'preliminary',
      type: { coding: [{ system: 'http://loinc.org', code: '11506-3' }] },
      category: [{ coding: [{ code: 'clinical-note' }] }],
      subject: { reference: 'Patient/pt-1' },
      author: [{ reference: `${run.record.fhirBase}/Practitioner/pr-1` }],
      context: { encounter: [{ reference: 'Encounter/enc-1' }] },
    });
    const attached = Buffer.from(doc.content[0].attachment.data, 'base64').toString('utf8');
    expect(attached).toBe(note.trim());
    expect(doc.content[0].attachment.contentType).toMatch(/^text\/plain/);
    // the Observations of the newest gas and of the earlier gases, none of the one outside 48 hours
    const related = doc.context.related.map((r: any) => r.reference);
    const used = run.record.data.observations.filter((o) => {
      const t = Date.parse(String(o.effectiveDateTime));
      return (
        (o.subject as any).reference === 'Patient/pt-1' &&
        Date.now() - t < 48 * 3600_000 &&
        (o.code as any).coding[0].code !== '8302-2'
      );
    });
    expect(new Set(related)).toEqual(new Set(used.map((o) => `Observation/${String(o.id)}`)));
    // the edited note stays on the page, and the button is gone once filed
    expect(html).toContain('Reviewed at the bedside');
    expect(html).not.toContain('>File as a draft note in the record<');
  });
  it('a new case drops the filing grant: nothing typed afterwards can be filed into the launched chart', async () => {
    expect(agent.cookieHeader(new URL(run.origin))).toContain('gasline_record=');
    const fresh = await agent.get(`${run.origin}/`);
    const html = await fresh.text();
    expect(agent.setCookies.at(-1)).toMatch(/^gasline_record=;.*Max-Age=0/);
    expect(html).not.toContain('File as a draft note');
    const form = formFields(draftHtml, '/preview');
    const refused = await agent.post(`${run.origin}/launch/file`, form);
    expect(refused.status).toBe(403);
    expect(await refused.text()).toContain('The launch from the record has ended');
    expect(run.record.documents).toHaveLength(1);
  });
});

describe('a standalone launch', () => {
  let run: Running;
  beforeAll(async () => {
    run = await startLaunch({ autoApprove: { patient: 'pt-2' }, env: { SMART_FILE_BACK: 'off' } });
  });
  afterAll(() => run.close());

  it('asks for launch/patient, not launch, and no DocumentReference scope when filing back is off', async () => {
    const agent = new Agent();
    const response = await agent.get(
      `${run.origin}/launch?iss=${encodeURIComponent(run.record.fhirBase)}`,
    );
    const html = await response.text();
    expect(response.status).toBe(200);
    const q = new URL(agent.visited.find((u) => u.includes('/auth/authorize'))!).searchParams;
    expect(q.get('launch')).toBeNull();
    expect(q.get('scope')).toBe(
      'launch/patient openid fhirUser patient/Observation.rs patient/Patient.rs',
    );
    expect(html).toContain('No earlier gas in the last 48 hours.');
    expect(html).toMatch(/7\.21/);
    // no token is kept when filing back is off: the only cookie set is the transaction's, and it is cleared
    expect(agent.setCookies.filter((c) => c.startsWith('gasline_record'))).toEqual([]);
    const confirmed = await agent.post(
      `${run.origin}/launch/confirm`,
      { ...formFields(html, '/launch/confirm'), action: 'confirm' },
      true,
    );
    const draft = await toDraft(agent, run.origin, await confirmed.text());
    expect(caseOf(draft).gas).toMatchObject({ ph: 7.21, pco2: 25, hco3: 10 });
    expect(caseOf(draft).patient).toMatchObject({ sex: 'male', ageYears: 37 });
    expect(draft).not.toContain('File as a draft note');
  });
});
