// The launch's settings, read once at start-up: SMART_CLIENT_ID turns the launch on; PUBLIC_URL is the only
// source of the redirect URI; SMART_FILE_BACK=on asks for the right to file a draft note; SMART_COOKIE_KEY
// encrypts the launch's cookies so that any process holding it can answer the callback; SMART_ISSUERS limits the
// FHIR servers a launch may name. FRAME_ANCESTORS (read here too) lists the record's origins allowed to embed.
import { randomBytes } from 'node:crypto';

export interface LaunchSettings {
  clientId: string;
  /** PUBLIC_URL without a trailing slash */
  publicUrl: string;
  redirectUri: string;
  fileBack: boolean;
  /** 32 bytes for A256GCM */
  cookieKey: Uint8Array;
  /** the key came from SMART_COOKIE_KEY (true) or was made for this process alone (false) */
  sharedKey: boolean;
  /** FHIR base URLs a launch may name; empty: any https server (and http on loopback) */
  issuers: string[];
  /** cookies only over https: true when PUBLIC_URL is https */
  secureCookies: boolean;
}

export type SettingsOutcome =
  | { ok: true; launch: LaunchSettings | null; frameAncestors: string[]; messages: string[] }
  | { ok: false; error: string };

const LOOPBACK_HOSTS = new Set(['localhost', '127.0.0.1', '[::1]', '::1']);

/** A loopback host (localhost, 127.0.0.0/8, ::1): the one place plain http is allowed. */
export const isLoopback = (url: URL): boolean =>
  LOOPBACK_HOSTS.has(url.hostname) || /^127(\.\d{1,3}){3}$/.test(url.hostname);

/** https, or http to a loopback host; no credentials, query or fragment in a base URL. */
export function checkBaseUrl(raw: string, name: string): { url: URL } | { error: string } {
  let url: URL;
  try {
    url = new URL(raw);
  } catch {
    return { error: `${name} is not a URL` };
  }
  if (url.protocol !== 'https:' && !(url.protocol === 'http:' && isLoopback(url)))
    return { error: `${name} must use https (plain http only for a loopback address)` };
  if (url.username || url.password || url.search || url.hash)
    return { error: `${name} must not carry a user name, a query or a fragment` };
  return { url };
}

/** A base URL as compared and stored: no trailing slash. */
export const baseOf = (url: URL): string => url.href.replace(/\/+$/, '');

const list = (value: string | undefined) =>
  (value ?? '')
    .split(/[\s,]+/)
    .map((s) => s.trim())
    .filter(Boolean);

/** The key from SMART_COOKIE_KEY: 32 bytes written as base64 or base64url (43-44 characters) or hex (64). */
function readKey(raw: string): Uint8Array | null {
  const text = raw.trim();
  if (/^[0-9a-fA-F]{64}$/.test(text)) return new Uint8Array(Buffer.from(text, 'hex'));
  if (/^[A-Za-z0-9+/_-]{43}=?$/.test(text)) {
    const bytes = Buffer.from(text.replace(/-/g, '+').replace(/_/g, '/'), 'base64');
    return bytes.length === 32 ? new Uint8Array(bytes) : null;
  }
  return null;
}

export function readSettings(
  env: NodeJS.ProcessEnv,
  options: { severalProcesses?: boolean } = {},
): SettingsOutcome {
  const messages: string[] = [];
  const frameAncestors: string[] = [];
  for (const origin of list(env.FRAME_ANCESTORS)) {
    const checked = checkBaseUrl(origin, `FRAME_ANCESTORS entry "${origin}"`);
    if ('error' in checked) return { ok: false, error: checked.error };
    if (checked.url.pathname !== '/')
      return {
        ok: false,
        error: `FRAME_ANCESTORS entry "${origin}" must be an origin (scheme, host and port only)`,
      };
    frameAncestors.push(checked.url.origin);
  }
  if (frameAncestors.length)
    messages.push(`The page may be embedded by: ${frameAncestors.join(', ')} (FRAME_ANCESTORS)`);

  const clientId = env.SMART_CLIENT_ID?.trim() ?? '';
  if (!clientId) return { ok: true, launch: null, frameAncestors, messages };

  const publicRaw = env.PUBLIC_URL?.trim() ?? '';
  if (!publicRaw)
    return {
      ok: false,
      error:
        'SMART_CLIENT_ID is set but PUBLIC_URL is not: set PUBLIC_URL to the address clinicians open (the redirect URI is PUBLIC_URL/callback)',
    };
  const publicChecked = checkBaseUrl(publicRaw, 'PUBLIC_URL');
  if ('error' in publicChecked) return { ok: false, error: publicChecked.error };
  const publicUrl = baseOf(publicChecked.url);

  const fileBackRaw = (env.SMART_FILE_BACK ?? 'off').trim().toLowerCase();
  if (fileBackRaw !== 'on' && fileBackRaw !== 'off')
    return { ok: false, error: `SMART_FILE_BACK must be on or off (got "${env.SMART_FILE_BACK}")` };

  const issuers: string[] = [];
  for (const raw of list(env.SMART_ISSUERS)) {
    const checked = checkBaseUrl(raw, `SMART_ISSUERS entry "${raw}"`);
    if ('error' in checked) return { ok: false, error: checked.error };
    issuers.push(baseOf(checked.url));
  }

  let cookieKey: Uint8Array;
  let sharedKey = false;
  if (env.SMART_COOKIE_KEY?.trim()) {
    const key = readKey(env.SMART_COOKIE_KEY);
    if (!key)
      return {
        ok: false,
        error:
          'SMART_COOKIE_KEY must be 32 random bytes written as base64url or hex (for example: openssl rand -base64 32)',
      };
    cookieKey = key;
    sharedKey = true;
  } else if (options.severalProcesses) {
    return {
      ok: false,
      error:
        'SMART_CLIENT_ID is set and several processes (or pods) may run: set SMART_COOKIE_KEY, the same in every process, so that any of them can answer a launch',
    };
  } else {
    cookieKey = new Uint8Array(randomBytes(32));
    messages.push(
      'SMART launch: no SMART_COOKIE_KEY, so this process made a key of its own: a launch must come back to this process, and launches under way are lost at a restart. Set SMART_COOKIE_KEY when several processes or pods run.',
    );
  }
  messages.push(
    `SMART launch on: client ${clientId}, redirect URI ${publicUrl}/callback, filing back ${fileBackRaw}, FHIR servers ${issuers.length ? issuers.join(', ') : 'any (set SMART_ISSUERS to limit them)'}`,
  );
  return {
    ok: true,
    launch: {
      clientId,
      publicUrl,
      redirectUri: `${publicUrl}/callback`,
      fileBack: fileBackRaw === 'on',
      cookieKey,
      sharedKey,
      issuers,
      secureCookies: publicChecked.url.protocol === 'https:',
    },
    frameAncestors,
    messages,
  };
}
