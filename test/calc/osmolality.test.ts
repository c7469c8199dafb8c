// Osmolar gap and lactate bands (calc/osmolality.ts).
import { describe, expect, it } from 'vitest';
import { units } from '../../calc/index.ts';
import { osmolality } from '../../calc/index.ts';

const {
  calculatedOsmolality,
  calculatedOsmolalityConventional,
  lactateBand,
  osmolarGap,
  osmolarGapRaised,
} = osmolality;

const conventional = units.DEFAULT_UNITS; // glucose, BUN and ethanol in mg/dL
const glucoseMgDlToMmolL = (v: number) => units.toCanonical('glucose', v, conventional);
const bunMgDlToUreaMmolL = (v: number) => units.toCanonical('urea', v, conventional);
const ethanolMgDlToMmolL = (v: number) => units.toCanonical('ethanol', v, conventional);

describe('calculated osmolality (Purssell et al. 2001; clinical-scope section 5)', () => {
  it.each([
    [140, 5, 5, null, 290, 'by hand: 280 + 5 + 5'],
    [130, 30, 20, null, 310, 'hyperglycaemia and uraemia: 260 + 30 + 20'],
    [140, 5, 5, ethanolMgDlToMmolL(100), 317.027, 'ethanol 100 mg/dL adds 100 / 3.7 = 27.03'],
  ])(
    'SI: Na %s, glucose %s, urea %s mmol/L, ethanol %s mmol/L: %s (%s)',
    (na, glucose, urea, ethanol, osm, _how) => {
      expect(calculatedOsmolality(na, glucose, urea, ethanol)).toBeCloseTo(osm, 2);
    },
  );

  it.each([
    [140, 90, 14, null, 290, 'by hand: 280 + 90 / 18 + 14 / 2.8'],
    [140, 90, 14, 100, 317.03, 'with ethanol 100 mg/dL / 3.7'],
    [125, 900, 56, null, 320, 'hyperosmolar state: 250 + 50 + 20'],
  ])(
    'conventional: Na %s, glucose %s, BUN %s, ethanol %s mg/dL: %s (%s)',
    (na, glucose, bun, ethanol, osm, _how) => {
      expect(calculatedOsmolalityConventional(na, glucose, bun, ethanol)).toBeCloseTo(osm, 2);
    },
  );

  it.each([
    [140, 90, 14, 0],
    [125, 900, 56, 0],
    [150, 300, 80, 250],
  ])(
    'the SI and conventional forms agree within 0.5 mOsm/kg (Na %s, glucose %s, BUN %s, ethanol %s mg/dL; the divisors 18 and 2.8 are rounded molar masses)',
    (na, glucose, bun, ethanol) => {
      const si = calculatedOsmolality(
        na,
        glucoseMgDlToMmolL(glucose),
        bunMgDlToUreaMmolL(bun),
        ethanolMgDlToMmolL(ethanol),
      );
      expect(
        Math.abs(si - calculatedOsmolalityConventional(na, glucose, bun, ethanol)),
      ).toBeLessThan(0.5);
    },
  );

  it.each([
    [320, 290, 30, true],
    [298, 290, 8, false],
    [300, 290, 10, false],
    [300.1, 290, 10.1, true],
  ])(
    'measured %s, calculated %s: gap %s, raised %s (above 10 is raised, common practice)',
    (measured, calculated, gap, raised) => {
      expect(osmolarGap(measured, calculated)).toBeCloseTo(gap, 9);
      expect(osmolarGapRaised(osmolarGap(measured, calculated))).toBe(raised);
    },
  );
});

describe('lactate bands: >= 2 raised, >= 4 high (Surviving Sepsis Campaign 2021, Evans et al.)', () => {
  it.each([
    [0.8, 'normal'],
    [1.99, 'normal'],
    [2, 'raised'],
    [3.9, 'raised'],
    [4, 'high'],
    [12, 'high'],
  ] as const)('lactate %s is %s', (lactate, band) => {
    expect(lactateBand(lactate)).toBe(band);
  });
});
