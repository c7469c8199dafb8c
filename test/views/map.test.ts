// The acid-base map: placement, PaCO2 lines, compensation bands, time order, escaping, accessibility.
// Check values come from the published rules written out here, not from calc/: the Henderson equation
// [H+] = 24 x PaCO2 / HCO3 with [H+] = 10^(9 - pH) (textbook; clinical-scope section 2), Winters' formula
// (Albert, Dell, Winters, Ann Intern Med 1967;66:312-22) and the compensation table of Berend K, de Vries APJ,
// Gans ROB (N Engl J Med 2014;371:1434-45).
import { existsSync } from 'node:fs';
import { createRequire } from 'node:module';
import { describe, expect, it } from 'vitest';
import { interpret, type Findings } from '../../calc/index.ts';
import {
  acidBaseMap,
  bandPolygon,
  bandsContaining,
  BANDS,
  fromPoint,
  isoplethPoints,
  ISOPLETHS_MMHG,
  MAP_WINDOW,
  type BandCode,
  type Frame,
  type PhHco3,
} from '../../views/map.ts';
import { compensation } from '../../calc/index.ts';

const { metabolicAlkalosisPco2, respiratoryAcidosisHco3, respiratoryAlkalosisHco3, wintersPco2 } =
  compensation;

// ---------- invented cases ----------

function findingsOf(c: unknown): Findings {
  const f = interpret(c);
  if (!f.ok) throw new Error(`invented case rejected: ${JSON.stringify(f.errors)}`);
  return f;
}

// An invented 23-year-old in diabetic ketoacidosis, three gases over the night; the earlier two are
// entered out of time order on purpose.
const ketoacidosis = {
  patient: { ageYears: 23, sex: 'male' },
  gas: { ph: 7.23, pco2: 22, hco3: 9 },
  previous: [
    { takenAt: '2026-03-02T04:10', gas: { ph: 7.12, pco2: 25, hco3: 7.9 } },
    { takenAt: '2026-03-02T02:30', label: 'on arrival', gas: { ph: 7.05, pco2: 28, hco3: 7.5 } },
  ],
};

// An invented 71-year-old with chronic hypercapnia, in kPa: 8.0 kPa is 60 mmHg.
const hypercapniaKpa = {
  units: { pressure: 'kPa' },
  gas: { ph: 7.35, pco2: 8.0, hco3: 32.8 },
  previous: [{ takenAt: '2026-03-02T04:10', gas: { ph: 7.26, pco2: 9.6, hco3: 33 } }],
};

// An invented 58-year-old with severe vomiting (HCO3 above the window) then a pH above it.
const offScale = {
  gas: { ph: 7.8, pco2: 30, hco3: 45.5 },
  previous: [{ takenAt: '2026-03-02T04:10', gas: { ph: 7.55, pco2: 60, hco3: 51 } }],
};

const hostile = '<script>alert(1)</script>';

// ---------- reading our own SVG ----------

type Attrs = Record<string, string>;
const attrsOf = (tag: string): Attrs =>
  Object.fromEntries([...tag.matchAll(/([\w:-]+)="([^"]*)"/g)].map((m) => [m[1], m[2]]));
const tags = (svg: string, name: string): Attrs[] =>
  [...svg.matchAll(new RegExp(`<${name}\\b[^>]*>`, 'g'))].map((m) => attrsOf(m[0]));
const byId = (svg: string, name: string, id: string): Attrs => {
  const found = tags(svg, name).find((a) => a.id === id);
  if (!found) throw new Error(`no <${name} id="${id}">`);
  return found;
};
const num = (a: Attrs, k: string) => Number(a[k]);
const frameOf = (svg: string, prefix = 'gasline-map'): Frame => {
  const r = byId(svg, 'rect', `${prefix}-plot`);
  return { left: num(r, 'x'), top: num(r, 'y'), width: num(r, 'width'), height: num(r, 'height') };
};
const pointsOf = (a: Attrs): { x: number; y: number }[] =>
  (a.points ?? '')
    .trim()
    .split(/\s+/)
    .map((p) => {
      const [x, y] = p.split(',').map(Number);
      return { x: x as number, y: y as number };
    });
const markerAt = (svg: string, id: string) => {
  const c = byId(svg, 'circle', id);
  return { x: num(c, 'cx'), y: num(c, 'cy') };
};

// Henderson equation, written out (textbook; clinical-scope section 2).
const hPlus = (ph: number) => 10 ** (9 - ph);
const hco3From = (ph: number, pco2: number) => (24 * pco2) / hPlus(ph);
const pco2From = (ph: number, hco3: number) => (hPlus(ph) * hco3) / 24;
const phFrom = (pco2: number, hco3: number) => 9 - Math.log10((24 * pco2) / hco3);

/** Ray casting in (pH, HCO3). */
function inside(poly: PhHco3[], p: PhHco3): boolean {
  let hit = false;
  for (let i = 0, j = poly.length - 1; i < poly.length; j = i++) {
    const a = poly[i] as PhHco3,
      b = poly[j] as PhHco3;
    if (
      a.hco3 > p.hco3 !== b.hco3 > p.hco3 &&
      p.ph < ((b.ph - a.ph) * (p.hco3 - a.hco3)) / (b.hco3 - a.hco3) + a.ph
    )
      hit = !hit;
  }
  return hit;
}
const polygonOf = (svg: string, band: BandCode, frame: Frame): PhHco3[] => {
  const a = tags(svg, 'polygon').find((t) => t['data-band'] === band);
  if (!a) throw new Error(`no polygon for ${band}`);
  return pointsOf(a).map((q) => fromPoint(frame, q));
};

// ---------- tests ----------

describe('placement', () => {
  const f = findingsOf(ketoacidosis);
  const { svg } = acidBaseMap(f);
  const frame = frameOf(svg);

  it('puts the current gas where the arithmetic says (linear pH across, linear HCO3 up)', () => {
    const at = markerAt(svg, 'gasline-map-gas-current');
    // pH 7.23 is (7.23 - 6.9) / (7.7 - 6.9) = 41.25 % across; HCO3 9 is (9 - 5) / (50 - 5) = 8.9 % up
    expect(at.x).toBeCloseTo(frame.left + 0.4125 * frame.width, 1);
    expect(at.y).toBeCloseTo(frame.top + frame.height - ((9 - 5) / 45) * frame.height, 1);
    const back = fromPoint(frame, at);
    expect(back.ph).toBeCloseTo(7.23, 3);
    expect(back.hco3).toBeCloseTo(9, 2);
  });

  it('puts the [H+] scale where 10^(9 - pH) says: 40 nmol/L over pH 7.40, 100 over pH 7.00', () => {
    const tick = (h: number) => tags(svg, 'text').find((t) => t['data-hplus'] === String(h));
    // [H+] 40 nmol/L <-> pH 7.398; 100 <-> 7.00 (definition of pH; clinical-scope section 2)
    expect(fromPoint(frame, { x: num(tick(40) as Attrs, 'x'), y: 0 }).ph).toBeCloseTo(
      9 - Math.log10(40),
      3,
    );
    expect(fromPoint(frame, { x: num(tick(100) as Attrs, 'x'), y: 0 }).ph).toBeCloseTo(7.0, 3);
  });
});

describe('PaCO2 lines', () => {
  const { svg } = acidBaseMap(findingsOf(ketoacidosis));
  const frame = frameOf(svg);
  const lines = tags(svg, 'polyline').filter((t) => t.class === 'gl-isopleth');

  it('draws one line for each PaCO2 and every point satisfies the Henderson equation', () => {
    expect(lines.map((l) => Number(l['data-pco2-mmhg']))).toEqual([...ISOPLETHS_MMHG]);
    for (const line of lines) {
      const pco2 = Number(line['data-pco2-mmhg']);
      const pts = pointsOf(line).map((q) => fromPoint(frame, q));
      expect(pts.length).toBeGreaterThan(5);
      for (const p of pts) {
        // coordinates are written to 0.01 px: well under 0.05 mmol/L of HCO3
        expect(Math.abs(p.hco3 - hco3From(p.ph, pco2))).toBeLessThan(0.05);
        expect(p.ph).toBeGreaterThanOrEqual(MAP_WINDOW.ph.min - 1e-4);
        expect(p.ph).toBeLessThanOrEqual(MAP_WINDOW.ph.max + 1e-4);
        expect(p.hco3).toBeGreaterThanOrEqual(MAP_WINDOW.hco3.min - 0.05);
        expect(p.hco3).toBeLessThanOrEqual(MAP_WINDOW.hco3.max + 0.05);
      }
    }
  });

  it('has the 40 mmHg line through pH 7.40 at HCO3 24 (normal: [H+] 40, PaCO2 40, HCO3 24; common practice)', () => {
    const near = isoplethPoints(40).find((p) => Math.abs(p.ph - 7.4) < 1e-9);
    expect(near?.hco3).toBeCloseTo(24.1, 1); // 24 x 40 / 39.8
  });

  it('stops each line exactly at the window edge it leaves by', () => {
    const p100 = isoplethPoints(100);
    // HCO3 50 at PaCO2 100: [H+] = 48, pH 7.319
    expect(p100.at(-1)?.hco3).toBeCloseTo(50, 9);
    expect(p100.at(-1)?.ph).toBeCloseTo(phFrom(100, 50), 9);
    const p20 = isoplethPoints(20);
    // HCO3 5 at PaCO2 20: [H+] = 96, pH 7.018
    expect(p20[0]?.hco3).toBeCloseTo(5, 9);
    expect(p20.at(-1)?.ph).toBeCloseTo(7.7, 9);
  });
});

describe('compensation bands', () => {
  const f = findingsOf(ketoacidosis);
  const { svg } = acidBaseMap(f);
  const frame = frameOf(svg);

  it('draws six closed bands and every vertex lies on the low or high edge of its calc rule', () => {
    const rule = (
      code: BandCode,
      p: PhHco3,
    ): { on: number; band: { low: number; high: number } } => {
      const pco2 = pco2From(p.ph, p.hco3);
      switch (code) {
        case 'metabolic_acidosis':
          return { on: pco2, band: wintersPco2(p.hco3) };
        case 'metabolic_alkalosis':
          return { on: pco2, band: metabolicAlkalosisPco2(p.hco3) };
        case 'acute_respiratory_acidosis':
          return { on: p.hco3, band: respiratoryAcidosisHco3(pco2, 'acute') };
        case 'chronic_respiratory_acidosis':
          return { on: p.hco3, band: respiratoryAcidosisHco3(pco2, 'chronic') };
        case 'acute_respiratory_alkalosis':
          return { on: p.hco3, band: respiratoryAlkalosisHco3(pco2, 'acute') };
        case 'chronic_respiratory_alkalosis':
          return { on: p.hco3, band: respiratoryAlkalosisHco3(pco2, 'chronic') };
      }
    };
    expect(tags(svg, 'polygon').filter((t) => t['data-band']).length).toBe(6);
    for (const b of BANDS) {
      const poly = polygonOf(svg, b.code, frame);
      expect(poly.length).toBeGreaterThan(20);
      const [from, to] = b.domain(f.reference);
      let onLow = 0,
        onHigh = 0,
        onEnd = 0;
      for (const p of poly) {
        const { on, band } = rule(b.code, p);
        const dLow = Math.abs(on - band.low),
          dHigh = Math.abs(on - band.high);
        if (dLow < 0.1) onLow++;
        else if (dHigh < 0.1) onHigh++;
        else {
          // otherwise it closes an end of the band: on the end's PaCO2 line (or HCO3), between the edges
          const along = b.along === 'hco3' ? p.hco3 : pco2From(p.ph, p.hco3);
          expect(
            Math.min(Math.abs(along - from), Math.abs(along - to)),
            `${b.code} vertex pH ${p.ph}, HCO3 ${p.hco3}`,
          ).toBeLessThan(0.05);
          expect(on).toBeGreaterThan(band.low);
          expect(on).toBeLessThan(band.high);
          onEnd++;
        }
      }
      expect(onEnd).toBeLessThanOrEqual(10);
      expect(onLow).toBeGreaterThan(10);
      expect(onHigh).toBeGreaterThan(10);
    }
  });

  // Published check values, converted to (pH, HCO3) with the Henderson equation written out above.
  const at = (pco2: number, hco3: number): PhHco3 => ({ ph: phFrom(pco2, hco3), hco3 });
  const cases: {
    band: BandCode;
    inside: [number, number][];
    outside: [number, number][];
    source: string;
  }[] = [
    // HCO3 12: expected PaCO2 1.5 x 12 + 8 = 26 (+/- 2)
    {
      band: 'metabolic_acidosis',
      inside: [
        [26, 12],
        [24.5, 12],
        [27.5, 12],
      ],
      outside: [
        [23, 12],
        [29, 12],
      ],
      source: 'Winters (Albert 1967)',
    },
    // HCO3 34: expected PaCO2 0.7 x 34 + 21 = 44.8 (+/- 2)
    {
      band: 'metabolic_alkalosis',
      inside: [
        [44.8, 34],
        [43.5, 34],
      ],
      outside: [
        [41.5, 34],
        [48, 34],
      ],
      source: 'Berend 2014',
    },
    // PaCO2 60: acute HCO3 24 + 1 x 2 = 26; chronic 24 + 3.5 x 2 = 31 (+/- 2)
    {
      band: 'acute_respiratory_acidosis',
      inside: [
        [60, 26],
        [60, 27.5],
      ],
      outside: [
        [60, 31],
        [60, 23],
      ],
      source: 'Berend 2014',
    },
    {
      band: 'chronic_respiratory_acidosis',
      inside: [
        [60, 31],
        [60, 32.5],
      ],
      outside: [
        [60, 26],
        [60, 34],
      ],
      source: 'Berend 2014',
    },
    // PaCO2 30: acute HCO3 24 - 2 = 22; chronic 24 - 4 to 5 = 19-20 (+/- 2)
    {
      band: 'acute_respiratory_alkalosis',
      inside: [
        [30, 22],
        [30, 23.5],
      ],
      outside: [
        [30, 19],
        [30, 25],
      ],
      source: 'Berend 2014',
    },
    {
      band: 'chronic_respiratory_alkalosis',
      inside: [
        [30, 19.5],
        [30, 17.5],
      ],
      outside: [
        [30, 15.5],
        [30, 23],
      ],
      source: 'Berend 2014',
    },
  ];
  for (const c of cases) {
    it(`holds the published ${c.band.replace(/_/g, ' ')} values inside the drawn band and not beyond (${c.source})`, () => {
      const poly = polygonOf(svg, c.band, frame);
      for (const [p, h] of c.inside)
        expect(inside(poly, at(p, h)), `PaCO2 ${p}, HCO3 ${h}`).toBe(true);
      for (const [p, h] of c.outside)
        expect(inside(poly, at(p, h)), `PaCO2 ${p}, HCO3 ${h}`).toBe(false);
    });
  }

  it('names the same bands in words as it draws, over a grid of gases', () => {
    let compared = 0;
    for (let ph = 6.95; ph <= 7.66; ph += 0.03) {
      for (let hco3 = 6; hco3 <= 48; hco3 += 1.5) {
        const gas = { ph, hco3, pco2: pco2From(ph, hco3) };
        const named = bandsContaining(gas, f.reference);
        for (const b of BANDS) {
          const poly = bandPolygon(b.code, f.reference);
          // the drawn edge is straight between samples: leave out gases within a hair of it
          const nearEdge =
            [0.004, -0.004].some(
              (d) => inside(poly, { ph: ph + d, hco3 }) !== inside(poly, { ph, hco3 }),
            ) ||
            [0.1, -0.1].some(
              (d) => inside(poly, { ph, hco3: hco3 + d }) !== inside(poly, { ph, hco3 }),
            );
          if (nearEdge) continue;
          expect(named.includes(b.code), `${b.code} at pH ${ph.toFixed(2)}, HCO3 ${hco3}`).toBe(
            inside(poly, { ph, hco3 }),
          );
          compared++;
        }
      }
    }
    expect(compared).toBeGreaterThan(2000);
  });

  it('starts the respiratory bands from a stated baseline (Berend 2014: rules apply from the usual values)', () => {
    const baseline = findingsOf({
      ...ketoacidosis,
      previous: [],
      context: { baseline: { pco2: 52, hco3: 30 } },
    });
    const poly = bandPolygon('chronic_respiratory_acidosis', baseline.reference);
    // first vertex: the usual PaCO2 52 with HCO3 30 - 2
    expect(pco2From(poly[0]?.ph as number, poly[0]?.hco3 as number)).toBeCloseTo(52, 6);
    expect(poly[0]?.hco3).toBeCloseTo(28, 6);
    // PaCO2 72, 20 above the usual 52: chronic HCO3 30 + 3.5 x 2 = 37
    expect(
      bandsContaining({ ph: phFrom(72, 37), pco2: 72, hco3: 37 }, baseline.reference),
    ).toContain('chronic_respiratory_acidosis');
    expect(acidBaseMap(baseline).text).toMatch(/usual values: PaCO2 52 mmHg, HCO3 30 mmol\/L/);
  });
});

describe('the case over time', () => {
  it('joins earlier gases in takenAt order, then the current gas', () => {
    const { svg, text } = acidBaseMap(findingsOf(ketoacidosis));
    const frame = frameOf(svg);
    // gas 1 is the 02:30 gas (pH 7.05, HCO3 7.5) although it was entered second
    const first = fromPoint(frame, markerAt(svg, 'gasline-map-gas-1'));
    expect(first.ph).toBeCloseTo(7.05, 3);
    expect(first.hco3).toBeCloseTo(7.5, 2);
    const second = fromPoint(frame, markerAt(svg, 'gasline-map-gas-2'));
    expect(second.ph).toBeCloseTo(7.12, 3);
    const steps = tags(svg, 'line')
      .filter((t) => t.class === 'gl-gas-step')
      .map((t) => `${t['data-from']}>${t['data-to']}`);
    expect(steps).toEqual(['1>2', '2>3']);
    for (const s of tags(svg, 'line').filter((t) => t.class === 'gl-gas-step'))
      expect(s['marker-end']).toBe('url(#gasline-map-arrow)');
    expect(text.indexOf('Gas 1 of 3, on arrival, taken 2 Mar 2026 02:30')).toBeLessThan(
      text.indexOf('Gas 2 of 3, taken 2 Mar 2026 04:10'),
    );
    expect(text).toMatch(/oldest first, by time taken/);
  });

  it('keeps the order entered when an earlier gas has no date and time', () => {
    const c = {
      ...ketoacidosis,
      previous: [
        ketoacidosis.previous[0],
        { label: 'after fluids', gas: { ph: 7.05, pco2: 28, hco3: 7.5 } },
      ],
    };
    const { svg, text } = acidBaseMap(findingsOf(c));
    const first = fromPoint(frameOf(svg), markerAt(svg, 'gasline-map-gas-1'));
    expect(first.ph).toBeCloseTo(7.12, 3);
    expect(text).toMatch(/in the order entered/);
  });

  it('emphasises the current gas', () => {
    const { svg } = acidBaseMap(findingsOf(ketoacidosis));
    expect(num(byId(svg, 'circle', 'gasline-map-gas-current'), 'r')).toBeGreaterThan(
      num(byId(svg, 'circle', 'gasline-map-gas-1'), 'r'),
    );
    expect(svg).toMatch(/<text class="gl-gas-label"[^>]*font-weight="700"[^>]*>3 now<\/text>/);
  });
});

describe('gases outside the window', () => {
  const { svg, text } = acidBaseMap(findingsOf(offScale));
  const frame = frameOf(svg);

  it('draws them at the edge they left by, with an outward mark', () => {
    const now = markerAt(svg, 'gasline-map-gas-current'); // pH 7.80 > 7.70
    expect(now.x).toBeCloseTo(frame.left + frame.width, 1);
    expect(fromPoint(frame, now).hco3).toBeCloseTo(45.5, 2);
    const before = markerAt(svg, 'gasline-map-gas-1'); // HCO3 51 > 50
    expect(before.y).toBeCloseTo(frame.top, 1);
    expect(fromPoint(frame, before).ph).toBeCloseTo(7.55, 3);
    expect(
      tags(svg, 'path')
        .filter((t) => t.class === 'gl-off-scale')
        .map((t) => t.id),
    ).toEqual(['gasline-map-off-scale-1', 'gasline-map-off-scale-2']);
    expect(svg).toContain('2 now (off scale)');
  });

  it('says so in words', () => {
    expect(text).toMatch(
      /Current gas \(2 of 2\): pH 7\.80[^\n]*outside the drawn window \(pH above 7\.70\), shown at its edge/,
    );
    expect(text).toMatch(/Gas 1 of 2[^\n]*outside the drawn window \(HCO3 above 50 mmol\/L\)/);
  });

  it('clamps a gas below both axes into the lower left corner', () => {
    // pH 6.80, PaCO2 30: HCO3 = 24 x 30 / 158.5 = 4.5 (Henderson)
    const low = acidBaseMap(findingsOf({ gas: { ph: 6.8, pco2: 30, hco3: 4.5 } }));
    const fr = frameOf(low.svg);
    const at = markerAt(low.svg, 'gasline-map-gas-current');
    expect(at.x).toBeCloseTo(fr.left, 1);
    expect(at.y).toBeCloseTo(fr.top + fr.height, 1);
    expect(low.text).toMatch(/pH below 6\.90, HCO3 below 5 mmol\/L/);
  });

  it('places nothing when the PaCO2 unit is in doubt, and asks', () => {
    // pH normal with "PaCO2 5.3 mmHg": probably kPa (clinical-scope section 3)
    const f = findingsOf({ gas: { ph: 7.4, pco2: 5.3 } });
    expect(f.withheld).toBe(true);
    const doubt = acidBaseMap(f);
    expect(doubt.svg).not.toContain('gasline-map-gas-current');
    expect(doubt.text).toMatch(/No gas is placed[^\n]*mmHg or kPa/);
  });
});

describe('units', () => {
  it('labels the PaCO2 lines in kPa when the clinician uses kPa', () => {
    const f = findingsOf(hypercapniaKpa);
    const { svg, text } = acidBaseMap(f);
    // a general-purpose UCUM library from the registry (it ships no type declarations)
    const ucum = createRequire(import.meta.url)('@lhncbc/ucum-lhc') as {
      UcumLhcUtils: {
        getInstance(): {
          convertUnitTo(from: string, v: number, to: string): { status: string; toVal: number };
        };
      };
    };
    const ucumUtils = ucum.UcumLhcUtils.getInstance();
    const labels = tags(svg, 'text').filter((t) => t.class === 'gl-isopleth-label');
    const words = [...svg.matchAll(/<text class="gl-isopleth-label"[^>]*>([^<]*)<\/text>/g)].map(
      (m) => m[1] as string,
    );
    expect(labels.length).toBe(ISOPLETHS_MMHG.length);
    ISOPLETHS_MMHG.forEach((mmHg, i) => {
      // independent conversion: UCUM mm[Hg] -> kPa (133.322 Pa per mmHg)
      const converted = ucumUtils.convertUnitTo('mm[Hg]', mmHg, 'kPa');
      expect(converted.status).toBe('succeeded');
      const kpa = converted.toVal;
      expect(words[i]).toContain(kpa.toFixed(1));
    });
    expect(words.join(' ')).toContain('kPa');
    expect(words.join(' ')).not.toContain('mmHg');
    expect(text).toContain('PaCO2 8.0 kPa');
    expect(text).toContain('(2.7, 4.0, 5.3, 6.7, 8.0, 10.7, 13.3 kPa)');
    expect(svg).toContain('PaCO₂ 8.0 kPa');
  });
});

describe('safety of the markup', () => {
  const c = {
    ...ketoacidosis,
    previous: [
      {
        takenAt: hostile,
        label: '"><img src=x onerror=alert(2)>',
        gas: { ph: 7.12, pco2: 25, hco3: 7.9 },
      },
    ],
  };
  const { svg, text } = acidBaseMap(findingsOf(c), { title: 'Map & <b>notes</b>' });

  it('escapes a hostile takenAt, label and title wherever they appear', () => {
    expect(svg).not.toMatch(/<script/i);
    expect(svg).not.toMatch(/<img/i);
    expect(svg).not.toMatch(/<b>/);
    expect(svg).toContain('&lt;script&gt;alert(1)&lt;/script&gt;');
    expect(svg).toContain('&quot;&gt;&lt;img src=x onerror=alert(2)&gt;');
    expect(svg).toContain('Map &amp; &lt;b&gt;notes&lt;/b&gt;');
    // the text alternative is plain text and keeps the words as typed
    expect(text).toContain(`taken ${hostile}`);
  });

  it('has no style attribute, no style or script element, no event handler', () => {
    for (const s of [
      svg,
      acidBaseMap(findingsOf(offScale)).svg,
      acidBaseMap(findingsOf(hypercapniaKpa)).svg,
    ]) {
      expect(s).not.toMatch(/\sstyle\s*=/i);
      expect(s).not.toMatch(/<style/i);
      expect(s).not.toMatch(/<script/i);
      expect(s).not.toMatch(/\son[a-z]+\s*=\s*"/i);
      expect(s).not.toMatch(/javascript:/i);
    }
  });

  it('drops characters XML cannot carry', () => {
    const odd = acidBaseMap(
      findingsOf({
        ...ketoacidosis,
        previous: [{ takenAt: 'night\u0001shift', gas: { ph: 7.12, pco2: 25, hco3: 7.9 } }],
      }),
    );
    expect(odd.svg).not.toContain('\u0001');
  });
});

describe('accessibility and determinism', () => {
  const f = findingsOf(ketoacidosis);
  const { svg, text } = acidBaseMap(f, { idPrefix: 'night-map' });

  it('is an image with a title and a description it is labelled by', () => {
    const root = tags(svg, 'svg')[0] as Attrs;
    expect(root.role).toBe('img');
    expect(root['aria-labelledby']).toBe('night-map-title night-map-desc');
    expect(svg).toMatch(/<title id="night-map-title">Acid-base map<\/title>/);
    expect(svg).toContain('<desc id="night-map-desc">Acid-base map: HCO3');
  });

  it('names each gas, its values and its band in the text alternative, with the cautions', () => {
    expect(text).toMatch(
      /Current gas \(3 of 3\): pH 7\.23, PaCO2 22 mmHg, HCO3 9 mmol\/L[^\n]*inside the metabolic acidosis band/,
    );
    // 02:30: HCO3 7.5 -> Winters 19.25 +/- 2; PaCO2 28 is above it
    expect(text).toMatch(
      /Gas 1 of 3, on arrival, taken 2 Mar 2026 02:30: pH 7\.05, PaCO2 28 mmHg, HCO3 7\.5 mmol\/L[^\n]*outside every compensation band/,
    );
    expect(text).toMatch(/Gas 2 of 3, taken 2 Mar 2026 04:10: pH 7\.12/);
    expect(text).toMatch(/steady state/);
    expect(text).toMatch(/local protocols/);
  });

  it('names two bands where the acute and chronic ones overlap', () => {
    // PaCO2 46, HCO3 25: acute 24.6 +/- 2 and chronic 26.1 +/- 2 (Berend 2014) both hold it
    const both = acidBaseMap(findingsOf({ gas: { ph: phFrom(46, 25), pco2: 46, hco3: 25 } })).text;
    expect(both).toMatch(/inside the acute and chronic respiratory acidosis bands/);
  });

  it('gives every id the prefix, uses each id once, and draws the same case the same way', () => {
    const ids = [...svg.matchAll(/\sid="([^"]+)"/g)].map((m) => m[1] as string);
    expect(ids.length).toBeGreaterThan(10);
    expect(new Set(ids).size).toBe(ids.length);
    for (const id of ids) expect(id.startsWith('night-map-')).toBe(true);
    for (const ref of [...svg.matchAll(/url\(#([^)]+)\)/g)].map((m) => m[1] as string))
      expect(ids).toContain(ref);
    expect(acidBaseMap(f, { idPrefix: 'night-map' })).toEqual({ svg, text });
  });

  it('refuses options it cannot honour, with a message', () => {
    expect(() => acidBaseMap(f, { idPrefix: '1 bad"id' })).toThrow(
      /idPrefix must start with a letter/,
    );
    expect(() => acidBaseMap(f, { height: 320 })).toThrow(/The map needs at least/);
    expect(() => acidBaseMap(f, { width: Number.NaN })).toThrow(/width must be a number/);
  });
});

// A real XML parser in a real browser: the markup is well formed and carries no script.
const chromiumPath = '/usr/bin/chromium';
const browserMissing = !existsSync(chromiumPath);
if (browserMissing) console.warn(`map browser check skipped: no ${chromiumPath}`);
describe.skipIf(browserMissing && process.env.CI !== 'true')('in a browser', () => {
  it('parses as SVG with no parser error, no script, and the hostile takenAt as text only', async () => {
    const { chromium } = await import('playwright-core');
    const browser = await chromium.launch({ executablePath: chromiumPath });
    try {
      const page = await browser.newPage();
      const c = {
        ...ketoacidosis,
        previous: [{ takenAt: hostile, gas: { ph: 7.12, pco2: 25, hco3: 7.9 } }],
      };
      const { svg } = acidBaseMap(findingsOf(c));
      const result = await page.evaluate((source) => {
        const doc = new DOMParser().parseFromString(source, 'image/svg+xml');
        return {
          errors: doc.getElementsByTagName('parsererror').length,
          scripts: doc.getElementsByTagName('script').length,
          root: doc.documentElement.localName,
          keyText: doc.documentElement.textContent ?? '',
        };
      }, svg);
      expect(result).toMatchObject({ errors: 0, scripts: 0, root: 'svg' });
      expect(result.keyText).toContain('<script>alert(1)<');
    } finally {
      await browser.close();
    }
  });
});
