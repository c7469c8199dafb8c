// The second-round ventilator and oxygen rules in the note's words (note.full: the reasoning and the plan), for the
// invented patients of test/calc/ventilatorCases.ts; the check values are the ones worked by hand there, each with its
// source (ARDS Network 2000; Amato 2015; West; Winters 1967; BICAR-ICU 2018; PROSEVA 2013; BTS oxygen 2017).
import { describe, expect, it } from 'vitest';
import { createNoteRenderer, type Note } from '../../templates/index.ts';
import { asthma, ards, copd, embolism, septic, stiffLungs } from '../calc/ventilatorCases.ts';
import { read } from './cases.ts';
import { noteProblems, section } from './helpers.ts';

const renderer = createNoteRenderer();
const note = (c: unknown, format: 'text' | 'markdown' = 'text'): Note =>
  renderer.render(read(c), { format });
const plan = (n: Note) => section(n.full, 'PLAN (SUGGESTIONS)');
const oxygenation = (n: Note) => section(n.full, 'OXYGENATION');
const ventilation = (n: Note) => section(n.full, 'VENTILATION');

const retainer = {
  gas: { ph: 7.31, pco2: 63, po2: 165, hco3: 31.3, sao2: 99 },
  patient: { ageYears: 68, sex: 'female' },
  context: { conditions: ['copd'] },
  oxygen: { fio2: 0.6, spo2: 99 },
};
const severe = {
  gas: { ph: 7.34, pco2: 48, po2: 86, hco3: 25.5 },
  patient: { ageYears: 44, sex: 'male', heightCm: 178 },
  oxygen: { fio2: 0.8, peep: 12 },
  ventilator: { vt: 460, rr: 24, pplat: 27 },
};
const roomAir = {
  gas: { ph: 7.46, pco2: 31, po2: 61, hco3: 21.7 },
  patient: { ageYears: 39, sex: 'female' },
  oxygen: { fio2: 0.21 },
};
const smoke = {
  gas: { ph: 7.33, pco2: 34, po2: 380, hco3: 17.6, sao2: 74, cohb: 24, lactate: 4.5 },
  patient: { ageYears: 52, sex: 'male' },
  oxygen: { fio2: 0.8, spo2: 98 },
};

describe('each invented patient gives a clean note', () => {
  it.each([
    ['stiffLungs', stiffLungs],
    ['asthma', asthma],
    ['septic', septic],
    ['ards', ards],
    ['copd', copd],
    ['embolism', embolism],
    ['retainer', retainer],
    ['severe', severe],
    ['roomAir', roomAir],
    ['smoke', smoke],
  ])('%s, in text and Markdown', (_name, c) => {
    for (const format of ['text', 'markdown'] as const)
      expect(noteProblems(note(c, format))).toEqual([]);
  });
});

describe('the plan a senior would sign', () => {
  it('1. the volume route is not offered, with the predicted plateau and driving pressure', () => {
    const p = plan(note(stiffLungs));
    expect(p).toMatch(/consider RR 21\/min at the same VT/);
    expect(p).toMatch(
      /the volume route \(VT 400 mL\) is not offered because at the present compliance it would give a plateau of about 28 cmH2O and a driving pressure of about 16 cmH2O/,
    );
  });

  it('2. the rate route gives the expiratory time; asthma: check for air trapping, permissive hypercapnia usual', () => {
    const n = note(asthma);
    expect(plan(n)).toMatch(/RR 19\/min at the same VT \(expiratory time 2\.2 s\)/);
    expect(plan(n)).toMatch(
      /Before raising the rate: in known asthma .*\(3\.3 s now\).*expiratory hold or the flow trace/,
    );
    expect(plan(n)).toMatch(
      /permissive hypercapnia\) with a slow rate and a long expiratory time is the usual strategy/,
    );
  });

  it("3. Winters' target, the best setting within limits with its PaCO2 and pH, and the levers beyond the ventilator", () => {
    const p = plan(note(septic));
    expect(p).toMatch(
      /Ventilator target: PaCO2 24 mmHg, .*\(22-26 mmHg by Winters' formula\), not the 40 mmHg asked for/,
    );
    expect(p).toMatch(
      /the best within them, VT 480 mL and RR 35\/min, should give PaCO2 about 26 mmHg and pH about 7\.20/,
    );
    expect(p).toMatch(
      /Beyond the ventilator: treat the cause .*sodium bicarbonate if there is acute kidney injury; renal replacement therapy/,
    );
    expect(p).not.toMatch(/permissive hypercapnia\)/);
  });

  it('4. pH 7.18 in ARDS: the protocol steps, not permissive hypercapnia', () => {
    const p = plan(note(ards));
    expect(p).toMatch(/should give PaCO2 about 58 mmHg and pH about 7\.23/);
    expect(p).toMatch(
      /pH 7\.18 is below the ARDS Network goal of pH 7\.30: the protocol raises RR up to 35\/min/,
    );
  });

  it('5. the usual PaCO2 is the default target, with why full correction is not advised; no "re-running"', () => {
    const p = plan(note(copd));
    expect(p).toMatch(
      /Ventilator target: this patient's usual PaCO2 of 58 mmHg, not the 54 mmHg asked for: full correction to pH 7\.40/,
    );
    expect(p).toMatch(/towards 58 mmHg, consider RR 18\/min/);
    expect(p).not.toMatch(/re-running/);
  });

  it('6. a CO2 retainer on too much oxygen: reduce the FiO2 to 88-92%', () => {
    const n = note(retainer);
    expect(plan(n)).toMatch(
      /Reduce the FiO2: SpO2 99% is above the target of 88-92% for a patient at risk of hypercapnic respiratory failure/,
    );
    expect(oxygenation(n)).toMatch(
      /SpO2 target 88-92% \(at risk of hypercapnic respiratory failure/,
    );
  });

  it('7. severe hypoxaemia names prone positioning, a PEEP/FiO2 strategy and neuromuscular blockade', () => {
    const n = note(severe);
    expect(plan(n)).toMatch(
      /Severe hypoxaemia \(P\/F 108 mmHg on FiO2 0\.80, PEEP 12 cmH2O\): prone positioning for at least 16 h a day, a PEEP\/FiO2 strategy, and neuromuscular blockade/,
    );
    expect(oxygenation(n)).toMatch(/A ratio is not a diagnosis of ARDS/);
  });

  it('7. the ARDS paragraph only where it applies: not on room air without PEEP', () => {
    expect(oxygenation(note(roomAir))).not.toMatch(/diagnosis of ARDS/);
  });

  it('8. a raised A-a gradient names the mechanisms and causes; a normal one, hypoventilation or low inspired PO2', () => {
    const n = note(roomAir);
    expect(oxygenation(n)).toMatch(
      /ventilation-perfusion mismatch, shunt, or less often impaired diffusion; common causes to consider are pneumonia, atelectasis, pulmonary oedema and pulmonary embolism/,
    );
    expect(plan(n)).toMatch(/Impaired gas exchange: look for the cause/);
    const hypo = note({
      gas: { ph: 7.25, pco2: 70, po2: 55, hco3: 29.8 },
      patient: { ageYears: 40 },
      oxygen: { fio2: 0.21 },
    });
    expect(oxygenation(hypo)).toMatch(/points to hypoventilation .* or a low inspired PO2/);
  });

  it('10. COHb: the saturation gap explained, high-flow oxygen in the plan', () => {
    const n = note(smoke);
    expect(oxygenation(n)).toMatch(
      /SpO2 98% is above the measured SaO2 74% by 24%: pulse oximetry reads falsely high with carboxyhaemoglobin/,
    );
    expect(plan(n)).toMatch(/Carbon monoxide: high-flow oxygen whatever the SpO2 shows/);
  });

  it('11. the dead space from end-tidal CO2 is said to be physiological, with the alveolar VD/VT', () => {
    const v = ventilation(note(embolism));
    expect(v).toMatch(/dead space 230 mL \(physiological: .*EtCO2 29 mmHg, alveolar VD\/VT 0\.44/);
    expect(v).toMatch(/VT 410 mL/);
  });
});
