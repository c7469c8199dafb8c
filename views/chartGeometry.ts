// The H+/CO2 chart's geometry: [H+] (nmol/L, up) against PaCO2 (mmHg, across), both linear, so that each HCO3
// is a straight line through the origin, [H+] = 24 x PaCO2 / HCO3 (the Henderson equation, through
// calc/acidBase.ts). Where a gas goes: measured, or a venous gas at its arterial estimate; and where the
// ventilator target leads. Canonical units only; the drawing converts to the clinician's unit for labels.
import { acidBase, reference, round, units, type Gas } from '../calc/index.ts';

const { hendersonHydrogenIon, hydrogenIon } = acidBase;
const { NORMAL, PHYSIOLOGY, VENOUS } = reference;

/** What the chart shows: a drawing choice wide enough for most bedside gases, not a clinical range.
 *  PaCO2 to 16 kPa (120 mmHg) so that both units end on a round tick; [H+] to 130 nmol/L (pH about 6.89). */
export const CHART_WINDOW = {
  pco2: { min: 0, max: 16 * units.MMHG_PER_KPA },
  hPlus: { min: 0, max: 130 },
} as const;

/** The HCO3 lines drawn, mmol/L; 24 (normal; common practice) drawn heavier. */
export const HCO3_LINES = [5, 10, 15, 20, 24, 30, 40, 50] as const;

/** pH marks on the right-hand axis, placed at their [H+] = 10^(9 - pH). */
export const PH_TICKS = [7.6, 7.5, 7.4, 7.3, 7.2, 7.1, 7.0, 6.9] as const;

export interface GasPoint {
  /** mmHg */
  pco2: number;
  /** nmol/L */
  hPlus: number;
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

/** PaCO2 across (higher to the right), [H+] up (more acid higher). */
export function toPoint(frame: Frame, p: GasPoint): Point {
  const { pco2, hPlus } = CHART_WINDOW;
  return {
    x: frame.left + ((p.pco2 - pco2.min) / (pco2.max - pco2.min)) * frame.width,
    y: frame.top + frame.height - ((p.hPlus - hPlus.min) / (hPlus.max - hPlus.min)) * frame.height,
  };
}

/** The inverse of toPoint. */
export function fromPoint(frame: Frame, point: Point): GasPoint {
  const { pco2, hPlus } = CHART_WINDOW;
  return {
    pco2: pco2.min + ((point.x - frame.left) / frame.width) * (pco2.max - pco2.min),
    hPlus:
      hPlus.min + ((frame.top + frame.height - point.y) / frame.height) * (hPlus.max - hPlus.min),
  };
}

export type Overflow = 'low' | 'high' | null;
export interface Clamped {
  point: GasPoint;
  off: { pco2: Overflow; hPlus: Overflow };
}

/** A gas outside the window is drawn at its edge and says which way it left. */
export function clampToWindow(p: GasPoint): Clamped {
  const { pco2, hPlus } = CHART_WINDOW;
  const side = (v: number, r: { min: number; max: number }): Overflow =>
    v < r.min ? 'low' : v > r.max ? 'high' : null;
  const clamp = (v: number, r: { min: number; max: number }) => Math.min(r.max, Math.max(r.min, v));
  return {
    point: { pco2: clamp(p.pco2, pco2), hPlus: clamp(p.hPlus, hPlus) },
    off: { pco2: side(p.pco2, pco2), hPlus: side(p.hPlus, hPlus) },
  };
}

export interface LineEnd extends GasPoint {
  edge: 'top' | 'right';
}

/** Where the line of one HCO3 leaves the window: the line runs from the origin to here. */
export function hco3LineEnd(hco3: number): LineEnd {
  const { pco2, hPlus } = CHART_WINDOW;
  // on the line, PaCO2 = [H+] x HCO3 / 24: at the top edge, or at the right edge if that comes first
  const atTop = (hPlus.max * hco3) / 24;
  if (atTop <= pco2.max) return { pco2: atTop, hPlus: hPlus.max, edge: 'top' };
  return { pco2: pco2.max, hPlus: hendersonHydrogenIon(pco2.max, hco3), edge: 'right' };
}

/** Normal arterial values (calc/reference.ts): PaCO2 35-45 mmHg, pH 7.35-7.45, a rectangle on this chart. */
export function normalZone(): {
  pco2: { low: number; high: number };
  hPlus: { low: number; high: number };
} {
  return {
    pco2: { low: NORMAL.pco2.low, high: NORMAL.pco2.high },
    hPlus: { low: hydrogenIon(NORMAL.ph.high), high: hydrogenIon(NORMAL.ph.low) },
  };
}

export const inNormalZone = (p: GasPoint): boolean => {
  const z = normalZone();
  return (
    p.pco2 >= z.pco2.low &&
    p.pco2 <= z.pco2.high &&
    p.hPlus >= z.hPlus.low &&
    p.hPlus <= z.hPlus.high
  );
};

export interface ArterialEstimate {
  ph: number;
  pco2Low: number;
  pco2High: number;
  hco3: number;
}

/**
 * The arterial estimate of a venous gas, as calc/readOxygenation.ts venousPart gives it for the current gas (same
 * figures, same rounding; Byrne et al. 2014, from memory): pH + 0.03, PCO2 4-6 mmHg lower, HCO3 1 lower. Null
 * for a venous PCO2 too low to estimate from.
 */
export function arterialEstimateOf(
  gas: Pick<Gas, 'ph' | 'pco2' | 'hco3'>,
): ArterialEstimate | null {
  if (gas.pco2 < VENOUS.minPco2) return null;
  return {
    ph: round(gas.ph + VENOUS.ph, 2),
    pco2Low: round(gas.pco2 - VENOUS.pco2High, 0),
    pco2High: round(gas.pco2 - VENOUS.pco2Low, 0),
    hco3: round(gas.hco3 - VENOUS.hco3, 1),
  };
}

export interface Placement {
  /** where the marker goes */
  point: GasPoint;
  /** the span of arterial PaCO2 a venous gas stands for, drawn as a bar; null when measured */
  pco2Range: { low: number; high: number } | null;
  basis: 'measured' | 'venous_estimate';
}

/** A measured gas at its pH and PaCO2; a venous gas at its arterial estimate, the middle of its PaCO2 span. */
export function placeGas(
  gas: Pick<Gas, 'ph' | 'pco2'>,
  estimate: ArterialEstimate | null,
): Placement {
  if (!estimate)
    return {
      point: { pco2: gas.pco2, hPlus: hydrogenIon(gas.ph) },
      pco2Range: null,
      basis: 'measured',
    };
  return {
    point: { pco2: (estimate.pco2Low + estimate.pco2High) / 2, hPlus: hydrogenIon(estimate.ph) },
    pco2Range: { low: estimate.pco2Low, high: estimate.pco2High },
    basis: 'venous_estimate',
  };
}

export interface TargetPoint extends GasPoint {
  hco3: number;
}

/**
 * Where a change of ventilation to the target PaCO2 leads: HCO3 moves 0.1 mmol/L per mmHg with an acute change
 * (Berend 2014; the same acute buffering calc/ventilation.ts targetPco2Buffered assumes), and [H+] follows from
 * the Henderson equation. For a target worked out from a target pH this lands on that pH's [H+].
 */
export function targetPoint(
  now: { pco2: number; hco3: number },
  targetPco2: number,
): TargetPoint | null {
  const hco3 = now.hco3 + PHYSIOLOGY.acuteBufferPerMmHg * (targetPco2 - now.pco2);
  if (!(hco3 > 0) || !(targetPco2 > 0)) return null;
  return { pco2: targetPco2, hco3, hPlus: hendersonHydrogenIon(targetPco2, hco3) };
}

export const mmHgToKpa = (mmHg: number) => mmHg / units.MMHG_PER_KPA;
