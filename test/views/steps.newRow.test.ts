// One new optional chemistry row in the table of fields, and nothing else changed: the chemistry step asks it under
// "If you have them", with its label and unit, and writes it into the case at its path. The row is invented for the
// test and added to calc's table through the module's one door (calc/index.ts).
import { describe, expect, it, vi } from 'vitest';

const ROW = {
  path: 'chemistry.testValue',
  label: 'Test value',
  unit: 'mmol/L',
  range: [0, 15],
  decimals: 1,
  step: 'chemistry',
  optional: true,
} as const;

vi.mock('../../calc/index.ts', async (importOriginal) => {
  const calc = await importOriginal<typeof import('../../calc/index.ts')>();
  return { ...calc, FIELDS: [...calc.FIELDS, ROW], FIELD: { ...calc.FIELD, [ROW.path]: ROW } };
});

const { createNoteRenderer } = await import('../../templates/index.ts');
const { flowView, renderFragment } = await import('../../views/render.ts');
const { STEPS, contextOf } = await import('../../views/steps.ts');
const { applyStep } = await import('../../views/answers.ts');
const { openStep } = await import('../server/pageHtml.ts');

// an invented patient with a metabolic acidosis
const answers = {
  sample: 'arterial',
  gas: { ph: 7.22, pco2: 21, po2: 96, hco3: 8.5 },
};

describe('a new optional row with step "chemistry"', () => {
  it('is asked in the chemistry form, under the legend, with its label and unit', () => {
    const state = { answers, done: ['sample' as const, 'gas' as const], format: 'text' as const };
    const html = openStep(
      renderFragment(flowView(state, { renderer: createNoteRenderer() }, { open: 'chemistry' })),
    );
    const legend = html.indexOf('<legend class="group-legend">If you have them</legend>');
    const input = html.indexOf(`name="${ROW.path}"`);
    expect(legend).toBeGreaterThan(-1);
    expect(input).toBeGreaterThan(legend);
    expect(html).toContain(
      `<label class="field-label" for="f-chemistry-testValue">Test value <span class="unit">mmol/L</span></label>`,
    );
  });

  it('is written into the case at its path, as a number', () => {
    const ctx = contextOf(answers, null);
    const { answers: next, errors } = applyStep(
      STEPS.chemistry,
      answers,
      { [ROW.path]: '2,5', 'chemistry.na': '137' },
      ctx,
    );
    expect(errors).toEqual([]);
    expect(next.chemistry).toEqual({ na: 137, testValue: 2.5 });
  });
});
