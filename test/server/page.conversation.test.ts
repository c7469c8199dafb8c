// The page as a conversation, through app.request: the draft from the first gas, the reply after each answer
// (what it reads now, what it asks next and why), Skip and Finish, and the steps not asked after Finish.
// Patients are invented.
import { describe, expect, it } from 'vitest';
import { createApp } from '../../server/app.ts';
import { caseOf, openId, poster, stateOf, textareaOf, type Fields } from './pageHtml.ts';

const app = createApp();
const post = poster(app);
const answer = (html: string, step: string, fields: Fields, action = 'next') =>
  post('/step', { ...stateOf(html), step, action, ...fields });

async function afterGas(gas: Fields): Promise<string> {
  let html = await (await app.request('/')).text();
  html = (await answer(html, 'sample', { sample: 'arterial' })).html;
  return (await answer(html, 'gas', gas)).html;
}

const reply = (html: string) =>
  html.match(/<li class="entry entry--reply" id="step-reply">([\s\S]*?)<\/li>/)?.[1] ?? '';

describe('the draft from the first gas', () => {
  it('comes with the gas, beside the next question, with the reading and why the next question is asked', async () => {
    // pH 7.24, PaCO2 30, HCO3 12.6: Winters' expected PaCO2 1.5 x 12.6 + 8 = 26.9 +/- 2 (Albert, Dell and Winters
    // 1967): 30 is above it, an added respiratory acidosis
    const html = await afterGas({ 'gas.ph': '7.24', 'gas.pco2': '30', 'gas.hco3': '12.6' });
    expect(openId(html)).toBe('chemistry');
    expect(html).toContain('id="draft-title"');
    expect(html).toContain('data-copy="line-text"');
    expect(html).toContain('data-copy="note-text"');
    expect(html).toContain('data-copy="handover-text"');
    const said = reply(html);
    expect(said).toMatch(
      /Reads now<\/span> ABG pH 7\.24, PaCO2 30 mmHg, HCO3 12\.6 mmol\/L: metabolic acidosis/,
    );
    expect(said).toContain(
      'Next, chemistry: a metabolic acidosis: Na, Cl and albumin give the anion gap, which sorts the cause.',
    );
    // the live region says the same
    expect(html).toMatch(
      /<hx-partial hx-target="#announce" hx-swap="innerHTML">Reads now: ABG pH 7\.24/,
    );
    // the full reasoning one toggle away
    expect(html).toMatch(/<details class="full">\s*<summary>Full reasoning<\/summary>/);
    expect(textareaOf(html, 'note-full')).toContain('INTERPRETATION');
  });

  it('has no draft before the gas, only the place it will appear', async () => {
    const html = await (await app.request('/')).text();
    expect(html).not.toContain('id="draft-title"');
    expect(html).toContain('The reading starts here as soon as the gas is in');
  });

  it('says which questions it passes over, and why', async () => {
    // a metabolic acidosis compensated as expected: no respiratory process, so timing cannot change the reading
    let html = await afterGas({ 'gas.ph': '7.22', 'gas.pco2': '21', 'gas.hco3': '8.5' });
    html = (await answer(html, 'chemistry', {}, 'skip')).html;
    expect(openId(html)).toBe('oxygen');
    // said once on the page, in the log, and to a screen reader in the live region with the reply
    expect(html).toMatch(
      /id="step-timing">\s*<p class="skipped">Timing not asked: these numbers show no respiratory process/,
    );
    expect(reply(html)).not.toContain('Timing not asked');
    expect(html).toMatch(
      /<hx-partial[^>]*>Reads now: [^<]*Timing not asked: these numbers show no respiratory process/,
    );
    expect(reply(html)).toContain('Next, oxygen and ventilation: FiO2 gives the A-a gradient');
  });
});

describe('Skip and Finish', () => {
  it('Skip leaves a required choice unanswered instead of refusing it', async () => {
    let html = await afterGas({ 'gas.ph': '7.22', 'gas.pco2': '21', 'gas.hco3': '8.5' });
    html = (await answer(html, 'chemistry', {}, 'skip')).html;
    const skipped = await answer(html, 'oxygen', { 'oxygen.fio2': '0.4' }, 'skip');
    expect(skipped.status).toBe(200);
    expect(caseOf(skipped.html).oxygen).toBeUndefined();
    expect(caseOf(skipped.html).ventilator).toBeUndefined();
    expect(openId(skipped.html)).toBe('patient');
  });

  it('Finish takes the answer, asks nothing more, and keeps the steps not answered within reach', async () => {
    const html = await afterGas({ 'gas.ph': '7.24', 'gas.pco2': '30', 'gas.hco3': '12.6' });
    const done = await answer(
      html,
      'chemistry',
      { 'chemistry.na': '138', 'chemistry.cl': '101' },
      'finish',
    );
    expect(done.status).toBe(200);
    expect(openId(done.html)).toBeNull();
    expect(caseOf(done.html).chemistry).toEqual({ na: 138, cl: 101 });
    expect(done.html).toContain('<input type="hidden" name="finished" value="yes">');
    expect(done.html).toMatch(/id="draft-title" tabindex="-1" autofocus/);
    expect(reply(done.html)).toContain('Nothing more to ask.');
    expect(done.html).toContain('<p class="skipped">Patient: not given.</p>');
    // a step not answered opens on request, and answering it leaves the conversation finished
    const opened = await post('/open', { ...stateOf(done.html), open: 'patient' });
    expect(openId(opened.html)).toBe('patient');
    const answered = await answer(opened.html, 'patient', { 'patient.ageYears': '58' });
    expect(openId(answered.html)).toBeNull();
    expect((caseOf(answered.html).patient as Record<string, unknown>).ageYears).toBe(58);
  });

  it('Finish on the gas step shows the draft at once', async () => {
    let html = await (await app.request('/')).text();
    html = (await answer(html, 'sample', { sample: 'venous' })).html;
    const done = await answer(
      html,
      'gas',
      { 'gas.ph': '7.31', 'gas.pco2': '53', 'gas.hco3': '26' },
      'finish',
    );
    expect(openId(done.html)).toBeNull();
    expect(textareaOf(done.html, 'note-text')).toMatch(/venous/i);
  });
});
