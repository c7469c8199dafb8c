// The page's steps come from calc's table of fields: every row with a `step` is asked in that step's form, in
// table order, the `optional` rows under the step's "if you have them" legend, with the page's label (`ask` or
// `label`), and a value with a choice of units offers calc's accepted units. The expectations are read from the
// table itself (calc/index.ts), so a row added there is checked here with no change to this file.
import { describe, expect, it } from 'vitest';
import { FIELDS, units, type FieldSpec } from '../../calc/index.ts';
import { createNoteRenderer } from '../../templates/index.ts';
import { flowView, renderFragment } from '../../views/render.ts';
import { STEP_IDS, STEPS, contextOf, ownedPaths, type StepId } from '../../views/steps.ts';
import { openStep, unescapeHtml } from '../server/pageHtml.ts';

const deps = { renderer: createNoteRenderer() };
const ROWS = (FIELDS as readonly FieldSpec[]).filter((f) => f.step);

// an invented ventilated patient, so that every step (the ventilator's too) can be opened
const answers = {
  sample: 'arterial',
  units: { pressure: 'mmHg' },
  gas: { ph: 7.31, pco2: 48, po2: 72, hco3: 23.5 },
  oxygen: { fio2: 0.4, peep: 8 },
  ventilator: { vt: 450, rr: 16 },
  patient: { ageYears: 64, sex: 'female' },
};

/** The open form of a step as the page renders it. */
function formOf(step: StepId, sample = 'arterial'): string {
  const state = { answers: { ...answers, sample }, done: [...STEP_IDS], format: 'text' as const };
  const html = openStep(renderFragment(flowView(state, deps, { open: step })));
  expect(html, `the ${step} step is open`).toContain(`id="step-${step}"`);
  return html;
}

const inputAt = (html: string, path: string) => html.indexOf(`name="${path}"`);
const labelOf = (html: string, path: string) =>
  unescapeHtml(
    html.match(
      new RegExp(`<label class="field-label" for="f-${path.replace(/\./g, '-')}">([^<]*)`),
    )?.[1] ?? '',
  ).trim();

describe('the steps derive from the table of fields', () => {
  it('has rows for every step that asks numbers (the table is not empty)', () => {
    const steps = new Set(ROWS.map((f) => f.step));
    for (const id of ['gas', 'chemistry', 'timing', 'oxygen', 'ventilator', 'patient'] as const)
      expect(steps.has(id), id).toBe(true);
  });

  for (const id of STEP_IDS) {
    const rows = ROWS.filter((f) => f.step === id);
    if (!rows.length) continue;
    it(`${id}: every row with step "${id}" is in its form, in table order, optional ones under the legend`, () => {
      const html = formOf(id);
      const legend = html.indexOf('<legend class="group-legend">');
      let last = -1;
      for (const required of [false, true]) {
        for (const f of rows.filter((r) => !!r.optional === required)) {
          const at = inputAt(html, f.path);
          expect(at, `${f.path} asked`).toBeGreaterThan(-1);
          expect(at, `${f.path} in table order`).toBeGreaterThan(last);
          last = at;
          if (f.optional) expect(at, `${f.path} under the legend`).toBeGreaterThan(legend);
          else if (legend >= 0) expect(at, `${f.path} before the legend`).toBeLessThan(legend);
          expect(labelOf(html, f.path), `${f.path} label`).toBe(f.ask ?? f.label);
        }
      }
      if (!rows.some((r) => r.optional)) expect(html).not.toContain('If you have');
    });
  }

  it('a value with a choice of units offers the accepted units of its kind; a pressure shows the case unit', () => {
    for (const f of ROWS.filter((r) => r.quantity)) {
      const html = formOf(f.step!);
      if (f.quantity === 'pressure') {
        // one pressure unit for the whole case, chosen on the gas step and shown beside each pressure
        expect(html).not.toContain('name="units.pressure" class');
        expect(html).toMatch(
          new RegExp(
            `for="f-${f.path.replace(/\./g, '-')}">[^<]*<span class="unit[^"]*"[^>]*>mmHg<`,
          ),
        );
        continue;
      }
      const select = html.match(
        new RegExp(
          `<select class="unit-select" id="f-units-${f.quantity}" name="units\\.${f.quantity}">([\\s\\S]*?)</select>`,
        ),
      )?.[1];
      expect(select, `${f.path} unit choice`).toBeDefined();
      const offered = [...select!.matchAll(/<option value="([^"]*)"/g)].map((m) => m[1]);
      expect(offered, f.path).toEqual(Object.keys(units.QUANTITIES[f.quantity!].units));
    }
  });

  it('the oxygenation values are asked of an arterial sample only', () => {
    for (const sample of ['venous', 'capillary']) {
      const gas = formOf('gas', sample);
      expect(inputAt(gas, 'gas.ph')).toBeGreaterThan(-1);
      for (const path of ['gas.po2', 'gas.sao2']) expect(inputAt(gas, path), path).toBe(-1);
      const oxygen = formOf('oxygen', sample);
      for (const path of ['oxygen.fio2', 'oxygen.spo2'])
        expect(inputAt(oxygen, path), path).toBe(-1);
      expect(labelOf(gas, 'gas.pco2')).toBe(sample === 'venous' ? 'PvCO2' : 'PcCO2');
    }
  });

  it('the forms own exactly the rows with a step, their unit choices and the step table choices', () => {
    const owned = new Set(
      STEP_IDS.flatMap((id) => ownedPaths(STEPS[id].groups(contextOf(answers, true)))),
    );
    for (const f of ROWS) expect(owned.has(f.path), f.path).toBe(true);
    const numbers = [...owned].filter((p) =>
      /^(gas|chemistry|context|oxygen|ventilator|patient)\./.test(p),
    );
    const choices = ['context.timing', 'context.conditions', 'patient.sex', 'patient.pregnant'];
    expect(numbers.filter((p) => !choices.includes(p)).sort()).toEqual(
      ROWS.map((f) => f.path).sort(),
    );
  });
});

describe('weeks of pregnancy are asked only when they can change the reading', () => {
  const weeksAsked = (patient: Record<string, unknown>) =>
    ownedPaths(STEPS.patient.groups(contextOf({ sample: 'arterial', patient }, true))).includes(
      'patient.pregnancyWeeks',
    );

  it('asked for a woman, or when sex is not known, unless she is said not to be pregnant', () => {
    expect(weeksAsked({})).toBe(true);
    expect(weeksAsked({ sex: 'female', pregnant: true })).toBe(true);
    expect(weeksAsked({ sex: 'female', pregnant: false })).toBe(false);
    expect(weeksAsked({ sex: 'male' })).toBe(false);
  });
});
