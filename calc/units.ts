// Unit kinds a clinician may choose for a value (the case's `units` group), each with its accepted units and
// the factor to the canonical unit: canonical = entered x factor. Inside the core only canonical units are used
// (clinical-scope section 1): mmHg, mmol/L, g/dL (albumin, Hb), µmol/L (creatinine).

export interface UnitDef {
  /** entered x factor = canonical */
  factor: number;
  /** the unit as the clinician reads it */
  label: string;
  /** decimals a value in this unit is shown with */
  decimals: number;
  /** UCUM codes (unitsofmeasure.org, case-sensitive) that mean this unit */
  ucum: readonly string[];
  /** the value's own name in this unit, where it differs (urea in mg/dL is reported as BUN) */
  name?: string;
}

export interface QuantityDef {
  canonical: string;
  default: string;
  units: Readonly<Record<string, UnitDef>>;
}

// SI: 1 mmHg = 101325 / 760 = 133.3224 Pa, so 1 kPa = 760 / 101.325 = 7.50062 mmHg.
export const MMHG_PER_KPA = 7.50062;

const u = (
  factor: number,
  label: string,
  decimals: number,
  ucum: string[],
  name?: string,
): UnitDef => (name ? { factor, label, decimals, ucum, name } : { factor, label, decimals, ucum });

export const QUANTITIES = {
  pressure: {
    canonical: 'mmHg',
    default: 'mmHg',
    units: { mmHg: u(1, 'mmHg', 0, ['mm[Hg]']), kPa: u(MMHG_PER_KPA, 'kPa', 1, ['kPa']) },
  },
  // g/L = 10 x g/dL
  albumin: {
    canonical: 'g/dL',
    default: 'g/dL',
    units: {
      'g/dL': u(1, 'g/dL', 1, ['g/dL', 'g/dl']),
      'g/L': u(0.1, 'g/L', 0, ['g/L', 'g/l']),
    },
  },
  hb: {
    canonical: 'g/dL',
    default: 'g/dL',
    units: {
      'g/dL': u(1, 'g/dL', 1, ['g/dL', 'g/dl']),
      'g/L': u(0.1, 'g/L', 0, ['g/L', 'g/l']),
    },
  },
  // glucose molar mass 180.16 g/mol: mmol/L = mg/dL x 10 / 180.16 = mg/dL / 18.016
  glucose: {
    canonical: 'mmol/L',
    default: 'mg/dL',
    units: {
      'mg/dL': u(1 / 18.016, 'mg/dL', 0, ['mg/dL', 'mg/dl']),
      'mmol/L': u(1, 'mmol/L', 1, ['mmol/L', 'mmol/l']),
    },
  },
  // urea carries two nitrogens, 2 x 14.007 = 28.01 g/mol: BUN mg/dL = urea mmol/L x 2.801
  urea: {
    canonical: 'mmol/L',
    default: 'bun-mg/dL',
    units: {
      'bun-mg/dL': u(1 / 2.801, 'mg/dL', 0, ['mg/dL', 'mg/dl'], 'BUN'),
      'urea-mmol/L': u(1, 'mmol/L', 1, ['mmol/L', 'mmol/l']),
    },
  },
  // creatinine molar mass 113.12 g/mol: µmol/L = mg/dL x 88.4
  creatinine: {
    canonical: 'umol/L',
    default: 'mg/dL',
    units: {
      'mg/dL': u(88.4, 'mg/dL', 1, ['mg/dL', 'mg/dl']),
      'umol/L': u(1, 'µmol/L', 0, ['umol/L', 'umol/l']),
    },
  },
  // ethanol molar mass 46.07 g/mol: mg/dL = mmol/L x 4.607
  ethanol: {
    canonical: 'mmol/L',
    default: 'mg/dL',
    units: {
      'mg/dL': u(1 / 4.607, 'mg/dL', 0, ['mg/dL', 'mg/dl']),
      'mmol/L': u(1, 'mmol/L', 1, ['mmol/L', 'mmol/l']),
    },
  },
} as const satisfies Record<string, QuantityDef>;

export type Quantity = keyof typeof QUANTITIES;
export type UnitOf<Q extends Quantity> = keyof (typeof QUANTITIES)[Q]['units'] & string;

/** The clinician's choice of unit for each kind: the case's `units` group, with its defaults. */
export type Units = { [Q in Quantity]: UnitOf<Q> };
export type PressureUnit = UnitOf<'pressure'>;

export const QUANTITY_NAMES = Object.keys(QUANTITIES) as Quantity[];

export const DEFAULT_UNITS = Object.fromEntries(
  QUANTITY_NAMES.map((q) => [q, QUANTITIES[q].default]),
) as Units;

/** The definition of the unit the clinician chose for a kind. */
export const unitDef = (kind: Quantity, units: Units): UnitDef =>
  (QUANTITIES[kind].units as Record<string, UnitDef>)[units[kind]]!;

/** A value as entered, in canonical units. */
export const toCanonical = (kind: Quantity, value: number, units: Units): number =>
  value * unitDef(kind, units).factor;

/** A canonical value in the unit the clinician chose, for display and messages. */
export const fromCanonical = (kind: Quantity, value: number, units: Units): number => {
  const factor = unitDef(kind, units).factor;
  return factor === 1 ? value : value / factor;
};

/** The label of the unit a clinician sees for a kind. */
export const unitLabel = (kind: Quantity, units: Units): string => unitDef(kind, units).label;

/** Units as a request gives them (any missing, null or absent), with the defaults filled in. */
export function resolveUnits(
  given: Partial<Record<Quantity, string | null>> | null | undefined,
): Units {
  const out = { ...DEFAULT_UNITS } as Record<Quantity, string>;
  for (const q of QUANTITY_NAMES) {
    const chosen = given?.[q];
    if (chosen) out[q] = chosen;
  }
  return out as Units;
}

/** FiO2 as entered: a fraction 0.21-1.00, or a percent 21-100 (any value above 1 is a percent). */
export const fio2Fraction = (entered: number): number => (entered > 1 ? entered / 100 : entered);

/** A value read from a report or a record, in the case's terms. */
export type UnitReading =
  | { ok: true; value: number; setting: { quantity: Quantity; unit: string } | null }
  | { ok: false; reason: string };

const MEQ = 'meq/l';
// how printouts write some units, beside their UCUM codes (compared without case)
const SPELLINGS: Readonly<Record<string, string>> = {
  mmhg: 'mm[hg]',
  torr: 'mm[hg]',
  'meq/l': MEQ,
  '': '1',
};

/**
 * A value whose unit is written beside it (a UCUM code, or a unit as a printout writes it) read for a field of the
 * table: the number the case takes and, for a kind with a unit choice, the setting it implies. mEq/L is mmol/L
 * times the ion's charge (so Ca 2.3 mEq/L is 1.15 mmol/L); a saturation given as a fraction (UCUM "1") becomes a
 * percent. Anything else is refused with the reason, never guessed.
 */
export function readUnit(
  field: {
    label: string;
    unit: string;
    quantity?: Quantity;
    charge?: 1 | 2;
    percent?: boolean;
    ucum?: readonly string[];
  },
  written: string,
  value: number,
): UnitReading {
  const code = written.trim().toLowerCase();
  const same = (ucum: string) =>
    (SPELLINGS[code] ?? code) === (SPELLINGS[ucum.toLowerCase()] ?? ucum.toLowerCase());
  if (field.quantity) {
    for (const [unit, def] of Object.entries(
      QUANTITIES[field.quantity].units as Record<string, UnitDef>,
    ))
      if (def.ucum.some(same))
        return { ok: true, value, setting: { quantity: field.quantity, unit } };
  } else if (code === MEQ || code === 'meq/l') {
    if (field.charge) return { ok: true, value: value / field.charge, setting: null };
    return {
      ok: false,
      reason: `${field.label} in mEq/L is not taken (it is not a single ion): give mmol/L`,
    };
  } else if (field.ucum?.some(same)) {
    return {
      ok: true,
      value: field.percent && same('1') && !same('%') ? value * 100 : value,
      setting: null,
    };
  }
  return { ok: false, reason: `"${written}" is not a unit for ${field.label}` };
}
