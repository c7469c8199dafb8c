// From the items read to the case: the newest gas is the case's gas (with the chemistry and settings of its
// time), the earlier gases become `previous` (oldest first, at most calc's MAX_PREVIOUS_GASES, each with its
// time, its gas and its FiO2, PEEP, VT and RR), and every other result is reported with the reason.
import {
  FIELD,
  MAX_PREVIOUS_GASES,
  PREVIOUS_SETTINGS,
  inRange,
  inTimeOrder,
  parseCase,
  rangeText,
  resolveUnits,
  type FieldPath,
  type Units,
} from '../../../calc/index.ts';
import {
  REQUIRED_GAS,
  missingGas,
  setCaseValue,
  unitShown,
  type Sample,
  SAMPLES,
} from '../case.ts';
import { CORE_GAS, OLDER, byTime, latestOf, type Aside, type Gas } from './gases.ts';
import type { Item, ReadState } from './observation.ts';
import type { FhirPrevious, FhirRead, FhirResult } from './types.ts';
import { harmonise } from './units.ts';

const KEPT_WITH_EARLIER: ReadonlySet<string> = new Set(PREVIOUS_SETTINGS);
const isSample = (s: string): s is Sample => (SAMPLES as readonly string[]).includes(s);
const statedSamples = (items: readonly Item[]): Sample[] => [
  ...new Set(
    items
      .filter((i) => CORE_GAS.has(i.path))
      .map((i) => i.entry.specimen)
      .filter(isSample),
  ),
];
const hasGas = (items: readonly Item[]) =>
  REQUIRED_GAS.filter((p) => items.some((i) => i.path === p)).length >= 2;

interface Earlier {
  gas: Gas;
  items: Item[];
}

export function build(state: ReadState): void {
  const { result } = state;
  zoneNote(state.items, result);
  const { gases, aside } = byTime(state.items);
  const [newest, ...before] = gases as [Gas, ...Gas[]];
  const now = newestGas(newest, before, result, aside);
  const earlier = before.map((gas) => earlierGas(gas, result.case.sample ?? null, aside));
  const candidates = [...now, ...earlier.flatMap((e) => e.items)];
  const converted = harmonise(candidates);
  // one unit per kind now (harmonised): the earlier values are judged in the units of the case
  const previous = keepEarlier(earlier, resolveUnits(settingsOf(candidates)), aside);

  for (const item of now) setCaseValue(result.case, item.path, item.value);
  const settings = settingsOf([...now, ...previous.flatMap((p) => p.items)]);
  if (Object.keys(settings).length) result.case.units = settings;
  result.read = now.map(readOf);
  const where = new Map<Item, number | undefined>(now.map((i) => [i, undefined]));
  if (previous.length)
    result.case.previous = previous.map((e, index) => {
      const takenAt = e.gas.effective!;
      const entry = { takenAt, gas: {} };
      for (const item of e.items) {
        setCaseValue(entry, item.path, item.value);
        where.set(item, index);
      }
      result.previous.push({ index, takenAt, read: e.items.map(readOf) });
      return entry;
    });
  for (const c of converted)
    if (where.has(c.item)) {
      const index = where.get(c.item);
      const { item, ...conversion } = c;
      result.conversions.push({
        path: item.path,
        source: item.source,
        ...conversion,
        ...(index !== undefined
          ? { previous: index, reason: `${c.reason} (the earlier gas of ${item.effective})` }
          : {}),
      });
    }
  report(aside, result);
  if (previous.length) result.notes.push(timesNote(newest, result.previous));
  checkSchema(now, previous, result);
}

/** The newest gas: one value per field (conflicts are errors), its sample type, and whether it is whole. */
function newestGas(newest: Gas, before: Gas[], result: FhirResult, aside: Aside[]): Item[] {
  const { kept, older, conflicts } = latestOf(newest.items);
  for (const c of conflicts) result.errors.push({ path: c.path, message: c.message });
  for (const item of older) aside.push({ item, reason: OLDER });
  result.takenAt = newest.effective;
  decideSample(kept, result);
  if (!hasGas(kept) && before.some((g) => hasGas(g.items)))
    result.questions.push({
      path: 'gas',
      reason: `the newest results${newest.effective ? ` (${newest.effective})` : ''} are not a whole gas (${kept.map((i) => FIELD[i.path].label).join(', ') || 'no gas value'}), and the payload holds an earlier one: results of different times are not read together; send the rest of the newest gas, or enter it by hand`,
    });
  return kept;
}

/** The earlier gases the case keeps: plausible, whole, the most recent MAX_PREVIOUS_GASES, oldest first. */
function keepEarlier(earlier: Earlier[], units: Units, aside: Aside[]): Earlier[] {
  const whole = earlier
    .map((e) => plausible(e, units, aside))
    .filter((e) => {
      if (hasGas(e.items)) return true;
      for (const item of e.items) aside.push({ item, reason: OLDER, noGas: true });
      return false;
    });
  for (const e of whole.slice(MAX_PREVIOUS_GASES))
    for (const item of e.items)
      aside.push({
        item,
        reason: `an earlier gas beyond the ${MAX_PREVIOUS_GASES} most recent: not kept`,
      });
  return inTimeOrder(
    whole.slice(0, MAX_PREVIOUS_GASES).map((e) => ({ takenAt: e.gas.effective, e })),
  ).map(({ e }) => e);
}

/** The case's unit choices the items are in (after harmonise, one per kind). */
const settingsOf = (items: readonly Item[]): Partial<Units> =>
  Object.fromEntries(
    items.flatMap((i) => (i.setting ? [[i.setting.quantity, i.setting.unit]] : [])),
  ) as Partial<Units>;

/** An earlier gas: one value per field, of the case's sample type, its gas values and settings only. */
function earlierGas(gas: Gas, sample: Sample | null, aside: Aside[]): Earlier {
  const { kept, older, conflicts } = latestOf(gas.items);
  for (const item of older) aside.push({ item, reason: OLDER });
  for (const c of conflicts)
    for (const item of gas.items.filter((i) => i.path === c.path))
      aside.push({ item, reason: c.message });
  const stated = statedSamples(kept);
  const other =
    stated.length > 1 || (sample !== null && stated.length === 1 && stated[0] !== sample);
  const items: Item[] = [];
  for (const item of kept) {
    if (other)
      aside.push({
        item,
        reason: `of an earlier ${stated.join(' and ')} gas (${gas.effective}), and the newest gas is ${sample ?? 'of another type'}: not compared`,
      });
    else if (item.path.startsWith('gas.') || KEPT_WITH_EARLIER.has(item.path)) items.push(item);
    else
      aside.push({
        item,
        reason: `of the earlier gas of ${gas.effective}: an earlier gas keeps its gas values, FiO2, PEEP, VT and RR only`,
      });
  }
  return { gas, items };
}

/** An earlier value outside the schema's range is left out of its gas, with the range. */
function plausible(e: Earlier, units: Units, aside: Aside[]): Earlier {
  const items = e.items.filter((item) => {
    const field = FIELD[item.path];
    if (inRange(field, item.value, units)) return true;
    aside.push({
      item,
      reason: `${field.label} ${item.value} is outside ${rangeText(field, units)}: left out of the earlier gas of ${e.gas.effective}`,
    });
    return false;
  });
  return { gas: e.gas, items };
}

function readOf(item: Item): FhirRead {
  const unit = unitShown(item.entry.field, item.setting, item.value);
  return {
    path: item.path,
    value: item.value,
    unit,
    code: item.entry.code,
    display: item.display,
    source: item.source,
    effective: item.effective,
    sourceText: `${item.entry.code} ${item.display}: ${item.value}${unit ? ` ${unit}` : ''}${item.effective ? ` (${item.effective})` : ''}`,
  };
}

/** The results the case does not hold, each with its reason; an older one says whether a newer one is read. */
function report(aside: Aside[], result: FhirResult): void {
  const read = new Set<FieldPath>(result.read.map((r) => r.path));
  for (const { item, reason, noGas } of aside) {
    let why = reason;
    if (reason === OLDER)
      why = `${read.has(item.path) ? 'an older result; the latest one is read' : 'an older result, of no gas the case keeps'}${noGas ? ' (its time has no gas of two of pH, PaCO2 and HCO3 to keep as an earlier one)' : ''}`;
    result.earlier.push({
      path: item.path,
      code: item.entry.code,
      value: item.value,
      unit: unitShown(item.entry.field, item.setting, item.value),
      effective: item.effective,
      source: item.source,
      reason: why,
    });
  }
}

function decideSample(kept: Item[], result: FhirResult): void {
  const core = kept.filter((i) => CORE_GAS.has(i.path));
  const stated = statedSamples(core);
  if (stated.length === 1) {
    result.case.sample = stated[0]!;
    return;
  }
  if (stated.length > 1) {
    const detail = core
      .filter((i) => i.entry.specimen !== 'blood')
      .map((i) => `${i.entry.code} (${i.entry.specimen}) at ${i.source}`)
      .join(', ');
    result.errors.push({
      path: 'sample',
      message: `The gas values come from different sample types: ${detail}. Send one sample`,
    });
    return;
  }
  if (core.length)
    result.questions.push({
      path: 'sample',
      reason:
        'the LOINC codes do not say whether the sample is arterial, venous or capillary (without it the gas is read as arterial)',
      options: ['arterial', 'venous', 'capillary'],
    });
}

/** The schema checks the draft like any case; its errors point back to the Observation. */
function checkSchema(kept: Item[], previous: Earlier[], result: FhirResult): void {
  const checked = parseCase(result.case);
  if (checked.ok) return;
  const at = new Map<string, Item>(kept.map((i) => [i.path, i]));
  previous.forEach((e, index) => {
    for (const i of e.items) at.set(`previous.${index}.${i.path}`, i);
  });
  for (const e of checked.errors) {
    if (e.path === 'gas' && missingGas(result.case).length > 1) continue; // reported in missing
    const item = at.get(e.path);
    result.errors.push({
      path: item ? `${item.source}.valueQuantity.value` : e.path,
      message: e.message,
    });
  }
}

function timesNote(newest: Gas, previous: FhirPrevious[]): string {
  const times = previous.map((p) => p.takenAt);
  return `The newest gas${newest.effective ? ` (${newest.effective})` : ''} is the case's gas; ${times.length === 1 ? 'an earlier gas is' : `${times.length} earlier gases are`} kept as previous: ${times.join(', ')}`;
}

/** Times are read as written (calc's gasTime); results written in different zones are pointed out. */
function zoneNote(items: readonly Item[], result: FhirResult): void {
  const zones = new Set(
    items.map((i) => /(?:Z|[+-]\d{2}:\d{2})$/.exec(i.effective ?? '')?.[0]).filter(Boolean),
  );
  if (zones.size > 1)
    result.notes.push(
      `The results carry times in different zones (${[...zones].join(', ')}): times are read as written, so check which gas is the newest`,
    );
}
