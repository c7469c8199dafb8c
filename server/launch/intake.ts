// What the launch read, as text and back: the Patient, the height and the gases' Observations go into one small
// FHIR Bundle (the text the confirm view shows and posts back, like a paste); reading it gives the paste's intake
// for the newest gas (through the FHIR reader), the patient's age, sex and height, and the earlier gases.
// The same reading runs in the callback and on confirm, so what the clinician confirms is what was shown.
import { MAX_PASTE_CHARS, caseFromFhir } from '../intake/index.ts';
import { intakeOf, type Intake } from '../../views/paste.ts';
import { readIntake } from '../page.ts';
import {
  HEIGHT_LOINC,
  LOINC_SYSTEM as LOINC,
  effectiveTime,
  groupGases,
  pathsOf,
} from './gases.ts';
import { previousGases, type EarlierGas } from './previous.ts';

type Json = Record<string, unknown>;
const isObject = (x: unknown): x is Json =>
  typeof x === 'object' && x !== null && !Array.isArray(x);

export interface RecordRead {
  intake: Intake;
  /** what the record gave besides the newest gas's values, for the confirm view */
  patient: string | null;
  earlier: EarlierGas[];
  notes: string[];
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

/** The Bundle the confirm view shows: one resource a line, within the paste's limit (oldest gases go first). */
export function recordText(patient: Json | null, observations: Json[]): string {
  const grouped = groupGases(observations.filter((o) => !isHeight(o)));
  const height = newestHeight(observations);
  const head = [
    ...(patient ? [pick(patient, ['resourceType', 'id', 'birthDate', 'gender'])] : []),
    ...(height ? [minimalObservation(height)] : []),
    ...grouped.newest.map((p) => minimalObservation(p.resource)),
  ];
  const earlier = grouped.earlier.map((g) =>
    g.observations.map((p) => minimalObservation(p.resource)),
  );
  const lines = (resources: Json[]) => resources.map((r) => `  {"resource":${JSON.stringify(r)}}`);
  const build = (groups: Json[][]) =>
    `{"resourceType":"Bundle","type":"collection","entry":[\n${[...lines(head), ...groups.flatMap(lines)].join(',\n')}\n]}`;
  let text = build(earlier);
  while (text.length > MAX_PASTE_CHARS && earlier.length) {
    earlier.shift();
    text = build(earlier);
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

/** Read the launch's text back into the paste's intake, with the patient and the earlier gases added to its case. */
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
    return { intake: intakeOf(readIntake(text), text), patient: null, earlier: [], notes: [] };
  const observations = resources.filter((r) => r.resourceType === 'Observation');
  const grouped = groupGases(observations.filter((o) => !isHeight(o)));
  const newest = {
    resourceType: 'Bundle',
    type: 'collection',
    entry: grouped.newest.map((p) => ({ resource: p.resource })),
  };
  const intake = intakeOf({ kind: 'fhir', result: caseFromFhir(newest) }, text);
  const notes: string[] = [];
  if (grouped.untimed.length)
    notes.push(
      `${grouped.untimed.length} result${grouped.untimed.length === 1 ? '' : 's'} without a time could not be placed in a gas and ${grouped.untimed.length === 1 ? 'was' : 'were'} not used.`,
    );

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
  const height = newestHeight(observations);
  const cm = height ? heightCm(height) : null;
  if (height && cm !== null && cm >= 100 && cm <= 250) {
    values.heightCm = cm;
    said.push(`height ${cm} cm (${String(height.effectiveDateTime ?? '').slice(0, 10)})`);
  } else if (height)
    notes.push(
      'The recorded height could not be used (unit or range): enter it at the patient step.',
    );
  if (Object.keys(values).length && intake.read.length) intake.case.patient = values;

  const earlier = previousGases(grouped.earlier, intake.case, notes);
  if (earlier.length && intake.read.length) intake.case.previous = earlier.map((e) => e.gas);
  return { intake, patient: said.length ? said.join(', ') : null, earlier, notes };
}

/** Observation references (Observation/id) a read case came from: the note's context.related. */
export function relatedOf(text: string): string[] {
  const resources = resourcesOf(JSON.parse(text)) ?? [];
  return resources
    .filter(
      (r) => r.resourceType === 'Observation' && typeof r.id === 'string' && pathsOf(r).length,
    )
    .map((r) => `Observation/${String(r.id)}`);
}
