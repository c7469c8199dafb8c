// The FHIR payload: a Bundle (collection, searchset, transaction), a list of resources or one Observation, read
// into its resources with their paths; and the small readers of JSON values and codings the Observation reader uses.
import type { FhirResult } from './types.ts';
import { LOINC_SYSTEM } from '../loinc.ts';

const BUNDLE_TYPES = new Set(['collection', 'searchset', 'transaction']);

export type Json = Record<string, unknown>;
export const isObject = (x: unknown): x is Json =>
  typeof x === 'object' && x !== null && !Array.isArray(x);
export const str = (x: unknown): string | undefined => (typeof x === 'string' ? x : undefined);
/** Any sent value as short text for a message: never String() on an object (its own toString may throw). */
export const text = (x: unknown): string => {
  if (typeof x === 'string') return x.slice(0, 200);
  if (typeof x === 'number' || typeof x === 'boolean') return String(x);
  return x === null || x === undefined ? '' : Array.isArray(x) ? 'a list' : 'an object';
};

export interface Located {
  resource: unknown;
  source: string;
  fullUrl?: string;
}

/** The resources in the payload with their paths; a payload it cannot read is an error. */
export function resources(payload: unknown, result: FhirResult): Located[] {
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

export function effectiveOf(obs: Json): string | null {
  const period = isObject(obs.effectivePeriod) ? obs.effectivePeriod : undefined;
  return (
    str(obs.effectiveDateTime) ??
    str(obs.effectiveInstant) ??
    str(period?.end) ??
    str(period?.start) ??
    null
  );
}

export function loincCodings(code: unknown): { code: string; display: string }[] {
  if (!isObject(code) || !Array.isArray(code.coding)) return [];
  return code.coding
    .filter(isObject)
    .filter((c) => c.system === LOINC_SYSTEM && typeof c.code === 'string')
    .map((c) => ({ code: String(c.code), display: str(c.display) ?? '' }));
}

export function anyCoding(code: unknown): { code: string | null; display: string } {
  if (!isObject(code)) return { code: null, display: '' };
  const first = Array.isArray(code.coding) ? code.coding.find(isObject) : undefined;
  return {
    code: first && typeof first.code === 'string' ? first.code : null,
    display: (first && str(first.display)) ?? str(code.text) ?? '',
  };
}

export const isVitalSign = (obs: Json): boolean =>
  Array.isArray(obs.category) &&
  obs.category.some(
    (c) =>
      isObject(c) &&
      Array.isArray(c.coding) &&
      c.coding.some((k) => isObject(k) && k.code === 'vital-signs'),
  );
