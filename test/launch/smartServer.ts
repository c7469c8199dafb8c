// A small SMART App Launch 2 authorization server and EHR for the tests, following the spec: discovery at
// {fhir}/.well-known/smart-configuration (PKCE S256 only), an EHR that launches the app with iss and a launch id,
// an authorize endpoint that checks client, redirect URI, aud, scopes, state and the PKCE challenge and asks the
// user (allow, deny, and pick a patient for a standalone launch), a token endpoint that checks the code once, the
// redirect URI and the PKCE verifier, and answers with the launch context and a signed ID token with fhirUser.
import { createHash, randomBytes } from 'node:crypto';
import type { AddressInfo } from 'node:net';
import { serve, type ServerType } from '@hono/node-server';
import { Hono } from 'hono';
import { exportJWK, generateKeyPair, SignJWT } from 'jose';
import { fhirEndpoint, type FhirState, type Grant, type RecordData } from './fhirEndpoint.ts';

export interface SmartOptions {
  clientId: string;
  redirectUri: string;
  /** the app's /launch, for the EHR's launch button */
  appLaunch: string;
  data: RecordData;
  practitioner?: string;
  pageSize?: number;
  tokenSeconds?: number;
  /** approve without a page (HTTP tests); the browser tests click through the page */
  autoApprove?: { patient?: string } | false;
  /** the PKCE methods discovery announces (a non-conformant server for a refusal test) */
  pkceMethods?: string[];
  /** host name in the URLs it announces (localhost, so the app and the record are different sites) */
  host?: string;
}

export interface SmartServer extends FhirState {
  origin: string;
  fhirBase: string;
  issued: string[];
  codes: Map<string, Pending>;
  close(): Promise<void>;
}

interface Pending {
  clientId: string;
  redirectUri: string;
  challenge: string;
  scope: string[];
  patient: string;
  encounter?: string;
  expires: number;
  used: boolean;
}

const SUPPORTED = [
  'launch',
  'launch/patient',
  'openid',
  'fhirUser',
  'patient/Observation.rs',
  'patient/Patient.rs',
  'patient/DocumentReference.c',
];
const random = () => randomBytes(24).toString('base64url');
const s256 = (verifier: string) => createHash('sha256').update(verifier).digest('base64url');
const esc = (s: string) => s.replace(/[&<>"']/g, (ch) => `&#${ch.charCodeAt(0)};`);

export async function startSmartServer(o: SmartOptions): Promise<SmartServer> {
  const keys = await generateKeyPair('RS256');
  const jwk = { ...(await exportJWK(keys.publicKey)), kid: 'k1', alg: 'RS256', use: 'sig' };
  const launches = new Map<string, { patient: string; encounter?: string }>();
  const asks = new Map<string, { query: URLSearchParams; expires: number }>();
  const state: SmartServer = {
    data: o.data,
    grants: new Map<string, Grant>(),
    documents: [],
    pageSize: o.pageSize ?? 50,
    requests: [],
    issued: [],
    codes: new Map(),
    origin: '',
    fhirBase: '',
    close: async () => {},
  };
  const app = new Hono();
  const issuer = () => `${state.origin}/auth`;

  app.get('/fhir/.well-known/smart-configuration', (c) =>
    c.json({
      issuer: issuer(),
      jwks_uri: `${issuer()}/jwks`,
      authorization_endpoint: `${issuer()}/authorize`,
      token_endpoint: `${issuer()}/token`,
      grant_types_supported: ['authorization_code'],
      response_types_supported: ['code'],
      scopes_supported: SUPPORTED,
      code_challenge_methods_supported: o.pkceMethods ?? ['S256'],
      capabilities: [
        'launch-ehr',
        'launch-standalone',
        'client-public',
        'context-ehr-patient',
        'context-ehr-encounter',
        'context-standalone-patient',
        'permission-v2',
        'permission-patient',
        'sso-openid-connect',
      ],
    }),
  );
  app.get('/auth/jwks', (c) => c.json({ keys: [jwk] }));

  // the EHR: a clinician in a chart presses the app's button
  app.get('/ehr/launch', (c) => {
    const id = random();
    launches.set(id, {
      patient: c.req.query('patient') ?? '',
      encounter: c.req.query('encounter'),
    });
    const to = new URL(o.appLaunch);
    to.searchParams.set('iss', state.fhirBase);
    to.searchParams.set('launch', id);
    return c.redirect(to.href, 302);
  });

  const back = (redirectUri: string, params: Record<string, string>) => {
    const url = new URL(redirectUri);
    for (const [k, v] of Object.entries(params)) url.searchParams.set(k, v);
    return url.href;
  };

  app.get('/auth/authorize', (c) => {
    const q = new URL(c.req.url).searchParams;
    // client and redirect URI first: on a mismatch nothing is sent back (RFC 6749 section 4.1.2.1)
    if (q.get('client_id') !== o.clientId || q.get('redirect_uri') !== o.redirectUri)
      return c.text('unknown client or redirect URI', 400);
    const fail = (error: string) =>
      c.redirect(back(o.redirectUri, { error, state: q.get('state') ?? '' }), 302);
    const scope = (q.get('scope') ?? '').split(' ').filter(Boolean);
    if (q.get('response_type') !== 'code' || !q.get('state')) return fail('invalid_request');
    if (q.get('aud') !== state.fhirBase) return fail('invalid_request'); // SMART: aud must be this FHIR server
    if (
      q.get('code_challenge_method') !== 'S256' ||
      !/^[A-Za-z0-9_-]{43}$/.test(q.get('code_challenge') ?? '')
    )
      return fail('invalid_request');
    if (!scope.length || scope.some((s) => !SUPPORTED.includes(s))) return fail('invalid_scope');
    const launch = q.get('launch');
    if (launch !== null && (!scope.includes('launch') || !launches.has(launch)))
      return fail('invalid_request');
    if (launch === null && !scope.includes('launch/patient')) return fail('invalid_scope');
    if (o.autoApprove) return c.redirect(decide(q, 'allow', o.autoApprove.patient ?? ''), 302);
    const ask = random();
    asks.set(ask, { query: q, expires: Date.now() + 5 * 60_000 });
    const pick =
      launch === null
        ? `<label for="patient">Patient</label><select id="patient" name="patient">${Object.entries(
            o.data.patients,
          )
            .map(
              ([id, p]) =>
                `<option value="${esc(id)}">${esc(String((p.name as { text: string }[] | undefined)?.[0]?.text ?? id))}</option>`,
            )
            .join('')}</select>`
        : '';
    return c.html(
      `<!doctype html><html lang="en"><head><title>Test record: allow access</title></head><body><main><h1>Allow Gasline to read this patient's results?</h1><form method="post" action="/auth/decide"><input type="hidden" name="ask" value="${ask}">${pick}<button name="decision" value="allow">Allow</button> <button name="decision" value="deny">Deny</button></form></main></body></html>`,
    );
  });

  function decide(q: URLSearchParams, decision: string, picked: string): string {
    const redirectUri = q.get('redirect_uri')!;
    if (decision !== 'allow')
      return back(redirectUri, { error: 'access_denied', state: q.get('state')! });
    const launch = q.get('launch');
    const context = launch
      ? launches.get(launch)!
      : { patient: picked || Object.keys(o.data.patients)[0]! };
    if (launch) launches.delete(launch);
    const code = random();
    state.codes.set(code, {
      clientId: q.get('client_id')!,
      redirectUri,
      challenge: q.get('code_challenge')!,
      scope: q.get('scope')!.split(' '),
      patient: context.patient,
      ...(context.encounter ? { encounter: context.encounter } : {}),
      expires: Date.now() + 60_000,
      used: false,
    });
    return back(redirectUri, { code, state: q.get('state')! });
  }

  app.post('/auth/decide', async (c) => {
    const form = await c.req.parseBody();
    const ask = asks.get(String(form.ask));
    if (!ask || ask.expires < Date.now()) return c.text('this request has expired', 400);
    asks.delete(String(form.ask));
    return c.redirect(decide(ask.query, String(form.decision), String(form.patient ?? '')), 302);
  });

  app.post('/auth/token', async (c) => {
    const f = await c.req.parseBody();
    const error = (e: string) => c.json({ error: e }, 400, { 'cache-control': 'no-store' });
    if (f.grant_type !== 'authorization_code') return error('unsupported_grant_type');
    const pending = state.codes.get(String(f.code));
    if (!pending || pending.expires < Date.now()) return error('invalid_grant');
    if (pending.used) {
      // a code used twice: refuse, and withdraw what it gave (RFC 6749 section 4.1.2)
      for (const [token, g] of state.grants)
        if (g.patient === pending.patient) state.grants.delete(token);
      return error('invalid_grant');
    }
    pending.used = true;
    if (f.client_id !== pending.clientId) return error('invalid_client');
    if (f.redirect_uri !== pending.redirectUri) return error('invalid_grant');
    if (typeof f.code_verifier !== 'string' || s256(f.code_verifier) !== pending.challenge)
      return error('invalid_grant');
    const token = `at-${random()}`;
    const seconds = o.tokenSeconds ?? 300;
    state.grants.set(token, {
      token,
      scope: pending.scope,
      patient: pending.patient,
      encounter: pending.encounter,
      expires: Date.now() + seconds * 1000,
    });
    state.issued.push(token);
    const idToken = pending.scope.includes('openid')
      ? await new SignJWT({
          fhirUser: `${state.fhirBase}/${o.practitioner ?? 'Practitioner/pr-1'}`,
        })
          .setProtectedHeader({ alg: 'RS256', kid: 'k1' })
          .setIssuer(issuer())
          .setSubject(o.practitioner ?? 'Practitioner/pr-1')
          .setAudience(pending.clientId)
          .setIssuedAt()
          .setExpirationTime('5m')
          .sign(keys.privateKey)
      : undefined;
    return c.json(
      {
        access_token: token,
        token_type: 'Bearer',
        expires_in: seconds,
        scope: pending.scope.join(' '),
        patient: pending.patient,
        ...(pending.encounter ? { encounter: pending.encounter } : {}),
        need_patient_banner: false,
        ...(idToken ? { id_token: idToken } : {}),
      },
      200,
      { 'cache-control': 'no-store', pragma: 'no-cache' },
    );
  });

  app.route(
    '/fhir',
    fhirEndpoint(state, () => state.fhirBase),
  );

  const server: ServerType = serve({ fetch: app.fetch, port: 0, hostname: '127.0.0.1' });
  await new Promise<void>((resolve) => server.once('listening', () => resolve()));
  const { port } = server.address() as AddressInfo;
  state.origin = `http://${o.host ?? '127.0.0.1'}:${port}`;
  state.fhirBase = `${state.origin}/fhir`;
  state.close = () => new Promise<void>((resolve) => server.close(() => resolve()));
  return state;
}
