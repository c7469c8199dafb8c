// numberText prints a rounded value as its shortest decimal; that must be exactly toFixed with the trailing
// zeros (and a bare point) dropped, which is how the note has always shown numbers. Rounding half away from
// zero for positives follows Math.round (ECMAScript), as before.
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { numberText } from '../../templates/format.ts';

const definition = (value: number, decimals: number): string => {
  const f = 10 ** decimals;
  let rounded = Math.round(value * f) / f;
  if (rounded === 0) rounded = 0;
  const text = rounded.toFixed(decimals);
  return decimals === 0 ? text : text.replace(/\.?0+$/, '');
};

describe('numberText', () => {
  it('equals toFixed without trailing zeros, for any value the note could show', () => {
    fc.assert(
      fc.property(
        fc.double({ min: -100_000, max: 100_000, noNaN: true }),
        fc.integer({ min: 0, max: 3 }),
        (value, decimals) => {
          expect(numberText(value, decimals)).toBe(definition(value, decimals));
        },
      ),
      { numRuns: 20_000 },
    );
  });

  it.each([
    [7.3, 2, false, '7.3'],
    [7.3, 2, true, '7.30'],
    [-0.04, 1, false, '0'],
    [23.456, 1, false, '23.5'],
    [0.0004, 3, false, '0'],
    [180, 0, false, '180'],
    [1e-7, 2, false, '0'],
    [12.0, 1, false, '12'],
  ])('%d to %d places (fixed %s) is %s', (value, decimals, fixed, expected) => {
    expect(numberText(value, decimals, fixed)).toBe(expected);
  });

  it('nothing for a value that is not a finite number', () => {
    for (const value of [null, undefined, Number.NaN, Number.POSITIVE_INFINITY])
      expect(numberText(value, 1)).toBeNull();
  });
});
