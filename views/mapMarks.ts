// The gases on the map: the path from the oldest to the current gas, their markers, the legend and the key.
import type { PressureUnit } from '../calc/index.ts';
import { BANDS } from './mapBands.ts';
import type { Frame } from './mapGeometry.ts';
import {
  INK,
  ISOPLETH,
  LOOK,
  type Layout,
  MUTED,
  NORMAL_FILL,
  NORMAL_STROKE,
  PAPER,
  ROW,
  dashAttr,
  n2,
} from './mapStyle.ts';
import {
  type Placed,
  type PlottedGas,
  escapeXml,
  hco3Text,
  phText,
  pressureText,
} from './mapWords.ts';

export const radius = (g: PlottedGas) => (g.current ? 7 : 4.5);

export function path(placed: Placed[], id: (s: string) => string): string {
  const s: string[] = [`<g class="gl-gas-path" fill="none" stroke="${INK}" stroke-width="1.5">`];
  for (let i = 1; i < placed.length; i++) {
    const a = placed[i - 1] as Placed,
      b = placed[i] as Placed;
    const dx = b.at.x - a.at.x,
      dy = b.at.y - a.at.y,
      d = Math.hypot(dx, dy);
    const ra = radius(a) + 2,
      rb = radius(b) + (b.current ? 6 : 2.5);
    if (d <= ra + rb + 2) continue; // too close to draw an arrow between them
    const ux = dx / d,
      uy = dy / d;
    s.push(
      `<line class="gl-gas-step" data-from="${a.number}" data-to="${b.number}" x1="${n2(a.at.x + ux * ra)}" y1="${n2(a.at.y + uy * ra)}" x2="${n2(b.at.x - ux * rb)}" y2="${n2(b.at.y - uy * rb)}" marker-end="url(#${id('arrow')})"/>`,
    );
  }
  s.push('</g>');
  return s.join('\n');
}

export function markers(placed: Placed[], f: Frame, id: (s: string) => string): string {
  const s: string[] = ['<g class="gl-gases">'];
  for (const g of placed) {
    const { x, y } = g.at;
    const gid = g.current ? id('gas-current') : id(`gas-${g.number}`);
    const cls = `gl-gas ${g.current ? 'gl-gas-current' : 'gl-gas-earlier'}${g.clamped.off.ph || g.clamped.off.hco3 ? ' gl-gas-off-scale' : ''}`;
    s.push(`<g class="${cls}" data-number="${g.number}">`);
    if (g.current) {
      s.push(
        `<circle cx="${n2(x)}" cy="${n2(y)}" r="11" fill="${PAPER}" fill-opacity="0.7" stroke="${INK}" stroke-width="1.4"/>`,
      );
      s.push(
        `<circle id="${gid}" class="gl-gas-marker" cx="${n2(x)}" cy="${n2(y)}" r="7" fill="${INK}" stroke="${PAPER}" stroke-width="1.5"/>`,
      );
    } else {
      s.push(
        `<circle id="${gid}" class="gl-gas-marker" cx="${n2(x)}" cy="${n2(y)}" r="4.5" fill="${PAPER}" stroke="${INK}" stroke-width="1.7"/>`,
      );
    }
    const off = g.clamped.off;
    if (off.ph || off.hco3) {
      // an outward wedge: this gas lies beyond the edge in that direction
      const ux = off.ph === 'high' ? 1 : off.ph === 'low' ? -1 : 0;
      const uy = off.hco3 === 'high' ? -1 : off.hco3 === 'low' ? 1 : 0;
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
    // number (and "now") beside the marker, on the side with room
    const roomRight = x + 60 < f.left + f.width;
    const lx = roomRight ? x + radius(g) + 5 : x - radius(g) - 5;
    const ly = y < f.top + 16 ? y + radius(g) + 12 : y - radius(g) - 2;
    const words = g.current
      ? `${g.number} now${off.ph || off.hco3 ? ' (off scale)' : ''}`
      : `${g.number}${off.ph || off.hco3 ? ' (off scale)' : ''}`;
    s.push(
      `<text class="gl-gas-label" x="${n2(lx)}" y="${n2(ly)}" text-anchor="${roomRight ? 'start' : 'end'}" font-size="${g.current ? 12 : 11}" font-weight="${g.current ? 700 : 600}" stroke="${PAPER}" stroke-width="3.5" paint-order="stroke">${escapeXml(words)}</text>`,
    );
    s.push('</g>');
  }
  s.push('</g>');
  return s.join('\n');
}

export function legend(L: Layout, id: (s: string) => string): string {
  const f = L.frame;
  const col = f.width / 3;
  const s: string[] = ['<g class="gl-map-legend" font-size="10.5">'];
  const swatch = (
    cx: number,
    cy: number,
    fill: string,
    stroke: string,
    dash: string | null,
    width = 1.3,
  ) =>
    `<rect x="${n2(cx)}" y="${n2(cy - 9)}" width="26" height="11" fill="${fill}" stroke="${stroke}" stroke-width="${width}"${dashAttr(dash)}/>`;
  const cells: { c: number; r: number; draw: (x: number, y: number) => string; words: string }[] = [
    ...BANDS.map((b, i) => ({
      c: i < 2 ? 0 : i < 4 ? 1 : 2,
      r: i % 2,
      draw: (x: number, y: number) =>
        swatch(x, y, `url(#${id(`pattern-${b.code}`)})`, LOOK[b.code].colour, LOOK[b.code].dash),
      words: b.name,
    })),
    {
      c: 0,
      r: 2,
      draw: (x, y) => swatch(x, y, NORMAL_FILL, NORMAL_STROKE, null, 1.6),
      words: 'normal region',
    },
    {
      c: 1,
      r: 2,
      draw: (x, y) =>
        `<line x1="${n2(x)}" y1="${n2(y - 4)}" x2="${n2(x + 26)}" y2="${n2(y - 4)}" stroke="${ISOPLETH}" stroke-width="1.2"/>`,
      words: 'line of equal PaCO₂',
    },
    {
      c: 2,
      r: 2,
      draw: (x, y) =>
        `<circle cx="${n2(x + 5)}" cy="${n2(y - 4)}" r="3.5" fill="${PAPER}" stroke="${INK}" stroke-width="1.5"/><circle cx="${n2(x + 20)}" cy="${n2(y - 4)}" r="5" fill="${INK}"/>`,
      words: 'earlier gas, current gas',
    },
  ];
  for (const cell of cells) {
    const x = f.left + cell.c * col,
      y = L.legendTop + cell.r * ROW + 10;
    s.push(cell.draw(x, y));
    s.push(`<text x="${n2(x + 32)}" y="${n2(y)}">${escapeXml(cell.words)}</text>`);
  }
  s.push('</g>');
  return s.join('\n');
}

export function key(L: Layout, placed: Placed[], unit: PressureUnit): string {
  if (!placed.length) return '';
  const f = L.frame;
  const s: string[] = ['<g class="gl-map-key" font-size="10.5">'];
  // the newest rows when there are more gases than room; the text alternative lists them all
  const hidden = placed.length > L.keyRows ? placed.length - (L.keyRows - 1) : 0;
  const rows = hidden ? placed.slice(hidden) : placed;
  let y = L.keyTop + 10;
  if (hidden) {
    s.push(
      `<text x="${n2(f.left)}" y="${n2(y)}" fill="${MUTED}">${hidden} earlier gas${hidden === 1 ? '' : 'es'} not listed here: see the text alternative</text>`,
    );
    y += ROW;
  }
  const cols = [0, 20, 150, 212, 332, 430].map((c) => f.left + (c * f.width) / 596);
  for (const g of rows) {
    const c = (i: number) => n2(cols[i] as number);
    const when = g.current ? 'current' : (g.when ?? (g.label ? '' : 'earlier'));
    const name = [when, g.label].filter(Boolean).join(', ');
    const where = g.normal
      ? 'normal region'
      : g.bands.length
        ? g.bands.map((b) => LOOK[b].short).join(' + ')
        : 'outside the bands';
    const weight = g.current ? ' font-weight="700"' : '';
    s.push(
      `<text class="gl-key-row" data-number="${g.number}" y="${n2(y)}"${weight}>` +
        `<tspan x="${c(0)}">${g.number}</tspan>` +
        `<tspan x="${c(1)}">${escapeXml(name.length > 19 ? `${name.slice(0, 18)}…` : name)}</tspan>` +
        `<tspan x="${c(2)}">pH ${phText(g.gas.ph)}</tspan>` +
        `<tspan x="${c(3)}">PaCO₂ ${pressureText(g.gas.pco2, unit)} ${unit}</tspan>` +
        `<tspan x="${c(4)}">HCO₃⁻ ${hco3Text(g.gas.hco3)}</tspan>` +
        `<tspan x="${c(5)}">${where}${g.clamped.off.ph || g.clamped.off.hco3 ? ' (off scale)' : ''}</tspan></text>`,
    );
    y += ROW;
  }
  s.push('</g>');
  return s.join('\n');
}
