// The naming of primary and added processes: which process explains the pH, whether compensation fits, and what
// the anion gap reveals.
import { NORMAL } from './reference.ts';
import {
  expectedHco3,
  metabolicAlkalosisPco2,
  wintersPco2,
  type Band,
  type Timing,
} from './compensation.ts';
import type { ReferencePoint } from './referencePoint.ts';

export type DisorderCode =
  | 'metabolic_acidosis'
  | 'metabolic_alkalosis'
  | 'respiratory_acidosis'
  | 'respiratory_alkalosis';
export type DisorderDetail =
  | 'high_anion_gap'
  | 'normal_anion_gap'
  | 'acute'
  | 'chronic'
  | 'acute_on_chronic';

/** Why a process was named: the finding the templates put into words. */
export type DisorderBasis =
  | 'explains_ph' // the primary process: it explains the direction of the pH
  | 'normal_ph_mixed' // pH normal with both components abnormal beyond compensation
  | 'pco2_above_expected'
  | 'pco2_below_expected'
  | 'hco3_above_expected'
  | 'hco3_below_expected'
  | 'delta_ratio_mixed' // delta ratio 0.4-0.8
  | 'delta_ratio_high' // delta ratio > 2
  | 'raised_gap_hidden' // raised AG though the HCO3 does not show an acidosis
  | 'raised_gap_with_high_hco3';

export interface Disorder {
  code: DisorderCode;
  detail: DisorderDetail | null;
  role: 'primary' | 'added';
  basis: DisorderBasis;
}

export interface AnionGapView {
  /** the gap used for judgement: corrected for albumin when known */
  value: number;
  upperLimit: number;
  normal: number;
  deltaRatio: number | null;
}

export interface ClassifyInput {
  ph: number;
  pco2: number;
  hco3: number;
  /** the PCO2 judged against the rules: measured, or the arterial estimate of a venous PCO2 */
  pco2Basis?: 'measured' | 'venous_estimate';
  /** for a venous estimate, the span of arterial PCO2 it stands for: an added respiratory process is
   *  named only when the whole span lies outside the expected band */
  pco2Range?: Band;
  timing: Timing;
  reference: ReferencePoint;
  anionGap: AnionGapView | null;
}

export type PhStatus = 'acidaemia' | 'alkalaemia' | 'normal';
export type RespiratoryFit = 'acute' | 'chronic' | 'either' | 'between' | 'above' | 'below';

export interface Compensation {
  primary: DisorderCode;
  rule: 'winters' | 'metabolic_alkalosis' | 'respiratory_acidosis' | 'respiratory_alkalosis';
  timing: Timing;
  expected: Band;
  observed: number;
  verdict: 'within' | 'above' | 'below';
  /** respiratory primaries: where the HCO3 lies against the acute and chronic rules */
  fit: RespiratoryFit | null;
  acute: Band | null;
  chronic: Band | null;
  pco2Basis: 'measured' | 'venous_estimate';
}

export interface Classification {
  phStatus: PhStatus;
  disorders: Disorder[];
  compensation: Compensation | null;
  expectedPco2: Band | null;
  expectedHco3: Band | null;
}

// Acidaemia pH < 7.35, alkalaemia pH > 7.45 (common practice).
export function phStatus(ph: number): PhStatus {
  if (ph < NORMAL.ph.low) return 'acidaemia';
  if (ph > NORMAL.ph.high) return 'alkalaemia';
  return 'normal';
}

const inBand = (v: number, b: Band) => v >= b.low && v <= b.high;
const verdictOf = (v: number, b: Band): 'within' | 'above' | 'below' =>
  v > b.high ? 'above' : v < b.low ? 'below' : 'within';

function respiratoryFit(hco3: number, acute: Band, chronic: Band): RespiratoryFit {
  const a = inBand(hco3, acute),
    c = inBand(hco3, chronic);
  if (a && c) return 'either';
  if (a) return 'acute';
  if (c) return 'chronic';
  const lo = Math.min(acute.low, chronic.low),
    hi = Math.max(acute.high, chronic.high);
  if (hco3 > hi) return 'above';
  if (hco3 < lo) return 'below';
  return 'between';
}

/** Which process is primary: the one that explains the pH, or for a normal pH the likelier one. */
function choosePrimary(x: ClassifyInput, status: PhStatus): DisorderCode | null {
  const ref = x.reference;
  // contributions to log([H+]) from each component, relative to the reference point
  const resp = Math.log(x.pco2 / ref.pco2);
  const met = Math.log(ref.hco3 / x.hco3);
  if (status === 'acidaemia') {
    if (resp > 0 && (met <= 0 || resp >= met)) return 'respiratory_acidosis';
    return 'metabolic_acidosis';
  }
  if (status === 'alkalaemia') {
    if (resp < 0 && (met >= 0 || -resp >= -met)) return 'respiratory_alkalosis';
    return 'metabolic_alkalosis';
  }
  const pco2Off = !inBand(x.pco2, ref.pco2Band),
    hco3Off = !inBand(x.hco3, ref.hco3Band);
  if (!pco2Off && !hco3Off) return null;
  if (pco2Off && !hco3Off)
    return x.pco2 > ref.pco2Band.high ? 'respiratory_acidosis' : 'respiratory_alkalosis';
  if (hco3Off && !pco2Off)
    return x.hco3 < ref.hco3Band.low ? 'metabolic_acidosis' : 'metabolic_alkalosis';
  // both off with a normal pH: the process on the side of the pH is taken as primary (common practice);
  // at exactly 7.40 the larger deviation decides
  const respiratoryFirst =
    x.ph < NORMAL.ph.mid
      ? resp > 0
      : x.ph > NORMAL.ph.mid
        ? resp < 0
        : Math.abs(resp) >= Math.abs(met);
  if (x.pco2 > ref.pco2 && x.hco3 > ref.hco3)
    return respiratoryFirst ? 'respiratory_acidosis' : 'metabolic_alkalosis';
  if (x.pco2 < ref.pco2 && x.hco3 < ref.hco3)
    return respiratoryFirst ? 'respiratory_alkalosis' : 'metabolic_acidosis';
  // same-direction changes (both acidifying or both alkalinising) cannot give a normal pH unless small
  if (resp > 0 || met > 0) return resp >= met ? 'respiratory_acidosis' : 'metabolic_acidosis';
  return -resp >= -met ? 'respiratory_alkalosis' : 'metabolic_alkalosis';
}

function anionGapDetail(ag: AnionGapView | null): DisorderDetail | null {
  if (!ag) return null;
  return ag.value > ag.upperLimit ? 'high_anion_gap' : 'normal_anion_gap';
}

/** Name every process: the primary first, then each added one. */
export function classify(x: ClassifyInput): Classification {
  const status = phStatus(x.ph);
  const primary = choosePrimary(x, status);
  const disorders: Disorder[] = [];
  const add = (d: Disorder) => {
    if (!disorders.some((e) => e.code === d.code && e.detail === d.detail)) disorders.push(d);
  };
  let compensation: Compensation | null = null;
  let expectedPco2: Band | null = null;
  let expectedHco3Band: Band | null = null;
  const normalPhMixedBasis = status === 'normal' ? 'normal_ph_mixed' : 'explains_ph';

  if (primary === 'metabolic_acidosis' || primary === 'metabolic_alkalosis') {
    const acid = primary === 'metabolic_acidosis';
    expectedPco2 = acid ? wintersPco2(x.hco3) : metabolicAlkalosisPco2(x.hco3);
    const span = x.pco2Range ?? { low: x.pco2, high: x.pco2 };
    const verdict =
      span.low > expectedPco2.high ? 'above' : span.high < expectedPco2.low ? 'below' : 'within';
    compensation = {
      primary,
      rule: acid ? 'winters' : 'metabolic_alkalosis',
      timing: x.timing,
      expected: expectedPco2,
      observed: x.pco2,
      verdict,
      fit: null,
      acute: null,
      chronic: null,
      pco2Basis: x.pco2Basis ?? 'measured',
    };
    add({
      code: primary,
      detail: acid ? anionGapDetail(x.anionGap) : null,
      role: 'primary',
      basis: verdict === 'within' ? 'explains_ph' : normalPhMixedBasis,
    });
    if (verdict === 'above')
      add({
        code: 'respiratory_acidosis',
        detail: null,
        role: 'added',
        basis: 'pco2_above_expected',
      });
    if (verdict === 'below')
      add({
        code: 'respiratory_alkalosis',
        detail: null,
        role: 'added',
        basis: 'pco2_below_expected',
      });
  } else if (primary === 'respiratory_acidosis' || primary === 'respiratory_alkalosis') {
    const acidosis = primary === 'respiratory_acidosis';
    const e = expectedHco3(x.pco2, x.timing, x.reference);
    expectedHco3Band = e.band;
    const verdict = verdictOf(x.hco3, e.band);
    const fit = respiratoryFit(x.hco3, e.acute, e.chronic);
    compensation = {
      primary,
      rule: acidosis ? 'respiratory_acidosis' : 'respiratory_alkalosis',
      timing: x.timing,
      expected: e.band,
      observed: x.hco3,
      verdict,
      fit,
      acute: e.acute,
      chronic: e.chronic,
      pco2Basis: x.pco2Basis ?? 'measured',
    };
    const chronicBaseline =
      x.reference.kind === 'baseline' &&
      (x.reference.pco2 > NORMAL.pco2.high || x.reference.pco2 < NORMAL.pco2.low);
    let detail: DisorderDetail | null;
    if (x.timing === 'acute') detail = chronicBaseline ? 'acute_on_chronic' : 'acute';
    else if (x.timing === 'chronic') detail = 'chronic';
    else
      detail =
        fit === 'acute'
          ? chronicBaseline
            ? 'acute_on_chronic'
            : 'acute'
          : fit === 'chronic'
            ? 'chronic'
            : fit === 'between'
              ? 'acute_on_chronic'
              : null;
    add({
      code: primary,
      detail,
      role: 'primary',
      basis: verdict === 'within' ? 'explains_ph' : normalPhMixedBasis,
    });
    if (verdict === 'above')
      add({
        code: 'metabolic_alkalosis',
        detail: null,
        role: 'added',
        basis: 'hco3_above_expected',
      });
    if (verdict === 'below')
      add({
        code: 'metabolic_acidosis',
        detail: anionGapDetail(x.anionGap),
        role: 'added',
        basis: 'hco3_below_expected',
      });
  }

  // The anion gap can reveal what the HCO3 hides (Kraut and Madias 2007; Wrenn 1990).
  const ag = x.anionGap;
  if (ag && ag.value > ag.upperLimit) {
    const hasHighGap = disorders.some(
      (d) => d.code === 'metabolic_acidosis' && d.detail === 'high_anion_gap',
    );
    if (!hasHighGap) {
      const relabel = disorders.find((d) => d.code === 'metabolic_acidosis' && d.detail === null);
      if (relabel) relabel.detail = 'high_anion_gap';
      else
        add({
          code: 'metabolic_acidosis',
          detail: 'high_anion_gap',
          role: disorders.length ? 'added' : 'primary',
          basis: 'raised_gap_hidden',
        });
    }
    if (ag.deltaRatio === null) {
      add({
        code: 'metabolic_alkalosis',
        detail: null,
        role: 'added',
        basis: 'raised_gap_with_high_hco3',
      });
    } else if (ag.deltaRatio > 2) {
      add({ code: 'metabolic_alkalosis', detail: null, role: 'added', basis: 'delta_ratio_high' });
    } else if (ag.deltaRatio < 0.8) {
      add({
        code: 'metabolic_acidosis',
        detail: 'normal_anion_gap',
        role: 'added',
        basis: 'delta_ratio_mixed',
      });
    }
  }
  // the first named process is the primary one
  disorders.forEach((d, i) => {
    d.role = i === 0 ? 'primary' : 'added';
  });
  return {
    phStatus: status,
    disorders,
    compensation,
    expectedPco2,
    expectedHco3: expectedHco3Band,
  };
}
