// How often one request of the page runs the case schema and the reading: the case is parsed and interpreted once
// per request and handed down, not worked out again by every part of the page. Counted through calc's one door.
import { describe, expect, it, vi } from 'vitest';

const counts = vi.hoisted(() => ({ parse: 0, interpret: 0, interpretParsed: 0 }));

vi.mock('../../calc/index.ts', async (importOriginal) => {
  const calc = await importOriginal<typeof import('../../calc/index.ts')>();
  return {
    ...calc,
    parseCase: (...a: Parameters<typeof calc.parseCase>) => {
      counts.parse++;
      return calc.parseCase(...a);
    },
    interpret: (...a: Parameters<typeof calc.interpret>) => {
      counts.interpret++;
      return calc.interpret(...a);
    },
    interpretParsed: (...a: Parameters<typeof calc.interpretParsed>) => {
      counts.interpretParsed++;
      return calc.interpretParsed(...a);
    },
  };
});

const { createApp } = await import('../../server/app.ts');
const { openId, poster, stateOf } = await import('./pageHtml.ts');
type Fields = Record<string, string>;

const app = createApp();
const post = poster(app);
const answer = (html: string, step: string, fields: Fields) =>
  post('/step', { ...stateOf(html), step, action: 'next', ...fields });

/** Schema runs (interpret() parses first) and readings during one request. */
async function measure<T>(request: () => Promise<T>) {
  counts.parse = counts.interpret = counts.interpretParsed = 0;
  const result = await request();
  return {
    result,
    parses: counts.parse + counts.interpret,
    readings: counts.interpret + counts.interpretParsed,
  };
}

// an invented arterial case: a 47-year-old with a metabolic acidosis, not ventilated
async function beforeTheLastStep(): Promise<string> {
  let html = await (await app.request('/')).text();
  html = (await answer(html, 'sample', { sample: 'arterial' })).html;
  html = (
    await answer(html, 'gas', {
      'units.pressure': 'mmHg',
      'gas.ph': '7.22',
      'gas.pco2': '21',
      'gas.po2': '96',
      'gas.hco3': '8.5',
    })
  ).html;
  html = (await answer(html, 'chemistry', { 'chemistry.na': '137', 'chemistry.cl': '100' })).html;
  html = (await answer(html, 'oxygen', { 'oxygen.fio2': '0.21', ventilated: 'no' })).html;
  expect(openId(html)).toBe('patient');
  return html;
}

describe('one request, one reading of the case', () => {
  it('the step that shows the draft', async () => {
    const html = await beforeTheLastStep();
    const { result, parses, readings } = await measure(() =>
      answer(html, 'patient', { 'patient.ageYears': '47', 'patient.pregnant': 'no' }),
    );
    expect(result.html).toContain('id="draft"');
    // the case that came with the form is checked before anything reads it; the answered case is checked and
    // read once, and that one reading serves the live region, the steps, the draft and the map
    expect({ parses, readings }).toEqual({ parses: 2, readings: 1 });
  });

  it('an answer refused at its field', async () => {
    const html = await beforeTheLastStep();
    const { result, parses, readings } = await measure(() =>
      answer(html, 'patient', { 'patient.ageYears': '300' }),
    );
    expect(result.status).toBe(422);
    // the refused case is checked once and never read; the page shown is the case as it came, read once
    expect({ parses, readings }).toEqual({ parses: 2, readings: 1 });
  });

  it('a format switch of the draft', async () => {
    const html = (await answer(await beforeTheLastStep(), 'patient', { 'patient.ageYears': '47' }))
      .html;
    const { result, parses, readings } = await measure(() =>
      post('/open', { ...stateOf(html), format: 'markdown' }),
    );
    expect(result.status).toBe(200);
    expect(result.html).toContain('id="draft"');
    expect({ parses, readings }).toEqual({ parses: 1, readings: 1 });
  });

  it('the gas step', async () => {
    let html = await (await app.request('/')).text();
    html = (await answer(html, 'sample', { sample: 'arterial' })).html;
    const { result, parses, readings } = await measure(() =>
      answer(html, 'gas', { 'gas.ph': '7.22', 'gas.pco2': '21', 'gas.hco3': '8.5' }),
    );
    expect(openId(result.html)).toBe('chemistry');
    // the case before the gas holds only the sample: the answered case is the one checked and read
    expect({ parses, readings }).toEqual({ parses: 1, readings: 1 });
  });
});
