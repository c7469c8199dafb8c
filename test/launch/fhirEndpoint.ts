// The test record's FHIR R4 endpoint, as the spec has it: every request needs an active Bearer token; a read or
// search stays in the token's patient compartment and needs its SMART v2 scope (r, s, c); an Observation search
// filters by patient, code (system|code lists), date (ge/le/gt/lt) and sorts by date; results come in pages of at
// most pageSize with a next link; DocumentReference create checks its subject and stores it. Invented data only.
import { Hono, type Context } from 'hono';

type Json = Record<string, unknown>;

export interface Grant {
  token: string;
  scope: string[];
  patient: string;
  encounter?: string;
  expires: number;
}

export interface RecordData {
  patients: Record<string, Json>;
  observations: Json[];
}

export interface FhirState {
  data: RecordData;
  grants: Map<string, Grant>;
  documents: Json[];
  /** largest page the server sends, whatever _count asks */
  pageSize: number;
  /** every FHIR request's method, path and query, for the tests */
  requests: string[];
  /** when set, every FHIR request fails with this status (a server that is down) */
  failWith?: number;
}

const outcome = (code: string, text: string) => ({
  resourceType: 'OperationOutcome',
  issue: [{ severity: 'error', code, diagnostics: text }],
});

/** SMART v2 scope check: patient/Type.cruds (or the v1 .read / .write / .*) covering the letter asked. */
export function allows(scope: string[], type: string, letter: 'c' | 'r' | 's'): boolean {
  return scope.some((s) => {
    const m = /^patient\/(\*|[A-Za-z]+)\.(.+)$/.exec(s);
    if (!m || (m[1] !== '*' && m[1] !== type)) return false;
    const perms = m[2]!;
    if (perms === '*' || perms === 'read' || perms === 'write')
      return perms === '*' || (perms === 'read' ? letter !== 'c' : letter === 'c');
    return /^c?r?u?d?s?$/.test(perms) && perms.includes(letter);
  });
}

const timeOf = (o: Json) => Date.parse(String(o.effectiveDateTime ?? ''));
const subjectOf = (o: Json) => String((o.subject as Json | undefined)?.reference ?? '');
const codesOf = (o: Json) =>
  (((o.code as Json | undefined)?.coding as Json[] | undefined) ?? []).map(
    (c) => `${String(c.system)}|${String(c.code)}`,
  );

/** A FHIR date search parameter (one prefix and an instant). */
function dateMatches(param: string, t: number): boolean {
  const m = /^(ge|le|gt|lt|eq)?(.+)$/.exec(param);
  const bound = Date.parse(m?.[2] ?? '');
  if (!Number.isFinite(bound) || !Number.isFinite(t)) return false;
  switch (m?.[1] ?? 'eq') {
    case 'ge':
      return t >= bound;
    case 'gt':
      return t > bound;
    case 'le':
      return t <= bound;
    case 'lt':
      return t < bound;
    default:
      return t === bound;
  }
}

export function fhirEndpoint(state: FhirState, fhirBase: () => string): Hono {
  const fhir = new Hono();

  const grantOf = (c: Context): Grant | Response => {
    const header = c.req.header('authorization') ?? '';
    const grant = state.grants.get(header.replace(/^Bearer /, ''));
    if (!header.startsWith('Bearer ') || !grant || grant.expires < Date.now()) {
      c.header('www-authenticate', 'Bearer error="invalid_token"');
      return c.json(outcome('login', 'no active access token'), 401);
    }
    return grant;
  };
  const refuse = (c: Context, text: string) => c.json(outcome('forbidden', text), 403);

  fhir.use('*', async (c, next) => {
    state.requests.push(
      `${c.req.method} ${new URL(c.req.url).pathname}${new URL(c.req.url).search}`,
    );
    if (state.failWith) return c.json(outcome('exception', 'down'), state.failWith as 503);
    await next();
    c.header('content-type', 'application/fhir+json');
  });

  fhir.get('/Patient/:id', (c) => {
    const grant = grantOf(c);
    if (grant instanceof Response) return grant;
    if (!allows(grant.scope, 'Patient', 'r')) return refuse(c, 'scope does not allow Patient read');
    if (c.req.param('id') !== grant.patient) return refuse(c, 'outside the patient compartment');
    const patient = state.data.patients[grant.patient];
    return patient ? c.json(patient) : c.json(outcome('not-found', 'no such patient'), 404);
  });

  fhir.get('/Observation', (c) => {
    const grant = grantOf(c);
    if (grant instanceof Response) return grant;
    if (!allows(grant.scope, 'Observation', 's'))
      return refuse(c, 'scope does not allow Observation search');
    const q = new URL(c.req.url).searchParams;
    const patient = q.get('patient') ?? q.get('subject')?.replace(/^Patient\//, '');
    if (patient !== grant.patient)
      return refuse(c, 'a search must stay in the patient compartment');
    const codes = q.get('code')?.split(',');
    const dates = q.getAll('date');
    let found = state.data.observations.filter(
      (o) =>
        subjectOf(o) === `Patient/${patient}` &&
        (!codes || codesOf(o).some((k) => codes.includes(k))) &&
        dates.every((d) => dateMatches(d, timeOf(o))),
    );
    const sort = q.get('_sort') ?? '';
    if (sort === '-date') found = found.sort((a, b) => timeOf(b) - timeOf(a));
    else if (sort === 'date') found = found.sort((a, b) => timeOf(a) - timeOf(b));
    const count = Math.min(
      Number(q.get('_count') ?? state.pageSize) || state.pageSize,
      state.pageSize,
    );
    const offset = Number(q.get('_offset') ?? 0);
    const page = found.slice(offset, offset + count);
    const self = new URL(c.req.url);
    const link = [{ relation: 'self', url: self.href }];
    if (offset + count < found.length) {
      const next = new URL(`${fhirBase()}/Observation${self.search}`);
      next.searchParams.set('_offset', String(offset + count));
      link.push({ relation: 'next', url: next.href });
    }
    return c.json({
      resourceType: 'Bundle',
      type: 'searchset',
      total: found.length,
      link,
      entry: page.map((resource) => ({
        fullUrl: `${fhirBase()}/Observation/${String(resource.id)}`,
        resource,
        search: { mode: 'match' },
      })),
    });
  });

  fhir.post('/DocumentReference', async (c) => {
    const grant = grantOf(c);
    if (grant instanceof Response) return grant;
    if (!allows(grant.scope, 'DocumentReference', 'c'))
      return refuse(c, 'scope does not allow DocumentReference create');
    if (!(c.req.header('content-type') ?? '').startsWith('application/fhir+json'))
      return c.json(outcome('invalid', 'send application/fhir+json'), 415);
    const doc = (await c.req.json()) as Json;
    if (doc.resourceType !== 'DocumentReference')
      return c.json(outcome('invalid', 'not a DocumentReference'), 400);
    if ((doc.subject as Json | undefined)?.reference !== `Patient/${grant.patient}`)
      return refuse(c, 'the subject is not the launch patient');
    const id = `doc-${state.documents.length + 1}`;
    const stored = { ...doc, id, meta: { versionId: '1', lastUpdated: new Date().toISOString() } };
    state.documents.push(stored);
    c.header('location', `${fhirBase()}/DocumentReference/${id}/_history/1`);
    return c.json(stored, 201);
  });

  return fhir;
}
