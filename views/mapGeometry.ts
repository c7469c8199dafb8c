// The map's window and its transforms: pH across, HCO3 up, and the lines of equal PaCO2 (the Henderson equation,
// through calc/acidBase.ts).
import { acidBase, units } from '../calc/index.ts';

const { hendersonBicarbonate, hendersonHydrogenIon, hydrogenIon, phFromHydrogenIon } = acidBase;

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
export const phOf = (pco2: number, hco3: number): number =>
  phFromHydrogenIon(hendersonHydrogenIon(pco2, hco3));
export const hco3Of = (ph: number, pco2: number): number =>
  hendersonBicarbonate(hydrogenIon(ph), pco2);

export const ISOPLETH_STEPS = 40;

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

export const mmHgToKpa = (mmHg: number) => mmHg / units.MMHG_PER_KPA;
