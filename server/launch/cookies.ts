// The launch's two cookies, each an encrypted JWT (jose: JWE, dir + A256GCM) that no script can read (HttpOnly)
// and that a cross-site sub-request does not carry (SameSite=Lax; Secure when PUBLIC_URL is https):
// - the transaction (state, PKCE verifier, FHIR server, launch id) from /launch to /callback, ten minutes at most;
// - the record (FHIR server, access token, patient, encounter, author, Observations read) for filing a draft,
//   only when SMART_FILE_BACK=on and never longer than the token's own expiry.
// Nothing is kept on the server, so any process with the same key answers any step.
import type { Context } from 'hono';
import { deleteCookie, getCookie, setCookie } from 'hono/cookie';
import { EncryptJWT, jwtDecrypt, type JWTPayload } from 'jose';
import type { LaunchSettings } from './settings.ts';

export const TRANSACTION_SECONDS = 10 * 60;
/** A token whose expiry is not stated is kept for this long at most (our own choice). */
export const RECORD_SECONDS_UNSTATED = 10 * 60;

export interface Transaction {
  state: string;
  verifier: string;
  /** the FHIR base URL (iss) the launch named */
  iss: string;
  /** the EHR launch id; absent for a standalone launch */
  launch?: string;
}

export interface RecordGrant {
  iss: string;
  token: string;
  patient: string;
  encounter?: string;
  /** fhirUser from the ID token: Practitioner/123 or a full URL */
  author?: string;
  /** Observation references the case was read from (Observation/id) */
  related: string[];
}

type Purpose = 'transaction' | 'record';
const NAMES: Record<Purpose, string> = { transaction: 'gasline_launch', record: 'gasline_record' };

async function seal(data: object, purpose: Purpose, seconds: number, key: Uint8Array) {
  return new EncryptJWT({ ...data, use: purpose } as JWTPayload)
    .setProtectedHeader({ alg: 'dir', enc: 'A256GCM' })
    .setIssuedAt()
    .setExpirationTime(`${seconds}s`)
    .encrypt(key);
}

export type Opened<T> =
  | { ok: true; data: T }
  | { ok: false; reason: 'missing' | 'expired' | 'unreadable' };

async function open<T>(value: string | undefined, purpose: Purpose, key: Uint8Array) {
  if (!value) return { ok: false, reason: 'missing' } as Opened<T>;
  try {
    const { payload } = await jwtDecrypt(value, key, { keyManagementAlgorithms: ['dir'] });
    if (payload.use !== purpose) return { ok: false, reason: 'unreadable' } as Opened<T>;
    return { ok: true, data: payload as T } as Opened<T>;
  } catch (error) {
    const code = (error as { code?: string }).code;
    return {
      ok: false,
      reason: code === 'ERR_JWT_EXPIRED' ? 'expired' : 'unreadable',
    } as Opened<T>;
  }
}

const options = (s: LaunchSettings, seconds: number) =>
  ({
    path: '/',
    httpOnly: true,
    secure: s.secureCookies,
    sameSite: 'Lax',
    maxAge: seconds,
    ...(s.secureCookies ? { prefix: 'host' as const } : {}),
  }) as const;

/** Over https hono's prefix option adds __Host- (this host, path /) itself: set and read by the bare name. */
const bare = (purpose: Purpose) => NAMES[purpose];

export async function setTransaction(c: Context, s: LaunchSettings, t: Transaction) {
  const value = await seal(t, 'transaction', TRANSACTION_SECONDS, s.cookieKey);
  setCookie(c, bare('transaction'), value, options(s, TRANSACTION_SECONDS));
}

export async function takeTransaction(c: Context, s: LaunchSettings) {
  const value = getCookie(c, bare('transaction'), s.secureCookies ? 'host' : undefined);
  // used once: whatever it holds, the callback clears it, so a replayed callback finds nothing
  if (value !== undefined) clearCookie(c, s, 'transaction');
  return open<Transaction>(value, 'transaction', s.cookieKey);
}

/** Browsers keep about 4 KB a cookie, name and attributes included. */
export const MAX_COOKIE_VALUE = 3800;

/**
 * Keep the grant for filing back, no longer than the token lives. A grant too large for a cookie keeps fewer of
 * the Observations read (the newest gas's come first and stay longest); 'none' when even the token alone does not fit.
 */
export async function setRecord(
  c: Context,
  s: LaunchSettings,
  grant: RecordGrant,
  expiresIn: number | undefined,
): Promise<'all' | 'some' | 'none'> {
  const seconds = Math.max(
    1,
    Math.floor(expiresIn && expiresIn > 0 ? expiresIn : RECORD_SECONDS_UNSTATED),
  );
  let related = grant.related;
  for (;;) {
    const value = await seal({ ...grant, related }, 'record', seconds, s.cookieKey);
    if (value.length <= MAX_COOKIE_VALUE) {
      setCookie(c, bare('record'), value, options(s, seconds));
      return related.length === grant.related.length ? 'all' : 'some';
    }
    if (!related.length) return 'none';
    related = related.slice(0, Math.floor(related.length / 2));
  }
}

export async function readRecord(c: Context, s: LaunchSettings) {
  const value = getCookie(c, bare('record'), s.secureCookies ? 'host' : undefined);
  return open<RecordGrant>(value, 'record', s.cookieKey);
}

export const hasRecord = (c: Context, s: LaunchSettings): boolean =>
  getCookie(c, bare('record'), s.secureCookies ? 'host' : undefined) !== undefined;

export function clearCookie(c: Context, s: LaunchSettings, purpose: Purpose) {
  deleteCookie(c, bare(purpose), {
    path: '/',
    secure: s.secureCookies,
    httpOnly: true,
    sameSite: 'Lax',
    ...(s.secureCookies ? { prefix: 'host' as const } : {}),
  });
}
