// The delta ratio against the HCO3 that applies (clinical-scope section 10; Wrenn 1990): the raised gap is set against
// the fall in HCO3 from where this patient's HCO3 would be without the acid, which is 24 only for a textbook patient.
// It is the pregnancy value, the usual (stated) HCO3, or the HCO3 a coexisting respiratory process predicts; with a
// respiratory process of unknown timing, both the acute and the chronic prediction, and a process is named from the
// ratio only when both agree.
import { DELTA_RATIO } from './reference.ts';
import { deltaRatio, deltaRatioBand, type DeltaBand } from './anionGap.ts';
import { centre, expectedHco3, RESPIRATORY_RATE, type Timing } from './compensation.ts';
import type { ReferencePoint } from './referencePoint.ts';

/** Where a reference HCO3 comes from. */
export type DeltaBasis =
  | 'textbook'
  | 'pregnancy'
  | 'usual'
  | 'respiratory_acute'
  | 'respiratory_chronic';

/** The reading against one reference HCO3: a band of Wrenn's, or an HCO3 that has not fallen from it. */
export type DeltaVerdict = DeltaBand | 'hco3_not_lowered';

export interface DeltaPoint {
  referenceHco3: number;
  basis: DeltaBasis;
  /** null when the HCO3 has not fallen from the reference by more than DELTA_RATIO.minHco3Fall */
  ratio: number | null;
  verdict: DeltaVerdict;
}

export interface DeltaReading {
  /** one point, or the acute and the chronic one when a respiratory process of unknown timing sets the reference */
  points: DeltaPoint[];
  /** what every point implies beside the raised-AG acidosis itself; 'timing_decides' when they disagree */
  implies: 'normal_gap_acidosis' | 'alkalosis' | 'nothing_more' | 'timing_decides';
}

/** A respiratory process that moves the HCO3 the gap is measured against. */
export interface RespiratoryShift {
  pco2: number;
  timing: Timing;
}

/** The HCO3 (one, or acute and chronic) that the raised gap is measured against. */
export function deltaReferences(
  ref: Pick<ReferencePoint, 'kind' | 'pco2' | 'hco3' | 'usual'>,
  respiratory: RespiratoryShift | null,
): { hco3: number; basis: DeltaBasis }[] {
  const usual = ref.usual;
  if (usual) {
    // from the usual point only the acute change is new (Berend 2014 acute rule)
    const rate =
      respiratory === null
        ? 0
        : respiratory.pco2 >= usual.pco2
          ? RESPIRATORY_RATE.acidosis.acute
          : RESPIRATORY_RATE.alkalosis.acute;
    const pco2 = respiratory?.pco2 ?? usual.pco2;
    return [{ hco3: usual.hco3 + rate * (pco2 - usual.pco2), basis: 'usual' }];
  }
  if (respiratory) {
    const e = expectedHco3(respiratory.pco2, respiratory.timing, ref);
    const acute = { hco3: centre(e.acute), basis: 'respiratory_acute' as const };
    const chronic = { hco3: centre(e.chronic), basis: 'respiratory_chronic' as const };
    if (respiratory.timing === 'acute') return [acute];
    if (respiratory.timing === 'chronic') return [chronic];
    return [acute, chronic];
  }
  return [{ hco3: ref.hco3, basis: ref.kind === 'pregnancy' ? 'pregnancy' : 'textbook' }];
}

const implication = (v: DeltaVerdict): DeltaReading['implies'] =>
  v === 'normal_gap' || v === 'mixed_high_and_normal_gap'
    ? 'normal_gap_acidosis'
    : v === 'high_gap'
      ? 'nothing_more'
      : 'alkalosis';

/** The delta ratio against each reference HCO3, and what they agree on (Wrenn 1990 bands). */
export function readDelta(
  anionGap: number,
  normalAnionGap: number,
  hco3: number,
  references: { hco3: number; basis: DeltaBasis }[],
): DeltaReading {
  const points = references.map((r): DeltaPoint => {
    const lowered = r.hco3 - hco3 > DELTA_RATIO.minHco3Fall;
    const ratio = lowered ? deltaRatio(anionGap, hco3, normalAnionGap, r.hco3) : null;
    return {
      referenceHco3: r.hco3,
      basis: r.basis,
      ratio,
      verdict: ratio === null ? 'hco3_not_lowered' : deltaRatioBand(ratio),
    };
  });
  const implied = new Set(points.map((p) => implication(p.verdict)));
  return {
    points,
    implies: implied.size === 1 ? ([...implied][0] as DeltaReading['implies']) : 'timing_decides',
  };
}
