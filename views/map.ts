// The acid-base map: plasma HCO3 against pH, with lines of equal PaCO2 and the bands of expected
// compensation for single disorders, drawn as SVG on the server. Every physiological number comes from
// calc/ (the Henderson equation and the compensation rules); this file only places and words them.
// No inline style, no script: presentation attributes and class names only (strict CSP).
import type { Findings } from '../calc/index.ts';
import {
  acidBase,
  compensation,
  gasTime,
  inTimeOrder,
  reference,
  units,
  type Band,
  type Gas,
  type PressureUnit,
  type ReferencePoint,
} from '../calc/index.ts';

const { metabolicAlkalosisPco2, respiratoryAcidosisHco3, respiratoryAlkalosisHco3, wintersPco2 } =
  compensation;
const {
  hendersonBicarbonate,
  hendersonConsistency,
  hendersonHydrogenIon,
  hendersonPco2,
  hydrogenIon,
  phFromHydrogenIon,
} = acidBase;
const { NORMAL } = reference;
const mmHgToKpa = (mmHg: number) => mmHg / units.MMHG_PER_KPA;

// ---------- geometry: the drawn window and the transforms ----------

/** What the map shows: a drawing choice wide enough for most bedside gases, not a clinical range. */
export const MAP_WINDOW = { ph: { min: 6.9, max: 7.7 }, hco3: { min: 5, max: 50 } } as const;

/** PaCO2 lines drawn, mmHg (labelled in the clinician's unit). */
export const ISOPLETHS_MMHG = [20, 30, 40, 50, 60, 80, 100] as const;

/** [H+] ticks on the secondary scale along the pH axis, nmol/L. */
export const HYDROGEN_ION_TICKS = [20, 25, 30, 40, 50, 60, 80, 100, 125] as const;

export interface PhHco3 {
  ph: number;
  hco3: number;
}
export interface Frame {
  left: number;
  top: number;
  width: number;
  height: number;
}
export interface Point {
  x: number;
  y: number;
}

/** pH on the horizontal axis (acid to the left), HCO3 on the vertical (higher up). */
export function toPoint(frame: Frame, p: PhHco3): Point {
  const { ph, hco3 } = MAP_WINDOW;
  return {
    x: frame.left + ((p.ph - ph.min) / (ph.max - ph.min)) * frame.width,
    y: frame.top + frame.height - ((p.hco3 - hco3.min) / (hco3.max - hco3.min)) * frame.height,
  };
}

/** The inverse of toPoint. */
export function fromPoint(frame: Frame, point: Point): PhHco3 {
  const { ph, hco3 } = MAP_WINDOW;
  return {
    ph: ph.min + ((point.x - frame.left) / frame.width) * (ph.max - ph.min),
    hco3: hco3.min + ((frame.top + frame.height - point.y) / frame.height) * (hco3.max - hco3.min),
  };
}

export type Overflow = 'low' | 'high' | null;
export interface Clamped {
  point: PhHco3;
  off: { ph: Overflow; hco3: Overflow };
}

/** A gas outside the window is drawn at its edge and says which way it left. */
export function clampToWindow(p: PhHco3): Clamped {
  const { ph, hco3 } = MAP_WINDOW;
  const side = (v: number, r: { min: number; max: number }): Overflow =>
    v < r.min ? 'low' : v > r.max ? 'high' : null;
  return {
    point: {
      ph: Math.min(ph.max, Math.max(ph.min, p.ph)),
      hco3: Math.min(hco3.max, Math.max(hco3.min, p.hco3)),
    },
    off: { ph: side(p.ph, ph), hco3: side(p.hco3, hco3) },
  };
}

// The Henderson equation, through calc/acidBase.ts, solved for the term each drawing needs.
const phOf = (pco2: number, hco3: number): number =>
  phFromHydrogenIon(hendersonHydrogenIon(pco2, hco3));
const hco3Of = (ph: number, pco2: number): number => hendersonBicarbonate(hydrogenIon(ph), pco2);
const _pco2Of = (ph: number, hco3: number): number => hendersonPco2(hydrogenIon(ph), hco3);

const ISOPLETH_STEPS = 40;

/** One PaCO2 line inside the window, sampled along pH; its ends lie exactly on the window's edges. */
export function isoplethPoints(pco2: number): PhHco3[] {
  const { ph, hco3 } = MAP_WINDOW;
  // HCO3 rises with pH along a PaCO2 line, so the part inside the window is one stretch of pH
  const start = Math.max(ph.min, phOf(pco2, hco3.min));
  const end = Math.min(ph.max, phOf(pco2, hco3.max));
  if (!(end > start)) return [];
  const points: PhHco3[] = [{ ph: start, hco3: hco3Of(start, pco2) }];
  for (let i = 1; i < ISOPLETH_STEPS; i++) {
    const x = ph.min + ((ph.max - ph.min) * i) / ISOPLETH_STEPS;
    if (x > start && x < end) points.push({ ph: x, hco3: hco3Of(x, pco2) });
  }
  points.push({ ph: end, hco3: hco3Of(end, pco2) });
  return points;
}

// ---------- the bands ----------

export type BandCode =
  | 'metabolic_acidosis'
  | 'metabolic_alkalosis'
  | 'acute_respiratory_acidosis'
  | 'chronic_respiratory_acidosis'
  | 'acute_respiratory_alkalosis'
  | 'chronic_respiratory_alkalosis';

interface BandSpec {
  code: BandCode;
  name: string;
  /** the value sampled along the band: HCO3 for metabolic bands, PaCO2 for respiratory ones */
  along: 'hco3' | 'pco2';
  domain: (ref: ReferencePoint) => [number, number];
  expected: (x: number, ref: ReferencePoint) => Band;
}

const refOf = (r: ReferencePoint) => ({ pco2: r.pco2, hco3: r.hco3 });
// Where each band stops (drawing choices): metabolic bands run out from the normal HCO3 to past the window's
// edges (clipped when drawn, so a gas drawn at an edge is still judged by its rule); respiratory bands run from
// the reference PaCO2 to the outermost PaCO2 line drawn.
const HCO3_SPAN = { low: 3, high: 60 } as const;
const PCO2_SPAN = { low: Math.min(...ISOPLETHS_MMHG), high: Math.max(...ISOPLETHS_MMHG) } as const;

export const BANDS: readonly BandSpec[] = [
  {
    code: 'metabolic_acidosis',
    name: 'metabolic acidosis',
    along: 'hco3',
    domain: () => [HCO3_SPAN.low, NORMAL.hco3.mid],
    expected: (h) => wintersPco2(h),
  },
  {
    code: 'metabolic_alkalosis',
    name: 'metabolic alkalosis',
    along: 'hco3',
    domain: () => [NORMAL.hco3.mid, HCO3_SPAN.high],
    expected: (h) => metabolicAlkalosisPco2(h),
  },
  {
    code: 'acute_respiratory_acidosis',
    name: 'acute respiratory acidosis',
    along: 'pco2',
    domain: (r) => [r.pco2, PCO2_SPAN.high],
    expected: (p, r) => respiratoryAcidosisHco3(p, 'acute', refOf(r)),
  },
  {
    code: 'chronic_respiratory_acidosis',
    name: 'chronic respiratory acidosis',
    along: 'pco2',
    domain: (r) => [r.pco2, PCO2_SPAN.high],
    expected: (p, r) => respiratoryAcidosisHco3(p, 'chronic', refOf(r)),
  },
  {
    code: 'acute_respiratory_alkalosis',
    name: 'acute respiratory alkalosis',
    along: 'pco2',
    domain: (r) => [PCO2_SPAN.low, r.pco2],
    expected: (p, r) => respiratoryAlkalosisHco3(p, 'acute', refOf(r)),
  },
  {
    code: 'chronic_respiratory_alkalosis',
    name: 'chronic respiratory alkalosis',
    along: 'pco2',
    domain: (r) => [PCO2_SPAN.low, r.pco2],
    expected: (p, r) => respiratoryAlkalosisHco3(p, 'chronic', refOf(r)),
  },
];

const BAND_STEPS = 40;
const CAP_STEPS = 6;

function bandSpec(code: BandCode): BandSpec {
  const spec = BANDS.find((b) => b.code === code);
  if (!spec) throw new Error(`unknown band ${code}`);
  return spec;
}

/**
 * A band as a closed polygon in (pH, HCO3): the low edge of the expected range out along the band, across the
 * far end, the high edge back, and across the near end. Respiratory bands sample PaCO2 and take the expected HCO3; metabolic bands sample HCO3 and
 * take the expected PaCO2; each (PaCO2, HCO3) becomes a pH by the Henderson equation. Empty if out of reach.
 */
export function bandPolygon(code: BandCode, reference: ReferencePoint): PhHco3[] {
  const spec = bandSpec(code);
  const [from, to] = spec.domain(reference);
  if (!(to > from)) return [];
  const low: PhHco3[] = [],
    high: PhHco3[] = [];
  // the ends of a respiratory band lie on a PaCO2 line, which curves: sample them too
  const cap = (pco2: number, e: Band, upward: boolean): PhHco3[] => {
    if (spec.along === 'hco3') return [];
    return Array.from({ length: CAP_STEPS - 1 }, (_, k) => {
      const t = (upward ? k + 1 : CAP_STEPS - k - 1) / CAP_STEPS;
      const hco3 = e.low + (e.high - e.low) * t;
      return { ph: phOf(pco2, hco3), hco3 };
    });
  };
  for (let i = 0; i <= BAND_STEPS; i++) {
    const x = from + ((to - from) * i) / BAND_STEPS;
    const e = spec.expected(x, reference);
    if (spec.along === 'hco3') {
      low.push({ ph: phOf(e.low, x), hco3: x });
      high.push({ ph: phOf(e.high, x), hco3: x });
    } else {
      low.push({ ph: phOf(x, e.low), hco3: e.low });
      high.push({ ph: phOf(x, e.high), hco3: e.high });
    }
  }
  return [
    ...low,
    ...cap(to, spec.expected(to, reference), true),
    ...high.reverse(),
    ...cap(from, spec.expected(from, reference), false),
  ];
}

export interface GasValues {
  ph: number;
  pco2: number;
  hco3: number;
}

/** The bands whose expected range holds this gas, tested with the same rules the polygons are drawn from. */
export function bandsContaining(gas: GasValues, reference: ReferencePoint): BandCode[] {
  return BANDS.filter((spec) => {
    const [from, to] = spec.domain(reference);
    const x = spec.along === 'hco3' ? gas.hco3 : gas.pco2;
    const y = spec.along === 'hco3' ? gas.pco2 : gas.hco3;
    if (!(to > from) || x < from || x > to) return false;
    const e = spec.expected(x, reference);
    return y >= e.low && y <= e.high;
  }).map((b) => b.code);
}

/** Normal arterial region (pH 7.35-7.45, PaCO2 35-45; calc/reference.ts), bounded by two pH lines and two PaCO2 lines. */
export function normalRegionPolygon(): PhHco3[] {
  const { ph, pco2 } = NORMAL;
  const steps = 10;
  const along = (p: number, phFrom: number, phTo: number): PhHco3[] =>
    Array.from({ length: steps + 1 }, (_, i) => {
      const x = phFrom + ((phTo - phFrom) * i) / steps;
      return { ph: x, hco3: hco3Of(x, p) };
    });
  return [...along(pco2.low, ph.low, ph.high), ...along(pco2.high, ph.high, ph.low)];
}

export const inNormalRegion = (g: GasValues): boolean =>
  g.ph >= NORMAL.ph.low &&
  g.ph <= NORMAL.ph.high &&
  g.pco2 >= NORMAL.pco2.low &&
  g.pco2 <= NORMAL.pco2.high;

// ---------- the case's gases, in time order ----------

export interface PlottedGas {
  /** 1 = oldest; the current gas carries the highest number */
  number: number;
  current: boolean;
  takenAt: string | null;
  label: string | null;
  gas: Gas;
}

const DATE_TIME = /^(\d{4})-(\d{2})-(\d{2})(?:[T ](\d{2}):(\d{2})(?::(\d{2}))?)?/;

/**
 * Earlier gases in time order (calc's inTimeOrder, the order the note reads them in) when every one has a date
 * and time, else in the order entered; then the current gas.
 */
export function gasesInTimeOrder(findings: Findings): { gases: PlottedGas[]; byTakenAt: boolean } {
  const earlier = inTimeOrder(findings.previous);
  const byTakenAt = earlier.length > 0 && earlier.every((p) => gasTime(p.takenAt) !== null);
  const gases: PlottedGas[] = earlier.map((p, i) => ({
    number: i + 1,
    current: false,
    takenAt: p.takenAt,
    label: p.label,
    gas: p.gas,
  }));
  gases.push({
    number: gases.length + 1,
    current: true,
    takenAt: null,
    label: null,
    gas: findings.case.gas,
  });
  return { gases, byTakenAt };
}

const DAY_MS = 86_400_000;
const MONTHS = ['Jan', 'Feb', 'Mar', 'Apr', 'May', 'Jun', 'Jul', 'Aug', 'Sep', 'Oct', 'Nov', 'Dec'];

/** takenAt for people: "04:10" when all dated gases share a day (short form), else "2 Mar 2026 04:10". */
export function whenText(takenAt: string | null, short: boolean): string | null {
  if (takenAt === null || takenAt.trim() === '') return null;
  const m = DATE_TIME.exec(takenAt.trim());
  if (!m) return takenAt.trim();
  const month = MONTHS[Number(m[2]) - 1];
  if (!month) return takenAt.trim();
  const time = m[4] !== undefined ? `${m[4]}:${m[5]}` : null;
  if (short && time) return time;
  return `${Number(m[3])} ${month} ${m[1]}${time ? ` ${time}` : ''}`;
}

// ---------- words and numbers ----------

/** Text and attribute values for XML: escape markup, drop characters XML 1.0 cannot carry. */
export function escapeXml(value: string): string {
  return value
    .replace(/[\u0000-\u0008\u000B\u000C\u000E-\u001F\uFFFE\uFFFF]/g, '')
    .replace(
      /[&<>"']/g,
      (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c] as string,
    );
}

const trim = (value: number, decimals: number): string => String(Number(value.toFixed(decimals)));
const phText = (ph: number) => ph.toFixed(2);
const hco3Text = (hco3: number) => trim(hco3, 1);
/** A pressure in the clinician's unit: a measured value (trailing zeros dropped) or a fixed label. */
export function pressureText(
  mmHg: number,
  unit: PressureUnit,
  style: 'value' | 'label' = 'value',
): string {
  if (unit === 'mmHg') return trim(mmHg, style === 'label' ? 0 : 1);
  const kpa = mmHgToKpa(mmHg);
  // kPa is read with at least one decimal (8.0, 6.45)
  return style === 'label' || Number(kpa.toFixed(2)) === Number(kpa.toFixed(1))
    ? kpa.toFixed(1)
    : kpa.toFixed(2);
}

function whereText(bands: BandCode[], normal: boolean): string {
  if (normal) return 'inside the normal region';
  if (bands.length === 0) return 'outside every compensation band';
  const names = bands.map((c) => bandSpec(c).name);
  // "acute respiratory acidosis" + "chronic respiratory acidosis" -> "the acute and chronic respiratory acidosis bands"
  const merged: string[] = [];
  for (const n of names) {
    const m = /^(acute|chronic) (.+)$/.exec(n);
    const partner = m
      ? merged.findIndex((x) => x === `${m[1] === 'acute' ? 'chronic' : 'acute'} ${m[2]}`)
      : -1;
    if (m && partner >= 0) merged[partner] = `acute and chronic ${m[2]}`;
    else merged.push(n);
  }
  const list =
    merged.length === 1
      ? (merged[0] as string)
      : `${merged.slice(0, -1).join(', ')} and ${merged.at(-1)}`;
  return `inside the ${list} band${merged.length > 1 || bands.length > 1 ? 's' : ''}`;
}

function offText(off: Clamped['off']): string | null {
  const parts: string[] = [];
  if (off.ph)
    parts.push(
      `pH ${off.ph === 'high' ? 'above' : 'below'} ${phText(off.ph === 'high' ? MAP_WINDOW.ph.max : MAP_WINDOW.ph.min)}`,
    );
  if (off.hco3)
    parts.push(
      `HCO3 ${off.hco3 === 'high' ? 'above' : 'below'} ${MAP_WINDOW.hco3[off.hco3 === 'high' ? 'max' : 'min']} mmol/L`,
    );
  return parts.length ? `outside the drawn window (${parts.join(', ')}), shown at its edge` : null;
}

// ---------- drawing ----------

export interface MapOptions {
  width?: number;
  height?: number;
  title?: string;
  /** prefix for every id in the drawing, so two maps can share a page */
  idPrefix?: string;
}

export interface MapResult {
  svg: string;
  text: string;
}

// Our palette: quiet ink and four muted tints; patterns and dash styles carry the meaning in greyscale.
const INK = '#27323a';
const MUTED = '#5f6b73';
const GRID = '#e4e7e9';
const ISOPLETH = '#8f999f';
const PAPER = '#ffffff';

interface BandLook {
  pattern: 'rising' | 'falling' | 'level' | 'upright' | 'dots' | 'grid';
  dash: string | null;
  colour: string;
  short: string;
}
const LOOK: Record<BandCode, BandLook> = {
  metabolic_acidosis: {
    pattern: 'rising',
    dash: null,
    colour: '#8c5a43',
    short: 'metabolic acidosis',
  },
  metabolic_alkalosis: {
    pattern: 'falling',
    dash: '9 3',
    colour: '#4f5f8a',
    short: 'metabolic alkalosis',
  },
  acute_respiratory_acidosis: {
    pattern: 'level',
    dash: '5 3',
    colour: '#7d6b2e',
    short: 'acute resp. acidosis',
  },
  chronic_respiratory_acidosis: {
    pattern: 'dots',
    dash: '1.5 2.5',
    colour: '#7d6b2e',
    short: 'chronic resp. acidosis',
  },
  acute_respiratory_alkalosis: {
    pattern: 'upright',
    dash: '7 2 1.5 2',
    colour: '#3d7169',
    short: 'acute resp. alkalosis',
  },
  chronic_respiratory_alkalosis: {
    pattern: 'grid',
    dash: '12 3 3 3',
    colour: '#3d7169',
    short: 'chronic resp. alkalosis',
  },
};
const NORMAL_FILL = '#dfe6da';
const NORMAL_STROKE = '#4d5e45';

const n2 = (v: number) => v.toFixed(2);
const pointsAttr = (frame: Frame, list: PhHco3[]) =>
  list
    .map((p) => {
      const q = toPoint(frame, p);
      return `${n2(q.x)},${n2(q.y)}`;
    })
    .join(' ');

function patternDef(id: string, look: BandLook): string {
  const c = look.colour;
  const line = (x1: number, y1: number, x2: number, y2: number) =>
    `<line x1="${x1}" y1="${y1}" x2="${x2}" y2="${y2}" stroke="${c}" stroke-width="1" stroke-opacity="0.75"/>`;
  const open = (size: number, rotate: number | null) =>
    `<pattern id="${id}" patternUnits="userSpaceOnUse" width="${size}" height="${size}"${rotate === null ? '' : ` patternTransform="rotate(${rotate})"`}>`;
  switch (look.pattern) {
    case 'rising':
      return `${open(7, -45)}${line(0, 0, 0, 7)}</pattern>`;
    case 'falling':
      return `${open(7, 45)}${line(0, 0, 0, 7)}</pattern>`;
    case 'level':
      return `${open(6, null)}${line(0, 3, 6, 3)}</pattern>`;
    case 'upright':
      return `${open(6, null)}${line(3, 0, 3, 6)}</pattern>`;
    case 'dots':
      return `${open(6, null)}<circle cx="3" cy="3" r="1.1" fill="${c}" fill-opacity="0.8"/></pattern>`;
    case 'grid':
      return `${open(8, 45)}${line(0, 4, 8, 4)}${line(4, 0, 4, 8)}</pattern>`;
  }
}

const dashAttr = (dash: string | null) => (dash ? ` stroke-dasharray="${dash}"` : '');

interface Layout {
  frame: Frame;
  width: number;
  height: number;
  legendTop: number;
  keyTop: number;
  keyRows: number;
  footY: number;
}

const KEY_MAX_ROWS = 6;
const ROW = 16;

function layout(width: number, height: number, gasCount: number): Layout {
  const keyRows = Math.min(gasCount, KEY_MAX_ROWS);
  const left = 62,
    right = 24,
    top = 66;
  const below =
    42 /* pH axis */ + 3 * ROW + 10 /* legend */ + keyRows * ROW + 8 + 20 /* footnote */;
  const frame = { left, top, width: width - left - right, height: height - top - below };
  if (frame.height < 160 || frame.width < 240) {
    throw new RangeError(
      `The map needs at least ${left + right + 240} x ${top + below + 160} to draw ${gasCount} gas${gasCount === 1 ? '' : 'es'}; got ${width} x ${height}`,
    );
  }
  const legendTop = frame.top + frame.height + 42;
  const keyTop = legendTop + 3 * ROW + 10;
  return { frame, width, height, legendTop, keyTop, keyRows, footY: height - 8 };
}

function checkOptions(options: MapOptions) {
  const size = (name: string, v: number | undefined, fallback: number) => {
    if (v === undefined) return fallback;
    if (!Number.isFinite(v) || v < 300 || v > 4000)
      throw new RangeError(`map ${name} must be a number from 300 to 4000, got ${String(v)}`);
    return v;
  };
  const idPrefix = options.idPrefix ?? 'gasline-map';
  if (!/^[A-Za-z][A-Za-z0-9_-]{0,40}$/.test(idPrefix)) {
    throw new RangeError(
      'map idPrefix must start with a letter and hold only letters, digits, "-" and "_" (at most 41 characters)',
    );
  }
  return {
    width: size('width', options.width, 680),
    height: size('height', options.height, 660),
    title: options.title ?? 'Acid-base map',
    idPrefix,
  };
}

interface Placed extends PlottedGas {
  clamped: Clamped;
  at: Point;
  bands: BandCode[];
  normal: boolean;
  when: string | null;
}

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

function axes(f: Frame): string {
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

function isopleths(f: Frame, unit: PressureUnit): string {
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

function isoplethLabels(f: Frame, unit: PressureUnit): string {
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

function bands(f: Frame, reference: ReferencePoint, id: (s: string) => string): string {
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
function bandLabels(f: Frame, reference: ReferencePoint): string {
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

function normalLabel(f: Frame): string {
  const q = toPoint(f, { ph: NORMAL.ph.high, hco3: hco3Of(NORMAL.ph.high, NORMAL.pco2.high) });
  return `<text class="gl-region-label" x="${n2(q.x + 4)}" y="${n2(q.y - 3)}" font-size="10.5" font-weight="600" fill="${NORMAL_STROKE}" stroke="${PAPER}" stroke-width="3.5" paint-order="stroke">normal</text>`;
}

function referenceMark(f: Frame, r: ReferencePoint): string {
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

const radius = (g: PlottedGas) => (g.current ? 7 : 4.5);

function path(placed: Placed[], id: (s: string) => string): string {
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

function markers(placed: Placed[], f: Frame, id: (s: string) => string): string {
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

function legend(L: Layout, id: (s: string) => string): string {
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

function key(L: Layout, placed: Placed[], unit: PressureUnit): string {
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

// ---------- the text alternative ----------

function gasSentence(g: Placed, unit: PressureUnit, total: number): string {
  const v = g.gas;
  const name = g.current
    ? `Current gas (${g.number} of ${total})`
    : `Gas ${g.number} of ${total}${g.label ? `, ${g.label.trim()}` : ''}${g.takenAt?.trim() ? `, taken ${whenText(g.takenAt, false)}` : ''}`;
  const computed = v.computed
    ? ` (${v.computed === 'ph' ? 'pH' : v.computed === 'pco2' ? 'PaCO2' : 'HCO3'} worked out from the other two)`
    : '';
  const values = `pH ${phText(v.ph)}, PaCO2 ${pressureText(v.pco2, unit)} ${unit}, HCO3 ${hco3Text(v.hco3)} mmol/L, [H+] ${trim(hydrogenIon(v.ph), 0)} nmol/L${computed}`;
  const parts = [whereText(g.bands, g.normal)];
  const off = offText(g.clamped.off);
  if (off) parts.push(off);
  if (v.complete && !hendersonConsistency(v.ph, v.pco2, v.hco3).consistent) {
    parts.push(
      `its HCO3 does not agree with pH and PaCO2 by the Henderson equation (expected about ${trim(hco3Of(v.ph, v.pco2), 0)} mmol/L), so it is placed by pH and HCO3 as reported`,
    );
  }
  return `${name}: ${values}; ${parts.join('; ')}.`;
}

function textAlternative(
  findings: Findings,
  placed: Placed[],
  byTakenAt: boolean,
  unit: PressureUnit,
): string {
  const r = findings.reference;
  const lines: string[] = [];
  const isopleths = ISOPLETHS_MMHG.map((p) => pressureText(p, unit, 'label')).join(', ');
  const normal = `pH ${phText(NORMAL.ph.low)}-${phText(NORMAL.ph.high)} with PaCO2 ${pressureText(NORMAL.pco2.low, unit, 'label')}-${pressureText(NORMAL.pco2.high, unit, 'label')} ${unit}`;
  lines.push(
    `Acid-base map: HCO3 (${MAP_WINDOW.hco3.min}-${MAP_WINDOW.hco3.max} mmol/L, up) against pH (${phText(MAP_WINDOW.ph.min)}-${phText(MAP_WINDOW.ph.max)}, across; [H+] along the top), with lines of equal PaCO2 (${isopleths} ${unit}), the normal region (${normal}) and the expected-compensation bands for metabolic acidosis (Winters' formula), metabolic alkalosis, and acute and chronic respiratory acidosis and alkalosis.`,
  );
  if (r.kind !== 'textbook') {
    const how =
      r.kind === 'pregnancy'
        ? 'the pregnancy reference'
        : `the patient's usual values${r.estimated.pco2 || r.estimated.hco3 ? ' (partly estimated)' : ''}`;
    lines.push(
      `Respiratory bands start from ${how}: PaCO2 ${pressureText(r.pco2, unit)} ${unit}, HCO3 ${hco3Text(r.hco3)} mmol/L.`,
    );
  }
  if (findings.withheld) {
    lines.push(
      'No gas is placed on the map: the PaCO2 may be in the other pressure unit. Confirm whether it was entered in mmHg or kPa.',
    );
  } else {
    const total = placed.length;
    const current = placed.at(-1) as Placed;
    lines.push(gasSentence(current, unit, total));
    if (total > 1) {
      const order = byTakenAt
        ? 'oldest first, by time taken'
        : 'in the order entered (not every earlier gas has a date and time)';
      lines.push(`Earlier gases, ${order}:`);
      for (const g of placed.slice(0, -1)) lines.push(gasSentence(g, unit, total));
      lines.push(
        `A line with arrows joins the gases from 1 to ${total}, ending at the current gas.`,
      );
    }
  }
  if (findings.case.sample !== 'arterial')
    lines.push(`This is a ${findings.case.sample} sample; the bands describe arterial values.`);
  lines.push(
    'The bands show the compensation expected for a single disorder, by rules of thumb that assume a steady state. A gas inside a band fits that disorder but does not prove it; a gas outside every band suggests more than one process. Decision support for licensed clinicians: check the sample and the patient, and follow local protocols and senior advice.',
  );
  return lines.join('\n');
}
