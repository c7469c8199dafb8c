// Gases by time: the items of a payload grouped into gases by their effective time, read as calc reads the time
// of a gas (gasTime: as written, local to the ward). The gas values (pH, PaCO2, PaO2, HCO3, base excess, SaO2)
// place a gas in time; chemistry, lactate, Hb and settings join the gas of their own time.
import { gasTime, type FieldPath } from '../../../calc/index.ts';
import type { Item } from './observation.ts';

// Results of one gas share one time: an analyser writes the whole run with the time the sample was drawn. More than
// 5 minutes apart they are different samples: shorter than any interval at which a gas is repeated (a recheck
// comes 20-30 minutes after a change, clinical-scope section 8), longer than the spread of times one run, or the
// chemistry drawn with it, is written with (our own limit).
export const SAME_SAMPLE_MS = 5 * 60 * 1000;

/** The values an analyser's gas run reports: they make one gas sample, place it in time and say its type. */
export const CORE_GAS: ReadonlySet<FieldPath> = new Set<FieldPath>([
  'gas.ph',
  'gas.pco2',
  'gas.po2',
  'gas.hco3',
  'gas.baseExcess',
  'gas.sao2',
]);

export interface Gas {
  /** the newest time of its gas values (calc's gasTime); null when the payload places nothing in time */
  time: number | null;
  /** that time as sent */
  effective: string | null;
  items: Item[];
}

/** A result the case will not hold, and why. */
export interface Aside {
  item: Item;
  reason: string;
  /** an older result whose time has no gas to keep */
  noGas?: boolean;
}

export const timeOf = (item: Item): number | null => gasTime(item.effective);

/**
 * Gases newest first. Gas values within SAME_SAMPLE_MS of the newest value of a gas belong to it; any other
 * result joins the gas nearest its time within that window. Without a single gas time, everything is one gas
 * (as sent); a result without a time joins the one gas there is, and cannot be placed when there are several.
 */
export function byTime(items: readonly Item[]): { gases: Gas[]; aside: Aside[] } {
  const core = items
    .filter((i) => CORE_GAS.has(i.path) && timeOf(i) !== null)
    .sort((a, b) => timeOf(b)! - timeOf(a)!);
  const gases: Gas[] = [];
  for (const item of core) {
    const t = timeOf(item)!;
    const last = gases.at(-1);
    if (last && last.time! - t <= SAME_SAMPLE_MS) last.items.push(item);
    else gases.push({ time: t, effective: item.effective, items: [item] });
  }
  const inGas = new Set(core);
  const rest = items.filter((i) => !inGas.has(i));
  if (!gases.length) return { gases: [{ time: null, effective: null, items: rest }], aside: [] };
  const aside: Aside[] = [];
  const newest = gases[0]!;
  for (const item of rest) {
    const t = timeOf(item);
    if (t === null) {
      if (gases.length === 1) newest.items.push(item);
      else
        aside.push({
          item,
          reason: `no effective time, and the payload holds gases of ${gases.length} times: it cannot be placed with one of them`,
        });
      continue;
    }
    const distance = (g: Gas) => Math.abs(g.time! - t);
    const near = gases
      .filter((g) => distance(g) <= SAME_SAMPLE_MS)
      .sort((a, b) => distance(a) - distance(b))[0];
    if (near) near.items.push(item);
    else if (t > newest.time!)
      aside.push({
        item,
        reason: `a result after the newest gas (${newest.effective}): not read with that gas`,
      });
    else aside.push({ item, reason: OLDER });
  }
  return { gases, aside };
}

// the reason for an older result the case does not hold; read.ts words it once the case is known
export const OLDER = 'older';

/**
 * One value per field in a gas: the latest by time. Two different values at the same time, or where one has no
 * time, cannot be told apart: the field gets the conflict's message instead.
 */
export function latestOf(items: readonly Item[]): {
  kept: Item[];
  older: Item[];
  conflicts: { path: FieldPath; message: string }[];
} {
  const byPath = new Map<FieldPath, Item[]>();
  for (const item of items) byPath.set(item.path, [...(byPath.get(item.path) ?? []), item]);
  const out = {
    kept: [] as Item[],
    older: [] as Item[],
    conflicts: [] as { path: FieldPath; message: string }[],
  };
  for (const [path, list] of byPath) {
    const pick = latest(list);
    if ('error' in pick) out.conflicts.push({ path, message: pick.error });
    else {
      out.kept.push(pick.item);
      out.older.push(...list.filter((i) => i !== pick.item));
    }
  }
  return out;
}

const shown = (i: Item) => `${i.value} ${i.setting?.unit ?? i.entry.field.unit}`.trim();

function latest(list: Item[]): { item: Item } | { error: string } {
  if (list.length === 1) return { item: list[0]! };
  const time = (i: Item) => timeOf(i) ?? Number.NEGATIVE_INFINITY;
  if (new Set(list.map(shown)).size === 1)
    return { item: list.reduce((a, b) => (time(b) > time(a) ? b : a)) };
  const name = list[0]!.entry.name;
  if (list.some((i) => timeOf(i) === null))
    return {
      error: `${name}: ${list.length} results and at least one has no effective time, so the latest cannot be told (${list.map((i) => i.source).join(', ')})`,
    };
  const max = Math.max(...list.map(time));
  const top = list.filter((i) => time(i) === max);
  if (new Set(top.map(shown)).size > 1)
    return {
      error: `${name}: different results at the same time (${top.map((i) => `${shown(i)} at ${i.source}`).join('; ')})`,
    };
  return { item: top[0]! };
}
