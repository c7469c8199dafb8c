// How the H+/CO2 chart looks: its size and options, the palette (line styles and shapes carry every meaning,
// so the chart reads the same in greyscale), the smallest type, and where the plot and the key go.
import type { Frame } from './chartGeometry.ts';

export interface ChartOptions {
  title?: string;
  /** prefix for every id in the drawing, so two charts can share a page */
  idPrefix?: string;
}

export interface ChartResult {
  svg: string;
  /** the chart in words, one line per point made */
  text: string;
}

export const INK = '#27323a';
export const MUTED = '#56626a';
export const GRID = '#e6e9eb';
export const LINE = '#9aa3a8';
export const PAPER = '#ffffff';
export const NORMAL_FILL = '#e3ebe0';
export const NORMAL_STROKE = '#4d5e45';

/**
 * The drawing is 360 units wide and scales with the page. On a phone the figure is at least about 330 px wide
 * (a 390 px screen less the page's margins), so 13 units is about 12 px there: no text under 11 px.
 */
export const WIDTH = 360;
export const MIN_FONT = 13;
export const FONT = { tick: 13, label: 13, title: 13, gas: 14 } as const;
export const ROW = 20;

export const n2 = (v: number) => v.toFixed(2);

export interface Layout {
  frame: Frame;
  width: number;
  height: number;
  /** the first row of the key under the plot */
  keyTop: number;
}

/** The plot is square-ish; the key under it grows one row per two entries. */
export function layout(keyEntries: number): Layout {
  const left = 46,
    right = 44,
    top = 46,
    plot = 272;
  const frame = { left, top, width: WIDTH - left - right, height: plot };
  const keyTop = top + plot + 62;
  const rows = Math.ceil(keyEntries / 2);
  return { frame, width: WIDTH, height: keyTop + rows * ROW, keyTop };
}

export function checkOptions(options: ChartOptions) {
  const idPrefix = options.idPrefix ?? 'gasline-chart';
  if (!/^[A-Za-z][A-Za-z0-9_-]{0,40}$/.test(idPrefix)) {
    throw new RangeError(
      'chart idPrefix must start with a letter and hold only letters, digits, "-" and "_" (at most 41 characters)',
    );
  }
  return {
    title: options.title ?? 'H⁺/CO₂ chart: [H⁺] against PaCO₂, with lines of equal HCO₃⁻',
    idPrefix,
  };
}
