// Invisible and bidirectional control characters stop at the edge: a right-to-left override typed into the
// follow-up box, pasted with a printout, sent in FHIR (even as a JSON escape) or read from the record never
// reaches the note, the handover, the page or the map (the review's item 1; the JSON case schema has its own test
// in test/templates/freetext.test.ts). Every patient here is invented.
import { describe, expect, it } from 'vitest';
import { createApp } from '../../server/app.ts';
import { withoutInvisibleDeep } from '../../server/intake/index.ts';
import { readJson } from '../../server/launch/http.ts';
import { PRINTOUT } from './fixtures.ts';
import { hidden, openId, poster, stateOf, textareaOf, typedGas, walkSteps } from './pageHtml.ts';

// the review's list (U+202A-202E, U+2066-2069, U+200E, U+200F, U+061C), each written out
const CONTROLS = [
  '\u202a',
  '\u202b',
  '\u202c',
  '\u202d',
  '\u202e',
  '\u2066',
  '\u2067',
  '\u2068',
  '\u2069',
  '\u200e',
  '\u200f',
  '\u061c',
];
const RLO = '\u202e';
/** a control character, literal or as an HTML or JSON escape */
const ANY_CONTROL =
  /[\u202a-\u202e\u2066-\u2069\u200e\u200f\u061c]|&#x0*(202[a-e]|206[6-9]|200[ef]|61c);|&#(8234|8235|8236|8237|8238|8294|8295|8296|8297|8206|8207|1564);|\\u(202[a-e]|206[6-9]|200[ef]|061c)/i;

const app = createApp();
const post = poster(app);

/** Skip every step still open, to the draft. */
async function skipToDraft(html: string): Promise<string> {
  // a follow-up gas asks its oxygen again: room air, not ventilated
  const done = await walkSteps(app, html, null, {
    oxygen: { 'oxygen.fio2': '0.21', ventilated: 'no' },
  });
  expect(openId(done)).toBeNull();
  return done;
}

async function draft(): Promise<string> {
  // an invented 58-year-old with an acute respiratory acidosis
  const html = await typedGas(app, {
    'gas.ph': '7.29',
    'gas.pco2': '48',
    'gas.po2': '80',
    'gas.hco3': '22.6',
  });
  return skipToDraft(html);
}

describe('the follow-up box', () => {
  it('a label with every control reaches neither the page, the note, the handover nor the map', async () => {
    const typed = `after ${CONTROLS.join('')}PaCO2 48 to 42${RLO}`;
    const first = await draft();
    const moved = await post('/followup', { ...stateOf(first), when: typed });
    expect(moved.status).toBe(200);
    expect(moved.html).not.toMatch(ANY_CONTROL);
    // the time or label typed belongs to the new gas; the earlier one keeps its own ("first gas" when it had none)
    expect(JSON.parse(hidden(moved.html, 'case')).previous[0].label).toBe('first gas');
    expect(hidden(moved.html, 'taken')).toBe('after PaCO2 48 to 42');
    // the follow-up gas: the page shows the new gas's label, the note the trend, and the chart both gases
    const next = await post('/step', {
      ...stateOf(moved.html),
      step: 'gas',
      action: 'next',
      'units.pressure': 'mmHg',
      'gas.ph': '7.34',
      'gas.pco2': '42',
      'gas.po2': '84',
      'gas.hco3': '22.4',
    });
    const done = await skipToDraft(next.html);
    expect(done).toContain('after PaCO2 48 to 42');
    expect(done).toMatch(/<svg/);
    expect(textareaOf(done, 'note-text')).toContain('Since the previous gas (first gas)');
    expect(textareaOf(done, 'handover-text')).toContain('PaCO2');
    expect(done).not.toMatch(ANY_CONTROL);
  });
});

describe('pasted text', () => {
  it('a printout with controls is read as if they were not there, and shows none', async () => {
    const pasted = PRINTOUT.replace('pH          7.26', `pH          ${RLO}7.26`).replace(
      'Ward 7B',
      `Ward ${RLO}B7\u2066`,
    );
    const read = await post(
      '/paste',
      { ...stateOf(await (await app.request('/')).text()), paste: pasted },
      true,
    );
    expect(read.status).toBe(200);
    expect(read.html).not.toMatch(ANY_CONTROL);
    expect(read.html).toContain('7.26');
  });

  it('FHIR JSON pasted with an escaped override shows none', async () => {
    const fhir = `[{"resourceType":"Pat\\u202eient"},{"resourceType":"Observation","status":"final","code":{"coding":[{"system":"http://loinc.org","code":"2744-1","display":"pH \\u202eof blood"}]},"effectiveDateTime":"2026-03-02T04:10:00Z","valueQuantity":{"value":7.26,"unit":"[pH]","system":"http://unitsofmeasure.org","code":"[pH]"}}]`;
    const read = await post('/paste', {
      ...stateOf(await (await app.request('/')).text()),
      paste: fhir,
    });
    expect(read.status).toBeLessThan(500);
    // the text area shows the JSON as pasted, less the literal controls; its escapes are JSON, not text on show
    const shown = read.html.replace(textareaOf(read.html, 'paste-again'), '');
    expect(shown).not.toMatch(/[\u202a-\u202e\u2066-\u2069\u200e\u200f\u061c]/);
  });
});

describe('FHIR sent to the API', () => {
  it('an escaped override in any string reaches no part of the answer', async () => {
    const bundle = {
      resourceType: 'Bundle',
      type: 'collection',
      entry: [
        { resource: { resourceType: `Pat${RLO}ient` } },
        {
          resource: {
            resourceType: 'Observation',
            status: 'final',
            code: { coding: [{ system: 'http://loinc.org', code: '0000-0', display: `x${RLO}y` }] },
            effectiveDateTime: '2026-03-02T04:10:00Z',
            valueString: `a${RLO}b`,
          },
        },
      ],
    };
    // JSON.stringify leaves U+202E as it is: escape it, as a hostile client would
    const body = JSON.stringify(bundle).replaceAll(RLO, '\\u202e');
    const res = await app.request('/api/interpret', {
      method: 'POST',
      headers: { 'content-type': 'application/fhir+json' },
      body,
    });
    expect(res.status).toBe(422);
    const text = await res.text();
    expect(text).toContain('Patient');
    expect(text).not.toMatch(ANY_CONTROL);
  });
});

describe('withoutInvisibleDeep (the FHIR edge)', () => {
  it('cleans every string and key, and leaves its input as it was', () => {
    const input = JSON.parse('{"a\\u202e":["x\\u2066y",{"b":"\\u200fz"}],"n":1,"t":true,"z":null}');
    const out = withoutInvisibleDeep(input);
    expect(out).toEqual({ a: ['xy', { b: 'z' }], n: 1, t: true, z: null });
    expect(Object.keys(input)[0]).toBe(`a${RLO}`);
  });

  it('a key that becomes "__proto__" stays an own property', () => {
    const out = withoutInvisibleDeep(
      JSON.parse('{"__pro\\u202eto__":{"polluted":true}}'),
    ) as object;
    expect(Object.getPrototypeOf(out)).toBe(Object.prototype);
    expect(({} as Record<string, unknown>).polluted).toBeUndefined();
    expect(Object.hasOwn(out, '__proto__')).toBe(true);
  });

  it('a document nested 30,000 deep is cleaned without overflowing the stack', () => {
    const deep = JSON.parse(`${'['.repeat(30_000)}"\\u202e"${']'.repeat(30_000)}`);
    let out = withoutInvisibleDeep(deep) as unknown;
    for (let i = 0; i < 30_000; i++) out = (out as unknown[])[0];
    expect(out).toBe('');
  });
});

describe("the record's answers (the launch)", () => {
  it('readJson returns the JSON with no control left', async () => {
    const body = '{"resourceType":"Patient","gender":"fe\\u202emale","name":[{"text":"\\u2067Q"}]}';
    expect(await readJson(new Response(body), 'fhir')).toEqual({
      resourceType: 'Patient',
      gender: 'female',
      name: [{ text: 'Q' }],
    });
  });
});
