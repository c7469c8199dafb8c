// The H+/CO2 chart's marks and words: the gases in time order, a venous gas at its arterial estimate as the note
// gives it, the ventilator target's arrow, the text alternative, type sizes, accessibility and safe markup.
// Every patient is invented.
import { describe, expect, it } from 'vitest';
import { acidBase } from '../../calc/index.ts';
import { createNoteRenderer } from '../../templates/index.ts';
import { acidBaseChart } from '../../views/chart.ts';
import { fromPoint } from '../../views/chartGeometry.ts';
import { MIN_FONT, WIDTH, layout } from '../../views/chartStyle.ts';
import { attrs, findingsOf, num } from './chartHelpers.ts';

const frame = layout(4).frame;
const renderer = createNoteRenderer();

// An invented 66-year-old ventilated for pneumonia, target pH 7.35.
const VENTILATED = {
  sample: 'arterial',
  gas: { ph: 7.22, pco2: 61, po2: 88, hco3: 24.3 },
  oxygen: { fio2: 0.5, peep: 8 },
  ventilator: { vt: 450, rr: 14, targetPh: 7.35 },
  patient: { heightCm: 170, sex: 'male', ageYears: 66 },
};
// An invented 71-year-old with a venous gas in the emergency department, an earlier venous gas at 03:00.
const VENOUS = {
  sample: 'venous',
  gas: { ph: 7.3, pco2: 52, hco3: 27 },
  patient: { ageYears: 71 },
  previous: [{ takenAt: '2026-03-02T03:00', gas: { ph: 7.25, pco2: 58, hco3: 26 } }],
};

describe('the text alternative', () => {
  it('says what the chart is, in plain words, and names the lines and the normal range', () => {
    const { text } = acidBaseChart(findingsOf({ gas: { ph: 7.4, pco2: 40, hco3: 24 } }));
    const first = text.split('\n')[0];
    expect(first).toMatch(/^H\+\/CO2 chart: \[H\+\] from 0 to 130 nmol\/L/);
    expect(first).toContain('[H+] = 24 x PaCO2 / HCO3 (the Henderson equation)');
    expect(first).toContain('5, 10, 15, 20, 24, 30, 40 and 50 mmol/L');
    // pH 7.35-7.45 is [H+] 44.7-35.5 nmol/L, rounded as the note rounds: 35-45
    expect(first).toContain('PaCO2 35-45 mmHg and pH 7.35-7.45 ([H+] 35-45 nmol/L)');
    expect(text).toMatch(
      /Today's gas \(1 of 1\): pH 7\.40 \(\[H\+\] 40 nmol\/L\), PaCO2 40 mmHg, HCO3 24\.0 mmol\/L; inside the normal range\./,
    );
    expect(text).not.toMatch(/map|band/i);
  });

  it('lists earlier gases oldest first by time, joined to today', () => {
    const f = findingsOf({
      gas: { ph: 7.32, pco2: 50, hco3: 25 },
      previous: [
        { takenAt: '2026-03-02 04:10', gas: { ph: 7.26, pco2: 55, hco3: 24 } },
        { takenAt: '2026-03-02T03:00', gas: { ph: 7.18, pco2: 61, hco3: 22 } },
      ],
    });
    const { text, svg } = acidBaseChart(f);
    expect(text).toMatch(
      /Gas 1 of 3, taken 2 Mar 2026 03:00: pH 7\.18[\s\S]*Gas 2 of 3, taken 2 Mar 2026 04:10: pH 7\.26/,
    );
    expect(text).toContain('A line with arrows joins the gases from 1 to 3');
    expect(svg).toMatch(/data-from="1" data-to="2"[\s\S]*data-from="2" data-to="3"/);
    // hollow marks for earlier gases, a filled one for today's: shape, not colour alone
    expect(attrs(svg, 'circle', 'id="gasline-chart-gas-1"').fill).toBe('#ffffff');
    expect(attrs(svg, 'circle', 'id="gasline-chart-gas-current"').fill).not.toBe('#ffffff');
  });

  it('writes pressures in kPa when the clinician uses kPa', () => {
    // 8.0 kPa = 60.0 mmHg; the axis runs to 16 kPa
    const f = findingsOf({ units: { pressure: 'kPa' }, gas: { ph: 7.25, pco2: 8, hco3: 25.8 } });
    const { text, svg } = acidBaseChart(f);
    expect(text).toContain('PaCO2 from 0 to 16 kPa');
    expect(text).toContain('PaCO2 8.0 kPa');
    expect(svg).toContain('PaCO₂ (kPa)');
  });

  it('says when the reported HCO3 disagrees with pH and PaCO2, and places the gas by those two', () => {
    // pH 7.40, PaCO2 40: 24 x 40 / 39.8 = 24 mmol/L by the Henderson equation, not the 30 reported
    const { text } = acidBaseChart(findingsOf({ gas: { ph: 7.4, pco2: 40, hco3: 30 } }));
    expect(text).toContain('which give about 24 mmol/L; the chart places it by pH and PaCO2');
  });

  it('places nothing when the PaCO2 unit is in doubt, and asks', () => {
    const f = findingsOf({ gas: { ph: 7.4, pco2: 5.3, hco3: 24 } });
    expect(f.withheld).toBe(true);
    const { text, svg } = acidBaseChart(f);
    expect(svg).not.toContain('gl-gas-marker');
    expect(text).toContain('Confirm whether it was entered in mmHg or kPa');
  });
});

describe("the patient's own reference", () => {
  it('marks stated usual values with a cross where the Henderson equation puts them', () => {
    // usual PaCO2 52, HCO3 30: [H+] = 24 x 52 / 30 = 41.6 nmol/L (Henderson equation, clinical-scope section 2)
    const f = findingsOf({
      gas: { ph: 7.3, pco2: 66, hco3: 31.5 },
      context: { timing: 'chronic', baseline: { pco2: 52, hco3: 30 } },
    });
    const { svg, text } = acidBaseChart(f);
    const cross = svg.match(/<g class="gl-reference"><path d="M([\d.]+),([\d.]+) H([\d.]+)/);
    const at = fromPoint(frame, { x: (num(cross?.[1]) + num(cross?.[3])) / 2, y: num(cross?.[2]) });
    expect(at.pco2).toBeCloseTo(52, 1);
    expect(at.hPlus).toBeCloseTo(41.6, 1);
    expect(text).toContain(
      "A cross marks the patient's usual values: PaCO2 52 mmHg, HCO3 30.0 mmol/L.",
    );
    expect(svg).toContain('>reference point</text>');
  });

  it('names a value worked out from the other two', () => {
    // pH and PaCO2 only: HCO3 = 24 x 40 / 39.8 = 24.1 mmol/L (Henderson equation)
    const { text } = acidBaseChart(findingsOf({ gas: { ph: 7.4, pco2: 40 } }));
    expect(text).toContain('HCO3 24.1 mmol/L (HCO3 worked out from the other two)');
  });
});

describe('a venous sample, plotted as its arterial estimate', () => {
  const f = findingsOf(VENOUS);
  const { text, svg } = acidBaseChart(f);

  it('puts today’s mark at the estimate and draws the span the note gives', () => {
    const a = attrs(svg, 'circle', 'id="gasline-chart-gas-current"');
    const at = fromPoint(frame, { x: num(a.cx), y: num(a.cy) });
    // Byrne 2014 (from memory): PvCO2 52 -> PaCO2 46-48, middle 47; pH 7.30 + 0.03 = 7.33, [H+] 46.77
    expect(at.pco2).toBeCloseTo(47, 1);
    expect(at.hPlus).toBeCloseTo(acidBase.hydrogenIon(7.33), 1);
    expect(svg).toContain('data-pco2-low="46" data-pco2-high="48"');
    expect(text).toContain(
      'placed at its arterial estimate: pH about 7.33 ([H+] 47 nmol/L), PaCO2 about 46-48 mmHg (the bar), HCO3 about 26.0 mmol/L',
    );
  });

  it('agrees with the note', () => {
    const note = renderer.render(f, { format: 'text' }).full;
    expect(note).toContain('about 46-48 mmHg arterial');
  });

  it('places the earlier venous gas the same way', () => {
    // PvCO2 58 -> 52-54; pH 7.25 -> 7.28
    expect(svg).toContain('data-pco2-low="52" data-pco2-high="54"');
    expect(text).toContain('Gas 1 of 2, taken 2 Mar 2026 03:00: venous, measured pH 7.25');
    expect(text).toContain('This is a venous sample: each gas is placed at its arterial estimate');
  });

  it('keys the bar', () => {
    expect(svg).toContain('>estimated PaCO₂</text>');
  });
});

describe('the ventilator target', () => {
  it('draws a dashed arrow from today’s gas to the target PaCO2, at the HCO3 acute buffering predicts', () => {
    const f = findingsOf(VENTILATED);
    // 41.6 mmHg (clinical-scope section 8, worked in chart.geometry.test.ts), rounded as the core records it
    expect(f.derived.targetPco2).toBe(41.6);
    const { svg, text } = acidBaseChart(f);
    const g = attrs(svg, 'g', 'class="gl-target"');
    expect(num(g['data-target-pco2-mmhg'])).toBeCloseTo(41.6, 2);
    // HCO3 24.3 + 0.1 x (41.6 - 61) = 22.36; [H+] = 24 x 41.6 / 22.36 = 44.65, pH 7.35 (target 44.67 at the
    // unrounded 41.62)
    expect(num(g['data-target-hco3'])).toBeCloseTo(22.36, 2);
    expect(num(g['data-target-hplus'])).toBeCloseTo(44.65, 1);
    const line = attrs(svg, 'line', 'class="gl-target-step"');
    expect(line['stroke-dasharray']).toBeTruthy();
    const head = fromPoint(frame, { x: num(line.x2), y: num(line.y2) });
    // the arrow ends one unit short of the target point
    expect(head.pco2).toBeCloseTo(41.6, 0);
    expect(head.hPlus).toBeCloseTo(44.65, 0);
    expect(text).toContain(
      "A dashed arrow runs from today's gas to the ventilator target: PaCO2 42 mmHg",
    );
    expect(text).toContain('(pH 7.35)');
    expect(svg).toContain('>ventilator target</text>');
  });

  it('draws no arrow without a ventilator, and none from a venous PCO2', () => {
    expect(acidBaseChart(findingsOf({ gas: VENTILATED.gas })).svg).not.toContain('gl-target');
    const venous = findingsOf({ ...VENTILATED, sample: 'venous' });
    expect(venous.derived.targetPco2).not.toBeNull();
    const { svg, text } = acidBaseChart(venous);
    expect(svg).not.toContain('gl-target');
    expect(text).toContain('No target arrow: the ventilator suggestion rests on a venous PCO2');
  });
});

describe('legible and accessible', () => {
  const { svg } = acidBaseChart(findingsOf({ ...VENTILATED, previous: VENOUS.previous }));

  it('writes no text under 13 units, 11 px or more on a 330 px wide phone figure', () => {
    const sizes = [...svg.matchAll(/font-size="([\d.]+)"/g)].map((m) => Number(m[1]));
    expect(sizes.length).toBeGreaterThan(10);
    expect(Math.min(...sizes)).toBeGreaterThanOrEqual(MIN_FONT);
    expect((MIN_FONT * 330) / WIDTH).toBeGreaterThanOrEqual(11);
    // every text element inherits a size from the root or sets its own
    expect(svg).toMatch(/^<svg [^>]*font-size="13"/);
  });

  it('is an image named by its title and described by the chart in words', () => {
    expect(svg).toMatch(
      /^<svg [^>]*role="img" aria-labelledby="gasline-chart-title" aria-describedby="gasline-chart-desc"/,
    );
    expect(svg).toContain('<title id="gasline-chart-title">H⁺/CO₂ chart');
    expect(svg).toMatch(/<desc id="gasline-chart-desc">H\+\/CO2 chart: /);
  });

  it('has no style attribute, no style or script element, no event handler, and none of the classic bands', () => {
    expect(svg).not.toMatch(/<script|<style|\sstyle=|\son[a-z]+=/i);
    expect(svg).not.toMatch(/<pattern|gl-band|hatch/);
  });

  it('gives every id the prefix, uses each id once, and draws the same case the same way', () => {
    const two = acidBaseChart(findingsOf(VENTILATED), { idPrefix: 'second' }).svg;
    const ids = [...two.matchAll(/\sid="([^"]+)"/g)].map((m) => m[1] as string);
    expect(ids.every((i) => i.startsWith('second-'))).toBe(true);
    expect(new Set(ids).size).toBe(ids.length);
    expect(acidBaseChart(findingsOf(VENTILATED)).svg).toBe(
      acidBaseChart(findingsOf(VENTILATED)).svg,
    );
    expect(() => acidBaseChart(findingsOf(VENTILATED), { idPrefix: '1 bad' })).toThrow(RangeError);
  });

  it('escapes a hostile label and time wherever they appear', () => {
    const hostile = '<script>alert(1)</script>"&';
    const f = findingsOf({
      gas: { ph: 7.3, pco2: 50, hco3: 24 },
      previous: [{ takenAt: hostile, label: hostile, gas: { ph: 7.25, pco2: 55, hco3: 23.6 } }],
    });
    const { svg } = acidBaseChart(f, { title: hostile });
    expect(svg).not.toContain('<script>');
    expect(svg).toContain('&lt;script&gt;alert(1)&lt;/script&gt;&quot;&amp;');
  });

  it('marks a gas beyond the window at its edge, in the drawing and in words', () => {
    // pH 6.85 -> [H+] 141 nmol/L, above 130; PaCO2 130 mmHg beyond 120 (HCO3 = 24 x 130 / 141 = 22.1)
    const { svg, text } = acidBaseChart(findingsOf({ gas: { ph: 6.85, pco2: 130, hco3: 22.1 } }));
    expect(svg).toContain('gl-gas-off-scale');
    expect(svg).toContain('now (off scale)');
    expect(text).toContain(
      'outside the drawn window (PaCO2 above 120 mmHg, [H+] above 130 nmol/L)',
    );
  });
});
