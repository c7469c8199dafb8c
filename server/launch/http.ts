// Talking to the record's servers: a time limit on every request, a size limit on every answer, and every failure
// turned into a LaunchProblem whose words a clinician can act on. No message carries a token, a code or a value.
import { withoutInvisibleDeep } from '../intake/index.ts';

export type ProblemKind =
  | 'bad-request'
  | 'stray'
  | 'expired'
  | 'refused'
  | 'token'
  | 'forbidden'
  | 'bad-server'
  | 'unreachable';

/** The status each kind is answered with: the client's request (4xx) or the record's server (502, 504). */
export const PROBLEM_STATUS: Record<ProblemKind, 400 | 403 | 502 | 504> = {
  'bad-request': 400,
  stray: 400,
  expired: 400,
  refused: 403,
  token: 400,
  forbidden: 403,
  'bad-server': 502,
  unreachable: 504,
};

export class LaunchProblem extends Error {
  constructor(
    readonly kind: ProblemKind,
    message: string,
  ) {
    super(message);
    this.name = 'LaunchProblem';
  }
}

/** Each request to the record gives up after this long (our own limit: a clinician is waiting). */
export const REQUEST_TIMEOUT_MS = 10_000;
/** The largest answer read from the record (a page of a search is far smaller). */
export const MAX_RESPONSE_BYTES = 4 * 1024 * 1024;

const WHAT: Record<string, string> = {
  discovery: "the record's SMART configuration",
  token: "the record's sign-in (token) service",
  fhir: "the record's FHIR server",
};

/** The fetch failed before an answer came: down, refused, unknown host or too slow. */
export function unreachable(what: string, error: unknown): LaunchProblem {
  const slow = (error as { name?: string })?.name === 'TimeoutError';
  return new LaunchProblem(
    'unreachable',
    `${capital(WHAT[what] ?? what)} did not answer${slow ? ` within ${REQUEST_TIMEOUT_MS / 1000} seconds` : ''}: it may be down or out of reach.`,
  );
}

/** An answer's JSON body, within the size limit; anything else is the server's problem, said plainly. */
export async function readJson(response: Response, what: string): Promise<unknown> {
  const declared = Number(response.headers.get('content-length') ?? 0);
  if (declared > MAX_RESPONSE_BYTES)
    throw new LaunchProblem(
      'bad-server',
      `${capital(WHAT[what] ?? what)} sent too large an answer.`,
    );
  const text = await response.text();
  if (text.length > MAX_RESPONSE_BYTES)
    throw new LaunchProblem(
      'bad-server',
      `${capital(WHAT[what] ?? what)} sent too large an answer.`,
    );
  try {
    // the record's strings enter here: none keeps an invisible or bidirectional control character
    return withoutInvisibleDeep(JSON.parse(text));
  } catch {
    throw new LaunchProblem(
      'bad-server',
      `${capital(WHAT[what] ?? what)} did not answer with JSON (status ${response.status}).`,
    );
  }
}

/** GET a JSON document without credentials (the SMART configuration). */
export async function fetchJson(url: string, init: RequestInit, what: string): Promise<unknown> {
  let response: Response;
  try {
    response = await fetch(url, {
      ...init,
      redirect: 'error',
      signal: AbortSignal.timeout(REQUEST_TIMEOUT_MS),
    });
  } catch (error) {
    throw unreachable(what, error);
  }
  if (!response.ok) {
    await response.body?.cancel();
    throw new LaunchProblem(
      response.status >= 500 ? 'unreachable' : 'bad-server',
      `${capital(WHAT[what] ?? what)} answered with status ${response.status}${response.status === 404 ? ': is the launch pointing at the right FHIR server?' : '.'}`,
    );
  }
  return readJson(response, what);
}

const capital = (s: string) => s.charAt(0).toUpperCase() + s.slice(1);
