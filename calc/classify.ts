// The naming of primary and added processes: which process explains the pH, whether compensation fits, and what
// the anion gap reveals.
import { ALKALOSIS_CEILING, COMPENSATION_BAND, NORMAL } from './reference.ts';
import {
  expectedHco3,
  metabolicAlkalosisPco2,
  wintersPco2,
  type Band,
  type Timing,
} from './compensation.ts';
import {
  usualIsChronic,
  usualOnChronicLine,
  type ReferencePoint,
  type UsualPoint,
} from './referencePoint.ts';
import {
  deltaReferences,
  readDelta,
  type DeltaReading,
  type RespiratoryShift,
} from './deltaReference.ts';

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
  | 'delta_ratio_mixed' // delta ratio below 0.8
  | 'delta_ratio_high' // delta ratio > 2
  | 'raised_gap_hidden' // raised AG though the HCO3 does not show an acidosis
  | 'raised_gap_with_high_hco3'; // raised AG with an HCO3 not below the one that applies

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
  /** respiratory primaries: a metabolic acidosis has lowered the HCO3 (a raised anion gap, or an HCO3 below the
   *  expectation), so the timing cannot be read from it (clinical-scope section 10) */
  hco3LoweredBy: 'raised_anion_gap' | 'low_hco3' | null;
  /** metabolic alkalosis: the expected PaCO2 reaches the usual ceiling of respiratory compensation */
  nearCeiling: boolean;
  /** the usual point was worked out from a usual pH with today's HCO3 as the chronic part, so today's HCO3 is the
   *  reference itself and is not checked against a rule */
  fromUsualPh: boolean;
}

export interface Classification {
  phStatus: PhStatus;
  disorders: Disorder[];
  compensation: Compensation | null;
  expectedPco2: Band | null;
  expectedHco3: Band | null;
  /** the patient's usual point: the reference's own, or estimated on the chronic line from today's gas */
  usual: UsualPoint | null;
  /** the delta ratio against the HCO3 that applies, when the anion gap is raised */
  delta: DeltaReading | null;
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

const raised = (ag: AnionGapView | null): boolean => ag !== null && ag.value > ag.upperLimit;
const band = (centre: number): Band => ({
  low: centre - COMPENSATION_BAND,
  high: centre + COMPENSATION_BAND,
});

/** Metabolic primaries: Winters' formula or the alkalosis rule, the latter with its ceiling. */
function metabolicCompensation(x: ClassifyInput, primary: DisorderCode): Compensation {
  const acid = primary === 'metabolic_acidosis';
  const expected = acid ? wintersPco2(x.hco3) : metabolicAlkalosisPco2(x.hco3);
  const span = x.pco2Range ?? { low: x.pco2, high: x.pco2 };
  let verdict = span.low > expected.high ? 'above' : span.high < expected.low ? 'below' : 'within';
  let nearCeiling = false;
  // Near the ceiling of 55-60 mmHg a shortfall no larger than the ceiling's own spread names no added process
  // (clinical-scope section 10; common practice, from memory).
  if (!acid && expected.high > ALKALOSIS_CEILING.low && verdict !== 'above') {
    const spread = ALKALOSIS_CEILING.high - ALKALOSIS_CEILING.low;
    const floor = Math.min(expected.low, ALKALOSIS_CEILING.low) - spread;
    if (span.high >= floor) {
      verdict = 'within';
      nearCeiling = true;
    }
  }
  return {
    primary,
    rule: acid ? 'winters' : 'metabolic_alkalosis',
    timing: x.timing,
    expected,
    observed: x.pco2,
    verdict: verdict as Compensation['verdict'],
    fit: null,
    acute: null,
    chronic: null,
    pco2Basis: x.pco2Basis ?? 'measured',
    hco3LoweredBy: null,
    nearCeiling,
    fromUsualPh: false,
  };
}

/** Respiratory primaries: expected HCO3, the fit against the acute and chronic rules, and the usual point. */
function respiratoryCompensation(x: ClassifyInput, primary: DisorderCode, gapRaised: boolean) {
  const acidosis = primary === 'respiratory_acidosis';
  // a usual pH alone makes today's HCO3 the chronic part (clinical-scope section 10): checking today's HCO3 against
  // a rule built on itself would be circular, so the band is that HCO3 +/- 2 and the timing comes from the usual PaCO2
  const fromUsualPh = x.reference.usual?.source === 'usual_ph';
  const e = fromUsualPh
    ? { band: band(x.reference.hco3), acute: null, chronic: null }
    : expectedHco3(x.pco2, x.timing, x.reference);
  const verdict = verdictOf(x.hco3, e.band);
  const fit = e.acute && e.chronic ? respiratoryFit(x.hco3, e.acute, e.chronic) : null;
  // a metabolic acidosis beside it has lowered the HCO3: its timing cannot be read from that HCO3
  const hco3LoweredBy = gapRaised
    ? ('raised_anion_gap' as const)
    : verdict === 'below'
      ? ('low_hco3' as const)
      : null;
  const compensation: Compensation = {
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
    hco3LoweredBy,
    nearCeiling: false,
    fromUsualPh,
  };
  const usual = x.reference.usual ?? chronicLineUsual(x, compensation);
  return { compensation, usual, detail: respiratoryDetail(x, compensation, usual, acidosis) };
}

/** No usual values, and an HCO3 that a chronic process explains, wholly or in part: the usual point on the chronic
 *  line from which an acute change reaches today's gas (clinical-scope section 10); an estimate. */
function chronicLineUsual(x: ClassifyInput, comp: Compensation): UsualPoint | null {
  const readable = comp.hco3LoweredBy === null && comp.verdict === 'within';
  const chronicPart =
    x.timing === 'chronic' ||
    (x.timing === 'unknown' && (comp.fit === 'between' || comp.fit === 'chronic'));
  if (!readable || !chronicPart) return null;
  const point = usualOnChronicLine(x.pco2, x.hco3, x.reference);
  const usual: UsualPoint = {
    ...point,
    source: 'chronic_line',
    estimated: { pco2: true, hco3: true },
  };
  return usualIsChronic(usual) ? usual : null;
}

function respiratoryDetail(
  x: ClassifyInput,
  comp: Compensation,
  usual: UsualPoint | null,
  acidosis: boolean,
): DisorderDetail | null {
  if (usual && usualIsChronic(usual)) {
    // however the usual PaCO2 was obtained, a PaCO2 beyond it (beyond its +/- 5 mmHg) is acute-on-chronic
    const beyond = acidosis ? x.pco2 > usual.pco2 + 5 : x.pco2 < usual.pco2 - 5;
    return beyond || x.timing === 'acute' ? 'acute_on_chronic' : 'chronic';
  }
  if (x.timing !== 'unknown') return x.timing;
  // a usual pH with a normal usual PaCO2: no chronic part, so the change since is acute
  if (comp.fromUsualPh) return usual ? 'acute' : null;
  if (comp.hco3LoweredBy !== null) return null;
  const fit = comp.fit;
  return fit === 'acute'
    ? 'acute'
    : fit === 'chronic'
      ? 'chronic'
      : fit === 'between'
        ? 'acute_on_chronic'
        : null;
}

/** The respiratory process that moves the HCO3 the raised gap is measured against: a respiratory primary, or a
 *  hypercapnia beside a metabolic primary (a low PaCO2 there is at least partly the compensation itself). */
function respiratoryShift(x: ClassifyInput, disorders: Disorder[]): RespiratoryShift | null {
  const primary = disorders[0]?.code;
  if (primary === 'respiratory_acidosis' || primary === 'respiratory_alkalosis')
    return { pco2: x.pco2, timing: x.timing };
  const hypercapnia = disorders.some((d) => d.code === 'respiratory_acidosis');
  return hypercapnia && x.pco2 > x.reference.pco2Band.high
    ? { pco2: x.pco2, timing: x.timing }
    : null;
}

/** Name every process: the primary first, then each added one. */
export function classify(x: ClassifyInput): Classification {
  const status = phStatus(x.ph);
  const primary = choosePrimary(x, status);
  const disorders: Disorder[] = [];
  const add = (d: Disorder) => {
    if (!disorders.some((e) => e.code === d.code && e.detail === d.detail)) disorders.push(d);
  };
  const ag = x.anionGap;
  const gapRaised = raised(ag);
  let compensation: Compensation | null = null;
  let expectedPco2: Band | null = null;
  let expectedHco3Band: Band | null = null;
  let usual: UsualPoint | null = x.reference.usual;
  const basisOf = (verdict: Compensation['verdict']): DisorderBasis =>
    verdict === 'within' ? 'explains_ph' : status === 'normal' ? 'normal_ph_mixed' : 'explains_ph';

  if (primary === 'metabolic_acidosis' || primary === 'metabolic_alkalosis') {
    compensation = metabolicCompensation(x, primary);
    expectedPco2 = compensation.expected;
    const acid = primary === 'metabolic_acidosis';
    add({
      code: primary,
      detail: acid ? anionGapDetail(ag) : null,
      role: 'primary',
      basis: basisOf(compensation.verdict),
    });
    if (compensation.verdict === 'above')
      add({
        code: 'respiratory_acidosis',
        detail: null,
        role: 'added',
        basis: 'pco2_above_expected',
      });
    if (compensation.verdict === 'below')
      add({
        code: 'respiratory_alkalosis',
        detail: null,
        role: 'added',
        basis: 'pco2_below_expected',
      });
  } else if (primary === 'respiratory_acidosis' || primary === 'respiratory_alkalosis') {
    const r = respiratoryCompensation(x, primary, gapRaised);
    compensation = r.compensation;
    expectedHco3Band = compensation.expected;
    usual = r.usual;
    add({ code: primary, detail: r.detail, role: 'primary', basis: basisOf(compensation.verdict) });
    if (compensation.verdict === 'above')
      add({
        code: 'metabolic_alkalosis',
        detail: null,
        role: 'added',
        basis: 'hco3_above_expected',
      });
    if (compensation.verdict === 'below')
      add({
        code: 'metabolic_acidosis',
        detail: anionGapDetail(ag),
        role: 'added',
        basis: 'hco3_below_expected',
      });
  }

  // The anion gap can reveal what the HCO3 hides (Kraut and Madias 2007); the delta ratio, against the HCO3 that
  // applies, what else is there (Wrenn 1990; clinical-scope section 10).
  let delta: DeltaReading | null = null;
  if (ag && gapRaised) {
    const unnamed = disorders.find((d) => d.code === 'metabolic_acidosis' && d.detail === null);
    if (unnamed) unnamed.detail = 'high_anion_gap';
    add({
      code: 'metabolic_acidosis',
      detail: 'high_anion_gap',
      role: disorders.length ? 'added' : 'primary',
      basis: 'raised_gap_hidden',
    });
    const references = deltaReferences({ ...x.reference, usual }, respiratoryShift(x, disorders));
    delta = readDelta(ag.value, ag.normal, x.hco3, references);
    if (delta.implies === 'alkalosis')
      add({
        code: 'metabolic_alkalosis',
        detail: null,
        role: 'added',
        basis: delta.points.every((p) => p.ratio === null)
          ? 'raised_gap_with_high_hco3'
          : 'delta_ratio_high',
      });
    if (delta.implies === 'normal_gap_acidosis')
      add({
        code: 'metabolic_acidosis',
        detail: 'normal_anion_gap',
        role: 'added',
        basis: 'delta_ratio_mixed',
      });
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
    usual,
    delta,
  };
}
