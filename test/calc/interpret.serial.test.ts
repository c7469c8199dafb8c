// Serial gases: what changed since the last gas, and whether the new PaCO2 followed a ventilator change as
// the alveolar ventilation equation predicts (West, Respiratory Physiology: at constant VCO2,
// VA1 x PaCO2_1 = VA2 x PaCO2_2).
import { describe, expect, it } from 'vitest';
import { gasTime, inTimeOrder, interpret, type Findings } from '../../calc/index.ts';

const read = (c: unknown): Findings => {
  const f = interpret(c);
  if (!f.ok) throw new Error(JSON.stringify(f.errors));
  return f;
};

// Invented: a 58-year-old man, 178 cm, ventilated after abdominal surgery; RR raised from 14 to 20 at VT 480.
const man = { sex: 'male', heightCm: 178, ageYears: 58 } as const;
const before = {
  takenAt: '2026-05-10T02:00',
  gas: { ph: 7.26, pco2: 58, hco3: 25.3 },
  ventilator: { vt: 480, rr: 14 },
};
const after = (pco2: number, ph: number, hco3: number) => ({
  gas: { ph, pco2, hco3 },
  patient: man,
  oxygen: { fio2: 0.4, peep: 8 },
  ventilator: { vt: 480, rr: 20 },
  previous: [before],
});

describe('changes since the last gas', () => {
  it('lists each value before and after, with the change', () => {
    const f = read(after(41, 7.38, 23.8));
    expect(f.changes.find((x) => x.field === 'pco2')).toEqual({
      field: 'pco2',
      from: 58,
      to: 41,
      change: -17,
    });
    expect(f.changes.find((x) => x.field === 'ph')?.change).toBeCloseTo(0.12, 10);
  });

  it('the latest earlier gas by takenAt is the one compared, whatever the order entered', () => {
    const older = {
      takenAt: '2026-05-09T22:00',
      gas: { ph: 7.2, pco2: 66, hco3: 25.3 },
      ventilator: { vt: 480, rr: 12 },
    };
    const f = read({ ...after(41, 7.38, 23.8), previous: [before, older] });
    expect(f.serial?.last.takenAt).toBe('2026-05-10T02:00');
    expect(f.previous.map((p) => p.takenAt)).toEqual(['2026-05-09T22:00', '2026-05-10T02:00']);
  });
});

describe('predicted against observed PaCO2 after a ventilator change', () => {
  it('RR 14 -> 20 at the same VT: predicted 58 x 14 / 20 = 40.6 mmHg; observed 41 is as predicted', () => {
    const f = read(after(41, 7.38, 23.8));
    expect(f.serial?.ventilatorChanged).toBe(true);
    expect(f.serial?.prediction?.verdict).toBe('as_predicted');
    expect(f.derived.predictedPco2).toBeCloseTo(40.6, 1);
    expect(f.explain.predictedPco2?.source).toMatch(/West/);
  });

  it('observed well above the prediction (49 against 40.6): higher, pointing to more CO2 production or dead space', () => {
    const f = read(after(49, 7.31, 24.3));
    expect(f.serial?.prediction?.verdict).toBe('higher');
    expect(f.serial?.prediction?.difference).toBeCloseTo(8.4, 1);
  });

  it('observed well below the prediction (33 against 40.6): lower', () => {
    expect(read(after(33, 7.47, 23.4)).serial?.prediction?.verdict).toBe('lower');
  });

  it('a VT change needs the dead space: VD = 2.2 x PBW 73.0 = 161 mL (Radford 1955, from memory)', () => {
    // PBW = 50 + 0.91 x (178 - 152.4) = 73.3 kg; VD 161 mL; VA before 14 x (480 - 161) = 4.47 L/min,
    // after 14 x (560 - 161) = 5.59 L/min; predicted 58 x 4.47 / 5.59 = 46.4 mmHg
    const f = read({ ...after(46, 7.33, 23.9), ventilator: { vt: 560, rr: 14 } });
    expect(f.serial?.prediction?.predicted).toBeCloseTo(
      (58 * (480 - 2.2 * 73.296)) / (560 - 2.2 * 73.296),
      6,
    );
    expect(f.derived.predictedPco2).toBeCloseTo(46.4, 1);
  });

  it('a VT change without height or sex: the prediction is unavailable, and says why', () => {
    const f = read({ ...after(46, 7.33, 23.9), patient: null, ventilator: { vt: 560, rr: 14 } });
    expect(f.serial?.prediction).toBeNull();
    expect(f.serial?.predictionUnavailable).toBe('dead_space_unknown');
  });

  it('unchanged settings: nothing to predict', () => {
    const f = read({ ...after(50, 7.3, 24.1), ventilator: { vt: 480, rr: 14 } });
    expect(f.serial?.predictionUnavailable).toBe('settings_unchanged');
  });

  it('an earlier gas without its settings: the prediction is unavailable', () => {
    const f = read({ ...after(41, 7.38, 23.8), previous: [{ gas: before.gas }] });
    expect(f.serial?.predictionUnavailable).toBe('settings_missing');
  });
});

describe('gases in time order (one function for the note, the chart and the page)', () => {
  it('"2026-03-02 04:10" and "2026-03-02T04:10" are the same moment; a date alone is its midnight (ISO 8601 date and time, space or T)', () => {
    expect(gasTime('2026-03-02 04:10')).toBe(gasTime('2026-03-02T04:10'));
    expect(gasTime('2026-03-02')).toBe(Date.UTC(2026, 2, 2));
    expect(gasTime('yesterday night')).toBeNull();
    expect(gasTime(null)).toBeNull();
  });

  it('orders a space-separated and a T-separated time by the time, not by the character between date and time', () => {
    // compared as text, "2026-03-02 04:10" sorts before "2026-03-02T03:00" (a space is below "T"): the wrong order
    const gases = [{ takenAt: '2026-03-02 04:10' }, { takenAt: '2026-03-02T03:00' }];
    expect(inTimeOrder(gases).map((g) => g.takenAt)).toEqual([
      '2026-03-02T03:00',
      '2026-03-02 04:10',
    ]);
  });

  it('keeps the order entered when a gas has no time it can place', () => {
    const gases = [{ takenAt: '2026-03-02T05:00' }, { takenAt: 'after the bronchoscopy' }];
    expect(inTimeOrder(gases)).toEqual(gases);
  });

  it('the note compares the latest earlier gas by time, whichever way its time is written', () => {
    const f = read({
      ...after(41, 7.38, 23.8),
      previous: [
        { ...before, takenAt: '2026-05-10 03:10', gas: { ph: 7.3, pco2: 50, hco3: 24.2 } },
        { ...before, takenAt: '2026-05-10T02:00' },
      ],
    });
    expect(f.serial?.last.takenAt).toBe('2026-05-10 03:10');
    expect(f.changes.find((x) => x.field === 'pco2')?.from).toBe(50);
  });
});

describe('what changed in the settings, and whether the target was reached', () => {
  it('lists only the settings known at both gases that differ, rate first', () => {
    const f = read({
      ...after(41, 7.38, 23.8),
      previous: [{ ...before, oxygen: { fio2: 0.5, peep: 8 } }],
    });
    // RR 14 -> 20 and FiO2 0.5 -> 0.4 changed; VT 480 and PEEP 8 did not
    expect(f.serial?.settingChanges).toEqual([
      { field: 'rr', from: 14, to: 20 },
      { field: 'fio2', from: 0.5, to: 0.4 },
    ]);
  });

  it('a setting not recorded at the earlier gas is not a change', () => {
    expect(read(after(41, 7.38, 23.8)).serial?.settingChanges).toEqual([
      { field: 'rr', from: 14, to: 20 },
    ]);
  });

  // "at target": within 0.02 of a target pH or 2 mmHg of a target PaCO2 (common practice, from memory)
  it.each([
    [7.38, 7.4, true],
    [7.42, 7.4, true],
    [7.37, 7.4, false],
  ])('pH %s against a target pH %s: reached %s', (ph, targetPh, reached) => {
    const c = after(41, ph, 23.8);
    const f = read({ ...c, ventilator: { ...c.ventilator, targetPh } });
    expect(f.serial?.target).toEqual({ kind: 'ph', value: targetPh, reached });
  });

  it('a target PaCO2 is judged when no target pH is set', () => {
    const c = after(43, 7.36, 23.8);
    const f = read({ ...c, ventilator: { ...c.ventilator, targetPco2: 40 } });
    // 43 is 3 mmHg from 40, beyond the 2 mmHg counted as at target
    expect(f.serial?.target).toEqual({ kind: 'pco2', value: 40, reached: false });
  });

  it('no target set: nothing to judge', () => {
    expect(read(after(41, 7.38, 23.8)).serial?.target).toBeNull();
  });
});
