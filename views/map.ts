// The acid-base map: plasma HCO3 against pH, with lines of equal PaCO2 and the bands of expected
// compensation for single disorders, drawn as SVG on the server. Every physiological number comes from
// calc/ (the Henderson equation and the compensation rules); these files only place and word them.
// No inline style, no script: presentation attributes and class names only (strict CSP).
import { gasTime, type Findings } from '../calc/index.ts';
import { BANDS, bandsContaining, inNormalRegion, normalRegionPolygon } from './mapBands.ts';
import {
  DAY_MS,
  type Placed,
  escapeXml,
  gasesInTimeOrder,
  textAlternative,
  whenText,
} from './mapWords.ts';
import {
  INK,
  LOOK,
  MUTED,
  type MapOptions,
  type MapResult,
  NORMAL_FILL,
  NORMAL_STROKE,
  PAPER,
  checkOptions,
  layout,
  n2,
  patternDef,
  pointsAttr,
} from './mapStyle.ts';
import {
  axes,
  bandLabels,
  bands,
  isoplethLabels,
  isopleths,
  normalLabel,
  referenceMark,
} from './mapPlot.ts';
import { clampToWindow, toPoint } from './mapGeometry.ts';
import { key, legend, markers, path } from './mapMarks.ts';

// the map's parts, for the tests and the chart that will replace it
export {
  MAP_WINDOW,
  ISOPLETHS_MMHG,
  HYDROGEN_ION_TICKS,
  type PhHco3,
  type Frame,
  type Point,
  toPoint,
  fromPoint,
  type Overflow,
  type Clamped,
  clampToWindow,
  isoplethPoints,
} from './mapGeometry.ts';
export {
  type BandCode,
  BANDS,
  bandPolygon,
  type GasValues,
  bandsContaining,
  normalRegionPolygon,
  inNormalRegion,
} from './mapBands.ts';
export {
  type PlottedGas,
  gasesInTimeOrder,
  whenText,
  escapeXml,
  pressureText,
} from './mapWords.ts';
export type { MapOptions, MapResult } from './mapStyle.ts';

/** The acid-base map of a case: the SVG and a plain-language text alternative saying the same. */
export function acidBaseMap(findings: Findings, options: MapOptions = {}): MapResult {
  const o = checkOptions(options);
  const unit = findings.units.pressure;
  const reference = findings.reference;
  const { gases, byTakenAt } = gasesInTimeOrder(findings);
  // with a unit in doubt nothing is computed from the pressure, so no gas is placed (clinical-scope section 3)
  const plotted = findings.withheld ? [] : gases;
  const L = layout(o.width, o.height, plotted.length);
  const f = L.frame;
  const id = (s: string) => `${o.idPrefix}-${s}`;

  const days = plotted.flatMap((g) => {
    const time = gasTime(g.takenAt);
    return time === null ? [] : [Math.floor(time / DAY_MS)];
  });
  const oneDay = days.length > 0 && new Set(days).size === 1;
  const placed: Placed[] = plotted.map((g) => {
    const clamped = clampToWindow({ ph: g.gas.ph, hco3: g.gas.hco3 });
    return {
      ...g,
      clamped,
      at: toPoint(f, clamped.point),
      bands: bandsContaining(g.gas, reference),
      normal: inNormalRegion(g.gas),
      when: whenText(g.takenAt, oneDay),
    };
  });

  const text = textAlternative(findings, placed, byTakenAt, unit);
  const out: string[] = [];
  const push = (s: string) => out.push(s);

  push(
    `<svg xmlns="http://www.w3.org/2000/svg" class="gl-map" viewBox="0 0 ${L.width} ${L.height}" width="${L.width}" height="${L.height}" role="img" aria-labelledby="${id('title')} ${id('desc')}" font-family="system-ui, 'Segoe UI', 'DejaVu Sans', Arial, sans-serif" font-size="11" fill="${INK}">`,
  );
  push(`<title id="${id('title')}">${escapeXml(o.title)}</title>`);
  push(`<desc id="${id('desc')}">${escapeXml(text)}</desc>`);

  // definitions: clip to the plot, band patterns, the arrowhead
  push('<defs>');
  push(
    `<clipPath id="${id('clip')}"><rect x="${n2(f.left)}" y="${n2(f.top)}" width="${n2(f.width)}" height="${n2(f.height)}"/></clipPath>`,
  );
  for (const b of BANDS) push(patternDef(id(`pattern-${b.code}`), LOOK[b.code]));
  push(
    `<marker id="${id('arrow')}" viewBox="0 0 10 10" refX="8.5" refY="5" markerWidth="6" markerHeight="6" orient="auto" markerUnits="strokeWidth"><path d="M0,1 L9,5 L0,9 L2.5,5 z" fill="${INK}"/></marker>`,
  );
  push('</defs>');

  push(
    `<rect class="gl-map-paper" x="0" y="0" width="${L.width}" height="${L.height}" fill="${PAPER}"/>`,
  );
  push(
    `<text class="gl-map-title" x="${f.left}" y="22" font-size="15" font-weight="600">${escapeXml(o.title)}</text>`,
  );

  push(axes(f));
  push(`<g class="gl-map-plot" clip-path="url(#${id('clip')})">`);
  push(isopleths(f, unit));
  push(bands(f, reference, id));
  push(
    `<polygon class="gl-region gl-region-normal" data-region="normal" points="${pointsAttr(f, normalRegionPolygon())}" fill="${NORMAL_FILL}" fill-opacity="0.85" stroke="${NORMAL_STROKE}" stroke-width="1.6"/>`,
  );
  push('</g>');
  push(bandLabels(f, reference));
  push(normalLabel(f));
  push(isoplethLabels(f, unit));
  if (reference.kind !== 'textbook') push(referenceMark(f, reference));
  push(
    `<rect class="gl-map-frame" x="${n2(f.left)}" y="${n2(f.top)}" width="${n2(f.width)}" height="${n2(f.height)}" fill="none" stroke="${INK}" stroke-width="1" id="${id('plot')}"/>`,
  );
  push(path(placed, id));
  push(markers(placed, f, id));
  if (findings.withheld) {
    push(
      `<text class="gl-map-withheld" x="${n2(f.left + f.width / 2)}" y="${n2(f.top + 24)}" text-anchor="middle" font-size="12" font-weight="600" stroke="${PAPER}" stroke-width="4" paint-order="stroke">No gas placed: confirm whether PaCO2 was entered in mmHg or kPa</text>`,
    );
  }
  push(legend(L, id));
  push(key(L, placed, unit));
  push(
    `<text class="gl-map-caution" x="${f.left}" y="${L.footY}" font-size="9.5" fill="${MUTED}">Bands: expected compensation for single disorders (rules of thumb, steady state). Decision support only; follow local protocols.</text>`,
  );
  push('</svg>');
  return { svg: out.join('\n'), text };
}
