// The page's templates run compiled (templates/compile.ts); nunjucks itself is the reference. For invented
// cases at several points of the flow, with errors, edits and both note formats, the compiled page and
// fragment must be the same HTML, character for character, as nunjucks renders.
import { describe, expect, it } from 'vitest';
import { createNoteRenderer } from '../../templates/index.ts';
import type { Json } from '../../views/steps.ts';
import { STEP_IDS, type StepId } from '../../views/steps.ts';
import {
  flowView,
  renderFragment,
  renderPage,
  renderPreview,
  renderProblem,
  VIEW_ENGINE,
  type Presentation,
} from '../../views/render.ts';
import { ALL_CASES } from '../templates/cases.ts';

const deps = { renderer: createNoteRenderer() };

const presentations: [string, Presentation][] = [
  ['plain', {}],
  ['a step opened for a change', { open: 'oxygen', announce: 'Oxygen opened' }],
  [
    'an error at a field',
    {
      open: 'gas',
      invalid: {
        step: 'gas',
        errors: [{ path: 'gas.ph', message: 'pH 9.1 is outside 6.50-8.00: check the value' }],
        typed: { ph: '9.1 <script>alert(1)</script>' },
      },
    },
  ],
  [
    "the clinician's edits",
    { edited: { note: 'Edited <b>note</b> & more', handover: 'Handover "quoted"' } },
  ],
];

const states = (
  answers: Json,
): [string, { answers: Json; done: StepId[]; format: 'text' | 'markdown' }][] => [
  [
    'nothing answered',
    { answers: { sample: answers.sample ?? 'arterial' }, done: ['sample'], format: 'text' },
  ],
  ['the gas only', { answers, done: ['sample', 'gas'], format: 'text' }],
  ['every step, text', { answers, done: [...STEP_IDS], format: 'text' }],
  ['every step, Markdown', { answers, done: [...STEP_IDS], format: 'markdown' }],
];

describe('the compiled page', () => {
  it('is what the page uses', () => {
    expect(VIEW_ENGINE).toBe('compiled');
  });

  for (const [name, answers] of Object.entries(ALL_CASES)) {
    it(`${name}: page and fragment as nunjucks renders them`, () => {
      for (const [, state] of states(answers as Json)) {
        for (const [, p] of presentations) {
          const view = flowView(state, deps, p);
          const fragment = renderFragment(view, 'compiled');
          if (state.done.length === STEP_IDS.length && p === presentations[0]![1])
            expect(fragment).toContain(state.format === 'markdown' ? '## Cautions' : 'CAUTIONS');
          expect(fragment).toBe(renderFragment(view, 'nunjucks'));
          expect(renderPage(view, 'compiled')).toBe(renderPage(view, 'nunjucks'));
        }
      }
    });
  }

  it('the preview and the problem page as nunjucks renders them, with their text escaped', () => {
    const hostile = '<img src=x onerror=alert(1)> & "q"';
    expect(renderPreview('<p>ok</p>', 'compiled')).toBe(renderPreview('<p>ok</p>', 'nunjucks'));
    for (const fragment of [true, false]) {
      const html = renderProblem(hostile, fragment, 'compiled');
      expect(html).toBe(renderProblem(hostile, fragment, 'nunjucks'));
      expect(html).not.toContain('<img');
    }
  });
});
