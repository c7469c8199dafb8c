// The chart-ready note (note.text) and the ISBAR handover: short enough to sign as written, with the line, a few
// bullets of assessment and plan, the cautions specific to the case, and one closing line of general caution.
import { describe, expect, it } from 'vitest';
import { interpret } from '../../calc/index.ts';
import { createNoteRenderer } from '../../templates/index.ts';
import * as C from './cases.ts';

const renderer = createNoteRenderer();
const bullets = (text: string) => text.split('\n').filter((l) => l.startsWith('- '));
const CLOSING = /^Decision support for the licensed clinician who signs this note/m;

describe('every invented case', () => {
  for (const [name, c] of Object.entries(C.ALL_CASES)) {
    const f = interpret(c);
    if (!f.ok) continue;
    it(`${name}: opens with the line, keeps to the chart-ready parts, closes with one caution line`, () => {
      const n = renderer.render(f);
      const lines = n.text.split('\n');
      expect(lines[0]).toBe(n.line);
      // only the short note's own headings: no section of the full reasoning
      const headings = lines.filter((l) => /^[A-Z][A-Za-z ]+:$/.test(l) || /^[A-Z ()]+$/.test(l));
      for (const h of headings) expect(['Assessment:', 'Plan:', 'Cautions:']).toContain(h);
      expect(n.text.match(new RegExp(CLOSING, 'gm'))).toHaveLength(1);
      expect(lines.at(-1)).toMatch(CLOSING);
      // shorter than the full reasoning, which stays one toggle away; far shorter where there is much to say
      expect(n.text.length).toBeLessThan(n.full.length);
      if (n.full.length > 2000) expect(n.text.length).toBeLessThan(n.full.length * 0.6);
      expect(bullets(n.text).length).toBeLessThanOrEqual(14);
    });
  }
});

// Invented: a 58-year-old woman, 165 cm, ventilated for pneumonia; RR raised from 18 to 24 and FiO2 lowered
// from 0.5 to 0.4 after a gas at 03:10; the team's target is pH 7.30.
const followUp = (ph: number, pco2: number, hco3: number) =>
  C.read({
    gas: { ph, pco2, hco3, po2: 88 },
    patient: { ageYears: 58, sex: 'female', heightCm: 165 },
    oxygen: { fio2: 0.4, peep: 8 },
    ventilator: { vt: 380, rr: 24, pplat: 24, targetPh: 7.3 },
    previous: [
      {
        takenAt: '2026-12-02T03:10',
        gas: { ph: 7.22, pco2: 61, hco3: 24.3 },
        ventilator: { vt: 380, rr: 18 },
        oxygen: { fio2: 0.5, peep: 8 },
      },
    ],
  });

describe('a follow-up gas', () => {
  // [H+] = 24 x 47 / 23.2 = 48.6 nmol/L, pH 7.31 (Henderson; clinical-scope section 2)
  const at = renderer.render(followUp(7.31, 47, 23.2));

  it('the line carries the trend: pH and PaCO2 then and now, the change made, the target reached', () => {
    expect(at.line).toContain(
      'since the previous gas (2026-12-02 03:10), pH 7.22 to 7.31, PaCO2 61 to 47 mmHg after RR 18 to 24/min and FiO2 0.50 to 0.40; target pH 7.30 reached.',
    );
  });

  it('at target, the plan does not chase a one-breath change', () => {
    expect(at.text).toContain(
      'At target pH 7.30: no ventilator change needed for the acid-base target.',
    );
    expect(at.text).not.toMatch(/Consider RR/);
  });

  it('the handover puts the trend in the situation', () => {
    const situation = at.handover.split('Situation:')[1]?.split('Background:')[0] ?? '';
    expect(situation).toContain(
      'Since the previous gas (2026-12-02 03:10): pH 7.22 to 7.31, PaCO2 61 to 47 mmHg',
    );
  });

  it('short of the target it says so, and the plan keeps its suggestion', () => {
    // [H+] = 24 x 55 / 23.9 = 55.2 nmol/L, pH 7.26: 0.04 below the target 7.30
    const short = renderer.render(followUp(7.26, 55, 23.9));
    expect(short.line).toContain('target pH 7.30 not yet reached');
    expect(short.text).toMatch(/Consider RR \d+\/min/);
  });
});

describe('the ISBAR handover', () => {
  it('has the five parts in order, leaves the identify line to the clinician, and closes with a caution', () => {
    for (const c of Object.values(C.ALL_CASES)) {
      const f = interpret(c);
      if (!f.ok) continue;
      const h = renderer.render(f).handover;
      const parts = h.split('\n').filter((l) => /^[A-Z][a-z]+:$/.test(l));
      expect(parts).toEqual([
        'Identify:',
        'Situation:',
        'Background:',
        'Assessment:',
        'Recommendation:',
      ]);
      expect(h).toContain('Patient and location: (to complete)');
      expect(h.trim().split('\n').at(-1)).toMatch(/^Decision support draft: verify the sample/);
    }
  });

  it('names known conditions and the usual values in the background', () => {
    const f = C.read({
      gas: { ph: 7.29, pco2: 72, hco3: 33.5 },
      context: { conditions: ['copd'], baseline: { pco2: 55, hco3: 32 } },
    });
    const background = renderer.render(f).handover.split('Background:')[1]?.split('Assessment:')[0];
    expect(background).toContain('Known COPD');
    expect(background).toContain('Usual PaCO2 55 mmHg, HCO3 32.0 mmol/L');
  });
});

describe('the plan bullets carry the ventilator and oxygen reasoning in a line each', () => {
  const short = (name: string) => {
    const f = interpret(C.ALL_CASES[name]);
    if (!f.ok) throw new Error(name);
    return renderer.render(f).text;
  };

  it('a retainer: the usual PaCO2 is the target, not the lower one asked for (clinical-scope section 10)', () => {
    expect(short('copdVentilated')).toMatch(
      /^- Consider RR \d+\/min for target PaCO2 55 mmHg \(the usual PaCO2, not the 52 mmHg asked for: full correction would leave a metabolic alkalosis\)/m,
    );
  });

  it('severe hypoxaemia on high FiO2 and PEEP: prone positioning named (PROSEVA, Guerin 2013)', () => {
    const text = short('ards');
    expect(text).toMatch(/^- Severe hypoxaemia: prone positioning/m);
    // the flag that says the same is left to the full note
    expect(text.match(/prone positioning/g)).toHaveLength(1);
  });
});
