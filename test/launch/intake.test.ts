// The record's results as the confirm view's text and back: what the text keeps and leaves out, the patient's age,
// sex and height, the earlier gases as the FHIR reader gives them, and the Observations a filed note names.
// Invented results only.
import { describe, expect, it } from 'vitest';
import { ageYears, readRecordText, recordText } from '../../server/launch/intake.ts';
import { arterialGas, obs } from './fixtures.ts';

const T = Date.parse('2026-03-02T04:10:00Z');
const at = (minutes: number) => new Date(T + minutes * 60_000).toISOString();

describe('ageYears (whole years to today, a partial date gives none)', () => {
  it.each([
    ['1962-03-02', '2026-03-02T00:00:00Z', 64],
    ['1962-03-03', '2026-03-02T00:00:00Z', 63],
    ['2000-02-29', '2026-02-28T12:00:00Z', 25],
    ['2000-02-29', '2026-03-01T00:00:00Z', 26],
    ['1962-03', '2026-03-02T00:00:00Z', null],
    ['1962', '2026-03-02T00:00:00Z', null],
  ] as const)('born %s, on %s: %s', (born, now, age) => {
    expect(ageYears(born, new Date(now))).toBe(age);
  });
});

describe('the record as text and back', () => {
  const patient = {
    resourceType: 'Patient',
    id: 'p',
    gender: 'female',
    birthDate: '1970-01-01',
    name: [{ text: 'Not Copied' }],
  };
  const height = obs('p', '8302-2', 5.5, '[ft_i]', at(-9000));

  it('keeps no name, performer or subject in the text, and reads back the same gas and patient', () => {
    const text = recordText(patient, [
      ...arterialGas('p', at(0), { ph: 7.3, pco2: 50, hco3: 24 }),
      height,
    ]);
    expect(text).not.toContain('Not Copied');
    expect(text).not.toContain('Invented Lab');
    expect(text).not.toContain('subject');
    const read = readRecordText(text, new Date(T));
    expect(read.intake.case.gas).toMatchObject({ ph: 7.3, pco2: 50, hco3: 24 });
    expect(read.intake.case.patient).toEqual({ ageYears: 56, sex: 'female' });
    // a height in feet is not among the units read: said, not guessed
    expect(read.notes.join(' ')).toMatch(/height could not be used/);
  });

  it('converts a height in inches (UCUM [in_i], 2.54 cm exactly) and metres', () => {
    for (const [value, unit, cm] of [
      [65, '[in_i]', 165],
      [1.72, 'm', 172],
    ] as const) {
      const text = recordText(patient, [
        ...arterialGas('p', at(0), { ph: 7.3, pco2: 50, hco3: 24 }),
        obs('p', '8302-2', value, unit, at(-100)),
      ]);
      expect(readRecordText(text, new Date(T)).intake.case.patient).toMatchObject({ heightCm: cm });
    }
  });

  it('leaves out earlier gases beyond the paste limit, oldest first', () => {
    const many = Array.from({ length: 60 }, (_, i) =>
      arterialGas('p', at(-30 * (i + 1)), {
        ph: 7.3,
        pco2: 50,
        hco3: 24,
        po2: 80,
        be: 0,
        lactate: 1,
      }),
    ).flat();
    const text = recordText(patient, [
      ...arterialGas('p', at(0), { ph: 7.3, pco2: 50, hco3: 24 }),
      ...many,
    ]);
    expect(text.length).toBeLessThanOrEqual(50_000);
    const read = readRecordText(text, new Date(T));
    expect(read.earlier.length).toBeGreaterThan(0);
    expect(read.earlier.length).toBeLessThanOrEqual(20);
    // the newest earlier gases are the ones kept; whole gases leave, never half of one
    expect(read.earlier.at(-1)!).toContain(at(-30).slice(0, 16).replace('T', ' '));
    expect(read.intake.notes.join(' ')).not.toMatch(/not a whole gas/);
  });

  it("the earlier gases are the FHIR reader's previous gases, and related names the Observations read, not the rest", () => {
    const gasNow = arterialGas('p', at(0), { ph: 7.29, pco2: 62, hco3: 29 });
    const gasBefore = arterialGas('p', at(-360), { ph: 7.24, pco2: 71, hco3: 29.5 });
    const farChemistry = obs('p', '2951-2', 140, 'mmol/L', at(-45)); // not of any gas's time
    const text = recordText(patient, [...gasNow, ...gasBefore, farChemistry]);
    const read = readRecordText(text, new Date(T));
    expect(read.intake.case.previous).toEqual([
      {
        takenAt: expect.stringContaining(at(-360).slice(0, 16)),
        gas: { ph: 7.24, pco2: 71, hco3: 29.5 },
      },
    ]);
    expect(read.earlier).toEqual([
      `${at(-360).slice(0, 16).replace('T', ' ')}${read.earlier[0]!.slice(16)}`,
    ]);
    expect(read.earlier[0]).toMatch(/pH 7\.24, PCO2 71 mmHg, HCO3 29\.5 mmol\/L/);
    const ids = (list: Record<string, unknown>[]) => list.map((o) => `Observation/${String(o.id)}`);
    expect(new Set(read.related)).toEqual(new Set([...ids(gasNow), ...ids(gasBefore)]));
  });
});
