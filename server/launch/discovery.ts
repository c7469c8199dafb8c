// SMART discovery: {iss}/.well-known/smart-configuration (SMART App Launch 2.x, section "Conformance"), checked
// before anything is sent to the server: both endpoints present and on https (or loopback http), and PKCE S256
// offered, or the server is refused. The result is the authorization server as oauth4webapi takes it.
import type { AuthorizationServer } from 'oauth4webapi';
import { z } from 'zod';
import { checkBaseUrl } from './settings.ts';
import { LaunchProblem, fetchJson } from './http.ts';

export interface SmartServer {
  /** the FHIR base URL (iss), without a trailing slash */
  fhirBase: string;
  as: AuthorizationServer;
  capabilities: string[];
  /** http to a loopback host: oauth4webapi must be told to allow it */
  insecure: boolean;
}

const configuration = z.object({
  issuer: z.string().optional(),
  authorization_endpoint: z.string(),
  token_endpoint: z.string(),
  jwks_uri: z.string().optional(),
  capabilities: z.array(z.string()).default([]),
  code_challenge_methods_supported: z.array(z.string()).default([]),
  scopes_supported: z.array(z.string()).optional(),
});

export async function discover(fhirBase: string): Promise<SmartServer> {
  const where = `${fhirBase}/.well-known/smart-configuration`;
  const json = await fetchJson(where, { headers: { accept: 'application/json' } }, 'discovery');
  const parsed = configuration.safeParse(json);
  if (!parsed.success)
    throw new LaunchProblem(
      'bad-server',
      "The record's SMART configuration is incomplete (it must name its authorization and token endpoints).",
    );
  const config = parsed.data;
  if (!config.code_challenge_methods_supported.includes('S256'))
    throw new LaunchProblem(
      'bad-server',
      "The record's authorization server does not offer PKCE with S256, which SMART App Launch 2 requires: Gasline does not sign in to it.",
    );
  let insecure = new URL(fhirBase).protocol === 'http:';
  for (const [name, value] of [
    ['authorization_endpoint', config.authorization_endpoint],
    ['token_endpoint', config.token_endpoint],
  ] as const) {
    const checked = checkBaseUrl(value.split('?')[0]!, `The record's ${name}`);
    if ('error' in checked) throw new LaunchProblem('bad-server', `${checked.error}.`);
    if (checked.url.protocol === 'http:') insecure = true;
  }
  return {
    fhirBase,
    insecure,
    capabilities: config.capabilities,
    as: {
      // the OpenID issuer when the server names one (the ID token is checked against it), else the FHIR base
      issuer: config.issuer ?? fhirBase,
      authorization_endpoint: config.authorization_endpoint,
      token_endpoint: config.token_endpoint,
      ...(config.jwks_uri ? { jwks_uri: config.jwks_uri } : {}),
      code_challenge_methods_supported: config.code_challenge_methods_supported,
    },
  };
}
