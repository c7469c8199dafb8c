// The bands of expected compensation for single disorders and the normal region, as polygons in (pH, HCO3), and
// the test of which bands hold a gas: both from the same rules of calc/compensation.ts.
import { compensation, reference, type Band, type ReferencePoint } from '../calc/index.ts';
import { ISOPLETHS_MMHG, type PhHco3, hco3Of, phOf } from './mapGeometry.ts';

const { NORMAL } = reference;
const { metabolicAlkalosisPco2, respiratoryAcidosisHco3, respiratoryAlkalosisHco3, wintersPco2 } =
  compensation;

export type BandCode =
  | 'metabolic_acidosis'
  | 'metabolic_alkalosis'
  | 'acute_respiratory_acidosis'
  | 'chronic_respiratory_acidosis'
  | 'acute_respiratory_alkalosis'
  | 'chronic_respiratory_alkalosis';

export interface BandSpec {
  code: BandCode;
  name: string;
  /** the value sampled along the band: HCO3 for metabolic bands, PaCO2 for respiratory ones */
  along: 'hco3' | 'pco2';
  domain: (ref: ReferencePoint) => [number, number];
  expected: (x: number, ref: ReferencePoint) => Band;
}

export const refOf = (r: ReferencePoint) => ({ pco2: r.pco2, hco3: r.hco3 });
// Where each band stops (drawing choices): metabolic bands run out from the normal HCO3 to past the window's
// edges (clipped when drawn, so a gas drawn at an edge is still judged by its rule); respiratory bands run from
// the reference PaCO2 to the outermost PaCO2 line drawn.
export const HCO3_SPAN = { low: 3, high: 60 } as const;
export const PCO2_SPAN = {
  low: Math.min(...ISOPLETHS_MMHG),
  high: Math.max(...ISOPLETHS_MMHG),
} as const;

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

export const BAND_STEPS = 40;
export const CAP_STEPS = 6;

export function bandSpec(code: BandCode): BandSpec {
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
