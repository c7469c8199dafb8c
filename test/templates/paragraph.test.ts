// The one-pass paragraph tidier gives exactly what its regular-expression definition gives (our own rule:
// whitespace runs to one space, none before , . ; : ) or after (, a space after . ; : before a capital, trimmed).
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { paragraph, WHITESPACE_CODES } from '../../templates/index.ts';

const definition = (v: unknown) =>
  String(v ?? '')
    .replace(/\s+/g, ' ')
    .replace(/\s+([,.;:)])/g, '$1')
    .replace(/\(\s+/g, '(')
    .replace(/([.;:])(?=[A-Z])/g, '$1 ')
    .trim();

const RUNS =
  Number.parseInt(process.env.FC_RUNS ?? '', 10) > 0
    ? Number.parseInt(process.env.FC_RUNS as string, 10)
    : 2000;

describe('paragraph()', () => {
  it('matches its definition on random text made of the characters that matter', () => {
    const unit = fc.constantFrom(
      ' ',
      '  ',
      '\n',
      '\t',
      '\u00a0',
      '\u2003',
      '\u3000',
      'a',
      'B',
      'Z',
      '7',
      '.',
      ',',
      ';',
      ':',
      '(',
      ')',
      'µ',
    );
    fc.assert(
      fc.property(fc.string({ unit, maxLength: 60 }), (t) => paragraph(t) === definition(t)),
      { numRuns: RUNS * 20 },
    );
  });

  it("counts as whitespace exactly the code units a regular expression's \\s matches (ECMAScript WhiteSpace and LineTerminator)", () => {
    const matched: number[] = [];
    for (let c = 0; c < 65536; c++) if (/\s/.test(String.fromCharCode(c))) matched.push(c);
    expect(WHITESPACE_CODES).toEqual(matched);
  });

  it('matches its definition on long random text with every kind of whitespace', () => {
    const unit = fc.constantFrom(
      ' ',
      ' ',
      ' ',
      '\n',
      '\n  ',
      '\t',
      '\u00a0',
      '\u2028',
      '\ufeff',
      'word',
      'Capital',
      '7.31',
      '.',
      ',',
      ';',
      ':',
      '(',
      ')',
      'é',
    );
    fc.assert(
      fc.property(fc.string({ unit, maxLength: 400 }), (t) => paragraph(t) === definition(t)),
      { numRuns: RUNS },
    );
  });

  it.each([
    ['  pH 7.31 ,  PaCO2 48 mmHg .Next sentence ', 'pH 7.31, PaCO2 48 mmHg. Next sentence'],
    ['( up 1 mmol/L per 10 mmHg )', '(up 1 mmol/L per 10 mmHg)'],
    ['within it.So compensation', 'within it. So compensation'],
    ['', ''],
  ])('%j', (input, expected) => {
    expect(paragraph(input)).toBe(expected);
    expect(definition(input)).toBe(expected);
  });
});
