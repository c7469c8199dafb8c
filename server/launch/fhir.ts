// FHIR R4 REST with the launch's access token (oauth4webapi's protected resource request): read the Patient,
// search the patient's Observations following the Bundle's next links, create a DocumentReference. The token
// goes to the launch's FHIR base only: a next link elsewhere is refused, not followed.
import * as oauth from 'oauth4webapi';
import { LOINC_CODES } from '../intake/index.ts';
import { HEIGHT_LOINC } from './intake.ts';
import { LaunchProblem, REQUEST_TIMEOUT_MS, readJson, unreachable } from './http.ts';

type Json = Record<string, unknown>;
const isObject = (x: unknown): x is Json =>
  typeof x === 'object' && x !== null && !Array.isArray(x);

export interface FhirAccess {
  fhirBase: string;
  token: string;
  /** http to a loopback server (tests and local trials) */
  insecure: boolean;
}

/** Pages of one search followed at most (at _count=100, thousands of results: far more than 48 hours hold). */
export const MAX_PAGES = 30;
export const PAGE_SIZE = 100;
/** How far back the earlier gases are read. */
export const EARLIER_HOURS = 48;

const FHIR_JSON = 'application/fhir+json';

async function request(access: FhirAccess, method: string, url: URL, body?: string) {
  const headers = new Headers({ accept: FHIR_JSON });
  if (body !== undefined) headers.set('content-type', FHIR_JSON);
  let response: Response;
  try {
    response = await oauth.protectedResourceRequest(access.token, method, url, headers, body, {
      signal: AbortSignal.timeout(REQUEST_TIMEOUT_MS),
      ...(access.insecure ? { [oauth.allowInsecureRequests]: true } : {}),
    });
  } catch (error) {
    if (error instanceof oauth.WWWAuthenticateChallengeError) throw forbidden(error.status);
    throw unreachable('fhir', error);
  }
  if (response.status === 401 || response.status === 403) {
    await response.body?.cancel();
    throw forbidden(response.status);
  }
  if (!response.ok) {
    await response.body?.cancel();
    throw new LaunchProblem(
      response.status >= 500 ? 'unreachable' : 'bad-server',
      `The record's FHIR server answered ${method === 'POST' ? 'the filing' : 'a read'} with status ${response.status}.`,
    );
  }
  return response;
}

const forbidden = (status: number) =>
  new LaunchProblem(
    'forbidden',
    status === 401
      ? 'The record no longer accepts this launch (its access has ended): launch again from the record.'
      : 'The record did not allow this (the access granted at launch does not cover it).',
  );

/** Inside the launch's FHIR base: the only place the token is sent. */
function withinBase(access: FhirAccess, href: string): URL {
  const url = new URL(href, `${access.fhirBase}/`);
  if (!url.href.startsWith(`${access.fhirBase}/`))
    throw new LaunchProblem(
      'bad-server',
      "The record's search pointed outside its own FHIR server; Gasline does not follow it.",
    );
  return url;
}

export async function readPatient(access: FhirAccess, id: string): Promise<Json> {
  const url = withinBase(access, `Patient/${encodeURIComponent(id)}`);
  const json = await readJson(await request(access, 'GET', url), 'fhir');
  if (!isObject(json) || json.resourceType !== 'Patient')
    throw new LaunchProblem('bad-server', 'The record did not return a Patient for this launch.');
  return json;
}

/** A search followed through its next links; the matches (search mode "match" or unstated) in page order. */
export async function searchAll(
  access: FhirAccess,
  type: string,
  params: Record<string, string>,
  options: { firstPageOnly?: boolean } = {},
): Promise<Json[]> {
  let url: URL | null = withinBase(access, type);
  for (const [key, value] of Object.entries(params)) url.searchParams.set(key, value);
  const found: Json[] = [];
  for (let page = 0; url; page++) {
    if (page === MAX_PAGES)
      throw new LaunchProblem(
        'bad-server',
        `The record's search ran past ${MAX_PAGES} pages; Gasline stopped reading rather than show part of it.`,
      );
    const bundle = await readJson(await request(access, 'GET', url), 'fhir');
    if (!isObject(bundle) || bundle.resourceType !== 'Bundle')
      throw new LaunchProblem('bad-server', 'The record answered a search without a Bundle.');
    for (const entry of Array.isArray(bundle.entry) ? bundle.entry : []) {
      if (!isObject(entry) || !isObject(entry.resource)) continue;
      const mode = isObject(entry.search) ? entry.search.mode : undefined;
      if ((mode === undefined || mode === 'match') && entry.resource.resourceType === type)
        found.push(entry.resource);
    }
    const next = (Array.isArray(bundle.link) ? bundle.link : []).find(
      (l) => isObject(l) && l.relation === 'next' && typeof l.url === 'string',
    ) as { url: string } | undefined;
    url = next && !options.firstPageOnly ? withinBase(access, next.url) : null;
  }
  return found;
}

const loinc = (codes: string[]) => codes.map((c) => `http://loinc.org|${c}`).join(',');

/** The patient's gases, chemistry and oxygen of the last 48 hours, and the latest height. */
export async function readResults(access: FhirAccess, patient: string, now: Date) {
  const since = new Date(now.getTime() - EARLIER_HOURS * 3600_000).toISOString();
  const [results, heights] = await Promise.all([
    searchAll(access, 'Observation', {
      patient,
      code: loinc(LOINC_CODES.map((e) => e.code)),
      date: `ge${since}`,
      _sort: '-date',
      _count: String(PAGE_SIZE),
    }),
    searchAll(
      access,
      'Observation',
      { patient, code: loinc([HEIGHT_LOINC]), _sort: '-date', _count: '1' },
      { firstPageOnly: true },
    ),
  ]);
  return [...results, ...heights];
}

/** Create a resource; its id from the Location header (or the body the server returned). */
export async function create(access: FhirAccess, resource: Json): Promise<string | null> {
  const url = withinBase(access, String(resource.resourceType));
  const response = await request(access, 'POST', url, JSON.stringify(resource));
  const location = response.headers.get('location') ?? response.headers.get('content-location');
  const body = await response.text().catch(() => '');
  const fromLocation = location
    ? /\/([A-Za-z0-9\-.]{1,64})(?:\/_history\/[^/]+)?\/?$/.exec(location)?.[1]
    : undefined;
  if (fromLocation) return fromLocation;
  try {
    const json = JSON.parse(body) as Json;
    return typeof json.id === 'string' ? json.id : null;
  } catch {
    return null;
  }
}
