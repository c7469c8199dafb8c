// Known conditions on the page (issue 12 item 9): the patient step asks the one that matters most, the case
// carries it as context.conditions, and the reading uses it. Every patient is invented.
import { describe, expect, it } from 'vitest';
import { createApp } from '../../server/app.ts';
import { caseOf, openId, poster, stateOf, textareaOf, typedGas, walkSteps } from './pageHtml.ts';

const app = createApp();
const post = poster(app);

/** An invented 67-year-old on 40% oxygen with SpO2 97%, answered step by step up to the patient step. */
async function upToPatient(): Promise<string> {
  const gas = await typedGas(app, {
    'gas.ph': '7.34',
    'gas.pco2': '58',
    'gas.po2': '92',
    'gas.hco3': '30.6',
  });
  const html = await walkSteps(app, gas, 'patient', {
    oxygen: { 'oxygen.fio2': '0.4', 'oxygen.spo2': '97', ventilated: 'no' },
  });
  expect(openId(html)).toBe('patient');
  return html;
}

describe('known conditions', () => {
  it('the patient step asks for one, and the case and the note carry it', async () => {
    const html = await upToPatient();
    expect(html).toContain('Known condition that changes the targets');
    const done = (
      await post('/step', {
        ...stateOf(html),
        step: 'patient',
        action: 'next',
        'patient.ageYears': '67',
        'context.conditions': 'copd',
      })
    ).html;
    expect((caseOf(done).context as { conditions?: string[] }).conditions).toEqual(['copd']);
    expect(done).toContain('Known COPD');
    // at risk of hypercapnic failure the SpO2 target is 88-92% (BTS guideline, O'Driscoll 2017): 97% on oxygen is
    // above it, so the plan says to reduce the FiO2
    expect(textareaOf(done, 'note-text')).toMatch(/Reduce the FiO2 to an SpO2 of 88-92%/);
  });

  it('"None known" leaves the case without conditions', async () => {
    const html = await upToPatient();
    const done = (
      await post('/step', {
        ...stateOf(html),
        step: 'patient',
        action: 'next',
        'context.conditions': '',
      })
    ).html;
    expect((caseOf(done).context as { conditions?: string[] } | undefined)?.conditions).toBe(
      undefined,
    );
    expect(done).toContain('No known condition');
  });
});
