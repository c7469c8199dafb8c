// The unit question at a field: a value believable only in another unit is asked about with a one-click switch.
// The windows are the table's `typical` ranges (calc/fields.ts, our own limits, common practice); the
// conversions behind each case are clinical-scope section 1 (albumin g/L = 10 x g/dL; glucose mmol/L =
// mg/dL / 18.016; 1 kPa = 7.50062 mmHg). Patients are invented.
import { describe, expect, it } from 'vitest';
import { doubtOf, keptOf, unitDoubts, withSwitch } from '../../views/unitDoubt.ts';
import { STEPS, contextOf } from '../../views/steps.ts';

describe('doubtOf: which values make sense only in another unit', () => {
  // [path, value, kind, chosen unit, expected switch (null: no question), outside the chosen unit's window]
  const cases = [
    // albumin 40 "g/dL" is 400 g/L: no adult has it; 40 g/L is a normal albumin
    ['chemistry.albumin', 40, 'albumin', 'g/dL', 'g/L', true],
    ['chemistry.albumin', 3.4, 'albumin', 'g/dL', null, false],
    // albumin 3.4 "g/L" is 0.34 g/dL: not believable; 3.4 g/dL is
    ['chemistry.albumin', 3.4, 'albumin', 'g/L', 'g/dL', true],
    // glucose 32 "mg/dL" is 1.8 mmol/L: inside the mg/dL window but below twice its floor (20), and 32 mmol/L fits
    ['chemistry.glucose', 32, 'glucose', 'mg/dL', 'mmol/L', false],
    ['chemistry.glucose', 5.4, 'glucose', 'mg/dL', 'mmol/L', true],
    ['chemistry.glucose', 110, 'glucose', 'mg/dL', null, false],
    // glucose 100 "mmol/L" is past the mmol/L window (60); 100 mg/dL is ordinary
    ['chemistry.glucose', 100, 'glucose', 'mmol/L', 'mg/dL', true],
    // a kPa gas typed under mmHg: PaCO2 6.1 "mmHg"; and an mmHg gas under kPa: PaCO2 45 "kPa" (338 mmHg)
    ['gas.pco2', 6.1, 'pressure', 'mmHg', 'kPa', true],
    ['gas.pco2', 45, 'pressure', 'kPa', 'mmHg', true],
    ['gas.pco2', 41, 'pressure', 'mmHg', null, false],
    ['gas.pco2', 5.3, 'pressure', 'kPa', null, false],
    // BUN 7 mg/dL is believable, and 7 is not below twice the floor (3): no question
    ['chemistry.urea', 7, 'urea', 'bun-mg/dL', null, false],
  ] as const;
  for (const [path, value, kind, chosen, to, outside] of cases) {
    it(`${path} ${value} ${chosen}: ${to ? `asks, switch to ${to}` : 'no question'}`, () => {
      const doubt = doubtOf(path, value, kind, chosen);
      if (to === null) expect(doubt).toBeNull();
      else expect(doubt).toMatchObject({ to, outside });
    });
  }
});

describe('unitDoubts: the questions of a step answer', () => {
  const chemistry = STEPS.chemistry.groups(contextOf({}, null));
  it('words the question, offers the switch, and offers keeping the unit only where the case accepts the value', () => {
    const answers = {
      units: { albumin: 'g/dL', glucose: 'mg/dL' },
      chemistry: { albumin: 40, glucose: 32 },
    };
    const doubts = unitDoubts(chemistry, answers, new Set());
    expect(doubts).toEqual([
      {
        path: 'chemistry.albumin',
        message: 'Albumin 40 g/dL is not a believable result in g/dL; it looks like g/L.',
        unitName: 'units.albumin',
        switchTo: 'g/L',
        switchLabel: 'This looks like g/L: switch',
        // 40 g/dL is outside the case's 0.5-7 g/dL: it cannot be kept
        keepLabel: null,
      },
      {
        path: 'chemistry.glucose',
        message: 'Glucose 32 mg/dL is unusual in mg/dL; it looks like mmol/L.',
        unitName: 'units.glucose',
        switchTo: 'mmol/L',
        switchLabel: 'This looks like mmol/L: switch',
        keepLabel: 'Keep mg/dL',
      },
    ]);
    // a value kept as entered is not asked again
    expect(unitDoubts(chemistry, answers, new Set(['chemistry.glucose']))).toHaveLength(1);
  });

  it('reads the kept paths and the switch pressed from the form', () => {
    expect([
      ...keptOf({ unitKept: 'gas.pco2 chemistry.glucose', unitKeep: 'chemistry.albumin' }),
    ]).toEqual(['gas.pco2', 'chemistry.glucose', 'chemistry.albumin']);
    expect(withSwitch({ unitSwitch: 'units.albumin=g/L', 'units.albumin': 'g/dL' })).toMatchObject({
      'units.albumin': 'g/L',
    });
    // only a unit the case knows is switched to; anything else leaves the form as sent
    for (const bad of ['units.albumin=mg/L', 'units.colour=red', 'sample=venous', '=g/L', 'g/L'])
      expect(withSwitch({ unitSwitch: bad, 'units.albumin': 'g/dL' })['units.albumin']).toBe(
        'g/dL',
      );
  });
});
