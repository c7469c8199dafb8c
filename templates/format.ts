// Display formatting for the note: canonical values become strings in the clinician's own units.
// Rounding here is for display only; nothing computed here feeds back into a calculation.
import { FIELD, units as U } from '../calc/index.ts';
import type { Band, FieldPath } from '../calc/index.ts';

/** A display string, or null when the value is unknown (templates test for it, never print it). */
export type Text = string | null;

type Maybe = number | null | undefined;

const known = (x: Maybe): x is number => typeof x === 'number' && Number.isFinite(x);

/** A number rounded for display: `decimals` places, trailing zeros dropped unless `fixed`, never "-0". */
export function numberText(value: Maybe, decimals: number, fixed = false): Text {
  if (!known(value)) return null;
  const f = 10 ** decimals;
  let rounded = Math.round(value * f) / f;
  if (Object.is(rounded, -0) || rounded === 0) rounded = 0;
  if (fixed) return rounded.toFixed(decimals);
  // a value rounded to a few places prints as its shortest decimal, which is toFixed without trailing zeros
  return String(rounded);
}

// "16/min" and "93%" take no space; every other unit does ("48 mmHg")
const withUnit = (text: Text, unit: string): Text =>
  text === null
    ? null
    : !unit
      ? text
      : unit[0] === '/' || unit[0] === '%'
        ? `${text}${unit}`
        : `${text} ${unit}`;

/** Every number-to-text rule of the note, bound to the clinician's units. */
export interface Formatter {
  units: U.Units;
  kpa: boolean;
  /** a pressure in the clinician's unit: kPa with 1 decimal, mmHg whole */
  pressure(mmHg: Maybe): Text;
  /** the bare number of a pressure, without its unit */
  pressureNumber(mmHg: Maybe): Text;
  pressureBand(band: Band | null | undefined): Text;
  pressureUnit: string;
  /** a pressure as the clinician typed it (up to 2 decimals), for quoting a doubtful entry back */
  pressureAsEntered(mmHg: Maybe): Text;
  /** P/F ratio, in the pressure unit (a ratio of PaO2 to a fraction) */
  pfRatio(mmHg: Maybe): Text;
  ph(value: Maybe): Text;
  mmol(value: Maybe, decimals?: number): Text;
  mmolBand(band: Band | null | undefined): Text;
  mosm(value: Maybe): Text;
  /** a value of the table of fields, in the clinician's unit with the decimals the table gives */
  field(path: FieldPath, value: Maybe): Text;
  plain(value: Maybe, decimals: number): Text;
  fixed(value: Maybe, decimals: number): Text;
  withUnit(value: Maybe, decimals: number, unit: string): Text;
  /** a number with its unit, keeping trailing zeros ("9.0 mL/kg PBW") */
  withUnitFixed(value: Maybe, decimals: number, unit: string): Text;
  /** a range of two numbers sharing one unit ("4-8 mL/kg PBW") */
  range(low: Maybe, high: Maybe, decimals: number, unit: string): Text;
  fio2(fraction: Maybe): Text;
}

export function formatter(units: U.Units): Formatter {
  const kpa = units.pressure === 'kPa';
  const pressureUnit = U.unitLabel('pressure', units);
  const pressureNumber = (mmHg: Maybe): Text =>
    known(mmHg) ? numberText(U.fromCanonical('pressure', mmHg, units), kpa ? 1 : 0, true) : null;
  const pressure = (mmHg: Maybe): Text => withUnit(pressureNumber(mmHg), pressureUnit);
  const band = (b: Band | null | undefined, show: (x: number) => Text, unit: string): Text => {
    if (!b) return null;
    const low = show(b.low),
      high = show(b.high);
    if (low === null || high === null) return null;
    return withUnit(low === high ? low : `${low}-${high}`, unit);
  };
  const field = (path: FieldPath, value: Maybe): Text => {
    if (!known(value)) return null;
    const f = FIELD[path];
    if (!f.quantity) return withUnit(numberText(value, f.decimals), f.unit);
    const unit = U.unitDef(f.quantity, units);
    return withUnit(
      numberText(U.fromCanonical(f.quantity, value, units), unit.decimals, true),
      unit.label,
    );
  };
  return {
    units,
    kpa,
    pressure,
    pressureNumber,
    pressureUnit,
    pressureBand: (b) => band(b, pressureNumber, pressureUnit),
    pressureAsEntered: (mmHg) =>
      known(mmHg)
        ? withUnit(numberText(U.fromCanonical('pressure', mmHg, units), 2), pressureUnit)
        : null,
    pfRatio: (mmHg) => pressure(mmHg),
    ph: (value) => numberText(value, 2, true),
    mmol: (value, decimals = 1) => withUnit(numberText(value, decimals), 'mmol/L'),
    mmolBand: (b) => band(b, (x) => numberText(x, 1), 'mmol/L'),
    mosm: (value) => withUnit(numberText(value, 1), 'mOsm/kg'),
    field,
    plain: (value, decimals) => numberText(value, decimals),
    fixed: (value, decimals) => numberText(value, decimals, true),
    withUnit: (value, decimals, unit) => withUnit(numberText(value, decimals), unit),
    withUnitFixed: (value, decimals, unit) => withUnit(numberText(value, decimals, true), unit),
    range: (low, high, decimals, unit) => {
      const a = numberText(low, decimals),
        b = numberText(high, decimals);
      return a === null || b === null ? null : withUnit(a === b ? a : `${a}-${b}`, unit);
    },
    fio2: (fraction) => numberText(fraction, 2, true),
  };
}
