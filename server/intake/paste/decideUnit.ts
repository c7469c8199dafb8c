// The unit of each value, and so the number the case takes. A unit written beside the value is read by calc's
// readUnit over the table of fields (mEq/L by the ion's charge); a bare number takes the unit in which it is
// plausible (the windows below), or the field's one unit (pressures: pressures.ts). Plausibility is the schema's
// (calc's inRange). Whatever is not clear is a question (doubts.ts), never a guess.
import {
  FIELD,
  inRange,
  readUnit,
  resolveUnits,
  type FieldPath,
  type FieldSpec,
  type UnitReading,
  type Units,
} from '../../../calc/index.ts';
import { unitShown, type Question } from '../case.ts';
import type { Candidate } from './collect.ts';
import {
  SPECIAL,
  questionOf,
  expectedUnits,
  fractionOfPercent,
  outside,
  wrongUnit,
} from './doubts.ts';
import type { Variant } from './labels.ts';
import type { ReadValue, UnitSource } from './types.ts';
import type { UnitToken } from './units.ts';

export type Ask = (q: Question) => void;
export type Fill = (
  cand: Candidate,
  read: Pick<ReadValue, 'value' | 'unit' | 'unitFrom' | 'note' | 'written'>,
  units?: Partial<Units>,
) => void;

export interface Window {
  min: number;
  max: number;
  /** a unit the number may be in that the case never takes for this label: it is asked about */
  notTaken?: true;
}

// Windows in which a bare number is a believable adult result in that unit. They only decide which unit a number
// without one is in; a number inside two windows, or only in a unit the case does not take, is asked about (our own
// limits, common practice).
export const WINDOWS: Partial<Record<FieldPath, Record<string, Window>>> = {
  'gas.pco2': { mmHg: { min: 10, max: 150 }, kPa: { min: 1.3, max: 20 } },
  'gas.po2': { mmHg: { min: 15, max: 700 }, kPa: { min: 2, max: 93 } },
  'chemistry.albumin': { 'g/dL': { min: 0.8, max: 6.5 }, 'g/L': { min: 8, max: 65 } },
  // Hb in mmol/L (Hb monomer, about 16.1 g/mmol; from memory) is used in some countries and is asked about
  'gas.hb': {
    'g/dL': { min: 3, max: 25 },
    'g/L': { min: 30, max: 250 },
    'mmol/L': { min: 1.8, max: 15.5 },
  },
  'chemistry.glucose': { 'mmol/L': { min: 0.5, max: 60 }, 'mg/dL': { min: 20, max: 1500 } },
  'chemistry.creatinine': { 'mg/dL': { min: 0.15, max: 25 }, 'umol/L': { min: 15, max: 2500 } },
  // "Urea" in mg/dL may be urea itself or urea nitrogen (BUN): asked about, never taken as one or the other
  'chemistry.urea': {
    'mmol/L': { min: 0.5, max: 60 },
    'mg/dL': { min: 3, max: 360, notTaken: true },
  },
  // the divalent ions and phosphate are also reported in mg/dL, which the case does not take
  'chemistry.ionisedCalcium': { 'mmol/L': { min: 0.4, max: 2 }, 'mg/dL': { min: 2.5, max: 10 } },
  'chemistry.magnesium': { 'mmol/L': { min: 0.2, max: 2.5 }, 'mg/dL': { min: 0.5, max: 6 } },
  'chemistry.phosphate': { 'mmol/L': { min: 0.2, max: 4 }, 'mg/dL': { min: 0.6, max: 12 } },
};

/** A label that names its unit: urea nitrogen (BUN) is reported in mg/dL (common practice). */
const IMPLIED: Partial<Record<Variant, UnitToken>> = { bun: 'mg/dL' };

const VARIANT_NOTE: Partial<Record<Variant, string>> = {
  standard: 'standard base excess (no actual base excess on the paste)',
  o2hb: 'oxyhaemoglobin fraction (no sO2 on the paste); it runs slightly below sO2 when COHb or MetHb is raised',
};

export const inWindow = (v: number, w: Window): boolean => v >= w.min && v <= w.max;
const settingOf = (r: UnitReading & { ok: true }): Partial<Units> =>
  r.setting ? ({ [r.setting.quantity]: r.setting.unit } as Partial<Units>) : {};

/** Take a reading if the schema's range allows it in its unit; else ask. */
export function take(
  f: FieldSpec,
  c: Candidate,
  r: UnitReading & { ok: true },
  from: UnitSource,
  ask: Ask,
  fill: Fill,
) {
  const settings = settingOf(r);
  const shown = unitShown(f, r.setting, r.value);
  if (!inRange(f, r.value, resolveUnits(settings)))
    return ask(outside(f, c, r.value, shown, settings));
  const converted = r.value !== c.value && c.unit === 'mEq/L';
  const note = [
    c.variant ? VARIANT_NOTE[c.variant] : undefined,
    converted ? `written ${c.value} mEq/L: mmol/L = mEq/L / ${f.charge} for this ion` : undefined,
  ].filter(Boolean);
  fill(
    c,
    {
      value: r.value,
      unit: shown,
      unitFrom: from,
      ...(note.length ? { note: note.join('; ') } : {}),
      ...(converted ? { written: { value: c.value, unit: 'mEq/L' } } : {}),
    },
    r.setting ? settings : undefined,
  );
}

/** A bare number: the one unit among the windows in which it is plausible, if the case takes it. */
function byWindow(
  f: FieldSpec,
  c: Candidate,
  windows: Record<string, Window>,
  ask: Ask,
  fill: Fill,
) {
  const fits = Object.keys(windows).filter((u) => inWindow(c.value, windows[u]!));
  const usable = fits
    .map((u) => (windows[u]!.notTaken ? null : readUnit(f, u, c.value)))
    .filter((r): r is UnitReading & { ok: true } => r?.ok === true);
  if (fits.length === 1 && usable.length === 1)
    return take(f, c, usable[0]!, 'magnitude', ask, fill);
  const reason =
    fits.length > 1
      ? `${f.label} ${c.value} has no unit and fits ${fits.join(' or ')}`
      : fits.length === 1
        ? `${f.label} ${c.value} has no unit and fits ${fits[0]}, which the case does not take: enter it in ${expectedUnits(f)}`
        : `${f.label} ${c.value} has no unit and is not plausible in ${Object.keys(windows).join(' or ')}`;
  ask(questionOf(f, c, reason, Object.keys(windows)));
}

/** One value other than a pressure: its unit and the number the case takes, or a question. */
export function decideOne(path: FieldPath, c: Candidate, ask: Ask, fill: Fill): void {
  const f = FIELD[path];
  const special = SPECIAL[path]?.(f, c) ?? fractionOfPercent(f, c);
  const written = c.unit ?? (c.variant ? IMPLIED[c.variant] : undefined);
  const windows = WINDOWS[path];
  if (special) ask(special);
  else if (written) {
    const r = readUnit(f, written, c.value);
    const from = c.unit === null ? 'implied' : c.headerUnit ? 'printout' : 'text';
    if (r.ok) take(f, c, r, from, ask, fill);
    else ask(wrongUnit(f, c, r.reason));
  } else if (windows) byWindow(f, c, windows, ask, fill);
  else take(f, c, { ok: true, value: c.value, setting: null }, 'implied', ask, fill);
}
