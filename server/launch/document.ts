// The note filed back as a draft: a FHIR R4 DocumentReference the clinician reviews and signs in the record.
// status current (the reference is in force), docStatus preliminary (the document is a draft), type LOINC 11506-3
// Progress note, category clinical-note, subject, the encounter of the launch, the author from fhirUser, the note
// as a text/plain attachment, and the Observations it was read from in context.related.
import type { RecordGrant } from './cookies.ts';

type Json = Record<string, unknown>;

// LOINC 11506-3 "Progress note" (from memory; the code US Core lists among its clinical note types)
const PROGRESS_NOTE = { system: 'http://loinc.org', code: '11506-3', display: 'Progress note' };
// US Core DocumentReference category (from memory: the code system of US Core's clinical notes guidance)
const CLINICAL_NOTE = {
  system: 'http://hl7.org/fhir/us/core/CodeSystem/us-core-documentreference-category',
  code: 'clinical-note',
  display: 'Clinical Note',
};
/** Resource types DocumentReference.author may point at (FHIR R4); fhirUser may also name a Person, which is left out. */
const AUTHOR_TYPES = ['Practitioner', 'PractitionerRole', 'Patient', 'RelatedPerson'];

/** fhirUser as a reference: Practitioner/123 as it is, an absolute URL kept whole; another type gives none. */
export function authorReference(fhirUser: string | undefined): string | null {
  if (!fhirUser) return null;
  const m = /(?:^|\/)([A-Za-z]+)\/([A-Za-z0-9\-.]{1,64})$/.exec(fhirUser);
  return m && AUTHOR_TYPES.includes(m[1]!) ? fhirUser : null;
}

export function draftNote(grant: RecordGrant, note: string, now: Date): Json {
  const author = authorReference(grant.author);
  const context: Json = {};
  if (grant.encounter) context.encounter = [{ reference: `Encounter/${grant.encounter}` }];
  if (grant.related.length) context.related = grant.related.map((reference) => ({ reference }));
  return {
    resourceType: 'DocumentReference',
    status: 'current',
    docStatus: 'preliminary',
    type: { coding: [PROGRESS_NOTE], text: 'Blood gas interpretation' },
    category: [{ coding: [CLINICAL_NOTE] }],
    subject: { reference: `Patient/${grant.patient}` },
    date: now.toISOString(),
    ...(author ? { author: [{ reference: author }] } : {}),
    description: 'Blood gas interpretation: a draft to review and sign (decision support)',
    content: [
      {
        attachment: {
          contentType: 'text/plain; charset=utf-8',
          data: Buffer.from(note, 'utf8').toString('base64'),
          title: 'Blood gas interpretation (draft)',
          creation: now.toISOString(),
        },
      },
    ],
    ...(Object.keys(context).length ? { context } : {}),
  };
}
