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

/** The marks a gas is joined to: the gases before and after it, and for today's gas the target. */
function neighbours(placed: Placed[], g: Placed, target: Point | null): Point[] {
  const i = placed.indexOf(g);
  const joined = [placed[i - 1], placed[i + 1]].flatMap((n) => (n ? [n.at] : []));
  return g.current && target ? [...joined, target] : joined;
}

/**
 * Where a mark's label goes: away from the marks it is joined to (so the path and the arrows stay clear), at
 * the given distance, and inside the frame. With nothing to avoid, up and to the right.
 */
export function labelSpot(
  at: Point,
  avoid: Point[],
  distance: number,
  f: Frame,
): { x: number; y: number; anchor: 'start' | 'end' } {
  let vx = 0,
    vy = 0;
  for (const n of avoid) {
    const d = Math.hypot(at.x - n.x, at.y - n.y);
    if (d > 0.5) {
      vx += (at.x - n.x) / d;
      vy += (at.y - n.y) / d;
    }
  }
  let len = Math.hypot(vx, vy);
  if (len < 0.3) {
    // on a straight path (or alone): beside it, on the side nearer the upper right
    const n = avoid[0];
    const ux = n ? (at.x - n.x) / Math.max(1, Math.hypot(at.x - n.x, at.y - n.y)) : 0;
    const uy = n ? (at.y - n.y) / Math.max(1, Math.hypot(at.x - n.x, at.y - n.y)) : 0;
    [vx, vy] = n && Math.hypot(ux, uy) > 0 ? (ux + uy > 0 ? [uy, -ux] : [-uy, ux]) : [0.6, -0.8];
    len = Math.hypot(vx, vy);
  }
  vx /= len;
  vy /= len;
  const anchor = vx >= 0 ? 'start' : 'end';
  let x = at.x + vx * distance,
    y = at.y + vy * distance + 4.5 + (vy > 0.3 ? 4 : 0);
  // inside the frame: flip to the other side when the label would leave it
  if (anchor === 'start' && x + 40 > f.left + f.width) x = at.x - distance;
  if (anchor === 'end' && x - 40 < f.left) x = at.x + distance;
  const flipped = x < at.x ? 'end' : 'start';
  y = Math.min(f.top + f.height - 4, Math.max(f.top + 14, y));
  return { x, y, anchor: flipped };
}

export function markers(
  placed: Placed[],
  f: Frame,
  id: (s: string) => string,
  target: Point | null,
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
    const spot = labelSpot(g.at, neighbours(placed, g, target), radius(g) + (g.current ? 6 : 3), f);
    const words = `${g.current ? 'now' : g.number}${offScale(g) ? ' (off scale)' : ''}`;
    s.push(
      `<text class="gl-gas-label" x="${n2(spot.x)}" y="${n2(spot.y)}" text-anchor="${spot.anchor}" font-size="${g.current ? FONT.gas : FONT.label}" font-weight="${g.current ? 700 : 600}" ${HALO}>${escapeXml(words)}</text>`,
    );
    s.push('</g>');
  }
  s.push('</g>');
  return s.join('\n');
}

/** From today's gas to where the ventilator suggestion aims: a dashed arrow, labelled at its head. */
export function targetArrow(
  f: Frame,
  from: Placed,
  target: TargetPoint,
  id: (s: string) => string,
): string {
  const to = toPoint(f, clampToWindow(target).point);
  const line = step(
    from.at,
    to,
    radius(from) + 6,
    1,
    `class="gl-target-step" stroke="${INK}" stroke-width="1.6" stroke-dasharray="5 3"`,
    id('arrow-open'),
  );
  // the label beside the head, across the arrow on the side towards the right, clear of the shaft
  const d = Math.max(1, Math.hypot(to.x - from.at.x, to.y - from.at.y));
  const ux = (to.x - from.at.x) / d,
    uy = (to.y - from.at.y) / d;
  const [px, py] = uy >= 0 ? [uy, -ux] : [-uy, ux];
  const lx = to.x + px * 12,
    ly = to.y + py * 12 + 4.5;
  const anchor = px >= 0 ? 'start' : 'end';
  return (
    `<g class="gl-target" data-target-pco2-mmhg="${n2(target.pco2)}" data-target-hplus="${n2(target.hPlus)}" data-target-hco3="${n2(target.hco3)}">${line}` +
    `<text x="${n2(lx)}" y="${n2(ly)}" text-anchor="${anchor}" font-size="${FONT.label}" font-weight="600" ${HALO}>target</text></g>`
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
    words: 'arterial estimate',
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
