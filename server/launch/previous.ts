// Earlier gases as the case's `previous` entries: each earlier sample read on its own through the FHIR reader,
// kept when the reader finds at least two of pH, PaCO2 and HCO3 in the newest gas's pressure unit.
// Interim: the FHIR reader is to give earlier gases as `previous` itself; this then gives way to it.
import { MAX_PREVIOUS_GASES } from '../../calc/index.ts';
import { caseFromFhir } from '../intake/index.ts';
import type { Placed } from './gases.ts';

type Json = Record<string, unknown>;

export interface EarlierGas {
  /** the case's previous entry: { takenAt, gas } */
  gas: Json;
  /** how the confirm view lists it */
  line: string;
}

const SHOWN: [string, string, (pressure: string) => string][] = [
  ['ph', 'pH', () => ''],
  ['pco2', 'PCO2', (p) => ` ${p}`],
  ['po2', 'PO2', (p) => ` ${p}`],
  ['hco3', 'HCO3', () => ' mmol/L'],
  ['baseExcess', 'BE', () => ' mmol/L'],
  ['lactate', 'lactate', () => ' mmol/L'],
];

/** The record's wall-clock time as written (YYYY-MM-DDTHH:MM): what the clinician saw on the chart. */
const takenAtOf = (p: Placed): string => {
  const r = p.resource;
  const raw = [r.effectiveDateTime, r.effectiveInstant].find((x) => typeof x === 'string') as
    | string
    | undefined;
  return raw && /^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}/.test(raw)
    ? raw.slice(0, 16)
    : new Date(p.time).toISOString().slice(0, 16);
};

export function previousGases(
  groups: { time: number; observations: Placed[] }[],
  current: Json,
  notes: string[],
): EarlierGas[] {
  const pressure = (current.units as Json | undefined)?.pressure ?? 'mmHg';
  const out: EarlierGas[] = [];
  let leftOut = 0;
  for (const group of groups) {
    const read = caseFromFhir({
      resourceType: 'Bundle',
      type: 'collection',
      entry: group.observations.map((p) => ({ resource: p.resource })),
    });
    const gas = read.case.gas as Json;
    const core = ['ph', 'pco2', 'hco3'].filter((k) => typeof gas[k] === 'number').length;
    const unit = read.case.units?.pressure ?? 'mmHg';
    const valueErrors = read.errors.filter((e) => e.path !== 'sample');
    if (core < 2 || unit !== pressure || valueErrors.length) {
      leftOut++;
      continue;
    }
    const newestOfGroup = group.observations.reduce((a, b) => (b.time > a.time ? b : a));
    const takenAt = takenAtOf(newestOfGroup);
    const values = Object.fromEntries(
      Object.entries(gas).filter(([, v]) => typeof v === 'number'),
    ) as Record<string, number>;
    const said = SHOWN.filter(([k]) => values[k] !== undefined).map(
      ([k, label, unitOf]) => `${label} ${values[k]}${unitOf(String(pressure))}`,
    );
    out.push({
      gas: { takenAt, gas: values },
      line: `${takenAt.replace('T', ' ')}: ${said.join(', ')}`,
    });
  }
  if (leftOut)
    notes.push(
      `${leftOut} earlier gas${leftOut === 1 ? ' was' : 'es were'} left out: fewer than two of pH, PCO2 and HCO3, another pressure unit, or a value that could not be read.`,
    );
  if (out.length > MAX_PREVIOUS_GASES) {
    notes.push(
      `Only the last ${MAX_PREVIOUS_GASES} earlier gases are kept (the most a case holds); ${out.length - MAX_PREVIOUS_GASES} older ones are left out.`,
    );
    return out.slice(-MAX_PREVIOUS_GASES);
  }
  return out;
}
