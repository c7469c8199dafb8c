// The point compensation is measured from (textbook values, the pregnancy reference, or the patient's usual values),
// and the patient's usual point wherever it comes from: stated, worked out from a usual pH, or estimated on the chronic
// line from today's gas (clinical-scope sections 4 and 10). Every check that needs the usual PaCO2 reads it here.
import { COMPENSATION_BAND, NORMAL, PREGNANCY } from './reference.ts';
import { hendersonPco2, hydrogenIon } from './acidBase.ts';
import { RESPIRATORY_RATE, type Band } from './compensation.ts';

const band = (centre: number, half = COMPENSATION_BAND): Band => ({
  low: centre - half,
  high: centre + half,
});

/** The patient's usual (chronic) point. */
export interface UsualPoint {
  pco2: number;
  hco3: number;
  /** stated (usual PaCO2 or HCO3 given), from a usual pH with today's HCO3, or on the chronic line from today's gas */
  source: 'stated' | 'usual_ph' | 'chronic_line';
  /** which of the two were worked out rather than measured or stated */
  estimated: { pco2: boolean; hco3: boolean };
}

/** The point from which compensation is measured. */
export interface ReferencePoint {
  pco2: number;
  hco3: number;
  pco2Band: Band;
  hco3Band: Band;
  kind: 'textbook' | 'pregnancy' | 'baseline';
  /** set when part of the baseline was worked out rather than stated */
  estimated: { pco2: boolean; hco3: boolean };
  /** a usual pH was given alone but today's HCO3 has itself moved (low, or lowered by a raised-AG acidosis), so it
   *  cannot stand for the chronic part: not used */
  usualPhIgnored: boolean;
  /** the patient's usual point, however it was obtained (the reference itself when it is a baseline); null if unknown */
  usual: UsualPoint | null;
}

export interface Baseline {
  pco2?: number | null;
  hco3?: number | null;
  ph?: number | null;
}

// An estimated usual value stays inside the plausibility ranges of schema.ts (PaCO2 5-200 mmHg, HCO3 1-70 mmol/L).
const plausiblePco2 = (p: number): number => Math.min(200, Math.max(5, p));
const plausibleHco3 = (h: number): number => Math.min(70, Math.max(1, h));
const has = (v: number | null | undefined): v is number => v !== null && v !== undefined;

// Usual PaCO2 from a usual pH (clinical-scope sections 4 and 10): today's HCO3 is the chronic part, so
// usual PaCO2 = [H+]usual x HCO3 / 24 (Henderson), an estimate. No acute buffering is taken out first.
export const usualPco2FromUsualPh = (usualPh: number, hco3: number): number =>
  hendersonPco2(hydrogenIon(usualPh), hco3);

// The usual point on the chronic line from which an acute change reaches today's gas (clinical-scope section 10):
// HCO3 = ref HCO3 + chronic rate x (P0 - ref PaCO2) + acute rate x (PaCO2 - P0), solved for P0 (Berend 2014 rates:
// acidosis 0.35 and 0.1, alkalosis 0.45 and 0.2 mmol/L per mmHg). P0 lies between the reference and today's PaCO2.
export function usualOnChronicLine(
  pco2: number,
  hco3: number,
  ref: { pco2: number; hco3: number },
): { pco2: number; hco3: number } {
  const rate = pco2 >= ref.pco2 ? RESPIRATORY_RATE.acidosis : RESPIRATORY_RATE.alkalosis;
  const p0 =
    (hco3 - ref.hco3 + rate.chronic * ref.pco2 - rate.acute * pco2) / (rate.chronic - rate.acute);
  const usual = Math.min(Math.max(p0, Math.min(ref.pco2, pco2)), Math.max(ref.pco2, pco2));
  return { pco2: usual, hco3: ref.hco3 + rate.chronic * (usual - ref.pco2) };
}

/** Is this usual PaCO2 outside the textbook range (35-45 mmHg), a chronic respiratory process of its own? */
export const usualIsChronic = (usual: UsualPoint | null): boolean =>
  usual !== null && (usual.pco2 > NORMAL.pco2.high || usual.pco2 < NORMAL.pco2.low);

/** The patient's usual PaCO2 in chronic hypercapnia, however it was obtained; null when there is none. */
export const usualPco2 = (ref: ReferencePoint): number | null =>
  ref.usual !== null && ref.usual.pco2 > NORMAL.pco2.high ? ref.usual.pco2 : null;

/**
 * The reference point: a stated baseline overrides textbook 40/24; pregnancy uses its own.
 * A usual pH with a usual PaCO2 or HCO3 gives the other by the Henderson equation; a usual pH alone takes today's HCO3
 * as the chronic part (not when that HCO3 has itself moved: below the reference range, or lowered by a raised-AG
 * acidosis). A usual PaCO2 alone gives the usual HCO3 by the chronic rule, a usual HCO3 alone the usual PaCO2 by the
 * chronic rule inverted: both are usual, chronic values, so the chronic rule applies to them.
 */
export function referencePoint(
  baseline: Baseline | null | undefined,
  pregnant: boolean,
  currentHco3: number,
  hco3Lowered = false,
): ReferencePoint {
  const ref = pregnant ? PREGNANCY : NORMAL;
  const textbookPoint = (usualPhIgnored: boolean): ReferencePoint => ({
    pco2: ref.pco2.mid,
    hco3: ref.hco3.mid,
    pco2Band: { low: ref.pco2.low, high: ref.pco2.high },
    hco3Band: { low: ref.hco3.low, high: ref.hco3.high },
    kind: pregnant ? 'pregnancy' : 'textbook',
    estimated: { pco2: false, hco3: false },
    usualPhIgnored,
    usual: null,
  });
  const b = baseline ?? {};
  if (!has(b.pco2) && !has(b.hco3) && !has(b.ph)) return textbookPoint(false);
  let pco2 = has(b.pco2) ? b.pco2 : null;
  let hco3 = has(b.hco3) ? b.hco3 : null;
  const estimated = { pco2: false, hco3: false };
  let source: UsualPoint['source'] = 'stated';
  if (has(b.ph)) {
    const h = hydrogenIon(b.ph);
    if (pco2 === null && hco3 === null) {
      if (currentHco3 < ref.hco3.low || hco3Lowered) return textbookPoint(true);
      hco3 = currentHco3;
      pco2 = usualPco2FromUsualPh(b.ph, currentHco3);
      estimated.pco2 = true;
      source = 'usual_ph';
    } else if (pco2 === null && hco3 !== null) {
      pco2 = hendersonPco2(h, hco3);
      estimated.pco2 = true;
    } else if (pco2 !== null && hco3 === null) {
      hco3 = (24 * pco2) / h;
      estimated.hco3 = true;
    }
  }
  const chronic = RESPIRATORY_RATE;
  if (pco2 !== null && hco3 === null) {
    // usual HCO3 from the chronic rule, an estimate (Berend 2014)
    const rate = pco2 >= NORMAL.pco2.mid ? chronic.acidosis.chronic : chronic.alkalosis.chronic;
    hco3 = NORMAL.hco3.mid + rate * (pco2 - NORMAL.pco2.mid);
    estimated.hco3 = true;
  }
  if (hco3 !== null && pco2 === null) {
    // usual PaCO2 by inverting the chronic rule on the usual HCO3, an estimate
    const rate = hco3 >= NORMAL.hco3.mid ? chronic.acidosis.chronic : chronic.alkalosis.chronic;
    pco2 = NORMAL.pco2.mid + (hco3 - NORMAL.hco3.mid) / rate;
    estimated.pco2 = true;
  }
  const p = estimated.pco2 ? plausiblePco2(pco2 as number) : (pco2 as number);
  const h = estimated.hco3 ? plausibleHco3(hco3 as number) : (hco3 as number);
  return {
    pco2: p,
    hco3: h,
    pco2Band: { low: p - 5, high: p + 5 },
    hco3Band: band(h),
    kind: 'baseline',
    estimated,
    usualPhIgnored: false,
    usual: { pco2: p, hco3: h, source, estimated: { ...estimated } },
  };
}
