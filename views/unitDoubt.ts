// A value that makes sense only in another unit (albumin 40 under g/dL, glucose 32 under mg/dL, a kPa gas typed
// under mmHg) is asked about at its field with a one-click switch, never refused and never converted silently.
// The windows are the table's `typical` ranges (where a number is a believable adult result in each unit, the
// same windows the paste reader uses); nothing here knows a field by name.
import { FIELD, units as U, type FieldPath } from '../calc/index.ts';
import type { Group } from './fields.ts';
import { getPath, type FormValues, type Json } from './paths.ts';

/** A unit question at a field: the switch offered, and whether keeping the unit is still possible. */
export interface UnitDoubt {
  path: string;
  message: string;
  /** the form field that holds the unit (units.albumin, units.pressure) and the unit to switch to */
  unitName: string;
  switchTo: string;
  switchLabel: string;
  /** the unit as chosen, offered to keep when the value is inside its range (null: it cannot be kept) */
  keepLabel: string | null;
}

type Window = readonly [number, number];

/** The unit's window in the table: keyed by the unit's key or by its label (mg/dL for BUN). */
function windowOf(path: string, key: string, def: U.UnitDef): Window | null {
  const typical = FIELD[path as FieldPath]?.typical;
  return typical?.[key] ?? typical?.[def.label] ?? null;
}

const inside = (value: number, w: Window) => value >= w[0] && value <= w[1];

/**
 * Our own rule (common practice, no published source): a value is in doubt when it lies outside the chosen
 * unit's window but inside another's, or inside both but below twice the chosen window's floor (glucose 32 under
 * mg/dL is 1.8 mmol/L, far rarer than 32 mmol/L).
 */
export function doubtOf(
  path: string,
  value: number,
  quantity: U.Quantity,
  chosen: string,
): { to: string; def: U.UnitDef; outside: boolean } | null {
  const all = U.QUANTITIES[quantity].units as Record<string, U.UnitDef>;
  const mine = all[chosen];
  if (!mine) return null;
  const w = windowOf(path, chosen, mine);
  if (!w) return null;
  const outside = !inside(value, w);
  if (!outside && value >= 2 * w[0]) return null;
  const fits = Object.entries(all).filter(([key, def]) => {
    if (key === chosen) return false;
    const other = windowOf(path, key, def);
    return other !== null && inside(value, other);
  });
  if (fits.length !== 1) return null;
  const [to, def] = fits[0]!;
  return { to, def, outside };
}

/** The number fields of a step form with the unit each was entered in. */
function unitFields(groups: Group[], answers: Json) {
  return groups.flatMap((g) =>
    g.fields.flatMap((f) => {
      if (f.kind !== 'number') return [];
      const path = f.name;
      const quantity = FIELD[path as FieldPath]?.quantity;
      if (!quantity) return [];
      const unitName = `units.${quantity}`;
      const chosen = String(getPath(answers, unitName) ?? U.QUANTITIES[quantity].default);
      return [{ path, label: f.label, quantity, unitName, chosen }];
    }),
  );
}

/** The paths the clinician chose to keep as entered ("unitKept" travels with the form while it is asked). */
export const keptOf = (form: FormValues): Set<string> =>
  new Set(
    [...(form.unitKept ?? '').split(/\s+/), form.unitKeep ?? ''].filter((p) => p.trim() !== ''),
  );

/** The unit questions of a step's answer, the kept ones left out. */
export function unitDoubts(groups: Group[], answers: Json, kept: Set<string>): UnitDoubt[] {
  const out: UnitDoubt[] = [];
  for (const f of unitFields(groups, answers)) {
    const value = getPath(answers, f.path);
    if (typeof value !== 'number' || kept.has(f.path)) continue;
    const doubt = doubtOf(f.path, value, f.quantity, f.chosen);
    if (!doubt) continue;
    const mine = (U.QUANTITIES[f.quantity].units as Record<string, U.UnitDef>)[f.chosen]!;
    const to = doubt.def.name ? `${doubt.def.name} ${doubt.def.label}` : doubt.def.label;
    // the clinician may keep the unit wherever the case accepts the value in it (the table's range, canonical)
    const [low, high] = FIELD[f.path as FieldPath]!.range;
    const canonical = value * mine.factor;
    const keepable = canonical >= low && canonical <= high;
    out.push({
      path: f.path,
      message: `${f.label} ${value} ${mine.label} is ${doubt.outside ? 'not a believable result' : 'unusual'} in ${mine.label}; it looks like ${to}.`,
      unitName: f.unitName,
      switchTo: doubt.to,
      switchLabel: `This looks like ${to}: switch`,
      keepLabel: keepable ? `Keep ${mine.label}` : null,
    });
  }
  return out;
}

/** A switch pressed on a unit question ("units.albumin=g/L"): the form as if that unit had been chosen. */
export function withSwitch(form: FormValues): FormValues {
  const pressed = form.unitSwitch ?? '';
  const at = pressed.indexOf('=');
  if (at <= 0) return form;
  const name = pressed.slice(0, at);
  const unit = pressed.slice(at + 1);
  const quantity = name.startsWith('units.') ? (name.slice(6) as U.Quantity) : null;
  if (!quantity || !(quantity in U.QUANTITIES)) return form;
  if (!(unit in U.QUANTITIES[quantity].units)) return form;
  return { ...form, [name]: unit };
}
