// Serial gases in one order: the note, the H+/CO2 chart and the page's log of earlier gases all place the gases by
// the time they were taken (calc's inTimeOrder), however the time is written. "2026-03-02 04:10" and
// "2026-03-02T03:00" are ISO 8601 date-times (the space for the "T" as RFC 3339 section 5.6 allows): 03:00 comes
// first, whatever order they were entered in. The patient is invented; each gas fits the Henderson equation,
// [H+] = 24 x PaCO2 / HCO3 with [H+] = 10^(9 - pH) (textbook; clinical-scope section 2).
import { describe, expect, it } from 'vitest';
import { createNoteRenderer } from '../../templates/index.ts';
import { flowView } from '../../views/render.ts';
import { STEP_IDS } from '../../views/steps.ts';

// 03:00: [H+] = 24 x 61 / 22 = 66.5 nmol/L, pH 7.18; 04:10: 24 x 55 / 24 = 55.0, pH 7.26; now: 24 x 50 / 25 = 48.0, pH 7.32
const EARLY = { takenAt: '2026-03-02T03:00', gas: { ph: 7.18, pco2: 61, hco3: 22 } };
const LATER = { takenAt: '2026-03-02 04:10', gas: { ph: 7.26, pco2: 55, hco3: 24 } };
const answers = {
  sample: 'arterial',
  units: { pressure: 'mmHg' },
  gas: { ph: 7.32, pco2: 50, po2: 84, hco3: 25 },
  oxygen: { fio2: 0.35 },
  patient: { ageYears: 58, pregnant: false },
};

function pageOf(previous: unknown[]) {
  const state = { answers: { ...answers, previous }, done: [...STEP_IDS], format: 'text' as const };
  const view = flowView(state, { renderer: createNoteRenderer() });
  if (!view.draft?.chart) throw new Error('no draft with a chart');
  const log = (
    view.items as { type: string; title: string; when: string | null; phrases: string[] }[]
  ).filter((i) => i.type === 'earlier');
  return { note: view.draft.text, chart: view.draft.chart, log };
}

describe('serial gases in one order', () => {
  for (const [entered, previous] of [
    ['the later gas entered first', [LATER, EARLY]],
    ['in time order', [EARLY, LATER]],
  ] as const) {
    it(`note, chart and page agree: ${entered}`, () => {
      const { note, chart, log } = pageOf([...previous]);
      // the note compares with the gas just before this one: 04:10
      expect(note).toContain('Since the previous gas (2026-03-02 04:10):');
      expect(note).toMatch(/pH 7\.26 to 7\.32/);
      // the chart numbers the gases oldest first and joins them 1 -> 2 -> 3: 03:00, then 04:10, then now
      const lines = chart.lines.join('\n');
      expect(lines).toContain('oldest first, by time taken');
      expect(lines).toMatch(/Gas 1 of 3, taken 2 Mar 2026 03:00: pH 7\.18/);
      expect(lines).toMatch(/Gas 2 of 3, taken 2 Mar 2026 04:10: pH 7\.26/);
      expect(lines).toMatch(/Today's gas \(3 of 3\): pH 7\.32/);
      expect(chart.svg).toContain('data-from="1" data-to="2"');
      expect(chart.svg).toContain('data-from="2" data-to="3"');
      // the page's log of earlier gases reads them in the same order
      expect(log.map((g) => [g.title, g.when])).toEqual([
        ['Earlier gas 1 of 2', '2026-03-02 03:00'],
        ['Earlier gas 2 of 2', '2026-03-02 04:10'],
      ]);
      // written as the note writes them: pH with two decimals, HCO3 with one (24 typed reads 24.0)
      expect(log[1]?.phrases).toContain('HCO3 24.0 mmol/L');
      expect(log[0]?.phrases).toContain('pH 7.18');
    });
  }
});
