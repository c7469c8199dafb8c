// A PaCO2 that looks normal but is not what this patient needs (clinical-scope section 10): in a metabolic acidosis
// it should sit in the Winters band, in pregnancy at about 28-32 mmHg, and in an asthma attack below normal. A PaCO2
// in or above the textbook range there is relative hypoventilation: tiring, or failing drive.
import { ASTHMA, NORMAL, PREGNANCY } from './reference.ts';
import type { Band } from './compensation.ts';
import type { Condition } from './conditions.ts';

export type HypoventilationReason = 'metabolic_acidosis' | 'pregnancy' | 'asthma';

export interface RelativeHypoventilation {
  reason: HypoventilationReason;
  pco2: number;
  /** the highest PaCO2 this patient should have */
  limit: number;
}

export interface HypoventilationInput {
  /** the PaCO2 judged: measured, or the lowest arterial estimate of a venous PCO2 */
  pco2: number;
  pregnant: boolean;
  conditions: readonly Condition[];
  /** Winters' band when a metabolic acidosis is the primary process */
  winters: Band | null;
  /** a ventilated patient's PaCO2 is the ventilator's: the ventilation checks judge it instead */
  ventilated: boolean;
}

/** Each reason this PaCO2 is too high for this patient although it looks normal (or is plainly high). */
export function relativeHypoventilation(x: HypoventilationInput): RelativeHypoventilation[] {
  if (x.ventilated || x.pco2 < NORMAL.pco2.low) return [];
  const out: RelativeHypoventilation[] = [];
  // Winters' formula (Albert, Dell and Winters 1967): above the band, ventilation is not keeping up
  if (x.winters && x.pco2 > x.winters.high)
    out.push({ reason: 'metabolic_acidosis', pco2: x.pco2, limit: x.winters.high });
  // pregnancy: PaCO2 about 28-32 mmHg (textbook common practice)
  if (x.pregnant && x.pco2 > PREGNANCY.pco2.high)
    out.push({ reason: 'pregnancy', pco2: x.pco2, limit: PREGNANCY.pco2.high });
  // acute asthma: a normal or raised PaCO2 is a life-threatening feature (BTS/SIGN asthma guideline; from memory)
  if (x.conditions.includes('asthma'))
    out.push({ reason: 'asthma', pco2: x.pco2, limit: ASTHMA.pco2NotLowFrom });
  return out;
}
