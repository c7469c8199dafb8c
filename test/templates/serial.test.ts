// The note on a follow-up gas: what changed and by how much, and whether the PaCO2 followed the ventilator
// change as the alveolar ventilation equation predicts (West: VA1 x PaCO2_1 = VA2 x PaCO2_2).
import { describe, expect, it } from 'vitest';
import { interpret, type Findings } from '../../calc/index.ts';
import { createNoteRenderer } from '../../templates/index.ts';

const renderer = createNoteRenderer();
const read = (c: unknown): Findings => {
  const f = interpret(c);
  if (!f.ok) throw new Error(JSON.stringify(f.errors));
  return f;
};
// Invented: ventilated after surgery, RR raised from 14 to 20 at VT 480 mL.
const man = { sex: 'male', heightCm: 178, ageYears: 58 };
const before = {
  takenAt: '2026-05-10T02:00',
  gas: { ph: 7.26, pco2: 58, hco3: 25.3 },
  ventilator: { vt: 480, rr: 14 },
};
const followUp = (pco2: number, ph: number, hco3: number, extra: object = {}) =>
  read({
    gas: { ph, pco2, hco3 },
    patient: man,
    oxygen: { fio2: 0.4, peep: 8 },
    ventilator: { vt: 480, rr: 20 },
    previous: [before],
    ...extra,
  });

describe('follow-up gas in the note', () => {
  it('says what changed and by how much', () => {
    const text = renderer.render(followUp(41, 7.38, 23.8)).full;
    expect(text).toContain(
      'Since the previous gas (2026-05-10 02:00): pH 7.26 to 7.38 (+0.12), PaCO2 58 to 41 mmHg (-17 mmHg)',
    );
  });

  it('a PaCO2 as predicted (58 x 14 / 20 = 40.6 mmHg) is said to match', () => {
    const text = renderer.render(followUp(41, 7.38, 23.8)).full;
    expect(text).toContain(
      'predicted a PaCO2 of about 41 mmHg, and the measured 41 mmHg matches it',
    );
  });

  it('a higher PaCO2 names the likely reasons', () => {
    const text = renderer.render(followUp(49, 7.31, 24.3)).full;
    expect(text).toMatch(
      /measured 49 mmHg is higher: CO2 production may have risen .* dead space increased/,
    );
  });

  it('a lower PaCO2 names the likely reasons', () => {
    expect(renderer.render(followUp(33, 7.47, 23.4)).full).toMatch(
      /is lower: CO2 production may have fallen/,
    );
  });

  it('in kPa the prediction is in kPa', () => {
    const kpa = (mmHg: number) => mmHg / 7.50062;
    const f = read({
      units: { pressure: 'kPa' },
      gas: { ph: 7.38, pco2: kpa(41), hco3: 23.8 },
      patient: man,
      oxygen: { fio2: 0.4, peep: 8 },
      ventilator: { vt: 480, rr: 20 },
      previous: [{ ...before, gas: { ...before.gas, pco2: kpa(58) } }],
    });
    const text = renderer.render(f).full;
    expect(text).toContain('predicted a PaCO2 of about 5.4 kPa');
    expect(text).not.toMatch(/\d mmHg/);
  });
});
