// A venous gas: the note says that compensation was judged from the arterial estimate of the venous PCO2
// (Byrne AL et al., Respirology 2014: venous PCO2 about 4-6 mmHg above arterial; from memory).
import { describe, expect, it } from 'vitest';
import { interpret, type Findings } from '../../calc/index.ts';
import { createNoteRenderer } from '../../templates/index.ts';

const renderer = createNoteRenderer();
const read = (c: unknown): Findings => {
  const f = interpret(c);
  if (!f.ok) throw new Error(JSON.stringify(f.errors));
  return f;
};

describe('venous compensation wording', () => {
  it('metabolic acidosis: names the venous value and its arterial estimate', () => {
    // invented: ketoacidosis in the emergency department; Winters 1.5 x 8.5 + 8 = 20.75 +/- 2
    const text = renderer.render(
      read({ sample: 'venous', gas: { ph: 7.15, pco2: 25, hco3: 8.5 } }),
    ).full;
    expect(text).toContain(
      'the venous PCO2 of 25 mmHg puts the arterial PCO2 at 19-25 mmHg (about 19-21 mmHg on average), which overlaps it',
    );
    expect(text).not.toMatch(/\w(which|all of it)/);
  });

  it('respiratory acidosis: says the expected HCO3 came from the arterial estimate', () => {
    const text = renderer.render(
      read({ sample: 'venous', gas: { ph: 7.3, pco2: 62, hco3: 30 } }),
    ).full;
    expect(text).toContain('62 mmHg venous, about 56-58 mmHg arterial');
  });

  it('an arterial gas says nothing of the kind', () => {
    const text = renderer.render(
      read({ sample: 'arterial', gas: { ph: 7.3, pco2: 62, hco3: 30 } }),
    ).full;
    expect(text).not.toContain('arterial estimate');
  });
});

describe('a usual pH that cannot be used', () => {
  it('says why the baseline was not estimated', () => {
    // invented: ketoacidosis with a usual pH given; the current low HCO3 is no chronic compensation
    const f = read({ gas: { ph: 7.18, pco2: 18, hco3: 6.5 }, context: { baseline: { ph: 7.4 } } });
    expect(f.reference.usualPhIgnored).toBe(true);
    expect(renderer.render(f).full).toContain('The usual pH was not used to estimate a baseline');
  });
});
