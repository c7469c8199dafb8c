// The patient on the chart: the gases joined in time order, today's gas emphasised, a venous gas's arterial
// span as a bar, the ventilator target as a dashed arrow, and the key to every mark.
import type {
  ArterialEstimate,
  Clamped,
  Frame,
  Placement,
  Point,
  TargetPoint,
} from './chartGeometry.ts';
import { clampToWindow, toPoint } from './chartGeometry.ts';
import {
  FONT,
  INK,
  LINE,
  type Layout,
  NORMAL_FILL,
  NORMAL_STROKE,
  PAPER,
  ROW,
  n2,
} from './chartStyle.ts';
import { type Obstacles, labelSpot } from './chartLabels.ts';
import { type PlottedGas, escapeXml } from './chartText.ts';

export interface Placed extends PlottedGas {
  placement: Placement;
  /** a venous gas's arterial estimate, the figures the note gives */
  estimate: ArterialEstimate | null;
  clamped: Clamped;
  at: Point;
  normal: boolean;
}

const HALO = `stroke="${PAPER}" stroke-width="3.5" paint-order="stroke"`;
const radius = (g: Placed) => (g.current ? 6.5 : 4.5);
const offScale = (g: Placed) => !!(g.clamped.off.pco2 || g.clamped.off.hPlus);

/** A straight step from a to b that stops short of both marks, with an arrowhead at b; two marks too close for
 *  an arrow are still joined, centre to centre, under the marks. */
function step(a: Point, b: Point, ra: number, rb: number, attrs: string, arrow: string): string {
  const dx = b.x - a.x,
    dy = b.y - a.y,
    d = Math.hypot(dx, dy);
  if (d <= ra + rb + 8)
    return `<line ${attrs} x1="${n2(a.x)}" y1="${n2(a.y)}" x2="${n2(b.x)}" y2="${n2(b.y)}"/>`;
  const ux = dx / d,
    uy = dy / d;
  return `<line ${attrs} x1="${n2(a.x + ux * ra)}" y1="${n2(a.y + uy * ra)}" x2="${n2(b.x - ux * rb)}" y2="${n2(b.y - uy * rb)}" marker-end="url(#${arrow})"/>`;
}

export function path(placed: Placed[], id: (s: string) => string): string {
  const s: string[] = [`<g class="gl-gas-path" fill="none" stroke="${INK}" stroke-width="1.5">`];
  for (let i = 1; i < placed.length; i++) {
    const a = placed[i - 1] as Placed,
      b = placed[i] as Placed;
    s.push(
      step(
        a.at,
        b.at,
        radius(a) + 1.5,
        radius(b) + (b.current ? 5.5 : 2),
        `class="gl-gas-step" data-from="${a.number}" data-to="${b.number}"`,
        id('arrow'),
      ),
    );
  }
  s.push('</g>');
  return s.join('\n');
}

/** The span of arterial PaCO2 a venous gas stands for: a bar with end caps through its mark. */
function rangeBar(f: Frame, g: Placed): string {
  const r = g.placement.pco2Range;
  if (!r) return '';
  // beneath the mark, at the true scale (the span is narrower than the mark itself)
  const y = g.at.y + radius(g) + (g.current ? 10 : 6);
  const a = toPoint(f, clampToWindow({ pco2: r.low, hPlus: g.clamped.point.hPlus }).point).x;
  const b = toPoint(f, clampToWindow({ pco2: r.high, hPlus: g.clamped.point.hPlus }).point).x;
  return `<path class="gl-venous-range" data-pco2-low="${r.low}" data-pco2-high="${r.high}" d="M${n2(a)},${n2(y - 6)} V${n2(y + 6)} M${n2(a)},${n2(y)} H${n2(b)} M${n2(b)},${n2(y - 6)} V${n2(y + 6)}" stroke="${INK}" stroke-width="2" fill="none"/>`;
}

/** What a gas's label keeps clear of: the other marks, the steps between gases, and the target's arrow. */
function obstacles(
  placed: Placed[],
  g: Placed | null,
  target: Point | null,
  extra: Point[] = [],
): Obstacles {
  const current = placed.at(-1);
  const segments: [Point, Point][] = placed
    .slice(1)
    .map((b, i) => [(placed[i] as Placed).at, b.at]);
  if (target && current) segments.push([current.at, target]);
  return {
    points: [
      ...placed.filter((p) => p !== g).map((p) => p.at),
      ...(target ? [target] : []),
      ...extra,
    ],
    segments,
  };
}

export function markers(
  placed: Placed[],
  f: Frame,
  id: (s: string) => string,
  target: Point | null,
  zone: Point[],
): string {
  const s: string[] = ['<g class="gl-gases">'];
  for (const g of placed) {
    const { x, y } = g.at;
    const cls = `gl-gas ${g.current ? 'gl-gas-current' : 'gl-gas-earlier'}${offScale(g) ? ' gl-gas-off-scale' : ''}`;
    s.push(`<g class="${cls}" data-number="${g.number}" data-basis="${g.placement.basis}">`);
    s.push(rangeBar(f, g));
    const gid = g.current ? id('gas-current') : id(`gas-${g.number}`);
    if (g.current) {
      s.push(
        `<circle cx="${n2(x)}" cy="${n2(y)}" r="10.5" fill="none" stroke="${INK}" stroke-width="1.4"/>`,
      );
      s.push(
        `<circle id="${gid}" class="gl-gas-marker" cx="${n2(x)}" cy="${n2(y)}" r="6.5" fill="${INK}" stroke="${PAPER}" stroke-width="1.5"/>`,
      );
    } else {
      s.push(
        `<circle id="${gid}" class="gl-gas-marker" cx="${n2(x)}" cy="${n2(y)}" r="4.5" fill="${PAPER}" stroke="${INK}" stroke-width="1.8"/>`,
      );
    }
    const off = g.clamped.off;
    if (offScale(g)) {
      // an outward wedge: this gas lies beyond the edge in that direction
      const ux = off.pco2 === 'high' ? 1 : off.pco2 === 'low' ? -1 : 0;
      const uy = off.hPlus === 'high' ? -1 : off.hPlus === 'low' ? 1 : 0;
      const len = Math.hypot(ux, uy),
        vx = ux / len,
        vy = uy / len;
      const r = radius(g) + (g.current ? 6 : 3);
      const base = { x: x + vx * r, y: y + vy * r },
        tip = { x: x + vx * (r + 9), y: y + vy * (r + 9) };
      s.push(
        `<path id="${id(`off-scale-${g.number}`)}" class="gl-off-scale" d="M${n2(base.x - vy * 5)},${n2(base.y + vx * 5)} L${n2(tip.x)},${n2(tip.y)} L${n2(base.x + vy * 5)},${n2(base.y - vx * 5)} z" fill="${INK}"/>`,
      );
    }
    const words = `${g.current ? 'now' : g.number}${offScale(g) ? ' (off scale)' : ''}`;
    const size = g.current ? FONT.gas : FONT.label;
    const spot = labelSpot(
      g.at,
      words,
      size,
      radius(g) + (g.current ? 6 : 3),
      f,
      obstacles(placed, g, target, zone),
    );
    s.push(
      `<text class="gl-gas-label" x="${n2(spot.x)}" y="${n2(spot.y)}" text-anchor="${spot.anchor}" font-size="${size}" font-weight="${g.current ? 700 : 600}" ${HALO}>${escapeXml(words)}</text>`,
    );
    s.push('</g>');
  }
  s.push('</g>');
  return s.join('\n');
}

/** From today's gas to where the ventilator suggestion aims: a dashed arrow, labelled at its head. */
export function targetArrow(
  f: Frame,
  placed: Placed[],
  target: TargetPoint,
  zone: Point[],
  id: (s: string) => string,
): string {
  const from = placed.at(-1) as Placed;
  const to = toPoint(f, clampToWindow(target).point);
  const line = step(
    from.at,
    to,
    radius(from) + 6,
    1,
    `class="gl-target-step" stroke="${INK}" stroke-width="1.6" stroke-dasharray="5 3"`,
    id('arrow-open'),
  );
  // the label beside the head, clear of the arrow, the gases and the normal box
  const avoid = obstacles(placed, null, null, zone);
  avoid.segments.push([from.at, to]);
  const spot = labelSpot(to, 'target', FONT.label, 8, f, avoid);
  return (
    `<g class="gl-target" data-target-pco2-mmhg="${n2(target.pco2)}" data-target-hplus="${n2(target.hPlus)}" data-target-hco3="${n2(target.hco3)}">${line}` +
    `<text x="${n2(spot.x)}" y="${n2(spot.y)}" text-anchor="${spot.anchor}" font-size="${FONT.label}" font-weight="600" ${HALO}>target</text></g>`
  );
}

export interface KeyEntry {
  glyph: (x: number, y: number) => string;
  words: string;
}

export const KEY = {
  today: {
    glyph: (x, y) => `<circle cx="${n2(x + 10)}" cy="${n2(y)}" r="5.5" fill="${INK}"/>`,
    words: 'today’s gas',
  },
  earlier: {
    glyph: (x, y) =>
      `<circle cx="${n2(x + 4)}" cy="${n2(y)}" r="3.5" fill="${PAPER}" stroke="${INK}" stroke-width="1.6"/><line x1="${n2(x + 9)}" y1="${n2(y)}" x2="${n2(x + 22)}" y2="${n2(y)}" stroke="${INK}" stroke-width="1.5"/>`,
    words: 'earlier, in order',
  },
  line: {
    glyph: (x, y) =>
      `<line x1="${n2(x)}" y1="${n2(y + 5)}" x2="${n2(x + 22)}" y2="${n2(y - 5)}" stroke="${LINE}" stroke-width="1.2"/>`,
    words: 'HCO₃⁻ line, mmol/L',
  },
  normal: {
    glyph: (x, y) =>
      `<rect x="${n2(x + 2)}" y="${n2(y - 6)}" width="18" height="12" fill="${NORMAL_FILL}" stroke="${NORMAL_STROKE}" stroke-width="1.4"/>`,
    words: 'normal range',
  },
  target: {
    glyph: (x, y) =>
      `<line x1="${n2(x)}" y1="${n2(y)}" x2="${n2(x + 22)}" y2="${n2(y)}" stroke="${INK}" stroke-width="1.6" stroke-dasharray="5 3"/>`,
    words: 'ventilator target',
  },
  venous: {
    glyph: (x, y) =>
      `<path d="M${n2(x + 2)},${n2(y - 6)} V${n2(y + 6)} M${n2(x + 2)},${n2(y)} H${n2(x + 20)} M${n2(x + 20)},${n2(y - 6)} V${n2(y + 6)}" stroke="${INK}" stroke-width="2" fill="none"/>`,
    words: 'estimated PaCO₂',
  },
  reference: {
    glyph: (x, y) =>
      `<path d="M${n2(x + 5)},${n2(y)} H${n2(x + 17)} M${n2(x + 11)},${n2(y - 6)} V${n2(y + 6)}" stroke="${INK}" stroke-width="1.8"/>`,
    words: 'reference point',
  },
} satisfies Record<string, KeyEntry>;

/** The key under the plot, two entries to a row. */
export function key(L: Layout, entries: KeyEntry[]): string {
  const s: string[] = [`<g class="gl-chart-key" font-size="${FONT.label}" fill="${INK}">`];
  entries.forEach((e, i) => {
    const x = i % 2 === 0 ? 8 : L.width / 2 + 4;
    const y = L.keyTop + Math.floor(i / 2) * ROW;
    s.push(e.glyph(x, y - 4));
    s.push(`<text x="${n2(x + 28)}" y="${n2(y)}">${escapeXml(e.words)}</text>`);
  });
  s.push('</g>');
  return s.join('\n');
}

export const arrowDefs = (id: (s: string) => string) =>
  `<marker id="${id('arrow')}" viewBox="0 0 10 10" refX="8.5" refY="5" markerWidth="6" markerHeight="6" orient="auto" markerUnits="strokeWidth"><path d="M0,1 L9,5 L0,9 L2.5,5 z" fill="${INK}"/></marker>` +
  `<marker id="${id('arrow-open')}" viewBox="0 0 10 10" refX="8.5" refY="5" markerWidth="7" markerHeight="7" orient="auto" markerUnits="strokeWidth"><path d="M0.5,1 L9,5 L0.5,9" fill="none" stroke="${INK}" stroke-width="1.5"/></marker>`;
