// The paste reader's labels come from calc's table of fields (FIELDS[].printed): every field with printout labels
// is read from a line as a printout writes it, in its unit. The spellings are common practice; the c-, ct- and s-
// prefixes and the (P), (B) marks are the quantity symbols of the IFCC/CLSI blood-gas recommendations (CLSI C46;
// from memory). The check value is the number written on the line. Every number is invented.
import { describe, expect, it } from 'vitest';
import { parsePaste } from '../../../server/intake/index.ts';
import { FIELDS, type FieldPath } from '../../../calc/index.ts';

// [line, field, value, unit as read, where the unit came from]
const EXAMPLES: readonly [string, FieldPath, number, string, string?][] = [
  ['pH 7.31', 'gas.ph', 7.31, '', 'implied'],
  ['pCO2 48 mmHg', 'gas.pco2', 48, 'mmHg'],
  ['PaO2 9.6 kPa', 'gas.po2', 9.6, 'kPa'],
  ['cHCO3-(P) 23.5 mmol/L', 'gas.hco3', 23.5, 'mmol/L'],
  ['BE(B) -2.1 mmol/L', 'gas.baseExcess', -2.1, 'mmol/L'],
  ['sO2 93 %', 'gas.sao2', 93, '%'],
  ['FCOHb 4.2 %', 'gas.cohb', 4.2, '%'],
  ['MetHb 1.1 %', 'gas.methb', 1.1, '%'],
  ['cLac 1.1 mmol/L', 'gas.lactate', 1.1, 'mmol/L'],
  ['ctHb 121 g/L', 'gas.hb', 121, 'g/L'],
  ['Na+ 138 mmol/L', 'chemistry.na', 138, 'mmol/L'],
  ['Potassium 4.1 mmol/L', 'chemistry.k', 4.1, 'mmol/L'],
  ['Cl- 104 mmol/L', 'chemistry.cl', 104, 'mmol/L'],
  ['Albumin 3.1 g/dL', 'chemistry.albumin', 3.1, 'g/dL'],
  ['Glucose 7.4 mmol/L', 'chemistry.glucose', 7.4, 'mmol/L'],
  ['BUN 18 mg/dL', 'chemistry.urea', 18, 'mg/dL (BUN)'],
  ['Creatinine 104 µmol/L', 'chemistry.creatinine', 104, 'µmol/L'],
  ['Osmolality 298 mOsm/kg', 'chemistry.osmolality', 298, 'mOsm/kg'],
  ['cCa2+ 1.18 mmol/L', 'chemistry.ionisedCalcium', 1.18, 'mmol/L'],
  ['Magnesium 0.82 mmol/L', 'chemistry.magnesium', 0.82, 'mmol/L'],
  ['Phosphate 1.1 mmol/L', 'chemistry.phosphate', 1.1, 'mmol/L'],
  ['FiO2 0.4', 'oxygen.fio2', 0.4, 'fraction', 'implied'],
  ['SpO2 94 %', 'oxygen.spo2', 94, '%'],
];

describe('labels from the table of fields', () => {
  it('every field with printout labels in the table has an example here', () => {
    const printed = FIELDS.filter((f) => 'printed' in f).map((f) => f.path);
    expect([...new Set(EXAMPLES.map((e) => e[1]))].sort()).toEqual([...printed].sort());
  });

  it.each(EXAMPLES)('"%s" is %s %d %s', (line, path, value, unit, unitFrom = 'text') => {
    const r = parsePaste(line);
    expect(r.questions.filter((q) => q.path !== 'sample')).toEqual([]);
    expect(r.read).toEqual([expect.objectContaining({ path, value, unit, unitFrom })]);
  });
});
