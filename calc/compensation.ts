// Expected compensation (Berend 2014; Winters 1967): the rules of thumb, one function each.
import { COMPENSATION_BAND } from './reference.ts';

export interface Band {
  low: number;
  high: number;
}
export type Timing = 'acute' | 'chronic' | 'unknown';

const band = (centre: number, half = COMPENSATION_BAND): Band => ({
  low: centre - half,
  high: centre + half,
});

// Winters' formula (Albert, Dell and Winters 1967): expected PaCO2 = 1.5 x HCO3 + 8 (+/- 2).
export const wintersPco2 = (hco3: number): Band => band(1.5 * hco3 + 8);

// Metabolic alkalosis (Berend 2014): expected PaCO2 = 0.7 x HCO3 + 21 (+/- 2).
export const metabolicAlkalosisPco2 = (hco3: number): Band => band(0.7 * hco3 + 21);

// Respiratory acidosis (Berend 2014): HCO3 rises 1 (acute) or 3.5 (chronic) mmol/L per 10 mmHg above the reference.
export function respiratoryAcidosisHco3(
  pco2: number,
  timing: 'acute' | 'chronic',
  ref = { pco2: 40, hco3: 24 },
): Band {
  const rate = timing === 'acute' ? 1 : 3.5;
  return band(ref.hco3 + (rate * (pco2 - ref.pco2)) / 10);
}

// Respiratory alkalosis (Berend 2014): HCO3 falls 2 (acute) or 4-5 (chronic) mmol/L per 10 mmHg below the reference.
export function respiratoryAlkalosisHco3(
  pco2: number,
  timing: 'acute' | 'chronic',
  ref = { pco2: 40, hco3: 24 },
): Band {
  const drop = (ref.pco2 - pco2) / 10;
  if (timing === 'acute') return band(ref.hco3 - 2 * drop);
  const a = ref.hco3 - 5 * drop,
    b = ref.hco3 - 4 * drop;
  return { low: Math.min(a, b) - COMPENSATION_BAND, high: Math.max(a, b) + COMPENSATION_BAND };
}

/** Expected HCO3 for a respiratory process, for the stated timing (unknown: the span from acute to chronic). */
export function expectedHco3(
  pco2: number,
  timing: Timing,
  ref = { pco2: 40, hco3: 24 },
): { band: Band; acute: Band; chronic: Band } {
  const rule = pco2 >= ref.pco2 ? respiratoryAcidosisHco3 : respiratoryAlkalosisHco3;
  const acute = rule(pco2, 'acute', ref),
    chronic = rule(pco2, 'chronic', ref);
  const span = { low: Math.min(acute.low, chronic.low), high: Math.max(acute.high, chronic.high) };
  return {
    band: timing === 'acute' ? acute : timing === 'chronic' ? chronic : span,
    acute,
    chronic,
  };
}
