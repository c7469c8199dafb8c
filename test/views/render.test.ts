// The page and its fragment render for every invented case at several points of the flow, with errors, edits
// and both note formats; whatever the clinician typed comes back escaped.
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

describe('the page', () => {
  for (const [name, answers] of Object.entries(ALL_CASES)) {
    it(`${name}: page and fragment at every point of the flow`, () => {
      for (const [, state] of states(answers as Json)) {
        for (const [, p] of presentations) {
          const view = flowView(state, deps, p);
          const fragment = renderFragment(view);
          if (state.done.length === STEP_IDS.length && p === presentations[0]![1])
            expect(fragment).toContain(
              'Decision support for the licensed clinician who signs this note',
            );
          const page = renderPage(view);
          for (const html of [fragment, page]) {
            expect(html).not.toContain('<script>alert(1)');
          }
        }
      }
    });
  }

  it('the preview and the problem page escape their text', () => {
    const hostile = '<img src=x onerror=alert(1)> & "q"';
    expect(renderPreview('<p>ok</p>')).toContain('<p>ok</p>');
    for (const fragment of [true, false]) {
      const html = renderProblem(hostile, fragment);
      expect(html).not.toContain('<img');
      expect(html).toContain('&lt;img');
    }
  });
});
