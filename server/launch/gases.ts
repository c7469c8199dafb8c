// The Observations read from the record, grouped into gases by their effective time: the newest gas with the
// values of the same time (the analyser's lactate, Hb and temperature within the same sample; chemistry, FiO2 and
// SpO2 within an hour), and the earlier gases. Pure: no I/O, no clock.
import { loincEntry, type CasePath } from '../intake/index.ts';

type Json = Record<string, unknown>;
export const LOINC_SYSTEM = 'http://loinc.org';
const isObject = (x: unknown): x is Json =>
  typeof x === 'object' && x !== null && !Array.isArray(x);

/** The values that make one gas sample (as the FHIR reader counts them). */
const CORE_GAS = new Set<CasePath>([
  'gas.ph',
  'gas.pco2',
  'gas.po2',
  'gas.hco3',
  'gas.baseExcess',
  'gas.sao2',
]);
/** Read by the analyser with the gas: they belong to a sample, not to an hour. */
const SAME_SAMPLE = new Set<CasePath>(['gas.lactate', 'gas.hb', 'context.temperatureC']);
// One sample's results lie within 5 minutes (the FHIR reader's own limit); chemistry, FiO2 and SpO2 charted
// within an hour of the gas count as "of the same time" (our own limit; the confirm view shows every time).
export const SAMPLE_WINDOW_MS = 5 * 60 * 1000;
export const SAME_TIME_MS = 60 * 60 * 1000;
/** Body height, LOINC 8302-2 (the FHIR vital-signs profile's code; from memory). */
export const HEIGHT_LOINC = '8302-2';

export interface Placed {
  resource: Json;
  time: number;
  paths: CasePath[];
}

export interface Grouped {
  /** the newest gas and the values of its time, one Observation per value */
  newest: Placed[];
  newestTime: number | null;
  /** earlier gases, oldest first, each its own Observations */
  earlier: { time: number; observations: Placed[] }[];
  /** Observations with no effective time: they cannot be placed in a gas */
  untimed: Json[];
}

/** effective[x] as a time: dateTime, instant, or a period's end (else its start). */
export function effectiveTime(obs: Json): number | null {
  const period = isObject(obs.effectivePeriod) ? obs.effectivePeriod : {};
  const raw = [obs.effectiveDateTime, obs.effectiveInstant, period.end, period.start].find(
    (x) => typeof x === 'string',
  ) as string | undefined;
  const t = raw ? Date.parse(raw) : Number.NaN;
  return Number.isFinite(t) ? t : null;
}

const loincCodes = (code: unknown): string[] =>
  isObject(code) && Array.isArray(code.coding)
    ? code.coding
        .filter(isObject)
        .filter((c) => c.system === LOINC_SYSTEM && typeof c.code === 'string')
        .map((c) => c.code as string)
    : [];

const isVitalSign = (obs: Json) =>
  Array.isArray(obs.category) &&
  obs.category.some(
    (c) =>
      isObject(c) &&
      Array.isArray(c.coding) &&
      c.coding.some((k) => isObject(k) && k.code === 'vital-signs'),
  );

/** The case fields an Observation (or its components) gives, by the FHIR reader's LOINC table. */
export function pathsOf(obs: Json): CasePath[] {
  const nodes = [obs, ...(Array.isArray(obs.component) ? obs.component.filter(isObject) : [])];
  const paths = new Set<CasePath>();
  for (const node of nodes)
    for (const code of loincCodes(node.code)) {
      const entry = loincEntry(code);
      if (!entry) continue;
      // SaO2 coded 2708-6 in a vital-signs Observation is pulse oximetry (the reader reads it as SpO2)
      paths.add(entry.path === 'gas.sao2' && isVitalSign(obs) ? 'oxygen.spo2' : entry.path);
    }
  return [...paths];
}

const isCore = (p: Placed) => p.paths.some((path) => CORE_GAS.has(path));

/** Group Observations into gases: samples are core gas results within SAMPLE_WINDOW_MS of the sample's newest. */
export function groupGases(observations: Json[]): Grouped {
  const placed: Placed[] = [];
  const untimed: Json[] = [];
  for (const resource of observations) {
    const paths = pathsOf(resource);
    if (!paths.length) continue;
    const time = effectiveTime(resource);
    if (time === null) untimed.push(resource);
    else placed.push({ resource, time, paths });
  }
  placed.sort((a, b) => b.time - a.time);
  const samples: Placed[][] = [];
  for (const p of placed.filter(isCore)) {
    const current = samples.at(-1);
    if (current && current[0]!.time - p.time <= SAMPLE_WINDOW_MS) current.push(p);
    else samples.push([p]);
  }
  if (!samples.length) return { newest: [], newestTime: null, earlier: [], untimed };
  const [first, ...rest] = samples;
  const newestTime = first![0]!.time;
  const others = placed.filter((p) => !isCore(p));
  const newest = [...first!, ...closestPerPath(others, newestTime)];
  const earlier = rest
    .map((sample) => ({
      time: sample[0]!.time,
      observations: [
        ...sample,
        ...closestPerPath(
          others.filter((p) => p.paths.every((path) => SAME_SAMPLE.has(path))),
          sample[0]!.time,
        ),
      ],
    }))
    .reverse();
  return { newest, newestTime, earlier, untimed };
}

/** For each value, the one Observation nearest the gas's time within its window (a tie goes to the later). */
function closestPerPath(candidates: Placed[], at: number): Placed[] {
  const best = new Map<CasePath, Placed>();
  for (const p of candidates) {
    const window = p.paths.every((path) => SAME_SAMPLE.has(path)) ? SAMPLE_WINDOW_MS : SAME_TIME_MS;
    const distance = Math.abs(p.time - at);
    if (distance > window) continue;
    for (const path of p.paths) {
      const held = best.get(path);
      const heldDistance = held ? Math.abs(held.time - at) : Infinity;
      if (distance < heldDistance || (distance === heldDistance && p.time > held!.time))
        best.set(path, p);
    }
  }
  return [...new Set(best.values())];
}
