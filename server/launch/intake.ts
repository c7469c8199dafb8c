// What the launch read, as text and back: the Patient, the height and the results' Observations go into one small
// FHIR Bundle (the text the confirm view shows and posts back, like a paste). Reading it gives the paste's intake
// through the FHIR reader, which makes the newest gas the case's gas and the earlier gases its `previous`; the
// launch adds the patient's age, sex and height. The same reading runs in the callback and on confirm, so what the
// clinician confirms is what was shown.
import { MAX_PASTE_CHARS, caseFromFhir } from '../intake/index.ts';
import { intakeOf, type Intake } from '../../views/intake.ts';
import { readIntake } from '../page.ts';

type Json = Record<string, unknown>;
const isObject = (x: unknown): x is Json =>
  typeof x === 'object' && x !== null && !Array.isArray(x);

export interface RecordRead {
  intake: Intake;
  /** what the record gave besides the newest gas's values, for the confirm view */
  patient: string | null;
  earlier: string[];
  notes: string[];
  /** the Observations the case was read from (Observation/id): a filed note's context.related */
  related: string[];
}

const LOINC = 'http://loinc.org';
/** Body height, LOINC 8302-2 (the FHIR vital-signs profile's code; from memory). */
export const HEIGHT_LOINC = '8302-2';

/** effective[x] as a time: dateTime, instant, or a period's end (else its start). */
function effectiveTime(obs: Json): number | null {
  const period = isObject(obs.effectivePeriod) ? obs.effectivePeriod : {};
  const raw = [obs.effectiveDateTime, obs.effectiveInstant, period.end, period.start].find(
    (x) => typeof x === 'string',
  ) as string | undefined;
  const t = raw ? Date.parse(raw) : Number.NaN;
  return Number.isFinite(t) ? t : null;
}

// ---------- text ----------

const minimalCode = (code: unknown) => ({
  coding: (isObject(code) && Array.isArray(code.coding) ? code.coding : [])
    .filter(isObject)
    .filter((c) => c.system === LOINC && typeof c.code === 'string')
    .map((c) => ({ system: LOINC, code: c.code })),
});
const pick = (from: Json, keys: string[]) =>
  Object.fromEntries(keys.filter((k) => from[k] !== undefined).map((k) => [k, from[k]]));
const VALUE_KEYS = ['valueQuantity', 'valueString', 'valueCodeableConcept', 'dataAbsentReason'];

/** An Observation cut to what the FHIR reader uses: no names, notes, performers or references. */
function minimalObservation(obs: Json): Json {
  const effective = ['effectiveDateTime', 'effectiveInstant', 'effectivePeriod'];
  return {
    resourceType: 'Observation',
    ...pick(obs, ['id', 'status']),
    ...(Array.isArray(obs.category) ? { category: obs.category.map(minimalCategory) } : {}),
    code: minimalCode(obs.code),
    ...pick(obs, effective),
    ...pick(obs, VALUE_KEYS),
    ...(Array.isArray(obs.component)
      ? {
          component: obs.component
            .filter(isObject)
            .map((c) => ({ code: minimalCode(c.code), ...pick(c, VALUE_KEYS) })),
        }
      : {}),
  };
}
const minimalCategory = (c: unknown) => ({
  coding: (isObject(c) && Array.isArray(c.coding) ? c.coding : [])
    .filter(isObject)
    .map((k) => pick(k, ['system', 'code'])),
});

/** The Bundle the confirm view shows: one resource a line, within the paste's limit (the oldest results go first). */
export function recordText(patient: Json | null, observations: Json[]): string {
  const height = newestHeight(observations);
  const head = [
    ...(patient ? [pick(patient, ['resourceType', 'id', 'birthDate', 'gender'])] : []),
    ...(height ? [minimalObservation(height)] : []),
  ];
  let results = observations
    .filter((o) => !isHeight(o))
    .map((o) => ({
      time: effectiveTime(o) ?? Number.POSITIVE_INFINITY,
      resource: minimalObservation(o),
    }))
    .sort((x, y) => y.time - x.time);
  const line = (r: Json) => `  {"resource":${JSON.stringify(r)}}`;
  const build = () =>
    `{"resourceType":"Bundle","type":"collection","entry":[\n${[...head, ...results.map((r) => r.resource)].map(line).join(',\n')}\n]}`;
  let text = build();
  while (text.length > MAX_PASTE_CHARS && results.length) {
    // the results of the oldest time leave together, so that no gas is cut in half
    const oldest = results.at(-1)!.time;
    results = results.filter((r) => r.time !== oldest);
    text = build();
  }
  return text;
}

// ---------- reading ----------

const isHeight = (obs: Json) =>
  isObject(obs.code) &&
  Array.isArray(obs.code.coding) &&
  obs.code.coding.some((c) => isObject(c) && c.system === LOINC && c.code === HEIGHT_LOINC);

function newestHeight(observations: Json[]): Json | null {
  const heights = observations.filter(isHeight).filter((o) => effectiveTime(o) !== null);
  heights.sort((a, b) => effectiveTime(b)! - effectiveTime(a)!);
  return heights[0] ?? null;
}

/** Height in cm from UCUM cm, m or [in_i]; null for anything else. */
function heightCm(obs: Json): number | null {
  const q = isObject(obs.valueQuantity) ? obs.valueQuantity : null;
  if (!q || typeof q.value !== 'number' || q.system !== 'http://unitsofmeasure.org') return null;
  const factor = { cm: 1, m: 100, '[in_i]': 2.54 }[String(q.code)]; // UCUM: 1 [in_i] = 2.54 cm exactly
  return factor ? Math.round(q.value * factor) : null;
}

/** Whole years from a full birth date to today (UTC); null for a partial date. */
export function ageYears(birthDate: unknown, now: Date): number | null {
  const m = typeof birthDate === 'string' ? /^(\d{4})-(\d{2})-(\d{2})$/.exec(birthDate) : null;
  if (!m) return null;
  const [y, mo, d] = [Number(m[1]), Number(m[2]), Number(m[3])];
  let age = now.getUTCFullYear() - y;
  if (now.getUTCMonth() + 1 < mo || (now.getUTCMonth() + 1 === mo && now.getUTCDate() < d)) age--;
  return age >= 0 ? age : null;
}

function resourcesOf(json: unknown): Json[] | null {
  if (Array.isArray(json)) return json.filter(isObject);
  if (isObject(json) && json.resourceType === 'Bundle' && Array.isArray(json.entry))
    return json.entry.filter(isObject).flatMap((e) => (isObject(e.resource) ? [e.resource] : []));
  return null;
}

/** The pressure unit of the case, for the earlier gases' lines. */
const pressureOf = (c: Json) => String((c.units as Json | undefined)?.pressure ?? 'mmHg');
const SHOWN: [string, string, (pressure: string) => string][] = [
  ['ph', 'pH', () => ''],
  ['pco2', 'PCO2', (p) => ` ${p}`],
  ['hco3', 'HCO3', () => ' mmol/L'],
  ['po2', 'PO2', (p) => ` ${p}`],
];

/** Read the launch's text back into the paste's intake, with the patient's age, sex and height added to its case. */
export function readRecordText(text: string, now = new Date()): RecordRead {
  let json: unknown;
  try {
    json = JSON.parse(text);
  } catch {
    json = undefined;
  }
  const resources = resourcesOf(json);
  // edited into something else: read like any paste
  if (!resources)
    return {
      intake: intakeOf(readIntake(text), text),
      patient: null,
      earlier: [],
      notes: [],
      related: [],
    };
  const results = resources.filter((r) => r.resourceType === 'Observation' && !isHeight(r));
  const read = caseFromFhir({
    resourceType: 'Bundle',
    type: 'collection',
    entry: results.map((resource) => ({ resource })),
  });
  const intake = intakeOf({ kind: 'fhir', result: read }, text);
  const notes: string[] = [];
  // the Observations read into the case or its earlier gases: entry[i] of the bundle given to the reader
  const sources = [...read.read, ...read.previous.flatMap((p) => p.read)].map((r) => r.source);
  const used = new Set(sources.map((s) => Number(/^entry\[(\d+)\]/.exec(s)?.[1] ?? -1)));
  const related = results
    .filter((r, i) => used.has(i) && typeof r.id === 'string')
    .map((r) => `Observation/${String(r.id)}`);

  const patient = resources.find((r) => r.resourceType === 'Patient') ?? null;
  const said: string[] = [];
  const values: Json = {};
  if (patient) {
    const age = ageYears(patient.birthDate, now);
    if (age !== null) {
      values.ageYears = age;
      said.push(`${age} years (born ${String(patient.birthDate)})`);
    } else if (patient.birthDate !== undefined)
      notes.push('The birth date is not a full date: age left for the patient step.');
    if (patient.gender === 'male' || patient.gender === 'female') {
      values.sex = patient.gender;
      said.push(patient.gender);
    }
  }
  const height = newestHeight(resources.filter((r) => r.resourceType === 'Observation'));
  const cm = height ? heightCm(height) : null;
  if (height && cm !== null && cm >= 100 && cm <= 250) {
    values.heightCm = cm;
    said.push(`height ${cm} cm (${String(height.effectiveDateTime ?? '').slice(0, 10)})`);
  } else if (height)
    notes.push(
      'The recorded height could not be used (unit or range): enter it at the patient step.',
    );
  if (Object.keys(values).length && intake.read.length) intake.case.patient = values;

  const previous = Array.isArray(intake.case.previous) ? (intake.case.previous as Json[]) : [];
  const pressure = pressureOf(intake.case);
  const earlier = previous.map((p) => {
    const gas = (p.gas ?? {}) as Record<string, number>;
    const values = SHOWN.filter(([k]) => typeof gas[k] === 'number').map(
      ([k, label, unit]) => `${label} ${gas[k]}${unit(pressure)}`,
    );
    return `${String(p.takenAt ?? '').replace('T', ' ')}: ${values.join(', ')}`;
  });
  return { intake, patient: said.length ? said.join(', ') : null, earlier, notes, related };
}
