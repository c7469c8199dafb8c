// The paste on the first step through app.request: a printout, the shorthand, a FHIR bundle, an ambiguous
// unit and text that holds no result. What was read is shown with its unit and source text before anything
// is used; questions are form controls; on confirm the case goes through the same schema and the flow goes
// on at the first step still missing something. Every patient and printout here is invented.
import { describe, expect, it } from 'vitest';
import { createApp } from '../../server/app.ts';
import { interpret } from '../../calc/index.ts';
import { createNoteRenderer } from '../../templates/index.ts';
import {
  caseOf,
  hidden,
  openId,
  openStep,
  stateOf,
  textareaOf,
  unescapeHtml,
  poster,
  type Fields,
} from './pageHtml.ts';
import { PRINTOUT } from './fixtures.ts';
import { MAX_LISTED } from '../../views/paste.ts';

const app = createApp();
const renderer = createNoteRenderer();

const announced = (html: string) =>
  unescapeHtml(
    html.match(
      /<hx-partial hx-target="#announce" hx-swap="innerHTML">([\s\S]*?)<\/hx-partial>/,
    )?.[1] ?? '',
  );
/** The rows of the "Values read" table as [result, read as, from]: tags and layout spacing removed, the source text as written. */
function readRows(html: string): string[][] {
  const body =
    html.match(/<table class="read-table">[\s\S]*?<tbody>([\s\S]*?)<\/tbody>/)?.[1] ?? '';
  const text = (cell: string) =>
    unescapeHtml(
      cell
        .replace(/<[^>]+>/g, ' ')
        .replace(/\s+/g, ' ')
        .trim(),
    );
  return [...body.matchAll(/<tr>([\s\S]*?)<\/tr>/g)].map((row) =>
    [...row[1]!.matchAll(/<t[hd][^>]*>([\s\S]*?)<\/t[hd]>/g)].map((cell) => {
      const code = cell[1]!.match(/^<code>([\s\S]*)<\/code>$/);
      return code ? unescapeHtml(code[1]!) : text(cell[1]!);
    }),
  );
}

const post = poster(app);
const EMPTY = { case: '{}', done: '', format: 'text' };
const read = (paste: string, state: Fields = EMPTY, htmx = true) =>
  post('/paste', { ...state, paste, action: 'read' }, htmx);
/** Confirm what the page showed: the text and the fingerprint it carried, with the answers given. */
const confirm = (shown: string, paste: string, answers: Fields = {}) =>
  post('/paste', {
    ...stateOf(shown),
    paste,
    pasteRead: hidden(shown, 'pasteRead'),
    action: 'confirm',
    ...answers,
  });
const answer = (html: string, step: string, fields: Fields) =>
  post('/step', { ...stateOf(html), step, action: 'next', ...fields });

const PRINTOUT_CASE = {
  sample: 'arterial',
  units: { pressure: 'mmHg' },
  gas: { ph: 7.26, pco2: 29, po2: 84, hco3: 13.6, baseExcess: -12.4, lactate: 7.8 },
  chemistry: { na: 141, k: 4.6, cl: 103 },
  oxygen: { fio2: 21 },
};

describe('the first step offers a paste', () => {
  it('has its own text area and submit, a separate form posting to /paste', async () => {
    const html = await (await app.request('/')).text();
    const step = openStep(html);
    expect(openId(html)).toBe('sample');
    expect(step).toMatch(
      /<form class="paste-form" method="post" action="\/paste" enctype="multipart\/form-data" hx-post="\/paste"/,
    );
    expect(step).toContain(
      '<label class="field-label" for="paste-text">Or paste the results</label>',
    );
    expect(step).toContain('shorthand such as 7.31/48/72/23, or FHIR JSON');
    expect(step).toMatch(
      /<textarea id="paste-text" name="paste"[^>]*aria-describedby="paste-text-hint"><\/textarea>/,
    );
    expect(step).toMatch(
      /<button type="submit" class="button" name="action" value="read">Read the pasted text<\/button>/,
    );
    // the one-press sample buttons stay the first thing to press
    expect(step.indexOf('value="arterial" autofocus')).toBeLessThan(step.indexOf('paste-form'));
  });

  it('is reachable from the gas step while no gas is entered, and not once the case holds a gas', async () => {
    const gas = (
      await answer(await (await app.request('/')).text(), 'sample', { sample: 'arterial' })
    ).html;
    expect(openStep(gas)).toContain(
      'name="open" value="sample" class="link-button">Paste the results instead</button>',
    );
    const chem = (await answer(gas, 'gas', { 'gas.ph': '7.3', 'gas.pco2': '40', 'gas.hco3': '19' }))
      .html;
    expect(chem).not.toContain('paste-form');
    expect(chem).not.toContain('Paste the results instead');
    // and the server refuses a paste into a case that already has a gas
    const res = await read(PRINTOUT, stateOf(chem));
    expect(res.status).toBe(400);
    expect(res.html).toContain('A paste starts a new case');
  });
});

describe('a printout', () => {
  it('is shown value by value with its unit and source text, and nothing is in the case yet', async () => {
    const { status, html } = await read(PRINTOUT);
    expect(status).toBe(200);
    expect(html).toMatch(/^<title>Check what was read · Gasline<\/title>/);
    expect(openId(html)).toBe('paste');
    expect(caseOf(html)).toEqual({});
    // no reply from the assistant over the confirm view: nothing is read until the values are used
    expect(html).not.toContain('id="step-reply"');
    expect(readRows(html)).toEqual([
      ['Sample type', 'Arterial', 'named in the text'],
      ['pH', '7.26', 'pH          7.26'],
      ['PaCO2', '29 mmHg', 'pCO2        29    mmHg'],
      ['PaO2', '84 mmHg', 'pO2         84    mmHg'],
      ['HCO3', '13.6 mmol/L', 'HCO3-       13.6  mmol/L'],
      ['Base excess', '-12.4 mmol/L', 'BE(B)       -12.4 mmol/L'],
      ['Lactate', '7.8 mmol/L', 'Lac         7.8   mmol/L'],
      ['Na', '141 mmol/L', 'Na+         141   mmol/L'],
      ['K', '4.6 mmol/L', 'K+          4.6   mmol/L'],
      ['Cl', '103 mmol/L', 'Cl-         103   mmol/L'],
      ['FiO2', '21 %', 'FiO2        21 %'],
    ]);
    // what was recognised and left out, and the lines that gave nothing, are listed too
    expect(html).toContain(
      '<li><code>Std HCO3    15.2  mmol/L</code>: standard bicarbonate is not the actual HCO3</li>',
    );
    expect(html).toMatch(
      /<summary>Lines with no result \(2\)<\/summary>[\s\S]*?<code>POINT-OF-CARE BLOOD GAS {8}Ward 7B<\/code>[\s\S]*?<code>Operator 117<\/code>/,
    );
    expect(html).toContain('Not on the text: Albumin.');
    expect(html).not.toContain('questions before');
    // the text comes back as pasted, for a second reading
    expect(textareaOf(html, 'paste-again')).toBe(PRINTOUT);
    expect(html).toContain('name="action" value="confirm">Use these values</button>');
    expect(announced(html)).toBe('Read 10 values: check them, then use them.');
  });

  it('with nothing ambiguous becomes a confirmed case in one step, and the flow goes on where something is missing', async () => {
    const shown = (await read(PRINTOUT)).html;
    const { status, html } = await confirm(shown, PRINTOUT);
    expect(status).toBe(200);
    expect(caseOf(html)).toEqual(PRINTOUT_CASE);
    expect(stateOf(html).done).toBe('sample gas chemistry');
    // HCO3 13.6 with PaCO2 29: inside Winters' 1.5 x 13.6 + 8 = 28.4 +/- 2 (Albert, Dell, Winters 1967), so no timing asked
    expect(html).toMatch(/id="step-timing">[\s\S]*?Timing not asked/);
    expect(openId(html)).toBe('oxygen');
    const step = openStep(html);
    expect(step).toMatch(/name="oxygen\.fio2" value="21"/);
    expect(step).toContain('<p class="remark">From the paste: FiO2. Check and go on.</p>');
    expect(html).toMatch(
      /id="step-gas">[\s\S]*?<span class="value">pH 7.26<\/span><span class="value">PaCO2 29 mmHg<\/span><span class="value">PaO2 84 mmHg<\/span><span class="value">HCO3 13.6 mmol\/L<\/span><span class="value">Base excess -12.4 mmol\/L<\/span><span class="value">Lactate 7.8 mmol\/L<\/span>/,
    );
    expect(announced(html)).toMatch(
      /^Kept from the paste: 10 values\. Reads now: ABG pH 7\.26, PaCO2 29 mmHg, HCO3 13\.6 mmol\/L: raised-AG metabolic acidosis.* Next, oxygen and ventilation: FiO2 gives the A-a gradient/,
    );

    // the rest as usual, to a draft written from the same case the API would get
    let page = (await answer(html, 'oxygen', { 'oxygen.fio2': '21', ventilated: 'no' })).html;
    page = (await answer(page, 'patient', { 'patient.ageYears': '52', 'patient.pregnant': 'no' }))
      .html;
    const full = { ...PRINTOUT_CASE, patient: { ageYears: 52, pregnant: false } };
    expect(caseOf(page)).toEqual(full);
    const findings = interpret(full);
    if (!findings.ok) throw new Error('the invented case should be accepted');
    expect(textareaOf(page, 'note-text')).toBe(renderer.render(findings, { format: 'text' }).text);
    // anion gap 141 - (103 + 13.6) = 24.4 (Kraut and Madias 2007)
    expect(page).toMatch(/Anion gap <strong>24\.4 mmol\/L<\/strong>/);
  });

  it('without htmx the same posts return whole pages', async () => {
    const shown = await read(PRINTOUT, EMPTY, false);
    expect(shown.html).toMatch(/^<!doctype html>/);
    expect(shown.html).toContain('id="step-paste"');
    const res = await post(
      '/paste',
      { ...EMPTY, paste: PRINTOUT, pasteRead: hidden(shown.html, 'pasteRead'), action: 'confirm' },
      false,
    );
    expect(res.html).toMatch(/^<!doctype html>/);
    expect(openId(res.html)).toBe('oxygen');
  });

  it('a text changed after it was read is read again and shown, not used unseen', async () => {
    const shown = (await read(PRINTOUT)).html;
    const changed = PRINTOUT.replace('pCO2        29', 'pCO2        39');
    const res = await confirm(shown, changed);
    expect(openId(res.html)).toBe('paste');
    expect(caseOf(res.html)).toEqual({});
    expect(res.html).toContain('The text changed after it was read');
    expect(readRows(res.html)).toContainEqual(['PaCO2', '39 mmHg', 'pCO2        39    mmHg']);
  });

  it('Enter by hand instead goes back to the steps with nothing kept', async () => {
    const shown = (await read(PRINTOUT)).html;
    const res = await post('/paste', { ...stateOf(shown), paste: PRINTOUT, action: 'cancel' });
    expect(openId(res.html)).toBe('sample');
    expect(caseOf(res.html)).toEqual({});
  });
});

describe('the shorthand', () => {
  it('is read with the units that fit and asks the sample type as a real control', async () => {
    const { html } = await read('7.31/48/72/23');
    expect(readRows(html)).toEqual([
      ['pH', '7.31', '7.31/48/72/23'],
      ['PaCO2', '48 mmHg unit not written: the only one that fits the number', '7.31/48/72/23'],
      ['PaO2', '72 mmHg unit not written: the only one that fits the number', '7.31/48/72/23'],
      ['HCO3', '23 mmol/L', '7.31/48/72/23'],
    ]);
    expect(html).toContain('<legend class="field-label">Sample type</legend>');
    expect(html).toContain(
      'The text does not say whether the sample is arterial, venous or capillary.',
    );
    for (const s of ['arterial', 'venous', 'capillary'])
      expect(html).toMatch(
        new RegExp(`<input type="radio" id="q-0-\\d" name="answer-0" value="${s}">`),
      );
    // nothing is chosen for the clinician
    expect(html).not.toMatch(/name="answer-0"[^>]* checked/);
  });

  it('confirmed with the sample answered: sample and gas answered, chemistry next', async () => {
    const shown = (await read('7.31/48/72/23')).html;
    const { html } = await confirm(shown, '7.31/48/72/23', { 'answer-0': 'arterial' });
    expect(caseOf(html)).toEqual({
      sample: 'arterial',
      units: { pressure: 'mmHg' },
      gas: { ph: 7.31, pco2: 48, po2: 72, hco3: 23 },
    });
    expect(stateOf(html).done).toBe('sample gas');
    expect(openId(html)).toBe('chemistry');
  });

  it('confirmed with the sample left open: the sample step asks it, with the gas kept', async () => {
    const shown = (await read('7.31/48/72/23')).html;
    const { html } = await confirm(shown, '7.31/48/72/23');
    expect(stateOf(html).done).toBe('gas');
    expect(openId(html)).toBe('sample');
    expect(openStep(html)).not.toContain('paste-form'); // the case holds a gas now
    const next = (await answer(html, 'sample', { sample: 'venous' })).html;
    // a venous sample: the PO2 leaves the case, as when the sample step is answered by hand
    expect(caseOf(next).gas).toEqual({ ph: 7.31, pco2: 48, hco3: 23 });
  });

  it('the sample chosen on the first step is kept when the text does not name one', async () => {
    const gasPage = (
      await answer(await (await app.request('/')).text(), 'sample', { sample: 'arterial' })
    ).html;
    const shown = (await read('7.31/48/72/23', stateOf(gasPage))).html;
    expect(readRows(shown)[0]).toEqual([
      'Sample type',
      'Arterial',
      'your answer on the first step',
    ]);
    expect(shown).not.toContain('name="answer-0"');
    const { html } = await confirm(shown, '7.31/48/72/23');
    expect(stateOf(html).done).toBe('sample gas');
  });

  it('a venous shorthand (VBG) leaves the PvO2 out and says so', async () => {
    const shown = (await read('VBG 7.33/52/40/27')).html;
    expect(readRows(shown)).toContainEqual([
      'PvO2',
      '40 mmHg unit not written: the only one that fits the number not used: the PO2 and saturation of a venous sample do not show oxygenation',
      '7.33/52/40/27',
    ]);
    const { html } = await confirm(shown, 'VBG 7.33/52/40/27');
    expect(caseOf(html)).toEqual({
      sample: 'venous',
      units: { pressure: 'mmHg' },
      gas: { ph: 7.33, pco2: 52, hco3: 27 },
    });
    expect(openStep(html)).toContain('Not used, as the sample is venous: PvO2 40.');
  });
});

describe('an ambiguous unit', () => {
  // An invented 69-year-old with acute-on-chronic hypercapnia. Henderson (clinical-scope section 2):
  // [H+] = 10^(9 - 7.12) = 75.9 nmol/L, PaCO2 = 75.9 x 28 / 24 = 88.5 mmHg = 11.8 kPa (1 kPa = 7.50062 mmHg),
  // so a bare 12 fits kPa; the page says so and still chooses nothing.
  const TEXT = 'Arterial sample\npH 7.12\npCO2 12\npO2 40\nHCO3 28';

  it('is asked as a question with the units as choices, and the value stays out of the case', async () => {
    const { html } = await read(TEXT);
    expect(readRows(html).map((r) => r[0])).toEqual(['Sample type', 'pH', 'HCO3']);
    expect(html).toContain('<legend class="field-label">PaCO2 12</legend>');
    expect(html).toContain('kPa fits the Henderson equation');
    expect(html).toMatch(/name="answer-0" value="mmHg"><span>12 mmHg<\/span>/);
    expect(html).toMatch(/name="answer-0" value="kPa"><span>12 kPa<\/span>/);
    expect(html).toMatch(
      /name="answer-0" value="leave-out"><span>Neither: leave it out, I will enter it at the gas step<\/span>/,
    );
    expect(html).toContain('<legend class="field-label">PaO2 40</legend>');
    expect(html).not.toMatch(/name="answer-\d"[^>]* checked/);
  });

  it('answered: the values go in with the unit chosen', async () => {
    const shown = (await read(TEXT)).html;
    const { html } = await confirm(shown, TEXT, { 'answer-0': 'kPa', 'answer-1': 'kPa' });
    expect(caseOf(html)).toEqual({
      sample: 'arterial',
      units: { pressure: 'kPa' },
      gas: { ph: 7.12, pco2: 12, po2: 40, hco3: 28 },
    });
    expect(stateOf(html).done).toBe('sample gas');
  });

  it('two pressure units for one case are refused at the question', async () => {
    const shown = (await read(TEXT)).html;
    const res = await confirm(shown, TEXT, { 'answer-0': 'kPa', 'answer-1': 'mmHg' });
    expect(res.status).toBe(422);
    expect(openId(res.html)).toBe('paste');
    expect(caseOf(res.html)).toEqual({});
    expect(res.html).toContain(
      'PaO2 cannot be in mmHg: other values of the case are in kPa, and the case holds one unit for them',
    );
    // the answers given stay chosen
    expect(res.html).toMatch(/name="answer-0" value="kPa" checked>/);
  });

  it('left unanswered: nothing is guessed, and the gas step opens with the question beside it', async () => {
    const shown = (await read(TEXT)).html;
    const { html } = await confirm(shown, TEXT);
    expect(caseOf(html)).toEqual({ sample: 'arterial', gas: { ph: 7.12, hco3: 28 } });
    expect(stateOf(html).done).toBe('sample');
    expect(openId(html)).toBe('gas');
    const step = openStep(html);
    expect(step).toMatch(/name="gas\.ph" value="7\.12"/);
    expect(step).toMatch(/name="gas\.pco2" value=""/);
    expect(step).toContain('PaCO2: left out at the paste; enter it here if you have it');
  });

  it('a PaCO2 written as mmHg that looks like kPa is not passed over: the gas step opens with the doubt said', async () => {
    // PaCO2 5.3 "mmHg" with pH 7.40: the core's unit screen (clinical-scope section 3)
    const text = 'Arterial\npH 7.40\npCO2 5.3 mmHg\nHCO3 24';
    const shown = (await read(text)).html;
    const { html } = await confirm(shown, text);
    expect(stateOf(html).done).toBe('sample');
    expect(openId(html)).toBe('gas');
    expect(openStep(html)).toContain('PCO2 5.3 mmHg with pH 7.4 looks like kPa');
  });
});

describe('a question with no safe answer to offer', () => {
  // lactate in mg/dL: the case takes mmol/L and the page converts nothing, so the value is left out and the
  // gas step opens for it
  const TEXT = 'Arterial\npH 7.30\npCO2 41 mmHg\npO2 90 mmHg\nHCO3 20\nLactate 18 mg/dL';

  it('is shown with its reason, and its step opens for the value after confirm', async () => {
    const shown = (await read(TEXT)).html;
    expect(shown).toContain('<div class="question-block question-block--step">');
    expect(shown).toContain('Lactate 18 mg/dL: the case takes lactate in mmol/L');
    expect(shown).toContain('Not filled in: the gas step opens for it.');
    const { html } = await confirm(shown, TEXT);
    expect((caseOf(html).gas as Record<string, unknown>).lactate).toBeUndefined();
    expect(stateOf(html).done).toBe('sample');
    expect(openId(html)).toBe('gas');
    expect(openStep(html)).toContain('Lactate 18 mg/dL: the case takes lactate in mmol/L');
    expect(openStep(html)).toMatch(/name="gas\.hco3" value="20"/);
  });
});

describe('a FHIR bundle', () => {
  const obs = (code: string, value: number, unit: string | null, at = '2026-03-02T04:10:00Z') => ({
    resourceType: 'Observation',
    status: 'final',
    code: { coding: [{ system: 'http://loinc.org', code }] },
    effectiveDateTime: at,
    valueQuantity:
      unit === null ? { value } : { value, unit, code: unit, system: 'http://unitsofmeasure.org' },
  });
  // LOINC (as in the intake's code list): 2744-1 pH, 2019-8 PaCO2, 2703-7 PaO2, 1960-4 HCO3 (arterial blood);
  // 2951-2 Na, 2075-0 Cl (serum); 33254-4 pH adjusted to the patient's temperature (not read). An invented
  // 74-year-old with chronic hypercapnia, in kPa.
  const BUNDLE = JSON.stringify(
    {
      resourceType: 'Bundle',
      type: 'collection',
      entry: [
        { resource: { resourceType: 'Patient', id: 'demo' } },
        ...[
          obs('2744-1', 7.34, '[pH]'),
          obs('2019-8', 8.4, 'kPa'),
          obs('2703-7', 8.1, 'kPa'),
          obs('1960-4', 33.1, 'mmol/L'),
          obs('2951-2', 137, 'mmol/L'),
          obs('2075-0', 94, 'mmol/L'),
          obs('33254-4', 7.32, '[pH]'),
        ].map((resource) => ({ resource })),
      ],
    },
    null,
    2,
  );

  it('is read by LOINC code with its units, and lists what it did not use', async () => {
    const { status, html } = await read(BUNDLE);
    expect(status).toBe(200);
    expect(html).toContain('Read from FHIR JSON.');
    expect(readRows(html)).toEqual([
      ['Sample type', 'Arterial', 'the specimen of the LOINC codes'],
      ['pH', '7.34', '2744-1 pH of Arterial blood: 7.34 (2026-03-02T04:10:00Z)'],
      [
        'PaCO2',
        '8.4 kPa',
        '2019-8 Carbon dioxide [Partial pressure] in Arterial blood: 8.4 kPa (2026-03-02T04:10:00Z)',
      ],
      [
        'PaO2',
        '8.1 kPa',
        '2703-7 Oxygen [Partial pressure] in Arterial blood: 8.1 kPa (2026-03-02T04:10:00Z)',
      ],
      [
        'HCO3',
        '33.1 mmol/L',
        '1960-4 Bicarbonate [Moles/volume] in Arterial blood: 33.1 mmol/L (2026-03-02T04:10:00Z)',
      ],
      [
        'Na',
        '137 mmol/L',
        '2951-2 Sodium [Moles/volume] in Serum or Plasma: 137 mmol/L (2026-03-02T04:10:00Z)',
      ],
      [
        'Cl',
        '94 mmol/L',
        '2075-0 Chloride [Moles/volume] in Serum or Plasma: 94 mmol/L (2026-03-02T04:10:00Z)',
      ],
    ]);
    expect(html).toMatch(/Read but left out \(2\)/);
    expect(html).toContain('<code>Patient</code>: not an Observation: not read');
    expect(html).toMatch(
      /<code>33254-4 pH of Arterial blood adjusted to patient&#39;s actual temperature<\/code>: temperature-corrected value/,
    );
    expect(html).toContain('Not in the payload: K, Albumin.');
  });

  it('confirmed: the case in kPa, and the flow at timing (a respiratory process)', async () => {
    const shown = (await read(BUNDLE)).html;
    const { html } = await confirm(shown, BUNDLE);
    expect(caseOf(html)).toEqual({
      sample: 'arterial',
      units: { pressure: 'kPa' },
      gas: { ph: 7.34, pco2: 8.4, po2: 8.1, hco3: 33.1 },
      chemistry: { na: 137, cl: 94 },
    });
    expect(stateOf(html).done).toBe('sample gas chemistry');
    expect(openId(html)).toBe('timing');
    expect(openStep(html)).toMatch(/Usual PaCO2 <span class="unit">kPa<\/span>/);
  });

  it('a value without a UCUM unit is not used, and the step for it opens', async () => {
    const bundle = JSON.stringify({
      resourceType: 'Bundle',
      type: 'collection',
      entry: [
        obs('2744-1', 7.3, '[pH]'),
        obs('1960-4', 19, 'mmol/L'),
        { ...obs('2019-8', 40, null) },
      ].map((resource) => ({ resource })),
    });
    const shown = (await read(bundle)).html;
    expect(shown).toContain('no unit. The value cannot be read without one');
    expect(readRows(shown).map((r) => r[0])).toEqual(['Sample type', 'pH', 'HCO3']);
  });

  it('JSON that is not FHIR is refused with the reason, not read as a printout', async () => {
    const { status, html } = await read('{"gas": {"ph": 7.3, "pco2": 48}}');
    expect(status).toBe(422);
    expect(html).toContain('This is JSON but not FHIR (it has no resourceType)');
    expect(html).not.toContain('Use these values');
  });
});

describe('text with no result in it', () => {
  it('says that nothing could be read, lists the lines, and offers no confirm', async () => {
    const { status, html } = await read('Thank you for your order.\nResults to follow.');
    expect(status).toBe(422);
    expect(html).toContain('Nothing could be used');
    expect(html).toContain('Nothing in the text could be read as a result');
    expect(html).toContain('<code>Thank you for your order.</code>');
    expect(html).not.toContain('Use these values');
    expect(caseOf(html)).toEqual({});
    // a confirm sent anyway is refused with a message
    const forced = await post('/paste', {
      ...EMPTY,
      paste: 'Thank you for your order.\nResults to follow.',
      pasteRead: hidden(html, 'pasteRead'),
      action: 'confirm',
    });
    expect(forced.status).toBe(422);
    expect(forced.html).toContain('No gas value was read');
    expect(caseOf(forced.html)).toEqual({});
  });

  it('an empty paste and a too-long paste get a clear message', async () => {
    const empty = await read('   ');
    expect(empty.status).toBe(422);
    expect(empty.html).toContain('The text is empty');
    const long = await read(`pH 7.31\n${'x'.repeat(50_001)}`);
    expect(long.status).toBe(422);
    expect(long.html).toMatch(/The text has 50009 characters, more than 50000/);
  });

  it('the paste forms post multipart, so a FHIR bundle is not tripled by URL-encoding; such a post is read', async () => {
    const first = await (await app.request('/')).text();
    const forms = first.match(/<form class="paste-form"[^>]*>/g) ?? [];
    expect(forms.length).toBe(1);
    expect(forms[0]).toContain('enctype="multipart/form-data"');
    const body = new FormData();
    for (const [k, v] of Object.entries({
      ...EMPTY,
      action: 'read',
      paste: 'pH 7.31\npCO2 48 mmHg\nHCO3 23.5 mmol/L',
    }))
      body.append(k, v);
    const res = await app.request('/paste', {
      method: 'POST',
      body,
      headers: { 'hx-request': 'true' },
    });
    expect(res.status).toBe(200);
    const html = await res.text();
    expect(html).toContain('class="paste-confirm"');
    expect(html.match(/<form class="paste-confirm"[^>]*>/)?.[0]).toContain(
      'enctype="multipart/form-data"',
    );
  });

  it('a body over the paste limit is refused with a message, not a failure', async () => {
    const res = await post('/paste', { ...EMPTY, action: 'read', paste: '{'.repeat(200_000) });
    expect(res.status).toBe(413);
    expect(res.html).toContain('The pasted text is too long');
  });

  it('hostile text is shown as text, never as markup', async () => {
    const { html } = await read(
      'pH 7.31 <img src=x onerror=alert(1)>\n<script>alert(2)</script>\npCO2 48 mmHg',
    );
    expect(html).not.toMatch(/<img|<script>alert/);
    expect(textareaOf(html, 'paste-again')).toContain('<img src=x onerror=alert(1)>'); // escaped in the page, the same text when read back
  });
});

describe('a long paste', () => {
  it('each list shows at most 20 entries and counts the rest, so the page is not many times the text', async () => {
    // the invented printout, then 1,500 lines that hold no result and 600 lines of standard bicarbonate, which is set aside
    const filler = Array.from({ length: 1500 }, (_, i) => `Qz ${i}`).join('\n');
    const repeats = Array.from({ length: 600 }, (_, i) => `Std HCO3 15.${i % 10} mmol/L`).join(
      '\n',
    );
    const text = `${PRINTOUT}\n${filler}\n${repeats}`;
    const res = await read(text);
    const counted = (heading: RegExp) => Number(res.html.match(heading)?.[1]);
    const ignored = counted(/Lines with no result \((\d+)\)/);
    expect(ignored).toBeGreaterThanOrEqual(1500);
    expect(res.html).toContain(`and ${ignored - MAX_LISTED} more not listed here`);
    const setAside = counted(/Read but left out \((\d+)\)/);
    expect(setAside).toBeGreaterThanOrEqual(600);
    expect(res.html).toContain(`and ${setAside - MAX_LISTED} more not listed here`);
    const lists = [...res.html.matchAll(/<ul class="aside-list">([\s\S]*?)<\/ul>/g)];
    for (const [, list] of lists)
      expect((list!.match(/<li>/g) ?? []).length).toBeLessThanOrEqual(MAX_LISTED);
    // the text itself comes back once, in its box; everything else is a few kilobytes
    expect(res.html.length).toBeLessThan(text.length + 20_000);
    // what was read is still read
    expect(readRows(res.html).some(([result]) => result === 'pH')).toBe(true);
  });
});
