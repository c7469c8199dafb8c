// What both intakes (paste, FHIR) share: the draft case they fill (calc's CaseInput, paths from calc's FieldPath),
// the question they ask when unsure, and how a value's unit is named for the clinician. Fields, labels, ranges and
// units all come from calc's table of fields.
import {
  units,
  type CaseInput,
  type FieldPath,
  type FieldSpec,
  type Quantity,
  type UnitDef,
} from '../../calc/index.ts';

export type Sample = 'arterial' | 'venous' | 'capillary';
export const SAMPLES: readonly Sample[] = ['arterial', 'venous', 'capillary'];

/** A reading the intake is not sure of: shown to the clinician, never filled into the case. */
export interface Question {
  /** the case field (or 'sample', 'units.pressure', 'gas', '(text)') the question is about */
  path: string;
  reason: string;
  options?: string[];
  /** the option the other values point to (for example by the Henderson equation); still only a suggestion */
  suggested?: string;
  value?: number;
  sourceText?: string;
}

/** The three values of which the schema needs at least two (calc's gas check). */
export const REQUIRED_GAS: readonly FieldPath[] = ['gas.ph', 'gas.pco2', 'gas.hco3'];

type Groups = Record<string, unknown>;

/** Set a number at a field's path ('gas.ph', 'context.baseline.pco2'), making the groups on the way. */
export function setCaseValue(c: CaseInput | Groups, path: string, value: number): void {
  const keys = path.split('.');
  let node = c as Groups;
  for (const key of keys.slice(0, -1)) {
    node[key] ??= {};
    node = node[key] as Groups;
  }
  node[keys.at(-1)!] = value;
}

export function getCaseValue(c: CaseInput | Groups, path: string): number | undefined {
  let node: unknown = c;
  for (const key of path.split('.'))
    node = node !== null && typeof node === 'object' ? (node as Groups)[key] : undefined;
  return typeof node === 'number' ? node : undefined;
}

export const missingGas = (c: CaseInput, pending: ReadonlySet<string> = new Set()): FieldPath[] =>
  REQUIRED_GAS.filter((p) => getCaseValue(c, p) === undefined && !pending.has(p));

/** A unit choice of the case (the `units` group): a kind and one of its units. */
export interface UnitSetting {
  quantity: Quantity;
  unit: string;
}

/**
 * A field's unit as the clinician reads it: the label of the chosen unit ('kPa', 'µmol/L'), named where the kind
 * names its value differently by unit ('mg/dL (BUN)', 'mmol/L (urea)'); FiO2 'fraction' or '%'; '' for pH.
 */
export function unitShown(field: FieldSpec, setting: UnitSetting | null, value: number): string {
  if (field.path === 'oxygen.fio2') return value > 1 ? '%' : 'fraction';
  if (!setting) return field.unit;
  const defs = units.QUANTITIES[setting.quantity].units as Readonly<Record<string, UnitDef>>;
  const def = defs[setting.unit]!;
  const named = Object.values(defs).some((d) => d.name);
  return named ? `${def.label} (${def.name ?? field.label.toLowerCase()})` : def.label;
}
