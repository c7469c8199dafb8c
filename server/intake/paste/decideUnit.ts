// The unit of each value, and so the number the case takes. A unit written beside the value is read by calc's
// readUnit over the table of fields (mEq/L by the ion's charge); a bare number takes the unit in which it is
// plausible (the windows below), or the field's one unit (pressures: pressures.ts). Plausibility is the schema's
// (calc's inRange). Whatever is not clear is a question (doubts.ts), never a guess.
import {
  FIELD,
  FIELDS,
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

// "Urea" in mg/dL may be urea itself or urea nitrogen (BUN): a bare number there is asked about, never taken as one
// or the other (common practice). A window in a unit the case does not take for the field (Hb in mmol/L, the divalent
// ions and phosphate in mg/dL) is asked about too, since readUnit refuses it.
const ASKED_BARE: Partial<Record<FieldPath, string>> = { 'chemistry.urea': 'mg/dL' };

/**
 * Windows in which a bare number is a believable adult result in that unit (the table's `typical`): they only decide
 * which unit a number without one is in; a number inside two windows, or only in a unit the case does not take, is
 * asked about.
 */
export const WINDOWS: Partial<Record<FieldPath, Record<string, Window>>> = Object.fromEntries(
  FIELDS.flatMap((f: FieldSpec) =>
    f.typical
      ? [
          [
            f.path,
            Object.fromEntries(
              Object.entries(f.typical).map(([unit, [min, max]]) => [
                unit,
                ASKED_BARE[f.path as FieldPath] === unit
                  ? { min, max, notTaken: true }
                  : { min, max },
              ]),
            ),
          ],
        ]
      : [],
  ),
);

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
