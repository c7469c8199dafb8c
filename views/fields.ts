// The questions of a step form. A number question is a row of calc's table of fields, read as the page asks it:
// its label (the table's `ask` where the page words it differently), the unit the clinician chose, and for a
// kind of value with a choice of units, that choice (calc's QUANTITIES: the accepted units and their labels).
import { enteredUnit, units as U, type FieldSpec } from '../calc/index.ts';
import type { Json } from './paths.ts';

export interface Option {
  value: string;
  label: string;
  json: unknown;
  /** how the answer reads back, where that differs from the option's label ("Pregnant") */
  said?: string;
}

export interface UnitOption {
  value: string;
  label: string;
  /** how a value in this unit reads back: its name ("BUN" for urea in mg/dL) and the unit */
  name: string;
  unit: string;
}

export interface UnitChoice {
  name: string;
  label: string;
  options: UnitOption[];
  fallback: string;
}

export interface NumberField {
  kind: 'number';
  name: string;
  label: string;
  unit: string;
  unitChoice?: UnitChoice;
  negative?: boolean;
  hint?: string;
  /** the choice in the same form whose unit this field's unit label follows as it changes */
  liveUnit?: string;
}

/**
 * A question whose answer is not a value at a path of the case but says something about it ("on a ventilator"
 * is the ventilator group being there): how the case answers it, and how an answer is written into the case.
 */
export interface Pseudo {
  /** the answer the case gives, read back once its step is answered */
  read(answers: Json): string;
  /** the answer the form shows ('' where the case cannot tell an answer from a question not yet asked) */
  shown(answers: Json): string;
  write(answers: Json, value: string): void;
}

export interface ChoiceField {
  kind: 'choice';
  name: string;
  label: string;
  options: Option[];
  required?: string;
  hint?: string;
  /** one press answers: each option is its own submit button */
  quick?: boolean;
  /** the option shown when the case does not hold an answer */
  fallback?: string;
  /** set once and rarely changed: the focus passes over it to the first value */
  passOver?: boolean;
  /** not read back among the step's answers (shown with every value it applies to) */
  silent?: boolean;
  pseudo?: Pseudo;
}

export type FieldDef = NumberField | ChoiceField;

export interface Group {
  legend?: string;
  fields: FieldDef[];
}

type Quantity = U.Quantity;

const unitsOf = (q: Quantity) => Object.entries(U.QUANTITIES[q].units as Record<string, U.UnitDef>);

// a unit per litre (mmol/L, µmol/L, g/L) is the SI one; per decilitre (mg/dL, g/dL) the conventional one
const isSi = (def: U.UnitDef) => /\/L$/.test(def.label);

/**
 * The unit a value is first offered in: laboratories that report pressures in kPa mostly report SI units elsewhere
 * too, so with kPa chosen the SI unit comes first, else the kind's default. The clinician sees and can change it.
 */
function firstOffered(q: Quantity, units: U.Units): string {
  const si = units.pressure === 'kPa' ? unitsOf(q).find(([, def]) => isSi(def)) : undefined;
  return si?.[0] ?? U.QUANTITIES[q].default;
}

/** The units a field may be entered in; where a unit names the value itself (BUN), every option says its name. */
export function unitOptions(field: FieldSpec, q: Quantity): UnitOption[] {
  const all = unitsOf(q);
  const named = all.some(([, def]) => def.name);
  return all.map(([value, def]) => ({
    value,
    label: named ? `${def.name ?? field.label.toLowerCase()} ${def.label}` : def.label,
    name: def.name ?? field.label,
    unit: def.label,
  }));
}

export interface Asked {
  /** the page's label where it depends on the case (PvCO2 for a venous sample) */
  label?: string;
  hint?: string;
  /** kinds of value whose unit is chosen once for the whole case, and the choice that sets it */
  caseWide: ReadonlyMap<Quantity, string>;
  /** the choices the same form asks */
  choices: ReadonlySet<string>;
}

/** A row of the table of fields as a number question, in the units the clinician chose. */
export function numberField(field: FieldSpec, units: U.Units, asked: Asked): NumberField {
  const q = field.quantity;
  const caseWide = q ? asked.caseWide.get(q) : undefined;
  const out: NumberField = {
    kind: 'number',
    name: field.path,
    label: asked.label ?? field.ask ?? field.label,
    unit: q && !caseWide ? '' : enteredUnit(field, units),
    negative: field.range[0] < 0,
  };
  if (q && !caseWide)
    out.unitChoice = {
      name: `units.${q}`,
      label: `${field.label} unit`,
      options: unitOptions(field, q),
      fallback: firstOffered(q, units),
    };
  if (caseWide && asked.choices.has(caseWide)) out.liveUnit = caseWide;
  if (asked.hint) out.hint = asked.hint;
  return out;
}
