// FHIR R4 intake: a Bundle (collection, searchset, transaction), a list of Observations or one Observation
// -> a draft case. Reads LOINC-coded Observations with UCUM valueQuantity units (loinc.ts); reports every
// code it does not use, every result it skips, every older result it sets aside and every unit it converts.
// Pure: no I/O. A value without a usable unit is an error, never a guess.
import { parseCase, type FieldError } from '../../calc/schema.ts';
import {
  DEFAULT_UNITS,
  fromCanonical,
  toCanonical,
  type Quantity,
  type Units,
} from '../../calc/units.ts';
import {
  LOINC_NOT_READ,
  LOINC_SYSTEM,
  UCUM,
  UCUM_SYSTEM,
  UNIT_OPTIONAL,
  loincEntry,
  missingGas,
  setCaseValue,
  type CasePath,
  type IntakeCase,
  type LoincEntry,
  type Question,
  type Sample,
  type UcumUnit,
} from './loinc.ts';

// ---------- public shapes ----------

export interface FhirRead {
  path: CasePath;
  value: number;
  /** the unit as the clinician reads it ('mmHg', 'kPa', '%', 'g/L', ... ; '' for pH) */
  unit: string;
  code: string;
  display: string;
  /** where in the payload: entry[2].resource, entry[0].resource.component[1] */
  source: string;
  effective: string | null;
  sourceText: string;
}

export interface FhirUnused {
  code: string | null;
  display: string;
  reason: string;
  source: string;
}

export interface FhirSuperseded {
  path: CasePath;
  code: string;
  value: number;
  unit: string;
  effective: string | null;
  source: string;
  keptSource: string;
}

export interface FhirConversion {
  path: CasePath;
  source: string;
  from: { value: number; unit: string };
  to: { value: number; unit: string };
  reason: string;
}

export interface FhirResult {
  /** true when there is nothing to fix or confirm: no errors, no questions */
  ok: boolean;
  case: IntakeCase;
  read: FhirRead[];
  unused: FhirUnused[];
  superseded: FhirSuperseded[];
  conversions: FhirConversion[];
  /** { path, message } with the path inside the payload, such as entry[3].resource.valueQuantity.code */
  errors: FieldError[];
  questions: Question[];
  notes: string[];
  /** of pH, PaCO2 and HCO3 (the schema needs two), the ones not found */
  missing: CasePath[];
}

const BUNDLE_TYPES = new Set(['collection', 'searchset', 'transaction']);
const USABLE_STATUS = new Set(['final', 'amended', 'corrected', 'preliminary']);
/** PaCO2 ... SaO2: the values that make one gas sample and say its type. */
const CORE_GAS: ReadonlySet<CasePath> = new Set([
  'gas.ph',
  'gas.pco2',
  'gas.po2',
  'gas.hco3',
  'gas.baseExcess',
  'gas.sao2',
]);
// Results of one gas share one time; more than 5 minutes apart they are treated as different samples (our own limit).
const SAME_SAMPLE_MS = 5 * 60 * 1000;

type Json = Record<string, unknown>;
const isObject = (x: unknown): x is Json =>
  typeof x === 'object' && x !== null && !Array.isArray(x);
const str = (x: unknown): string | undefined => (typeof x === 'string' ? x : undefined);
/** Any sent value as short text for a message: never String() on an object (its own toString may throw). */
const text = (x: unknown): string => {
  if (typeof x === 'string') return x.slice(0, 200);
  if (typeof x === 'number' || typeof x === 'boolean') return String(x);
  return x === null || x === undefined ? '' : Array.isArray(x) ? 'a list' : 'an object';
};

interface Item {
  entry: LoincEntry;
  path: CasePath;
  value: number;
  unit: UcumUnit;
  ucum: string | null;
  effective: string | null;
  time: number | null;
  source: string;
  display: string;
}

interface State {
  result: FhirResult;
  items: Item[];
  /** fullUrl and Type/id of every resource in the payload, to find a panel's members */
  known: Set<string>;
}

export function caseFromFhir(json: unknown): FhirResult {
  const result: FhirResult = {
    ok: false,
    case: { gas: {} },
    read: [],
    unused: [],
    superseded: [],
    conversions: [],
    errors: [],
    questions: [],
    notes: [],
    missing: [],
  };
  const state: State = { result, items: [], known: new Set() };
  let payload = json;
  if (typeof payload === 'string') {
    try {
      payload = JSON.parse(payload);
    } catch {
      result.errors.push({
        path: '(body)',
        message:
          'The text is not JSON: send a FHIR Bundle, a list of Observations or one Observation',
      });
      return finish(state);
    }
  }
  const located = resources(payload, result);
  for (const { resource, fullUrl } of located) {
    if (fullUrl) state.known.add(fullUrl);
    if (isObject(resource) && resource.resourceType && resource.id)
      state.known.add(`${text(resource.resourceType)}/${text(resource.id)}`);
  }
  for (const { resource, source } of located) {
    if (!isObject(resource)) {
      result.errors.push({ path: source, message: 'A resource must be a JSON object' });
      continue;
    }
    if (resource.resourceType !== 'Observation') {
      result.unused.push({
        code: null,
        display: text(resource.resourceType ?? 'unknown resource'),
        reason: 'not an Observation: not read',
        source,
      });
      continue;
    }
    readObservation(resource, source, state);
  }
  choose(state);
  return finish(state);
}

function finish(state: State): FhirResult {
  const r = state.result;
  r.missing = missingGas(r.case);
  r.ok = r.errors.length === 0 && r.questions.length === 0;
  return r;
}

// ---------- the payload ----------

interface Located {
  resource: unknown;
  source: string;
  fullUrl?: string;
}

/** The resources in the payload with their paths; a payload it cannot read is an error. */
function resources(payload: unknown, result: FhirResult): Located[] {
  if (Array.isArray(payload)) return payload.map((resource, i) => ({ resource, source: `[${i}]` }));
  if (!isObject(payload)) {
    result.errors.push({
      path: '(body)',
      message: 'Send a FHIR Bundle, a list of Observations or one Observation',
    });
    return [];
  }
  if (payload.resourceType === 'Observation') return [{ resource: payload, source: 'Observation' }];
  if (payload.resourceType !== 'Bundle') {
    result.errors.push({
      path: 'resourceType',
      message: `A ${text(payload.resourceType ?? 'resource without resourceType')} is not read: send a Bundle, a list of Observations or one Observation`,
    });
    return [];
  }
  const type = str(payload.type);
  if (!type || !BUNDLE_TYPES.has(type)) {
    result.errors.push({
      path: 'type',
      message: `Bundle type "${type ?? ''}" is not read: send a collection, searchset or transaction Bundle`,
    });
    return [];
  }
  if (payload.entry !== undefined && !Array.isArray(payload.entry)) {
    result.errors.push({ path: 'entry', message: 'Bundle.entry must be a list' });
    return [];
  }
  const entries = (payload.entry ?? []) as unknown[];
  return entries.flatMap((entry, i) => {
    if (!isObject(entry)) {
      result.errors.push({ path: `entry[${i}]`, message: 'A Bundle entry must be an object' });
      return [];
    }
    if (entry.resource === undefined) {
      if (!(isObject(entry.request) && entry.request.method === 'DELETE'))
        result.errors.push({
          path: `entry[${i}].resource`,
          message: 'A Bundle entry without a resource',
        });
      return [];
    }
    const fullUrl = str(entry.fullUrl);
    return [
      { resource: entry.resource, source: `entry[${i}].resource`, ...(fullUrl ? { fullUrl } : {}) },
    ];
  });
}

function effectiveOf(obs: Json): string | null {
  const period = isObject(obs.effectivePeriod) ? obs.effectivePeriod : undefined;
  return (
    str(obs.effectiveDateTime) ??
    str(obs.effectiveInstant) ??
    str(period?.end) ??
    str(period?.start) ??
    null
  );
}

function timeOf(effective: string | null): number | null {
  if (!effective) return null;
  const t = Date.parse(effective);
  return Number.isFinite(t) ? t : null;
}

function loincCodings(code: unknown): { code: string; display: string }[] {
  if (!isObject(code) || !Array.isArray(code.coding)) return [];
  return code.coding
    .filter(isObject)
    .filter((c) => c.system === LOINC_SYSTEM && typeof c.code === 'string')
    .map((c) => ({ code: String(c.code), display: str(c.display) ?? '' }));
}

function anyCoding(code: unknown): { code: string | null; display: string } {
  if (!isObject(code)) return { code: null, display: '' };
  const first = Array.isArray(code.coding) ? code.coding.find(isObject) : undefined;
  return {
    code: first && typeof first.code === 'string' ? first.code : null,
    display: (first && str(first.display)) ?? str(code.text) ?? '',
  };
}

const isVitalSign = (obs: Json): boolean =>
  Array.isArray(obs.category) &&
  obs.category.some(
    (c) =>
      isObject(c) &&
      Array.isArray(c.coding) &&
      c.coding.some((k) => isObject(k) && k.code === 'vital-signs'),
  );

// ---------- one Observation ----------

function readObservation(obs: Json, source: string, state: State): void {
  const { result } = state;
  const status = str(obs.status);
  const head = anyCoding(obs.code);
  if (!status || !USABLE_STATUS.has(status)) {
    result.unused.push({
      code: loincCodings(obs.code)[0]?.code ?? head.code,
      display: loincCodings(obs.code)[0]?.display || head.display,
      reason: `status "${status ?? 'missing'}": not a result to use`,
      source,
    });
    return;
  }
  if (status === 'preliminary')
    result.notes.push(`${source}: a preliminary result; check it against the final report`);
  const effective = effectiveOf(obs);
  const components = Array.isArray(obs.component) ? obs.component : [];
  const hasValue = Object.keys(obs).some((k) => k.startsWith('value'));
  if (components.length || (!hasValue && Array.isArray(obs.hasMember))) {
    if (!hasValue) {
      const codings = loincCodings(obs.code);
      result.unused.push({
        code: codings[0]?.code ?? head.code,
        display: codings[0]?.display || head.display,
        reason: 'a panel: its results are read one by one',
        source,
      });
      const members = Array.isArray(obs.hasMember) ? obs.hasMember : [];
      const missingMembers = members.filter(
        (m) => isObject(m) && typeof m.reference === 'string' && !state.known.has(m.reference),
      ).length;
      if (missingMembers)
        result.notes.push(
          `${source}: the panel lists ${missingMembers} result(s) that are not in this payload`,
        );
    } else readValue(obs, obs, source, effective, state);
    components.forEach((component, j) => {
      if (isObject(component))
        readValue(component, obs, `${source}.component[${j}]`, effective, state);
    });
    return;
  }
  readValue(obs, obs, source, effective, state);
}

/** One coded value: an Observation or one of its components. */
function readValue(
  node: Json,
  obs: Json,
  source: string,
  effective: string | null,
  state: State,
): void {
  const { result } = state;
  const codings = loincCodings(node.code);
  const head = anyCoding(node.code);
  if (!codings.length) {
    result.unused.push({
      code: head.code,
      display: head.display,
      reason: 'no LOINC code: not read',
      source,
    });
    return;
  }
  // pulse oximetry: 59408-5 is sent with 2708-6 (the FHIR oxygen saturation profile); a vital sign coded 2708-6 alone is SpO2 too
  const spo2 =
    codings.some((c) => c.code === '59408-5') ||
    (isVitalSign(obs) && codings.some((c) => c.code === '2708-6'));
  const known = spo2
    ? [loincEntry('59408-5')!]
    : codings.map((c) => loincEntry(c.code)).filter((x): x is LoincEntry => !!x);
  const display =
    codings.find((c) => c.code === known[0]?.code)?.display ||
    known[0]?.name ||
    codings[0]!.display;
  if (!known.length) {
    const c = codings[0]!;
    const notRead = LOINC_NOT_READ[c.code];
    result.unused.push({
      code: c.code,
      display: c.display || notRead?.name || '',
      reason: notRead?.reason ?? 'a LOINC code Gasline does not read',
      source,
    });
    return;
  }
  if (new Set(known.map((k) => k.path)).size > 1) {
    result.errors.push({
      path: `${source}.code`,
      message: `The LOINC codes ${known.map((k) => k.code).join(', ')} name different values: send one`,
    });
    return;
  }
  const entry = known[0]!;
  if (spo2 && !codings.some((c) => c.code === '59408-5'))
    result.notes.push(
      `${source}: 2708-6 in a vital-signs Observation is read as SpO2 (pulse oximetry), not SaO2`,
    );
  if (node.dataAbsentReason !== undefined && node.valueQuantity === undefined) {
    result.unused.push({
      code: entry.code,
      display,
      reason: `no value (${anyCoding(node.dataAbsentReason).code ?? 'data absent'})`,
      source,
    });
    return;
  }
  const q = node.valueQuantity;
  if (!isObject(q)) {
    const other = Object.keys(node).find((k) => k.startsWith('value'));
    result.unused.push({
      code: entry.code,
      display,
      reason: other ? `${other} is not a quantity: not read` : 'no value',
      source,
    });
    return;
  }
  if (q.comparator !== undefined) {
    result.unused.push({
      code: entry.code,
      display,
      reason: `the value is a bound (${text(q.comparator)} ${text(q.value)}), not a number to work with`,
      source,
    });
    return;
  }
  if (typeof q.value !== 'number' || !Number.isFinite(q.value)) {
    result.errors.push({
      path: `${source}.valueQuantity.value`,
      message: `${entry.name}: the value must be a number`,
    });
    return;
  }
  const unit = unitOf(q, entry, source, result);
  if (!unit) return;
  const value = unit.unit.scale ? q.value * unit.unit.scale : q.value;
  if (unit.unit.scale)
    result.conversions.push({
      path: entry.path,
      source,
      from: { value: q.value, unit: unit.ucum ?? '' },
      to: { value, unit: unit.unit.label },
      reason: 'a fraction given as UCUM "1"; the case takes a percent',
    });
  state.items.push({
    entry,
    path: entry.path,
    value,
    unit: unit.unit,
    ucum: unit.ucum,
    effective,
    time: timeOf(effective),
    source,
    display,
  });
}

/** The UCUM unit of a valueQuantity, or an error naming the field; a unit is never assumed. */
function unitOf(
  q: Json,
  entry: LoincEntry,
  source: string,
  result: FhirResult,
): { unit: UcumUnit; ucum: string | null } | null {
  const accepted = UCUM[entry.kind];
  const system = str(q.system),
    code = str(q.code),
    text = str(q.unit);
  const list = Object.keys(accepted)
    .map((k) => `"${k}"`)
    .join(', ');
  if (!code && !text && !system) {
    if (UNIT_OPTIONAL.has(entry.kind)) return { unit: { label: '' }, ucum: null };
    result.errors.push({
      path: `${source}.valueQuantity.unit`,
      message: `${entry.name}: no unit. The value cannot be read without one (UCUM ${list})`,
    });
    return null;
  }
  if (system !== UCUM_SYSTEM) {
    result.errors.push({
      path: `${source}.valueQuantity.system`,
      message: `${entry.name}: the unit "${code ?? text ?? ''}" is not marked as UCUM (valueQuantity.system ${UCUM_SYSTEM}); Gasline does not guess units`,
    });
    return null;
  }
  if (!code) {
    result.errors.push({
      path: `${source}.valueQuantity.code`,
      message: `${entry.name}: no UCUM code for the unit "${text ?? ''}" (expected ${list})`,
    });
    return null;
  }
  const unit = accepted[code];
  if (!unit) {
    // UCUM codes are case-sensitive and mm[Hg] has brackets; name the code that was probably meant, still without using it
    const meant = Object.keys(accepted).find(
      (k) =>
        k.toLowerCase() === code.toLowerCase() ||
        k.replace(/[[\]]/g, '').toLowerCase() === code.toLowerCase(),
    );
    const hint = meant ? ` UCUM writes "${meant}"; send the value with that code.` : '';
    result.errors.push({
      path: `${source}.valueQuantity.code`,
      message: `${entry.name}: "${code}" is not a UCUM unit Gasline reads for this code (expected ${list}).${hint}`,
    });
    return null;
  }
  return { unit, ucum: code };
}

// ---------- choosing and building ----------

function choose(state: State): void {
  const { result, items } = state;
  const byPath = new Map<CasePath, Item[]>();
  for (const item of items) {
    const list = byPath.get(item.path);
    if (list) list.push(item);
    else byPath.set(item.path, [item]);
  }
  const kept: Item[] = [];
  for (const [path, list] of byPath) {
    const pick = latest(list);
    if ('error' in pick) {
      result.errors.push({ path, message: pick.error });
      continue;
    }
    kept.push(pick.item);
    for (const other of list) {
      if (other !== pick.item)
        result.superseded.push({
          path,
          code: other.entry.code,
          value: other.value,
          unit: other.unit.label,
          effective: other.effective,
          source: other.source,
          keptSource: pick.item.source,
        });
    }
  }
  harmonise(kept, result);
  decideSample(kept, result);
  checkOneSample(kept, result);
  const c = result.case;
  for (const item of kept) {
    setCaseValue(c, item.path, item.value);
    if (item.unit.units) c.units = { ...c.units, [item.unit.units[0]]: item.unit.units[1] };
    result.read.push({
      path: item.path,
      value: item.value,
      unit: item.unit.label,
      code: item.entry.code,
      display: item.display,
      source: item.source,
      effective: item.effective,
      sourceText: `${item.entry.code} ${item.display}: ${item.value}${item.unit.label ? ` ${item.unit.label}` : ''}${item.effective ? ` (${item.effective})` : ''}`,
    });
  }
  // the schema checks the draft like any case; its errors point back to the Observation
  const checked = parseCase(c);
  if (!checked.ok) {
    for (const e of checked.errors) {
      const item = kept.find((k) => k.path === e.path);
      if (e.path === 'gas' && missingGas(c).length > 1) continue; // reported in missing
      result.errors.push({
        path: item ? `${item.source}.valueQuantity.value` : e.path,
        message: e.message,
      });
    }
  }
}

/** The latest by effective time; two different values at the same or an unknown time cannot be told apart. */
function latest(list: Item[]): { item: Item } | { error: string } {
  if (list.length === 1) return { item: list[0]! };
  const distinctValues = new Set(list.map((i) => `${i.value} ${i.unit.label}`));
  if (distinctValues.size === 1)
    return { item: list.reduce((a, b) => ((b.time ?? -Infinity) > (a.time ?? -Infinity) ? b : a)) };
  const name = list[0]!.entry.name;
  if (list.some((i) => i.time === null))
    return {
      error: `${name}: ${list.length} results and at least one has no effective time, so the latest cannot be told (${list.map((i) => i.source).join(', ')})`,
    };
  const max = Math.max(...list.map((i) => i.time!));
  const top = list.filter((i) => i.time === max);
  if (new Set(top.map((i) => `${i.value} ${i.unit.label}`)).size > 1)
    return {
      error: `${name}: different results at the same time (${top.map((i) => `${i.value} ${i.unit.label} at ${i.source}`).join('; ')})`,
    };
  return { item: top[0]! };
}

/** One unit per quantity in the case: a mixed payload is converted to the unit most values use (ties: the project default). */
function harmonise(kept: Item[], result: FhirResult): void {
  const byKey = new Map<keyof Units, Item[]>();
  for (const item of kept)
    if (item.unit.units)
      byKey.set(item.unit.units[0], [...(byKey.get(item.unit.units[0]) ?? []), item]);
  for (const [key, list] of byKey) {
    const counts = new Map<string, number>();
    for (const item of list)
      counts.set(item.unit.units![1], (counts.get(item.unit.units![1]) ?? 0) + 1);
    if (counts.size < 2) continue;
    const best = Math.max(...counts.values());
    const leaders = [...counts.keys()].filter((u) => counts.get(u) === best);
    const target = leaders.includes(DEFAULT_UNITS[key]) ? DEFAULT_UNITS[key] : leaders[0]!;
    for (const item of list) {
      const from = item.unit.units![1];
      if (from === target) continue;
      const kind = key as Quantity;
      const canonical = toCanonical(kind, item.value, { ...DEFAULT_UNITS, [key]: from });
      const converted = fromCanonical(kind, canonical, { ...DEFAULT_UNITS, [key]: target });
      const toUnit =
        Object.values(UCUM[item.entry.kind]).find((u) => u.units?.[1] === target) ??
        Object.values(UCUM)
          .flatMap((m) => Object.values(m))
          .find((u) => u.units?.[0] === key && u.units[1] === target)!;
      result.conversions.push({
        path: item.path,
        source: item.source,
        from: { value: item.value, unit: item.unit.label },
        to: { value: converted, unit: toUnit.label },
        reason: `the payload gives ${key} in ${[...counts.keys()].join(' and ')}; the case holds one unit, ${target}`,
      });
      item.value = converted;
      item.unit = toUnit;
    }
  }
}

function decideSample(kept: Item[], result: FhirResult): void {
  const core = kept.filter((i) => CORE_GAS.has(i.path));
  const stated = [
    ...new Set(
      core
        .map((i) => i.entry.specimen)
        .filter((s): s is Sample => s === 'arterial' || s === 'venous' || s === 'capillary'),
    ),
  ];
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

function checkOneSample(kept: Item[], result: FhirResult): void {
  const timed = kept.filter((i) => CORE_GAS.has(i.path) && i.time !== null);
  if (timed.length < 2) return;
  const times = timed.map((i) => i.time!);
  if (Math.max(...times) - Math.min(...times) > SAME_SAMPLE_MS) {
    result.questions.push({
      path: 'gas',
      reason: `the latest gas values are from different times (${timed.map((i) => `${i.entry.name.split(' [')[0]} ${i.effective}`).join('; ')}): values of different samples must not be read together; confirm or send one sample`,
    });
  }
}
