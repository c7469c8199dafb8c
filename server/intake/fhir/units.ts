// One unit per kind in the case: the case (its gas and its earlier gases) holds one pressure unit, one Hb unit and
// so on. A payload that mixes them is converted, with calc's units, to the unit most values use (on a tie, the
// project's default), and every conversion is reported.
import { units, type Quantity, type Units } from '../../../calc/index.ts';
import { unitShown } from '../case.ts';
import type { Item } from './observation.ts';

export interface Converted {
  item: Item;
  from: { value: number; unit: string };
  to: { value: number; unit: string };
  reason: string;
}

export function harmonise(items: readonly Item[]): Converted[] {
  const byKind = new Map<Quantity, Item[]>();
  for (const item of items)
    if (item.setting)
      byKind.set(item.setting.quantity, [...(byKind.get(item.setting.quantity) ?? []), item]);
  const out: Converted[] = [];
  for (const [kind, list] of byKind) {
    const counts = new Map<string, number>();
    for (const item of list)
      counts.set(item.setting!.unit, (counts.get(item.setting!.unit) ?? 0) + 1);
    if (counts.size < 2) continue;
    const best = Math.max(...counts.values());
    const leaders = [...counts.keys()].filter((u) => counts.get(u) === best);
    const fallback = units.DEFAULT_UNITS[kind];
    const target = leaders.includes(fallback) ? fallback : leaders[0]!;
    const inUnit = (unit: string) => ({ ...units.DEFAULT_UNITS, [kind]: unit }) as Units;
    for (const item of list) {
      const from = item.setting!.unit;
      if (from === target) continue;
      const canonical = units.toCanonical(kind, item.value, inUnit(from));
      const value = units.fromCanonical(kind, canonical, inUnit(target));
      const setting = { quantity: kind, unit: target };
      out.push({
        item,
        from: { value: item.value, unit: unitShown(item.entry.field, item.setting, item.value) },
        to: { value, unit: unitShown(item.entry.field, setting, value) },
        reason: `the payload gives ${kind} in ${[...counts.keys()].join(' and ')}; the case holds one unit, ${target}`,
      });
      item.value = value;
      item.setting = setting;
    }
  }
  return out;
}
