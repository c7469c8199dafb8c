// The glucose part of a reading: corrected sodium and effective osmolality in hyperglycaemia, the ketoacidosis
// pattern, the hyperosmolar state, and the potassium to know before insulin (clinical-scope section 10).
import type { CanonicalCase } from './canonical.ts';
import type { Disorder } from './classify.ts';
import {
  correctedSodiumKatz,
  effectiveOsmolality,
  hyperglycaemic,
  hyperosmolarState,
  potassiumBeforeInsulin,
  type PotassiumBeforeInsulin,
} from './glucose.ts';
import { flag, type Flag } from './flags.ts';
import { input, record, round } from './explain.ts';
import { type Book, has } from './findings.ts';

const M = 'mmol/L';

export interface GlucoseReading {
  hyperglycaemia: boolean | null;
  knownDiabetes: boolean;
  /** a raised-AG metabolic acidosis with hyperglycaemia or known diabetes: ketones decide */
  ketoacidosisPattern: boolean;
  hyperosmolar: boolean | null;
  /** where insulin is likely (either pattern): the potassium to act on first */
  potassium: PotassiumBeforeInsulin | null;
}

export function glucosePart(
  c: CanonicalCase,
  book: Book,
  flags: Flag[],
  disorders: Disorder[],
): GlucoseReading | null {
  const { na, glucose, k } = c.chemistry;
  const knownDiabetes = c.context.conditions.includes('diabetes');
  if (!has(glucose) && !knownDiabetes) return null;
  const high = has(glucose) ? hyperglycaemic(glucose) : null;
  const raisedGap = disorders.some(
    (d) => d.code === 'metabolic_acidosis' && d.detail === 'high_anion_gap',
  );
  const reading: GlucoseReading = {
    hyperglycaemia: high,
    knownDiabetes,
    ketoacidosisPattern: raisedGap && (high === true || knownDiabetes),
    hyperosmolar: null,
    potassium: null,
  };
  if (has(na) && has(glucose) && high) {
    record(book, 'correctedSodium', correctedSodiumKatz(na, glucose), {
      label: 'Sodium corrected for glucose (Katz)',
      unit: M,
      decimals: 0,
      formula: 'Na + 1.6 x (glucose mg/dL - 100) / 100',
      inputs: [input('Na', na, M), input('Glucose', round(glucose, 1), M)],
      source: 'katz1973',
    });
    const effective = record(book, 'effectiveOsmolality', effectiveOsmolality(na, glucose), {
      label: 'Effective osmolality',
      unit: 'mOsm/kg',
      decimals: 1,
      formula: '2 Na + glucose (mmol/L)',
      inputs: [input('Na', na, M), input('Glucose', round(glucose, 1), M)],
      source: 'kitabchi2009',
    });
    reading.hyperosmolar = hyperosmolarState(effective, glucose);
    if (reading.hyperosmolar)
      flags.push(
        flag('hyperosmolar_state', 'warning', {
          effectiveOsmolality: round(effective, 1),
          glucose: round(glucose, 1),
        }),
      );
  }
  if (reading.ketoacidosisPattern)
    flags.push(
      flag('ketoacidosis_pattern', 'warning', {
        glucose: has(glucose) ? round(glucose, 1) : null,
        knownDiabetes,
      }),
    );
  if (reading.ketoacidosisPattern || reading.hyperosmolar) {
    reading.potassium = potassiumBeforeInsulin(has(k) ? k : null);
    if (reading.potassium !== 'within')
      flags.push(
        flag('potassium_before_insulin', 'warning', {
          k: has(k) ? round(k, 1) : null,
          status: reading.potassium,
        }),
      );
  }
  return reading;
}
