// How the map looks and where its parts go: size and options, the palette (patterns and dashes carry the meaning
// in greyscale too), and the layout of plot, legend and key.
import type { BandCode } from './mapBands.ts';
import { type Frame, type PhHco3, toPoint } from './mapGeometry.ts';

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
export const INK = '#27323a';
export const MUTED = '#5f6b73';
export const GRID = '#e4e7e9';
export const ISOPLETH = '#8f999f';
export const PAPER = '#ffffff';

export interface BandLook {
  pattern: 'rising' | 'falling' | 'level' | 'upright' | 'dots' | 'grid';
  dash: string | null;
  colour: string;
  short: string;
}
export const LOOK: Record<BandCode, BandLook> = {
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
export const NORMAL_FILL = '#dfe6da';
export const NORMAL_STROKE = '#4d5e45';

export const n2 = (v: number) => v.toFixed(2);
export const pointsAttr = (frame: Frame, list: PhHco3[]) =>
  list
    .map((p) => {
      const q = toPoint(frame, p);
      return `${n2(q.x)},${n2(q.y)}`;
    })
    .join(' ');

export function patternDef(id: string, look: BandLook): string {
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

export const dashAttr = (dash: string | null) => (dash ? ` stroke-dasharray="${dash}"` : '');

export interface Layout {
  frame: Frame;
  width: number;
  height: number;
  legendTop: number;
  keyTop: number;
  keyRows: number;
  footY: number;
}

export const KEY_MAX_ROWS = 6;
export const ROW = 16;

export function layout(width: number, height: number, gasCount: number): Layout {
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

export function checkOptions(options: MapOptions) {
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
