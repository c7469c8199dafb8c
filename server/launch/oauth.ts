// The OAuth 2 side of SMART App Launch 2 with oauth4webapi: authorization code with PKCE S256, state, aud, the
// launch scopes, and the token exchange with its launch context (patient, encounter) and the ID token's fhirUser.
// A public client (no secret): the client id alone, as SMART's public-client profile describes.
import * as oauth from 'oauth4webapi';
import type { SmartServer } from './discovery.ts';
import { LaunchProblem, REQUEST_TIMEOUT_MS, unreachable } from './http.ts';
import type { LaunchSettings } from './settings.ts';
import type { Transaction } from './cookies.ts';

/** SMART v2 scopes: read and search the patient's Observations and the Patient; create a DocumentReference to file. */
export function scopesFor(standalone: boolean, fileBack: boolean): string {
  return [
    standalone ? 'launch/patient' : 'launch',
    'openid',
    'fhirUser',
    'patient/Observation.rs',
    'patient/Patient.rs',
    ...(fileBack ? ['patient/DocumentReference.c'] : []),
  ].join(' ');
}

/** A new transaction: fresh state and PKCE verifier for one launch. */
export function newTransaction(iss: string, launch: string | undefined): Transaction {
  return {
    state: oauth.generateRandomState(),
    verifier: oauth.generateRandomCodeVerifier(),
    iss,
    ...(launch ? { launch } : {}),
  };
}

export async function authorizationUrl(
  server: SmartServer,
  settings: LaunchSettings,
  t: Transaction,
): Promise<URL> {
  const url = new URL(server.as.authorization_endpoint!);
  const params: Record<string, string> = {
    response_type: 'code',
    client_id: settings.clientId,
    redirect_uri: settings.redirectUri,
    scope: scopesFor(t.launch === undefined, settings.fileBack),
    state: t.state,
    aud: server.fhirBase,
    code_challenge: await oauth.calculatePKCECodeChallenge(t.verifier),
    code_challenge_method: 'S256',
    ...(t.launch ? { launch: t.launch } : {}),
  };
  for (const [key, value] of Object.entries(params)) url.searchParams.set(key, value);
  return url;
}

export interface Granted {
  accessToken: string;
  expiresIn: number | undefined;
  scope: string;
  patient: string;
  encounter: string | undefined;
  fhirUser: string | undefined;
}

const FHIR_ID = /^[A-Za-z0-9\-.]{1,64}$/;

const options = (server: SmartServer) => ({
  signal: AbortSignal.timeout(REQUEST_TIMEOUT_MS),
  ...(server.insecure ? { [oauth.allowInsecureRequests]: true } : {}),
});

/** The callback's answer, checked against the transaction, exchanged for a token and its launch context. */
export async function exchangeCode(
  server: SmartServer,
  settings: LaunchSettings,
  t: Transaction,
  callbackUrl: URL,
): Promise<Granted> {
  const client: oauth.Client = { client_id: settings.clientId };
  let params: URLSearchParams;
  try {
    params = oauth.validateAuthResponse(server.as, client, callbackUrl, t.state);
  } catch (error) {
    if (error instanceof oauth.AuthorizationResponseError) {
      const code = error.error;
      throw new LaunchProblem(
        'refused',
        code === 'access_denied'
          ? 'Access was not granted in the record (consent refused or cancelled), so nothing was read.'
          : `The record did not grant access (${code.slice(0, 60)}), so nothing was read.`,
      );
    }
    throw new LaunchProblem(
      'stray',
      'This sign-in answer does not belong to the launch under way (its state does not match).',
    );
  }
  let response: Response;
  try {
    response = await oauth.authorizationCodeGrantRequest(
      server.as,
      client,
      oauth.None(),
      params,
      settings.redirectUri,
      t.verifier,
      options(server),
    );
  } catch (error) {
    throw unreachable('token', error);
  }
  let result: oauth.TokenEndpointResponse;
  try {
    result = await oauth.processAuthorizationCodeResponse(server.as, client, response);
  } catch (error) {
    if (error instanceof oauth.ResponseBodyError)
      throw new LaunchProblem(
        'token',
        `The record refused the sign-in code (${error.error.slice(0, 60)}): it may have been used already or have expired.`,
      );
    throw new LaunchProblem(
      'bad-server',
      "The record's token answer could not be used (it did not follow the OAuth and OpenID rules Gasline checks).",
    );
  }
  const patient = typeof result.patient === 'string' ? result.patient : '';
  if (!FHIR_ID.test(patient))
    throw new LaunchProblem(
      'bad-server',
      'The record did not say which patient this is: launch again from the patient\u2019s chart.',
    );
  const encounter =
    typeof result.encounter === 'string' && FHIR_ID.test(result.encounter)
      ? result.encounter
      : undefined;
  const claims = oauth.getValidatedIdTokenClaims(result);
  const fhirUser = typeof claims?.fhirUser === 'string' ? claims.fhirUser : undefined;
  return {
    accessToken: result.access_token,
    expiresIn: typeof result.expires_in === 'number' ? result.expires_in : undefined,
    scope: typeof result.scope === 'string' ? result.scope : '',
    patient,
    encounter,
    fhirUser,
  };
}
