// Grouping the record's Observations into gases by time, and the patient read from the record: table-driven, with
// invented results. The 5-minute sample window is the FHIR reader's own; the hour for chemistry is our own limit.
import { describe, expect, it } from 'vitest';
import { groupGases } from '../../server/launch/gases.ts';
import { ageYears, readRecordText, recordText } from '../../server/launch/intake.ts';
import { arterialGas, obs } from './fixtures.ts';

const T = Date.parse('2026-03-02T04:10:00Z');
const at = (minutes: number) => new Date(T + minutes * 60_000).toISOString();
const ids = (list: { resource: Record<string, unknown> }[]) => list.map((p) => p.resource.code);

describe('groupGases', () => {
  it('takes the newest sample, values within 5 minutes of it, and chemistry within the hour (the nearest one)', () => {
    const g = groupGases([
      ...arterialGas('p', at(0), { ph: 7.3, pco2: 50, hco3: 24 }),
      obs('p', '2019-8', 51, 'mm[Hg]', at(-3)), // same sample, 3 minutes apart
      obs('p', '2951-2', 140, 'mmol/L', at(-50)),
      obs('p', '2951-2', 139, 'mmol/L', at(-20)), // the nearer sodium wins
      obs('p', '2075-0', 100, 'mmol/L', at(-75)), // more than an hour: not of this gas
      obs('p', '2518-9', 2.0, 'mmol/L', at(-20)), // lactate is the analyser's: 20 minutes is another sample
      ...arterialGas('p', at(-240), { ph: 7.25, pco2: 60, hco3: 26 }),
    ]);
    expect(g.newestTime).toBe(T);
    expect(g.newest).toHaveLength(5);
    expect(
      g.newest
        .filter((p) => p.paths.includes('chemistry.na'))
        .map((p) => (p.resource.valueQuantity as { value: number }).value),
    ).toEqual([139]);
    expect(g.newest.some((p) => p.paths.includes('chemistry.cl'))).toBe(false);
    expect(g.newest.some((p) => p.paths.includes('gas.lactate'))).toBe(false);
    expect(g.earlier).toHaveLength(1);
    expect(g.earlier[0]!.time).toBe(T - 240 * 60_000);
    expect(ids(g.earlier[0]!.observations)).toHaveLength(3);
  });

  it('orders earlier gases oldest first and sets aside results without a time', () => {
    const g = groupGases([
      ...arterialGas('p', at(-60), { ph: 7.31, pco2: 48 }),
      ...arterialGas('p', at(0), { ph: 7.35, pco2: 44 }),
      ...arterialGas('p', at(-600), { ph: 7.28, pco2: 55 }),
      { ...obs('p', '2744-1', 7.4, '[pH]', at(0)), effectiveDateTime: undefined },
    ]);
    expect(g.earlier.map((e) => e.time)).toEqual([T - 600 * 60_000, T - 60 * 60_000]);
    expect(g.untimed).toHaveLength(1);
  });

  it('without a gas there is nothing newest, whatever chemistry there is', () => {
    const g = groupGases([obs('p', '2951-2', 140, 'mmol/L', at(0))]);
    expect(g.newest).toEqual([]);
    expect(g.newestTime).toBeNull();
  });
});

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
    expect(read.earlier.at(-1)!.line).toContain(at(-30).slice(0, 16).replace('T', ' '));
  });
});
