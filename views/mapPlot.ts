// The plot's layers: axes, lines of equal PaCO2, bands and their labels, the normal region's label and the
// patient's own reference.
import { acidBase, reference, type PressureUnit, type ReferencePoint } from '../calc/index.ts';
import { BANDS, type BandCode, bandPolygon } from './mapBands.ts';
import {
  type Frame,
  HYDROGEN_ION_TICKS,
  ISOPLETHS_MMHG,
  MAP_WINDOW,
  clampToWindow,
  hco3Of,
  isoplethPoints,
  phOf,
  toPoint,
} from './mapGeometry.ts';
import {
  GRID,
  INK,
  ISOPLETH,
  LOOK,
  MUTED,
  NORMAL_STROKE,
  PAPER,
  dashAttr,
  n2,
  pointsAttr,
} from './mapStyle.ts';
import { escapeXml, pressureText } from './mapWords.ts';

const { NORMAL } = reference;
const { phFromHydrogenIon } = acidBase;

export function axes(f: Frame): string {
  const s: string[] = ['<g class="gl-map-axes">'];
  const bottom = f.top + f.height,
    right = f.left + f.width;
  // pH: major ticks every 0.1, minor every 0.05
  for (let i = 0; i <= 16; i++) {
    const ph = MAP_WINDOW.ph.min + i * 0.05;
    const x = toPoint(f, { ph, hco3: MAP_WINDOW.hco3.min }).x;
    const major = i % 2 === 0;
    if (major && i > 0 && i < 16)
      s.push(
        `<line class="gl-grid" x1="${n2(x)}" y1="${n2(f.top)}" x2="${n2(x)}" y2="${n2(bottom)}" stroke="${GRID}" stroke-width="1"/>`,
      );
    s.push(
      `<line x1="${n2(x)}" y1="${n2(bottom)}" x2="${n2(x)}" y2="${n2(bottom + (major ? 6 : 3))}" stroke="${INK}" stroke-width="1"/>`,
    );
    if (major)
      s.push(
        `<text x="${n2(x)}" y="${n2(bottom + 18)}" text-anchor="middle">${ph.toFixed(1)}</text>`,
      );
  }
  s.push(
    `<text class="gl-axis-title" x="${n2(f.left + f.width / 2)}" y="${n2(bottom + 34)}" text-anchor="middle" font-size="12" font-weight="600">pH</text>`,
  );
  // normal pH and HCO3 as faint reference lines
  const mid = toPoint(f, { ph: NORMAL.ph.mid, hco3: NORMAL.hco3.mid });
  s.push(
    `<line class="gl-grid gl-grid-normal" x1="${n2(mid.x)}" y1="${n2(f.top)}" x2="${n2(mid.x)}" y2="${n2(bottom)}" stroke="#c9cfd3" stroke-width="1" stroke-dasharray="2 3"/>`,
  );
  s.push(
    `<line class="gl-grid gl-grid-normal" x1="${n2(f.left)}" y1="${n2(mid.y)}" x2="${n2(right)}" y2="${n2(mid.y)}" stroke="#c9cfd3" stroke-width="1" stroke-dasharray="2 3"/>`,
  );
  // HCO3: ticks every 5 mmol/L
  for (let h = MAP_WINDOW.hco3.min; h <= MAP_WINDOW.hco3.max; h += 5) {
    const y = toPoint(f, { ph: MAP_WINDOW.ph.min, hco3: h }).y;
    if (h > MAP_WINDOW.hco3.min && h < MAP_WINDOW.hco3.max)
      s.push(
        `<line class="gl-grid" x1="${n2(f.left)}" y1="${n2(y)}" x2="${n2(right)}" y2="${n2(y)}" stroke="${GRID}" stroke-width="1"/>`,
      );
    s.push(
      `<line x1="${n2(f.left - 6)}" y1="${n2(y)}" x2="${n2(f.left)}" y2="${n2(y)}" stroke="${INK}" stroke-width="1"/>`,
    );
    s.push(`<text x="${n2(f.left - 9)}" y="${n2(y + 4)}" text-anchor="end">${h}</text>`);
  }
  const cy = f.top + f.height / 2;
  s.push(
    `<text class="gl-axis-title" x="${n2(f.left - 40)}" y="${n2(cy)}" text-anchor="middle" font-size="12" font-weight="600" transform="rotate(-90 ${n2(f.left - 40)} ${n2(cy)})">HCO₃⁻ (mmol/L)</text>`,
  );
  // [H+] along the top, the same axis read the other way: [H+] = 10^(9 - pH)
  for (const h of HYDROGEN_ION_TICKS) {
    const x = toPoint(f, { ph: phFromHydrogenIon(h), hco3: MAP_WINDOW.hco3.max }).x;
    s.push(
      `<line x1="${n2(x)}" y1="${n2(f.top - 5)}" x2="${n2(x)}" y2="${n2(f.top)}" stroke="${INK}" stroke-width="1"/>`,
    );
    s.push(
      `<text class="gl-hplus-tick" data-hplus="${h}" x="${n2(x)}" y="${n2(f.top - 9)}" text-anchor="middle" font-size="10" fill="${MUTED}">${h}</text>`,
    );
  }
  s.push(
    `<text class="gl-axis-title" x="${n2(right)}" y="${n2(f.top - 24)}" text-anchor="end" font-size="10.5" fill="${MUTED}">[H⁺] nmol/L</text>`,
  );
  s.push('</g>');
  return s.join('\n');
}

export function isopleths(f: Frame, unit: PressureUnit): string {
  return [
    '<g class="gl-isopleths">',
    ...ISOPLETHS_MMHG.map((p) => {
      const pts = isoplethPoints(p);
      if (!pts.length) return '';
      const heavy = p === NORMAL.pco2.mid;
      return `<polyline class="gl-isopleth" data-pco2-mmhg="${p}" data-label="${escapeXml(pressureText(p, unit, 'label'))} ${unit}" points="${pointsAttr(f, pts)}" fill="none" stroke="${ISOPLETH}" stroke-width="${heavy ? 1.4 : 0.9}"/>`;
    }),
    '</g>',
  ].join('\n');
}

export function isoplethLabels(f: Frame, unit: PressureUnit): string {
  const s: string[] = ['<g class="gl-isopleth-labels" font-size="10" fill="#6d777d">'];
  ISOPLETHS_MMHG.forEach((p, i) => {
    const pts = isoplethPoints(p);
    const end = pts.at(-1);
    if (!end) return;
    const q = toPoint(f, end);
    // label just inside the window where the line leaves it, at the top or at the right
    const atTop = end.hco3 >= MAP_WINDOW.hco3.max - 1e-9;
    const x = q.x - 4,
      y = atTop ? q.y + 12 : q.y - 5;
    const value = pressureText(p, unit, 'label');
    const label = i === ISOPLETHS_MMHG.length - 1 ? `PaCO₂ ${value} ${unit}` : value;
    s.push(
      `<text class="gl-isopleth-label" data-pco2-mmhg="${p}" x="${n2(x)}" y="${n2(y)}" text-anchor="end" stroke="${PAPER}" stroke-width="3" paint-order="stroke">${escapeXml(label)}</text>`,
    );
  });
  s.push('</g>');
  return s.join('\n');
}

export function bands(f: Frame, reference: ReferencePoint, id: (s: string) => string): string {
  const s: string[] = ['<g class="gl-bands">'];
  for (const b of BANDS) {
    const poly = bandPolygon(b.code, reference);
    if (!poly.length) continue;
    const look = LOOK[b.code];
    s.push(
      `<polygon class="gl-band gl-band-${b.code.replace(/_/g, '-')}" data-band="${b.code}" points="${pointsAttr(f, poly)}" fill="url(#${id(`pattern-${b.code}`)})" stroke="${look.colour}" stroke-width="1.3"${dashAttr(look.dash)} stroke-linejoin="round"/>`,
    );
  }
  s.push('</g>');
  return s.join('\n');
}

/** Direct labels at the outer end of each band, kept inside the window. */
export function bandLabels(f: Frame, reference: ReferencePoint): string {
  const s: string[] = ['<g class="gl-band-labels" font-size="10.5" font-weight="600">'];
  // where along each band (0-1) the label sits, and how it is anchored (drawing choices, checked by eye)
  const place: Record<
    BandCode,
    { at: number; dx: number; dy: number; anchor: 'start' | 'end' | 'middle' }
  > = {
    metabolic_acidosis: { at: 0.62, dx: -12, dy: 4, anchor: 'end' },
    metabolic_alkalosis: { at: 0.55, dx: 12, dy: 4, anchor: 'start' },
    acute_respiratory_acidosis: { at: 0.85, dx: 0, dy: 18, anchor: 'middle' },
    chronic_respiratory_acidosis: { at: 0.85, dx: 0, dy: -14, anchor: 'middle' },
    acute_respiratory_alkalosis: { at: 0.1, dx: 0, dy: -13, anchor: 'middle' },
    chronic_respiratory_alkalosis: { at: 0.1, dx: 0, dy: 20, anchor: 'middle' },
  };
  for (const b of BANDS) {
    const [from, to] = b.domain(reference);
    if (!(to > from)) continue;
    const p = place[b.code];
    const x = from + (to - from) * p.at;
    const e = b.expected(x, reference);
    const mid = (e.low + e.high) / 2;
    const centre =
      b.along === 'hco3' ? { ph: phOf(mid, x), hco3: x } : { ph: phOf(x, mid), hco3: mid };
    const q = toPoint(f, clampToWindow(centre).point);
    const look = LOOK[b.code];
    // keep the whole label inside the frame (width estimated from the character count)
    const w = look.short.length * 6.1;
    const lo = f.left + 4 + (p.anchor === 'end' ? w : p.anchor === 'middle' ? w / 2 : 0);
    const hi =
      f.left + f.width - 4 - (p.anchor === 'start' ? w : p.anchor === 'middle' ? w / 2 : 0);
    const tx = Math.min(hi, Math.max(lo, q.x + p.dx));
    const ty = Math.min(f.top + f.height - 4, Math.max(f.top + 12, q.y + p.dy));
    s.push(
      `<text class="gl-band-label" data-band="${b.code}" x="${n2(tx)}" y="${n2(ty)}" text-anchor="${p.anchor}" fill="${look.colour}" stroke="${PAPER}" stroke-width="3.5" paint-order="stroke">${look.short}</text>`,
    );
  }
  s.push('</g>');
  return s.join('\n');
}

export function normalLabel(f: Frame): string {
  const q = toPoint(f, { ph: NORMAL.ph.high, hco3: hco3Of(NORMAL.ph.high, NORMAL.pco2.high) });
  return `<text class="gl-region-label" x="${n2(q.x + 4)}" y="${n2(q.y - 3)}" font-size="10.5" font-weight="600" fill="${NORMAL_STROKE}" stroke="${PAPER}" stroke-width="3.5" paint-order="stroke">normal</text>`;
}

export function referenceMark(f: Frame, r: ReferencePoint): string {
  const q = toPoint(f, clampToWindow({ ph: phOf(r.pco2, r.hco3), hco3: r.hco3 }).point);
  const label =
    r.kind === 'pregnancy'
      ? 'pregnancy reference'
      : r.estimated.pco2 || r.estimated.hco3
        ? 'usual (estimate)'
        : 'usual';
  return (
    `<g class="gl-reference"><path d="M${n2(q.x - 6)},${n2(q.y)} H${n2(q.x + 6)} M${n2(q.x)},${n2(q.y - 6)} V${n2(q.y + 6)}" stroke="${INK}" stroke-width="1.8"/>` +
    `<text x="${n2(q.x - 8)}" y="${n2(q.y - 6)}" text-anchor="end" font-size="10" stroke="${PAPER}" stroke-width="3" paint-order="stroke">${label}</text></g>`
  );
}
