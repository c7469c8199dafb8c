// The paragraph tidier (our own rule: whitespace runs to one space, none before , . ; : ) or after (, a space
// after . ; : before a capital, trimmed).
import { describe, expect, it } from 'vitest';
import { paragraph } from '../../templates/index.ts';

describe('paragraph()', () => {
  it.each([
    ['  pH 7.31 ,  PaCO2 48 mmHg .Next sentence ', 'pH 7.31, PaCO2 48 mmHg. Next sentence'],
    ['( up 1 mmol/L per 10 mmHg )', '(up 1 mmol/L per 10 mmHg)'],
    ['within it.So compensation', 'within it. So compensation'],
    ['a\n\t\u00a0b\u2028c', 'a b c'],
    ['HCO3 23.5 mmol/L', 'HCO3 23.5 mmol/L'],
    ['', ''],
    [null, ''],
  ])('%j', (input, expected) => {
    expect(paragraph(input)).toBe(expected);
  });
});
