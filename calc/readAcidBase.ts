// The acid-base part of a reading beyond the naming of processes: the expected band explained, the patient's usual
// point recorded (however it was obtained), and a PaCO2 that is too high for this patient although it looks normal.
import type { CanonicalCase, Gas } from './canonical.ts';
import { VENOUS } from './reference.ts';
import type { Band } from './compensation.ts';
import type { Classification, Compensation } from './classify.ts';
import type { ReferencePoint } from './referencePoint.ts';
import { relativeHypoventilation } from './hypoventilation.ts';
import { flag, type Flag } from './flags.ts';
import { explanation, input, record, round, type How, type Input } from './explain.ts';
import type { Book } from './findings.ts';

const P = 'mmHg';
const M = 'mmol/L';

/** The expected band of the compensation rule that was applied, as a derived value with its explanation. */
export function explainCompensation(
  comp: Compensation | null,
  ref: ReferencePoint,
  g: Gas,
  book: Book,
) {
  if (!comp) return;
  const rounded = (b: Band): Band => ({ low: round(b.low, 1), high: round(b.high, 1) });
  const mid = (b: Band) => (b.low + b.high) / 2;
  const refInputs: Input[] = [
    input('Reference PaCO2', round(ref.pco2, 1), P),
    input('Reference HCO3', round(ref.hco3, 1), M),
  ];
  const acidosis = comp.rule === 'respiratory_acidosis';
  const respiratory: Record<'acute' | 'chronic' | 'unknown', string> = acidosis
    ? {
        acute: 'HCO3 = ref HCO3 + 1 x (PaCO2 - ref PaCO2) / 10 (+/- 2)',
        chronic: 'HCO3 = ref HCO3 + 3.5 x (PaCO2 - ref PaCO2) / 10 (+/- 2)',
        unknown: 'from acute (1 per 10 mmHg) to chronic (3.5 per 10 mmHg), +/- 2',
      }
    : {
        acute: 'HCO3 = ref HCO3 - 2 x (ref PaCO2 - PaCO2) / 10 (+/- 2)',
        chronic: 'HCO3 = ref HCO3 - 4 to 5 x (ref PaCO2 - PaCO2) / 10 (+/- 2)',
        unknown: 'from acute (2 per 10 mmHg) to chronic (4-5 per 10 mmHg), +/- 2',
      };
  const how: How = comp.fromUsualPh
    ? {
        label: `Expected HCO3 (respiratory ${acidosis ? 'acidosis' : 'alkalosis'})`,
        unit: M,
        decimals: 1,
        formula: "today's HCO3 is the chronic part (a usual pH given alone), +/- 2",
        inputs: [input('HCO3', g.hco3, M), ...refInputs],
        source: 'henderson',
      }
    : comp.rule === 'winters'
      ? {
          label: 'Expected PaCO2 (Winters)',
          unit: P,
          decimals: 1,
          formula: 'PaCO2 = 1.5 x HCO3 + 8 (+/- 2)',
          inputs: [input('HCO3', g.hco3, M)],
          source: 'winters',
        }
      : comp.rule === 'metabolic_alkalosis'
        ? {
            label: 'Expected PaCO2 (metabolic alkalosis)',
            unit: P,
            decimals: 1,
            formula: 'PaCO2 = 0.7 x HCO3 + 21 (+/- 2)',
            inputs: [input('HCO3', g.hco3, M)],
            source: 'berend2014',
          }
        : {
            label: `Expected HCO3 (respiratory ${acidosis ? 'acidosis' : 'alkalosis'})`,
            unit: M,
            decimals: 1,
            formula: respiratory[comp.timing],
            inputs: [input('PaCO2', g.pco2, P), ...refInputs],
            source: 'berend2014',
          };
  const key = how.unit === P ? 'expectedPco2' : 'expectedHco3';
  book.derived[key] = rounded(comp.expected);
  book.explain[key] = explanation(key, mid(comp.expected), how);
}

/** The usual point where part of it was worked out, as derived values with their explanations, and the flag. */
export function explainUsual(ref: ReferencePoint, g: Gas, book: Book, flags: Flag[]) {
  const usual = ref.usual;
  if (!usual || (!usual.estimated.pco2 && !usual.estimated.hco3)) return;
  const how: Record<typeof usual.source, Pick<How, 'formula' | 'inputs' | 'source'>> = {
    usual_ph: {
      formula:
        "usual PaCO2 = [H+] at the usual pH x today's HCO3 / 24 (today's HCO3 is the chronic part)",
      inputs: [input('HCO3', g.hco3, M)],
      source: 'henderson',
    },
    chronic_line: {
      formula:
        'HCO3 = ref HCO3 + chronic rate x (P0 - ref PaCO2) + acute rate x (PaCO2 - P0), solved for the usual PaCO2 P0',
      inputs: [input('PaCO2', g.pco2, P), input('HCO3', g.hco3, M)],
      source: 'berend2014',
    },
    stated: {
      formula: 'from the stated usual value by the Henderson equation or the chronic rule',
      inputs: [input('Usual PaCO2', usual.pco2, P), input('Usual HCO3', usual.hco3, M)],
      source: 'berend2014',
    },
  };
  const parts = [
    ['usualPco2', 'Usual PaCO2 (estimate)', P, usual.pco2, usual.estimated.pco2],
    ['usualHco3', 'Usual HCO3 (estimate)', M, usual.hco3, usual.estimated.hco3],
  ] as const;
  for (const [key, label, unit, value, estimated] of parts)
    if (estimated) record(book, key, value, { label, unit, decimals: 1, ...how[usual.source] });
  flags.push(
    flag('baseline_estimated', 'info', {
      pco2: round(usual.pco2, 1),
      hco3: round(usual.hco3, 1),
      pco2Estimated: usual.estimated.pco2,
      hco3Estimated: usual.estimated.hco3,
      source: usual.source,
    }),
  );
}

/** A "normal" PaCO2 that is not normal for this patient (clinical-scope section 10), one flag per reason. */
export function hypoventilationFlags(c: CanonicalCase, cl: Classification, flags: Flag[]) {
  const venous = c.sample === 'venous' && c.gas.pco2 >= VENOUS.minPco2;
  const primary = cl.disorders[0]?.code;
  for (const r of relativeHypoventilation({
    // a venous PCO2 stands for an arterial one up to 6 mmHg lower (Byrne et al. 2014, from memory)
    pco2: venous ? c.gas.pco2 - VENOUS.pco2High : c.gas.pco2,
    pregnant: c.patient.pregnant,
    conditions: c.context.conditions,
    winters: primary === 'metabolic_acidosis' ? cl.expectedPco2 : null,
    ventilated: c.ventilator !== null,
  }))
    flags.push(
      flag('relative_hypoventilation', 'warning', {
        reason: r.reason,
        pco2: round(c.gas.pco2, 1),
        limit: round(r.limit, 1),
      }),
    );
}
