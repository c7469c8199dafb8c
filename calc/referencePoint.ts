// The point compensation is measured from: textbook values, the pregnancy reference, or the patient's usual values
// (stated, or worked out from a usual pH; clinical-scope sections 4 and 10).
import { COMPENSATION_BAND, NORMAL, PREGNANCY } from './reference.ts';
import { hendersonPco2, hydrogenIon } from './acidBase.ts';
import type { Band } from './compensation.ts';

const band = (centre: number, half = COMPENSATION_BAND): Band => ({
  low: centre - half,
  high: centre + half,
});

/** The point from which compensation is measured. */
export interface ReferencePoint {
  pco2: number;
  hco3: number;
  pco2Band: Band;
  hco3Band: Band;
  kind: 'textbook' | 'pregnancy' | 'baseline';
  /** set when part of the baseline was worked out rather than stated */
  estimated: { pco2: boolean; hco3: boolean };
  /** a usual pH was given alone but the current HCO3 is low, so it cannot stand for the chronic part: not used */
  usualPhIgnored: boolean;
}

export interface Baseline {
  pco2?: number | null;
  hco3?: number | null;
  ph?: number | null;
}

// Usual pH with the current gas: the current HCO3 is the chronic part plus the acute buffering of the change in
// PaCO2 since baseline (Berend 2014 acute rules: +1 per 10 mmHg rising, -2 per 10 falling), so with k = 0.1 or 0.2
// usual HCO3 = (HCO3 - k x PaCO2) / (1 - k x [H+]usual / 24) and usual PaCO2 = [H+]usual x usual HCO3 / 24 (Henderson).
export function baselineFromUsualPh(
  usualPh: number,
  pco2: number,
  hco3: number,
): { pco2: number; hco3: number } {
  const h = hydrogenIon(usualPh);
  for (const [k, rising] of [
    [0.1, true],
    [0.2, false],
  ] as const) {
    const numerator = hco3 - k * pco2,
      denominator = 1 - (k * h) / 24;
    if (numerator <= 0 || denominator <= 0) continue;
    const usualHco3 = numerator / denominator,
      usualPco2 = hendersonPco2(h, usualHco3);
    if (rising ? usualPco2 <= pco2 : usualPco2 >= pco2) return { pco2: usualPco2, hco3: usualHco3 };
  }
  return { pco2: hendersonPco2(h, hco3), hco3 };
}

// An estimated usual value stays inside the plausibility ranges of schema.ts (PaCO2 5-200 mmHg, HCO3 1-70 mmol/L).
const plausiblePco2 = (p: number): number => Math.min(200, Math.max(5, p));
const plausibleHco3 = (h: number): number => Math.min(70, Math.max(1, h));

/**
 * The reference point: a stated baseline overrides textbook 40/24; pregnancy uses its own.
 * Baseline reasoning: with a usual pH and an HCO3 (usual, or the current one as the chronic part),
 * the usual PaCO2 follows from the Henderson equation, reported as an estimate. A usual pH alone is not used
 * when the current HCO3 is below the reference range: that HCO3 has itself moved (a metabolic change).
 */
export function referencePoint(
  baseline: Baseline | null | undefined,
  pregnant: boolean,
  currentHco3: number,
  currentPco2?: number,
): ReferencePoint {
  const ref = pregnant ? PREGNANCY : NORMAL;
  const textbook = {
    pco2Band: { low: ref.pco2.low, high: ref.pco2.high },
    hco3Band: { low: ref.hco3.low, high: ref.hco3.high },
  };
  const textbookPoint = (usualPhIgnored: boolean): ReferencePoint => ({
    pco2: ref.pco2.mid,
    hco3: ref.hco3.mid,
    pco2Band: textbook.pco2Band,
    hco3Band: textbook.hco3Band,
    kind: pregnant ? 'pregnancy' : 'textbook',
    estimated: { pco2: false, hco3: false },
    usualPhIgnored,
  });
  const b = baseline ?? {};
  const has = (v: number | null | undefined): v is number => v !== null && v !== undefined;
  if (!has(b.pco2) && !has(b.hco3) && !has(b.ph)) return textbookPoint(false);
  let pco2 = has(b.pco2) ? b.pco2 : null;
  let hco3 = has(b.hco3) ? b.hco3 : null;
  const estimated = { pco2: false, hco3: false };
  if (has(b.ph)) {
    const h = hydrogenIon(b.ph);
    if (pco2 === null && hco3 === null) {
      if (currentHco3 < textbook.hco3Band.low) return textbookPoint(true);
      const usual =
        currentPco2 === undefined
          ? { pco2: hendersonPco2(h, currentHco3), hco3: currentHco3 }
          : baselineFromUsualPh(b.ph, currentPco2, currentHco3);
      pco2 = usual.pco2;
      hco3 = usual.hco3;
      estimated.pco2 = true;
      estimated.hco3 = true;
    } else if (pco2 === null && hco3 !== null) {
      pco2 = hendersonPco2(h, hco3);
      estimated.pco2 = true;
    } else if (pco2 !== null && hco3 === null) {
      hco3 = (24 * pco2) / h;
      estimated.hco3 = true;
    }
  }
  if (pco2 !== null && hco3 === null) {
    // usual HCO3 from the chronic rule, an estimate (Berend 2014)
    hco3 = pco2 >= 40 ? 24 + (3.5 * (pco2 - 40)) / 10 : 24 - (4.5 * (40 - pco2)) / 10;
    estimated.hco3 = true;
  }
  if (hco3 !== null && pco2 === null) {
    // usual PaCO2 by inverting the chronic respiratory rule, an estimate
    pco2 = hco3 >= 24 ? 40 + ((hco3 - 24) * 10) / 3.5 : 40 - ((24 - hco3) * 10) / 4.5;
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
  };
}
