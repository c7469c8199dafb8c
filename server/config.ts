// Everything the server reads from its environment, checked at once: the single process checks it before it
// listens, and a cluster's primary checks it before it forks (a setting that cannot work stops the start with a
// message, instead of workers failing one after another). README's settings section lists each name.
import { createNoteRenderer, type NoteRenderer } from '../templates/index.ts';
import { readSettings, type LaunchSettings } from './launch/index.ts';
import { allowedHostNames } from './security.ts';
import { parseUnits, type UnitChoices } from './unitsSetting.ts';

export interface Limits {
  /** time to receive a request's headers (Node's server.headersTimeout) */
  headersTimeoutMs: number;
  /** time to receive a whole request (Node's server.requestTimeout) */
  requestTimeoutMs: number;
  /** open connections a process holds at most (Node's server.maxConnections; MAX_CONNECTIONS) */
  maxConnections: number;
  /** event-loop lag above which requests are refused with 503 (OVERLOAD_LAG_MS) */
  overloadLagMs: number;
  /** requests in progress at most in one process; more are refused with 503 (MAX_IN_FLIGHT) */
  maxInFlight: number;
  /** the longest a stop waits for requests in progress before it closes what is left (SHUTDOWN_SECONDS) */
  shutdownMs: number;
}

export interface Config {
  port: number;
  hostname: string;
  renderer: NoteRenderer;
  launch: LaunchSettings | null;
  frameAncestors: string[];
  allowedOrigins: string[];
  allowedHosts: string[];
  hsts: boolean;
  cspReports: boolean;
  requestLog: boolean;
  /** the units a new case starts in (UNITS, server/unitsSetting.ts) */
  units: UnitChoices;
  limits: Limits;
  /** lines to print once at start-up */
  messages: string[];
}

export const LOOPBACK = new Set(['127.0.0.1', 'localhost', '::1']);
/** about 10 s for the headers and 20 s for a whole request (the review's figures; a 64 KiB body needs far less) */
export const HEADERS_TIMEOUT_MS = 10_000;
export const REQUEST_TIMEOUT_MS = 20_000;

const list = (value: string | undefined) =>
  (value ?? '')
    .split(',')
    .map((s) => s.trim())
    .filter(Boolean);

function onOff(env: NodeJS.ProcessEnv, name: string, fallback: boolean): boolean | string {
  const raw = env[name]?.trim().toLowerCase();
  if (raw === undefined || raw === '') return fallback;
  if (raw === 'on' || raw === 'off') return raw === 'on';
  return `${name} must be on or off (got "${env[name]}")`;
}

function whole(
  env: NodeJS.ProcessEnv,
  name: string,
  fallback: number,
  min: number,
  max: number,
): number | string {
  const raw = env[name]?.trim();
  if (raw === undefined || raw === '') return fallback;
  const n = Number(raw);
  if (!/^\d+$/.test(raw) || n < min || n > max)
    return `${name} must be a whole number from ${min} to ${max} (got "${env[name]}")`;
  return n;
}

/** The configuration, or the first message that says what is wrong with it. */
export function readConfig(
  env: NodeJS.ProcessEnv,
  options: { severalProcesses: boolean },
): { ok: true; config: Config } | { ok: false; error: string } {
  const port = whole(env, 'PORT', 3000, 0, 65535);
  const hsts = onOff(env, 'HSTS', false);
  const cspReports = onOff(env, 'CSP_REPORTS', false);
  const maxConnections = whole(env, 'MAX_CONNECTIONS', 2000, 10, 100_000);
  const overloadLagMs = whole(env, 'OVERLOAD_LAG_MS', 200, 20, 10_000);
  const maxInFlight = whole(env, 'MAX_IN_FLIGHT', 64, 1, 100_000);
  const shutdownSeconds = whole(env, 'SHUTDOWN_SECONDS', 10, 1, 10);
  for (const value of [
    port,
    hsts,
    cspReports,
    maxConnections,
    overloadLagMs,
    maxInFlight,
    shutdownSeconds,
  ])
    if (typeof value === 'string') return { ok: false, error: value };

  const settings = readSettings(env, options);
  if (!settings.ok) return { ok: false, error: settings.error };
  const publicUrl = env.PUBLIC_URL?.trim() ?? '';
  if (publicUrl && !URL.canParse(publicUrl))
    return { ok: false, error: `PUBLIC_URL is not a URL (got "${publicUrl}")` };
  const allowedOrigins = list(env.ALLOWED_ORIGINS);
  const notUrl = allowedOrigins.find((o) => !URL.canParse(o));
  if (notUrl)
    return {
      ok: false,
      error: `ALLOWED_ORIGINS entry "${notUrl}" is not an origin (https://host)`,
    };

  const units = parseUnits(env.UNITS ?? '');
  if (!units.ok) return { ok: false, error: units.error };

  const templateDir = env.NOTE_TEMPLATES?.trim() || null;
  let renderer: NoteRenderer;
  try {
    // a department's folder is checked here: every invented example must render with it
    renderer = createNoteRenderer({ templateDir });
  } catch (error) {
    return { ok: false, error: error instanceof Error ? error.message : String(error) };
  }

  const hostname = env.HOST?.trim() || '127.0.0.1';
  const allowedHosts = allowedHostNames(
    [...(publicUrl ? [publicUrl] : []), ...allowedOrigins],
    list(env.ALLOWED_HOSTS),
  );
  const messages = [...settings.messages];
  if (!LOOPBACK.has(hostname))
    messages.push(
      allowedHosts.length
        ? `Host names answered: ${allowedHosts.join(', ')}, localhost and IP addresses`
        : 'Host names answered: localhost and IP addresses only; set PUBLIC_URL or ALLOWED_HOSTS to answer a name',
    );
  return {
    ok: true,
    config: {
      port: port as number,
      hostname,
      renderer,
      launch: settings.launch,
      frameAncestors: settings.frameAncestors,
      allowedOrigins,
      allowedHosts,
      hsts: hsts as boolean,
      cspReports: cspReports as boolean,
      requestLog: env.REQUEST_LOG !== 'off',
      units: units.units,
      limits: {
        headersTimeoutMs: HEADERS_TIMEOUT_MS,
        requestTimeoutMs: REQUEST_TIMEOUT_MS,
        maxConnections: maxConnections as number,
        overloadLagMs: overloadLagMs as number,
        maxInFlight: maxInFlight as number,
        shutdownMs: (shutdownSeconds as number) * 1000,
      },
      messages,
    },
  };
}
