// A follow-up gas on the draft, and the H+/CO2 chart beside it, through app.request. The current gas (with its
// FiO2, PEEP, VT and RR) becomes an earlier gas; the gas, oxygen and ventilator steps open for the new values;
// chemistry, patient and context stay; the draft then carries the trend the note templates write, and the chart
// places both gases. Every patient here is invented.
import { describe, expect, it } from 'vitest';
import { createApp } from '../../server/app.ts';
import { interpret } from '../../calc/index.ts';
import { MAX_PREVIOUS_GASES } from '../../calc/index.ts';
import { createNoteRenderer } from '../../templates/index.ts';
import { caseOf, openId, openStep, stateOf, textareaOf, poster, type Fields } from './pageHtml.ts';

const app = createApp();
const renderer = createNoteRenderer();

const svgOf = (html: string) => html.match(/<svg[\s\S]*?<\/svg>/)?.[0] ?? '';

const post = poster(app);
const answer = (html: string, step: string, fields: Fields) =>
  post('/step', { ...stateOf(html), step, action: 'next', ...fields });
/**
 * A follow-up from a draft: `earlier` is the time or label the current gas was given (it keeps it as the earlier
 * gas; without one it is the "first gas"), `when` the time of the new gas.
 */
const followUp = (html: string, earlier: string, when = '') =>
  post('/followup', { ...stateOf(html), ...(earlier ? { taken: earlier } : {}), when });

// An invented 66-year-old ventilated for pneumonia with an acute respiratory acidosis.
async function ventilatedDraft(): Promise<string> {
  let html = await (await app.request('/')).text();
  html = (await answer(html, 'sample', { sample: 'arterial' })).html;
  html = (
    await answer(html, 'gas', {
      'units.pressure': 'mmHg',
      'gas.ph': '7.22',
      'gas.pco2': '61',
      'gas.po2': '88',
      'gas.hco3': '24.3',
    })
  ).html;
  html = (
    await answer(html, 'chemistry', {
      'chemistry.na': '139',
      'chemistry.k': '4.4',
      'chemistry.cl': '102',
    })
  ).html;
  html = (await answer(html, 'timing', { 'context.timing': 'acute' })).html;
  html = (
    await answer(html, 'oxygen', { 'oxygen.fio2': '0.5', 'oxygen.peep': '8', ventilated: 'yes' })
  ).html;
  html = (
    await answer(html, 'ventilator', {
      'ventilator.vt': '450',
      'ventilator.rr': '14',
      'patient.heightCm': '170',
      'patient.sex': 'male',
    })
  ).html;
  html = (await answer(html, 'patient', { 'patient.ageYears': '66' })).html;
  expect(openId(html)).toBeNull();
  return html;
}

const FIRST = {
  sample: 'arterial',
  units: { pressure: 'mmHg' },
  gas: { ph: 7.22, pco2: 61, po2: 88, hco3: 24.3 },
};
const KEPT = {
  chemistry: { na: 139, k: 4.4, cl: 102 },
  context: { timing: 'acute' },
  patient: { heightCm: 170, sex: 'male', ageYears: 66 },
};

describe('the draft offers a follow-up gas', () => {
  it('has the button with an optional time or label', async () => {
    const html = await ventilatedDraft();
    expect(html).toMatch(
      /<form class="followup-form" method="post" action="\/followup" hx-post="\/followup"/,
    );
    expect(html).toContain(
      '<label class="field-label" for="followup-when">New gas taken at <span class="unit">time or label</span></label>',
    );
    expect(html).toContain('<button type="submit" class="button">Add the later gas</button>');
  });

  it('moves the gas with its FiO2, PEEP, VT and RR into the earlier gases and opens the gas step, keeping the rest', async () => {
    const { status, html } = await followUp(
      await ventilatedDraft(),
      '2026-03-02T04:10',
      '2026-03-02T06:40',
    );
    expect(status).toBe(200);
    expect(caseOf(html)).toEqual({
      sample: 'arterial',
      units: { pressure: 'mmHg' },
      ...KEPT,
      oxygen: { fio2: 0.5, peep: 8 },
      ventilator: { vt: 450, rr: 14 },
      previous: [
        {
          takenAt: '2026-03-02T04:10',
          gas: FIRST.gas,
          oxygen: { fio2: 0.5, peep: 8 },
          ventilator: { vt: 450, rr: 14 },
        },
      ],
    });
    expect(stateOf(html).done).toBe('sample chemistry timing patient');
    // the time typed belongs to the new gas
    expect(html).toContain('<input type="hidden" name="taken" value="2026-03-02T06:40">');
    expect(openId(html)).toBe('gas');
    const step = openStep(html);
    for (const name of ['gas.ph', 'gas.pco2', 'gas.po2', 'gas.hco3'])
      expect(step).toMatch(new RegExp(`name="${name.replace('.', '\\.')}" value=""`));
    expect(step).toContain(
      'A follow-up gas: enter it in mmHg, like the earlier one. Chemistry, patient and context are kept from before',
    );
    // the earlier gas heads the conversation, with the way back
    expect(html).toMatch(
      /<li class="entry entry--earlier" id="step-earlier-1">[\s\S]*?Earlier gas<span class="bubble-when"> · 2026-03-02 04:10<\/span>[\s\S]*?<span class="value">pH 7.22<\/span><span class="value">PaCO2 61 mmHg<\/span><span class="value">PaO2 88 mmHg<\/span><span class="value">HCO3 24.3 mmol\/L<\/span><span class="value">FiO2 0.5<\/span><span class="value">PEEP 8 cmH2O<\/span><span class="value">VT 450 mL<\/span><span class="value">RR 14\/min<\/span>/,
    );
    expect(html).toContain('name="open" value="cancel-followup"');
    expect(html).not.toContain('id="draft-title"');
  });

  it('a gas given no time of its own is the "first gas" once a later gas follows', async () => {
    const { html } = await followUp(await ventilatedDraft(), '', '06:40');
    const previous = caseOf(html).previous as Record<string, unknown>[];
    expect(previous[0]!.label).toBe('first gas');
    expect(html).toContain('<input type="hidden" name="taken" value="06:40">');
  });

  it('an earlier gas whose time was given in words keeps them as its label', async () => {
    const { html } = await followUp(await ventilatedDraft(), '  before RR change ');
    const previous = caseOf(html).previous as Record<string, unknown>[];
    expect(previous[0]!.label).toBe('before RR change');
    expect(previous[0]!.takenAt).toBeUndefined();
  });

  it('the follow-up flow: gas, oxygen, ventilator, then a draft with the trend in the note and both gases on the chart', async () => {
    let html = (await followUp(await ventilatedDraft(), 'before RR change')).html;
    html = (
      await answer(html, 'gas', {
        'units.pressure': 'mmHg',
        'gas.ph': '7.31',
        'gas.pco2': '49',
        'gas.po2': '95',
        'gas.hco3': '24.1',
      })
    ).html;
    expect(openId(html)).toBe('oxygen');
    expect(openStep(html)).toMatch(/name="oxygen\.fio2" value="0\.5"/); // as before, to be confirmed
    html = (
      await answer(html, 'oxygen', { 'oxygen.fio2': '0.5', 'oxygen.peep': '8', ventilated: 'yes' })
    ).html;
    expect(openId(html)).toBe('ventilator');
    expect(openStep(html)).toMatch(/name="ventilator\.rr" value="14"/);
    html = (
      await answer(html, 'ventilator', {
        'ventilator.vt': '450',
        'ventilator.rr': '18',
        'patient.heightCm': '170',
        'patient.sex': 'male',
      })
    ).html;
    expect(openId(html)).toBeNull();

    const expected = {
      ...FIRST,
      gas: { ph: 7.31, pco2: 49, po2: 95, hco3: 24.1 },
      ...KEPT,
      oxygen: { fio2: 0.5, peep: 8 },
      ventilator: { vt: 450, rr: 18 },
      previous: [
        {
          label: 'before RR change',
          gas: FIRST.gas,
          oxygen: { fio2: 0.5, peep: 8 },
          ventilator: { vt: 450, rr: 14 },
        },
      ],
    };
    expect(caseOf(html)).toEqual(expected);
    const findings = interpret(expected);
    if (!findings.ok) throw new Error('the invented case should be accepted');
    const note = textareaOf(html, 'note-text');
    expect(note).toBe(renderer.render(findings, { format: 'text' }).text);
    expect(note).toContain('Since the previous gas (before RR change): pH 7.22 to 7.31');
    // RR 14 -> 18 at the same VT: PaCO2 61 x 14 / 18 = 47 mmHg (alveolar ventilation equation, West)
    expect(renderer.render(findings, { format: 'text' }).full).toContain(
      'predicted a PaCO2 of about 47 mmHg',
    );

    const svg = svgOf(html);
    expect(svg.match(/class="gl-gas-marker"/g)).toHaveLength(2);
    expect(svg).toContain('id="gasline-chart-gas-current"');
    expect(svg).toContain('id="gasline-chart-gas-1"');
    expect(svg).toMatch(/class="gl-gas-step" data-from="1" data-to="2"/);
    expect(html).toMatch(
      /<li>Gas 1 of 2, before RR change: pH 7\.22 \(\[H\+\] 60 nmol\/L\), PaCO2 61 mmHg, HCO3 24\.3 mmol\/L/,
    );
    // what changed since the earlier gas, beside the reading
    expect(html).toContain(
      'Since the earlier gas (before RR change): pH 7.22 to 7.31; PaCO2 61 to 49 mmHg; PaO2 88 to 95 mmHg; HCO3 24.3 to 24.1 mmol/L. Changed: RR 14 to 18/min.',
    );
    // a second follow-up is offered, up to the schema's limit
    expect(html).toContain('Add the later gas');
  });

  it('cancelling before the new gas is entered puts the gas back and shows the draft again', async () => {
    const draft = await ventilatedDraft();
    const pending = (await followUp(draft, 'before RR change')).html;
    const res = await post('/open', { ...stateOf(pending), open: 'cancel-followup' });
    expect(caseOf(res.html)).toEqual(caseOf(draft));
    expect(stateOf(res.html).done).toBe(stateOf(draft).done);
    expect(textareaOf(res.html, 'note-text')).toBe(textareaOf(draft, 'note-text'));
  });

  it('the follow-up keeps the pressure unit of the earlier gases', async () => {
    const pending = (await followUp(await ventilatedDraft(), '')).html;
    const res = await answer(pending, 'gas', {
      'units.pressure': 'kPa',
      'gas.ph': '7.31',
      'gas.pco2': '6.5',
      'gas.hco3': '24.1',
    });
    expect(res.status).toBe(422);
    expect(res.html).toContain(
      'The earlier gases of this case are in mmHg: enter the follow-up gas in mmHg too, or start a new case',
    );
    expect(caseOf(res.html).gas).toBeUndefined();
  });

  it('a label too long is refused at its field; the case is unchanged', async () => {
    const draft = await ventilatedDraft();
    const res = await followUp(draft, '', 'x'.repeat(81));
    expect(res.status).toBe(422);
    expect(res.html).toMatch(
      /<p class="error" id="followup-when-error"><span class="visually-hidden">Error: <\/span>Keep the time or label to 80 characters or fewer \(it has 81\)\.<\/p>/,
    );
    expect(caseOf(res.html)).toEqual(caseOf(draft));
  });

  it(`stops at the schema's limit of ${MAX_PREVIOUS_GASES} earlier gases, and says so`, async () => {
    const draft = await ventilatedDraft();
    const full = {
      ...caseOf(draft),
      previous: Array.from({ length: MAX_PREVIOUS_GASES }, (_, i) => ({
        label: `gas ${i + 1}`,
        gas: { ph: 7.3, pco2: 50, hco3: 24 },
      })),
    };
    const page = await post('/open', { ...stateOf(draft), case: JSON.stringify(full) });
    expect(page.html).toContain(
      `This case holds ${MAX_PREVIOUS_GASES} earlier gases, the most it can`,
    );
    expect(page.html).not.toContain('Add a follow-up gas');
    const res = await followUp(page.html, '');
    expect(res.status).toBe(422);
    expect(caseOf(res.html).previous).toHaveLength(MAX_PREVIOUS_GASES);
  });

  it('a follow-up needs a gas to follow', async () => {
    const res = await post('/followup', {
      case: '{"sample":"arterial"}',
      done: 'sample',
      format: 'text',
      when: '',
    });
    expect(res.status).toBe(400);
    expect(res.html).toContain('There is no gas to follow up yet.');
  });
});

describe('the H+/CO2 chart on the draft', () => {
  it('is drawn beside the note with its text alternative, CSP-safe', async () => {
    const html = await ventilatedDraft();
    expect(html).toMatch(
      /<\/section>\s*<section class="chart-panel" id="chart" aria-labelledby="chart-heading">/,
    );
    const svg = svgOf(html);
    expect(svg).toMatch(
      /^<svg xmlns="http:\/\/www\.w3\.org\/2000\/svg" class="gl-chart"[^>]* role="img" aria-labelledby="gasline-chart-title" aria-describedby="gasline-chart-desc"/,
    );
    expect(svg.match(/class="gl-gas-marker"/g)).toHaveLength(1);
    expect(svg).not.toMatch(/<script|\sstyle=|\son[a-z]+=/i);
    expect(html).toContain('<summary>What the chart shows</summary>');
    expect(html).toMatch(
      /<ul class="chart-lines"><li>H\+\/CO2 chart: \[H\+\] from 0 to 130 nmol\/L \(up, with pH beside it\) against PaCO2/,
    );
    expect(html).toMatch(
      /<li>Today&#39;s gas \(1 of 1\): pH 7\.22 \(\[H\+\] 60 nmol\/L\), PaCO2 61 mmHg, HCO3 24\.3 mmol\/L/,
    );
  });

  it('escapes a hostile label in the drawing and in the words', async () => {
    const pending = (await followUp(await ventilatedDraft(), '<script>alert(1)</script>')).html;
    let html = (
      await answer(pending, 'gas', {
        'units.pressure': 'mmHg',
        'gas.ph': '7.31',
        'gas.pco2': '49',
        'gas.hco3': '24.1',
      })
    ).html;
    html = (await answer(html, 'oxygen', { 'oxygen.fio2': '0.5', ventilated: 'yes' })).html;
    html = (await answer(html, 'ventilator', { 'ventilator.vt': '450', 'ventilator.rr': '18' }))
      .html;
    expect(openId(html)).toBeNull();
    expect(html).not.toContain('<script>alert(1)');
    expect(html).toContain('Gas 1 of 2, &lt;script&gt;alert(1)&lt;/script&gt;');
  });

  it('is not drawn while no draft is shown', async () => {
    const pending = (await followUp(await ventilatedDraft(), '')).html;
    expect(pending).not.toContain('chart-panel');
  });
});
