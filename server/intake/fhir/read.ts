// FHIR R4 intake: a Bundle (collection, searchset, transaction), a list of Observations or one Observation
// -> a draft case. Reads LOINC-coded Observations with UCUM valueQuantity units (the codes and units are calc's
// table of fields); groups the results into gases by time (the newest is the case's gas, the earlier ones its
// previous gases); reports every code it does not use, every result it sets aside and every unit it converts.
// Pure: no I/O. A value without a usable unit is an error, never a guess.
import { missingGas } from '../case.ts';
import { build } from './build.ts';
import { readObservation, type ReadState } from './observation.ts';
import { isObject, resources, text } from './payload.ts';
import { withoutInvisibleDeep } from '../invisible.ts';
import type { FhirResult } from './types.ts';

export function caseFromFhir(json: unknown): FhirResult {
  const result: FhirResult = {
    ok: false,
    case: { gas: {} },
    takenAt: null,
    read: [],
    previous: [],
    earlier: [],
    unused: [],
    conversions: [],
    errors: [],
    questions: [],
    notes: [],
    missing: [],
  };
  const state: ReadState = { result, items: [], known: new Set() };
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
      return finish(result);
    }
  }
  // the edge: no string of the payload keeps an invisible or bidirectional control character
  payload = withoutInvisibleDeep(payload);
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
  build(state);
  return finish(result);
}

/** The most entries each report list keeps (results not used, results set aside, notes); a hostile or very long
 *  payload would otherwise come back several times its size. The rest are counted in one last note. */
export const MAX_REPORTED = 20;

function bound(r: FhirResult): void {
  const left: string[] = [];
  const cut = <T>(list: T[], what: (n: number) => string) => {
    if (list.length <= MAX_REPORTED) return;
    left.push(what(list.length - MAX_REPORTED));
    list.length = MAX_REPORTED;
  };
  cut(r.unused, (n) => `${n} more result${n === 1 ? '' : 's'} not used`);
  cut(r.earlier, (n) => `${n} more result${n === 1 ? '' : 's'} set aside`);
  cut(r.notes, (n) => `${n} more note${n === 1 ? '' : 's'}`);
  if (left.length) r.notes.push(`Not listed here: ${left.join(', ')}.`);
}

function finish(r: FhirResult): FhirResult {
  bound(r);
  r.missing = missingGas(r.case);
  r.ok = r.errors.length === 0 && r.questions.length === 0;
  return r;
}
