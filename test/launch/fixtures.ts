// Invented patients in the test record, with times relative to now so that "the last 48 hours" holds whenever the
// tests run. LOINC codes are the FHIR reader's own (server/intake/loinc.ts, each checked there against a published
// list); 8302-2 body height is from the FHIR vital-signs profile (from memory). No real person or record.
import type { RecordData } from './fhirEndpoint.ts';

type Json = Record<string, unknown>;
const UCUM = 'http://unitsofmeasure.org';
let serial = 0;

export const minutesAgo = (m: number, now = Date.now()) => new Date(now - m * 60_000).toISOString();

export function obs(
  patient: string,
  code: string,
  value: number,
  unit: string,
  at: string,
  extra: Json = {},
): Json {
  serial += 1;
  return {
    resourceType: 'Observation',
    id: `obs-${serial}`,
    status: 'final',
    category: [
      {
        coding: [
          {
            system: 'http://terminology.hl7.org/CodeSystem/observation-category',
            code: 'laboratory',
          },
        ],
      },
    ],
    code: { coding: [{ system: 'http://loinc.org', code }] },
    subject: { reference: `Patient/${patient}` },
    effectiveDateTime: at,
    performer: [{ display: 'Invented Lab' }],
    valueQuantity: { value, unit, system: UCUM, code: unit },
    ...extra,
  };
}

/** An arterial gas: pH 2744-1, PaCO2 2019-8, PaO2 2703-7, HCO3 1960-4 (any value may be left out with null). */
export function arterialGas(
  patient: string,
  at: string,
  v: { ph?: number; pco2?: number; po2?: number; hco3?: number; be?: number; lactate?: number },
) {
  return [
    v.ph !== undefined ? obs(patient, '2744-1', v.ph, '[pH]', at) : null,
    v.pco2 !== undefined ? obs(patient, '2019-8', v.pco2, 'mm[Hg]', at) : null,
    v.po2 !== undefined ? obs(patient, '2703-7', v.po2, 'mm[Hg]', at) : null,
    v.hco3 !== undefined ? obs(patient, '1960-4', v.hco3, 'mmol/L', at) : null,
    v.be !== undefined ? obs(patient, '1925-7', v.be, 'mmol/L', at) : null,
    v.lactate !== undefined ? obs(patient, '2518-9', v.lactate, 'mmol/L', at) : null,
  ].filter((x): x is Json => x !== null);
}

/** A birth date that makes the patient the given age today: that many years ago, and a week more. */
export function bornYearsAgo(years: number, now = Date.now()): string {
  const d = new Date(now - 7 * 86400_000);
  d.setUTCFullYear(d.getUTCFullYear() - years);
  return d.toISOString().slice(0, 10);
}

const patient = (id: string, name: string, gender: string, birthDate: string) => ({
  resourceType: 'Patient',
  id,
  name: [{ text: name }],
  gender,
  birthDate,
  telecom: [{ system: 'phone', value: '000 000 0000' }],
});

/**
 * pt-1: an invented woman of 64 on a ward, CO2 rising (a newest gas 30 minutes ago, two earlier ones, one from three
 * days ago that is outside the window), chemistry and FiO2 drawn and charted with the newest gas (within the FHIR reader's five minutes), a height. pt-2: an invented man with
 * one gas of a metabolic acidosis. pt-3: no gas at all. pt-4: a gas with pH alone.
 */
export function inventedRecord(now = Date.now()): RecordData {
  const at = (m: number) => minutesAgo(m, now);
  return {
    patients: {
      'pt-1': patient('pt-1', 'Invented Patient One', 'female', bornYearsAgo(64, now)),
      'pt-2': patient('pt-2', 'Invented Patient Two', 'male', bornYearsAgo(37, now)),
      'pt-3': patient('pt-3', 'Invented Patient Three', 'female', '1950-05-05'),
      'pt-4': patient('pt-4', 'Invented Patient Four', 'male', '1970-10-10'),
    },
    observations: [
      ...arterialGas('pt-1', at(30), {
        ph: 7.29,
        pco2: 62,
        po2: 68,
        hco3: 29,
        be: 3,
        lactate: 1.4,
      }),
      obs('pt-1', '2951-2', 138, 'mmol/L', at(32)),
      obs('pt-1', '2823-3', 4.4, 'mmol/L', at(32)),
      obs('pt-1', '2075-0', 97, 'mmol/L', at(32)),
      obs('pt-1', '1751-7', 3.6, 'g/dL', at(32)),
      obs('pt-1', '3150-0', 35, '%', at(30)),
      ...arterialGas('pt-1', at(6 * 60), { ph: 7.24, pco2: 71, hco3: 29.5 }),
      ...arterialGas('pt-1', at(20 * 60), { ph: 7.33, pco2: 58, hco3: 30 }),
      ...arterialGas('pt-1', at(60 * 60), { ph: 7.38, pco2: 52, hco3: 30 }),
      obs('pt-1', '8302-2', 162, 'cm', at(90 * 24 * 60), {
        category: [
          {
            coding: [
              {
                system: 'http://terminology.hl7.org/CodeSystem/observation-category',
                code: 'vital-signs',
              },
            ],
          },
        ],
      }),
      ...arterialGas('pt-2', at(15), { ph: 7.21, pco2: 25, po2: 95, hco3: 10 }),
      obs('pt-2', '2951-2', 136, 'mmol/L', at(20)),
      obs('pt-2', '2075-0', 100, 'mmol/L', at(20)),
      ...arterialGas('pt-4', at(10), { ph: 7.3, po2: 80 }),
    ],
  };
}
