// The edge: a validated case in the clinician's units becomes a case in canonical units, once. Every number is
// converted by its row of the table of fields (fields.ts).
import { fio2Fraction, resolveUnits, toCanonical, type Units } from './units.ts';
import { FIELD, fieldsOf, keyOf, type FieldSpec, type KeysOf } from './fields.ts';
import type { ParsedCase } from './schema.ts';
import { mergeSettings, type Settings } from './reference.ts';
import {
  hendersonBicarbonate,
  hendersonHydrogenIon,
  hendersonPco2,
  hydrogenIon,
  phFromHydrogenIon,
} from './acidBase.ts';
import type { Timing } from './compensation.ts';
import type { Condition } from './conditions.ts';
import type { Sex } from './ventilation.ts';

type N = number | null;
/** A group's numbers in canonical units, null where not given. */
export type Values<G extends string> = Record<KeysOf<G>, N>;

/** One entered number in canonical units (FiO2 as a fraction). */
export function canonicalValue(f: FieldSpec, value: number, units: Units): number {
  if (f.path === 'oxygen.fio2') return fio2Fraction(value);
  return f.quantity ? toCanonical(f.quantity, value, units) : value;
}

/** Every number of a group, in canonical units. */
function valuesOf<G extends string>(group: G, given: unknown, units: Units): Values<G> {
  const source = (given ?? {}) as Record<string, number | null | undefined>;
  const out: Record<string, N> = {};
  for (const f of fieldsOf(group)) {
    const value = source[keyOf(f)];
    out[keyOf(f)] = value === null || value === undefined ? null : canonicalValue(f, value, units);
  }
  return out as Values<G>;
}

export interface Gas extends Omit<Values<'gas'>, 'ph' | 'pco2' | 'hco3'> {
  ph: number;
  pco2: number;
  hco3: number;
  /** the one of pH, PaCO2, HCO3 that was worked out with the Henderson equation, if any */
  computed: 'ph' | 'pco2' | 'hco3' | null;
  /** all three of pH, PaCO2 and HCO3 were entered */
  complete: boolean;
}

export interface CanonicalCase {
  sample: 'arterial' | 'venous' | 'capillary';
  units: Units;
  gas: Gas;
  chemistry: Values<'chemistry'>;
  urine: Values<'urine'>;
  patient: Values<'patient'> & { sex: Sex | null; pregnant: boolean };
  context: Values<'context'> & {
    timing: Timing;
    /** known conditions, each once */
    conditions: Condition[];
    baseline: Values<'context.baseline'> | null;
  };
  oxygen: Values<'oxygen'>;
  ventilator: Values<'ventilator'> | null;
  settings: Settings;
  previous: {
    takenAt: string | null;
    label: string | null;
    gas: Gas;
    fio2: N;
    peep: N;
    vt: N;
    rr: N;
  }[];
}

/** Fill the third of pH, PaCO2, HCO3 from the other two (the schema guarantees at least two). */
export function completeGas(g: ParsedCase['gas'], units: Units): Gas {
  const values = valuesOf('gas', g, units);
  let { ph, pco2, hco3 } = values;
  let computed: Gas['computed'] = null;
  if (hco3 === null && ph !== null && pco2 !== null) {
    hco3 = hendersonBicarbonate(hydrogenIon(ph), pco2);
    computed = 'hco3';
  } else if (pco2 === null && ph !== null && hco3 !== null) {
    pco2 = hendersonPco2(hydrogenIon(ph), hco3);
    computed = 'pco2';
  } else if (ph === null && pco2 !== null && hco3 !== null) {
    ph = phFromHydrogenIon(hendersonHydrogenIon(pco2, hco3));
    computed = 'ph';
  }
  return {
    ...values,
    ph: ph as number,
    pco2: pco2 as number,
    hco3: hco3 as number,
    computed,
    complete: computed === null,
  };
}

const known = (x: unknown) => x !== null && x !== undefined;

export function canonicalize(c: ParsedCase): CanonicalCase {
  const units = resolveUnits(c.units);
  const context = c.context ?? {};
  const baseline = context.baseline;
  const earlier = (
    value: number | null | undefined,
    path: 'oxygen.fio2' | 'oxygen.peep' | 'ventilator.vt' | 'ventilator.rr',
  ): N => (known(value) ? canonicalValue(FIELD[path], value as number, units) : null);
  return {
    sample: c.sample ?? 'arterial',
    units,
    gas: completeGas(c.gas, units),
    chemistry: valuesOf('chemistry', c.chemistry, units),
    urine: valuesOf('urine', c.urine, units),
    patient: {
      ...valuesOf('patient', c.patient, units),
      sex: c.patient?.sex ?? null,
      // weeks of pregnancy say the patient is pregnant (the schema refuses weeks with "not pregnant")
      pregnant: c.patient?.pregnant === true || known(c.patient?.pregnancyWeeks),
    },
    context: {
      ...valuesOf('context', context, units),
      timing: context.timing ?? 'unknown',
      conditions: [...new Set(context.conditions ?? [])],
      baseline:
        baseline && Object.values(baseline).some(known)
          ? valuesOf('context.baseline', baseline, units)
          : null,
    },
    oxygen: valuesOf('oxygen', c.oxygen, units),
    ventilator: c.ventilator ? valuesOf('ventilator', c.ventilator, units) : null,
    settings: mergeSettings(
      c.settings
        ? {
            anionGapNormal: c.settings.anionGapNormal ?? undefined,
            anionGapHalfWidth: c.settings.anionGapHalfWidth ?? undefined,
            anionGapIncludesK: c.settings.anionGapIncludesK ?? undefined,
          }
        : null,
    ),
    previous: (c.previous ?? []).map((p) => ({
      takenAt: p.takenAt ?? null,
      label: p.label ?? null,
      gas: completeGas(p.gas, units),
      fio2: earlier(p.oxygen?.fio2, 'oxygen.fio2'),
      peep: earlier(p.oxygen?.peep, 'oxygen.peep'),
      vt: earlier(p.ventilator?.vt, 'ventilator.vt'),
      rr: earlier(p.ventilator?.rr, 'ventilator.rr'),
    })),
  };
}

export type { Settings };
