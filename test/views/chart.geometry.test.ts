// The H+/CO2 chart's geometry against the Henderson equation, [H+] = 24 x PaCO2 / HCO3 (nmol/L, mmHg, mmol/L),
// and the definition of pH, [H+] = 10^(9 - pH) (clinical-scope section 2, textbook). Every check value is worked
// out by hand in the comment beside it, with its source; the drawing is read back from the SVG it writes.
import { describe, expect, it } from 'vitest';
import { acidBaseChart } from '../../views/chart.ts';
import {
  CHART_WINDOW,
  HCO3_LINES,
  arterialEstimateOf,
  clampToWindow,
  fromPoint,
  hco3LineEnd,
  inNormalZone,
  normalZone,
  placeGas,
  targetPoint,
  toPoint,
} from '../../views/chartGeometry.ts';
import { layout } from '../../views/chartStyle.ts';
import { attrs, findingsOf, num } from './chartHelpers.ts';

const frame = layout(4).frame;

describe('the axes: [H+] up, PaCO2 across, both linear', () => {
  it('maps a point and back again', () => {
    for (const p of [
      { pco2: 0, hPlus: 0 },
      { pco2: 40, hPlus: 40 },
      { pco2: 97.5, hPlus: 123.4 },
    ]) {
      const back = fromPoint(frame, toPoint(frame, p));
      expect(back.pco2).toBeCloseTo(p.pco2, 9);
      expect(back.hPlus).toBeCloseTo(p.hPlus, 9);
    }
  });

  it('is linear: equal steps of [H+] or PaCO2 are equal distances', () => {
    const y = (h: number) => toPoint(frame, { pco2: 0, hPlus: h }).y;
    const x = (p: number) => toPoint(frame, { pco2: p, hPlus: 0 }).x;
    expect(y(20) - y(40)).toBeCloseTo(y(80) - y(100), 9);
    expect(x(40) - x(20)).toBeCloseTo(x(100) - x(80), 9);
    // more acid is higher on the page
    expect(y(100)).toBeLessThan(y(40));
  });

  it('ends PaCO2 on a round tick in both units: 16 kPa = 120.01 mmHg (1 kPa = 7.50062 mmHg, SI)', () => {
    expect(CHART_WINDOW.pco2.max).toBeCloseTo(120.01, 2);
  });

  it('puts the pH marks at 10^(9 - pH): 7.00 at 100 nmol/L, 7.40 at 39.8, 7.10 at 79.4 (clinical-scope section 2)', () => {
    const svg = acidBaseChart(findingsOf({ gas: { ph: 7.4, pco2: 40, hco3: 24 } })).svg;
    // textbook: pH 7.00 -> 100; 7.40 -> 39.8; rule of thumb: 0.3 lower doubles [H+], so 7.10 -> about 80
    for (const [ph, hPlus] of [
      ['7.0', 100],
      ['7.4', 39.81],
      ['7.1', 79.43],
    ] as const) {
      const a = attrs(svg, 'text', `data-ph="${ph}"`);
      // the label's baseline sits 4.5 units under its mark
      expect(fromPoint(frame, { x: 0, y: num(a.y) - 4.5 }).hPlus).toBeCloseTo(hPlus, 1);
    }
  });
});

describe('the HCO3 lines: the Henderson equation made visible', () => {
  const svg = acidBaseChart(findingsOf({ gas: { ph: 7.4, pco2: 40, hco3: 24 } })).svg;

  it('draws each HCO3 as a straight line from the origin whose slope is 24 / HCO3', () => {
    for (const hco3 of HCO3_LINES) {
      const a = attrs(svg, 'line', `data-hco3="${hco3}"`);
      const start = fromPoint(frame, { x: num(a.x1), y: num(a.y1) });
      const end = fromPoint(frame, { x: num(a.x2), y: num(a.y2) });
      expect(start.pco2).toBeCloseTo(0, 1);
      expect(start.hPlus).toBeCloseTo(0, 1);
      // [H+] = 24 x PaCO2 / HCO3 at the far end (coordinates are written to 0.01 of a unit)
      expect(end.hPlus).toBeCloseTo((24 * end.pco2) / hco3, 0);
    }
  });

  it('passes the 24 line through the normal point: [H+] 40, PaCO2 40, HCO3 24 (common practice)', () => {
    const end = hco3LineEnd(24);
    // on a line through the origin, the normal point lies on it if 40 / 40 equals end.hPlus / end.pco2
    expect(end.hPlus / end.pco2).toBeCloseTo(40 / 40, 9);
  });

  it('ends each line where it leaves the window, by the top or by the right', () => {
    // HCO3 10 reaches [H+] 130 at PaCO2 = 130 x 10 / 24 = 54.17 mmHg: leaves by the top
    expect(hco3LineEnd(10)).toMatchObject({ edge: 'top', hPlus: 130 });
    expect(hco3LineEnd(10).pco2).toBeCloseTo(54.17, 2);
    // HCO3 30 at PaCO2 120.01: [H+] = 24 x 120.01 / 30 = 96.0 nmol/L: leaves by the right
    expect(hco3LineEnd(30)).toMatchObject({ edge: 'right' });
    expect(hco3LineEnd(30).hPlus).toBeCloseTo(96.0, 1);
  });

  it('labels every line with its HCO3', () => {
    for (const hco3 of HCO3_LINES)
      expect(svg).toMatch(new RegExp(`class="gl-hco3-label" data-hco3="${hco3}"[^>]*>${hco3}<`));
  });
});

describe('where a gas goes', () => {
  it('puts an arterial gas at its PaCO2 and its [H+] = 10^(9 - pH)', () => {
    // pH 7.22 -> [H+] = 10^1.78 = 60.26 nmol/L (definition of pH)
    const f = findingsOf({ gas: { ph: 7.22, pco2: 61, hco3: 24.3 } });
    const a = attrs(acidBaseChart(f).svg, 'circle', 'class="gl-gas-marker"');
    const at = fromPoint(frame, { x: num(a.cx), y: num(a.cy) });
    expect(at.pco2).toBeCloseTo(61, 1);
    expect(at.hPlus).toBeCloseTo(60.26, 1);
    // and so on the HCO3 line the Henderson equation gives: 24 x 61 / 60.26 = 24.3 mmol/L
    expect((24 * at.pco2) / at.hPlus).toBeCloseTo(24.3, 1);
  });

  it('places a venous gas at its arterial estimate (Byrne et al. 2014, from memory: pH +0.03, PCO2 4-6 lower, HCO3 1 lower)', () => {
    // venous pH 7.30, PvCO2 52, HCO3 27 -> pH 7.33, PaCO2 46-48, HCO3 26; the mark at the middle, 47 mmHg
    const venous = { ph: 7.3, pco2: 52, hco3: 27 };
    const estimate = arterialEstimateOf(venous);
    expect(estimate).toEqual({ ph: 7.33, pco2Low: 46, pco2High: 48, hco3: 26 });
    // the same figures as the core's own for the current gas, which the note prints
    const f = findingsOf({ sample: 'venous', gas: venous });
    expect(f.venous?.arterialEstimate).toEqual(estimate);
    const placed = placeGas(venous, estimate);
    expect(placed.point.pco2).toBe(47);
    // [H+] at pH 7.33 = 10^1.67 = 46.77 nmol/L
    expect(placed.point.hPlus).toBeCloseTo(46.77, 2);
    expect(placed.pco2Range).toEqual({ low: 46, high: 48 });
    // a venous PCO2 under 15 mmHg is not estimated from (calc/reference.ts VENOUS.minPco2)
    expect(arterialEstimateOf({ ph: 7.4, pco2: 12, hco3: 8 })).toBeNull();
  });

  it('draws a gas beyond the window at its edge and says which way it left', () => {
    // pH 6.80 -> [H+] 158.5 nmol/L, above the window's 130; PaCO2 150 beyond 120.01
    const c = clampToWindow({ pco2: 150, hPlus: 158.5 });
    expect(c.point).toEqual({ pco2: CHART_WINDOW.pco2.max, hPlus: 130 });
    expect(c.off).toEqual({ pco2: 'high', hPlus: 'high' });
    expect(clampToWindow({ pco2: 40, hPlus: 40 }).off).toEqual({ pco2: null, hPlus: null });
  });
});

describe('the normal zone', () => {
  it('is the box of PaCO2 35-45 mmHg and pH 7.35-7.45, [H+] 35.48-44.67 nmol/L (10^(9 - pH))', () => {
    const z = normalZone();
    expect(z.pco2).toEqual({ low: 35, high: 45 });
    expect(z.hPlus.low).toBeCloseTo(35.48, 2);
    expect(z.hPlus.high).toBeCloseTo(44.67, 2);
    expect(inNormalZone({ pco2: 40, hPlus: 40 })).toBe(true);
    expect(inNormalZone({ pco2: 40, hPlus: 46 })).toBe(false);
    const a = attrs(
      acidBaseChart(findingsOf({ gas: { ph: 7.4, pco2: 40, hco3: 24 } })).svg,
      'rect',
      'data-zone="normal"',
    );
    const top = fromPoint(frame, { x: num(a.x), y: num(a.y) });
    const bottom = fromPoint(frame, { x: num(a.x) + num(a.width), y: num(a.y) + num(a.height) });
    expect(top.pco2).toBeCloseTo(35, 1);
    expect(top.hPlus).toBeCloseTo(44.67, 1);
    expect(bottom.pco2).toBeCloseTo(45, 1);
    expect(bottom.hPlus).toBeCloseTo(35.48, 1);
  });
});

describe('where the ventilator target leads (acute buffering)', () => {
  it('lands a target worked out from a target pH on that pH', () => {
    // clinical-scope section 8: PaCO2_t = [H+]_t x (HCO3 - 0.1 PaCO2) / (24 - 0.1 [H+]_t); pH 7.22, PaCO2 61,
    // HCO3 24.3, target pH 7.35: [H+]_t = 44.67; PaCO2_t = 44.67 x (24.3 - 6.1) / (24 - 4.467) = 41.62 mmHg.
    // HCO3 there = 24.3 + 0.1 x (41.62 - 61) = 22.36 (Berend 2014: 0.1 mmol/L per mmHg, acute), and
    // [H+] = 24 x 41.62 / 22.36 = 44.67 nmol/L: pH 7.35 again.
    const t = targetPoint({ pco2: 61, hco3: 24.3 }, 41.62);
    expect(t?.hco3).toBeCloseTo(22.36, 2);
    expect(t?.hPlus).toBeCloseTo(44.67, 1);
  });

  it('takes a PaCO2 target as given and moves HCO3 by the acute rule', () => {
    // PaCO2 70 -> 50 with HCO3 28: HCO3 28 - 0.1 x 20 = 26.0; [H+] = 24 x 50 / 26 = 46.15 nmol/L
    const t = targetPoint({ pco2: 70, hco3: 28 }, 50);
    expect(t?.hco3).toBeCloseTo(26.0, 9);
    expect(t?.hPlus).toBeCloseTo(46.15, 2);
  });
});
