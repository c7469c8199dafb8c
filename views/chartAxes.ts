// The chart's frame of reference: the axes ([H+] up at the left, pH beside it at the right, PaCO2 across), the
// straight HCO3 lines through the origin with their labels, the normal zone and the patient's own reference.
import { acidBase, type PressureUnit, type ReferencePoint } from '../calc/index.ts';
import {
  CHART_WINDOW,
  type Frame,
  HCO3_LINES,
  type Point,
  PH_TICKS,
  clampToWindow,
  hco3LineEnd,
  normalZone,
  toPoint,
} from './chartGeometry.ts';
import {
  FONT,
  GRID,
  INK,
  LINE,
  MUTED,
  NORMAL_FILL,
  NORMAL_STROKE,
  PAPER,
  n2,
} from './chartStyle.ts';
import { escapeXml } from './chartText.ts';

const { hendersonHydrogenIon, hydrogenIon } = acidBase;
const HALO = `stroke="${PAPER}" stroke-width="3.5" paint-order="stroke"`;

/** PaCO2 ticks in the clinician's unit, as mmHg positions: every 20 mmHg, or every 2 kPa. */
export function pco2Ticks(unit: PressureUnit): { mmHg: number; label: string }[] {
  const step = unit === 'mmHg' ? 20 : 2;
  const per = unit === 'mmHg' ? 1 : CHART_WINDOW.pco2.max / 16;
  const out: { mmHg: number; label: string }[] = [];
  for (let v = 0; v * per <= CHART_WINDOW.pco2.max + 1e-9; v += step)
    out.push({ mmHg: v * per, label: String(v) });
  return out;
}

export const H_PLUS_TICKS = [0, 20, 40, 60, 80, 100, 120] as const;

export function axes(f: Frame, unit: PressureUnit): string {
  const bottom = f.top + f.height,
    right = f.left + f.width;
  const s: string[] = ['<g class="gl-chart-axes">'];
  for (const t of pco2Ticks(unit)) {
    const x = toPoint(f, { pco2: t.mmHg, hPlus: 0 }).x;
    if (t.mmHg > 0 && x < right - 1)
      s.push(
        `<line class="gl-grid" x1="${n2(x)}" y1="${n2(f.top)}" x2="${n2(x)}" y2="${n2(bottom)}" stroke="${GRID}"/>`,
      );
    s.push(
      `<line x1="${n2(x)}" y1="${n2(bottom)}" x2="${n2(x)}" y2="${n2(bottom + 5)}" stroke="${INK}"/>`,
    );
    s.push(
      `<text class="gl-tick" x="${n2(x)}" y="${n2(bottom + 19)}" text-anchor="middle" font-size="${FONT.tick}">${t.label}</text>`,
    );
  }
  s.push(
    `<text class="gl-axis-title" x="${n2(f.left + f.width / 2)}" y="${n2(bottom + 40)}" text-anchor="middle" font-size="${FONT.title}" font-weight="600">PaCO₂ (${unit})</text>`,
  );
  for (const h of H_PLUS_TICKS) {
    const y = toPoint(f, { pco2: 0, hPlus: h }).y;
    if (h > 0)
      s.push(
        `<line class="gl-grid" x1="${n2(f.left)}" y1="${n2(y)}" x2="${n2(right)}" y2="${n2(y)}" stroke="${GRID}"/>`,
      );
    s.push(
      `<line x1="${n2(f.left - 5)}" y1="${n2(y)}" x2="${n2(f.left)}" y2="${n2(y)}" stroke="${INK}"/>`,
    );
    s.push(
      `<text class="gl-tick" x="${n2(f.left - 8)}" y="${n2(y + 4.5)}" text-anchor="end" font-size="${FONT.tick}">${h}</text>`,
    );
  }
  s.push(
    `<text class="gl-axis-title" x="4" y="18" font-size="${FONT.title}" font-weight="600">[H⁺] nmol/L</text>`,
  );
  // pH on the right, the same height read the other way: [H+] = 10^(9 - pH)
  for (const ph of PH_TICKS) {
    const y = toPoint(f, { pco2: 0, hPlus: hydrogenIon(ph) }).y;
    s.push(
      `<line x1="${n2(right)}" y1="${n2(y)}" x2="${n2(right + 5)}" y2="${n2(y)}" stroke="${INK}"/>`,
    );
    s.push(
      `<text class="gl-ph-tick" data-ph="${ph.toFixed(1)}" x="${n2(right + 8)}" y="${n2(y + 4.5)}" font-size="${FONT.tick}" fill="${MUTED}">${ph.toFixed(1)}</text>`,
    );
  }
  s.push(
    `<text class="gl-axis-title" x="${n2(right + 8)}" y="18" font-size="${FONT.title}" font-weight="600">pH</text>`,
  );
  s.push('</g>');
  return s.join('\n');
}

/** Each HCO3 as a straight line from the origin to where it leaves the window, and its label there. */
export function hco3Lines(f: Frame): string {
  const origin = toPoint(f, { pco2: 0, hPlus: 0 });
  const s: string[] = ['<g class="gl-hco3-lines">'];
  for (const hco3 of HCO3_LINES) {
    const end = toPoint(f, hco3LineEnd(hco3));
    const normal = hco3 === 24;
    s.push(
      `<line class="gl-hco3-line" data-hco3="${hco3}" x1="${n2(origin.x)}" y1="${n2(origin.y)}" x2="${n2(end.x)}" y2="${n2(end.y)}" stroke="${normal ? MUTED : LINE}" stroke-width="${normal ? 1.8 : 1}"/>`,
    );
  }
  s.push('</g>');
  return s.join('\n');
}

export function hco3Labels(f: Frame): string {
  const s: string[] = [`<g class="gl-hco3-labels" font-size="${FONT.label}" fill="${MUTED}">`];
  s.push(`<text x="${n2(f.left + 2)}" y="${n2(f.top - 7)}" font-weight="600">HCO₃⁻</text>`);
  for (const hco3 of HCO3_LINES) {
    const end = hco3LineEnd(hco3);
    const q = toPoint(f, end);
    // above the frame where a line leaves by the top; just inside the right edge where it leaves by the side
    const at =
      end.edge === 'top'
        ? `x="${n2(q.x)}" y="${n2(f.top - 7)}" text-anchor="middle"`
        : `x="${n2(q.x - 4)}" y="${n2(q.y - 5)}" text-anchor="end" ${HALO}`;
    s.push(`<text class="gl-hco3-label" data-hco3="${hco3}" ${at}>${hco3}</text>`);
  }
  s.push('</g>');
  return s.join('\n');
}

/** The normal box, and the points of it a label should keep clear of (its corners and middle). */
export function normalZoneMark(f: Frame): { svg: string; points: Point[] } {
  const z = normalZone();
  const a = toPoint(f, { pco2: z.pco2.low, hPlus: z.hPlus.high });
  const b = toPoint(f, { pco2: z.pco2.high, hPlus: z.hPlus.low });
  return {
    svg: `<g class="gl-normal-zone"><rect data-zone="normal" x="${n2(a.x)}" y="${n2(a.y)}" width="${n2(b.x - a.x)}" height="${n2(b.y - a.y)}" fill="${NORMAL_FILL}" fill-opacity="0.9" stroke="${NORMAL_STROKE}" stroke-width="1.4"/></g>`,
    points: [
      a,
      b,
      { x: a.x, y: b.y },
      { x: b.x, y: a.y },
      { x: (a.x + b.x) / 2, y: (a.y + b.y) / 2 },
    ],
  };
}

/** The patient's usual point (or the pregnancy reference) as a cross, where the reading starts from. */
export function referenceMark(f: Frame, r: ReferencePoint): string {
  const q = toPoint(
    f,
    clampToWindow({ pco2: r.pco2, hPlus: hendersonHydrogenIon(r.pco2, r.hco3) }).point,
  );
  const label =
    r.kind === 'pregnancy'
      ? 'pregnancy'
      : r.estimated.pco2 || r.estimated.hco3
        ? 'usual (est.)'
        : 'usual';
  return (
    `<g class="gl-reference"><path d="M${n2(q.x - 6)},${n2(q.y)} H${n2(q.x + 6)} M${n2(q.x)},${n2(q.y - 6)} V${n2(q.y + 6)}" stroke="${INK}" stroke-width="1.8"/>` +
    `<text x="${n2(q.x + 8)}" y="${n2(q.y + 16)}" font-size="${FONT.label}" ${HALO}>${escapeXml(label)}</text></g>`
  );
}
