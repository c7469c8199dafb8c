// Every shape of draft note Gasline files passes the official FHIR R4 JSON schema and the fhir package's validator;
// the validators themselves are shown to refuse a broken DocumentReference, so a pass means something.
import { describe, expect, it } from 'vitest';
import { authorReference, draftNote } from '../../server/launch/document.ts';
import { fhirErrors, schemaErrors } from './validators.ts';

const grant = {
  iss: 'https://ehr.example.org/fhir',
  token: 'unused',
  patient: 'pt-9',
  related: [] as string[],
};
const NOW = new Date('2026-03-02T04:20:00Z');

describe('the draft DocumentReference', () => {
  it.each([
    ['the least a launch gives', grant],
    [
      'with encounter, author and related results',
      {
        ...grant,
        encounter: 'enc-3',
        author: 'Practitioner/pr-7',
        related: ['Observation/o1', 'Observation/o2'],
      },
    ],
    [
      'with an absolute fhirUser',
      { ...grant, author: 'https://ehr.example.org/fhir/PractitionerRole/r-1' },
    ],
    ['with a fhirUser that may not author (Person)', { ...grant, author: 'Person/x' }],
  ])('%s passes both validators', (_label, g) => {
    const doc = draftNote(
      g,
      'pH 7.29 PaCO2 62: acute on chronic respiratory acidosis.\n- Plan: review NIV.',
      NOW,
    );
    expect(schemaErrors(doc)).toEqual([]);
    expect(fhirErrors(doc)).toEqual([]);
    expect(doc).toMatchObject({
      status: 'current',
      docStatus: 'preliminary',
      subject: { reference: 'Patient/pt-9' },
    });
  });

  it('carries the note whole, UTF-8, in a text/plain attachment', () => {
    const note = 'SpO2 88–92 % target; PaCO2 ↑ (μ check)';
    const doc = draftNote(grant, note, NOW) as {
      content: { attachment: { data: string; contentType: string } }[];
    };
    expect(Buffer.from(doc.content[0]!.attachment.data, 'base64').toString('utf8')).toBe(note);
    expect(doc.content[0]!.attachment.contentType).toBe('text/plain; charset=utf-8');
  });

  it('names an author only of a type DocumentReference.author allows', () => {
    expect(authorReference('Practitioner/pr-1')).toBe('Practitioner/pr-1');
    expect(authorReference('https://ehr.example.org/fhir/Practitioner/pr-1')).toBe(
      'https://ehr.example.org/fhir/Practitioner/pr-1',
    );
    expect(authorReference('Person/p-1')).toBeNull();
    expect(authorReference(undefined)).toBeNull();
  });

  it('the validators refuse a broken one (a status outside its value set, no content, an unknown property)', () => {
    const doc = {
      ...draftNote(grant, 'x', NOW),
      docStatus: 'signed-ish',
      content: undefined,
      note: 'x',
    };
    expect(schemaErrors(doc).length).toBeGreaterThan(0);
    expect(fhirErrors(doc).length).toBeGreaterThan(0);
  });
});
