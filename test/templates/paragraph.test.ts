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

// The rules as regular expressions, applied one after another: the specification the one-pass version keeps to.
const byRules = (value: unknown): string =>
  String(value ?? '')
    .replace(/\s+/g, ' ')
    .replace(/ ([,.;:)])/g, '$1')
    .replace(/\( /g, '(')
    .replace(/([.;:])(?=[A-Z])/g, '$1 ')
    .trim();

describe('paragraph() keeps to the rules written as regular expressions', () => {
  // a seeded generator over the characters that matter: spaces of several kinds, the punctuation, capitals
  const alphabet = [
    ' ',
    '  ',
    '\n',
    '\t',
    '\u00a0',
    '\u2028',
    ',',
    '.',
    ';',
    ':',
    '(',
    ')',
    'A',
    'Z',
    'a',
    '7',
    '-',
  ];
  let seed = 20261202;
  const next = () => {
    seed = (seed * 1103515245 + 12345) % 2147483648;
    return seed;
  };
  it('on 5,000 generated strings', () => {
    for (let n = 0; n < 5000; n++) {
      let s = '';
      const length = next() % 24;
      for (let i = 0; i < length; i++) s += alphabet[next() % alphabet.length];
      expect(paragraph(s), JSON.stringify(s)).toBe(byRules(s));
    }
  });
});
