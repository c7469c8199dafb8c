// The requests the benchmark sends: the routes measured; a number of them, or a time's worth, as fast as the
// server answers (autocannon); and a fixed rate of them one by one, for their latency.
import { Agent, request } from 'node:http';
import autocannon from 'autocannon';
import { BENCH_CASE } from './case.ts';

export interface Route {
  name: string;
  path: string;
  method: 'GET' | 'POST';
  headers?: Record<string, string>;
  body?: string;
}

export const HEALTHZ: Route = { name: 'GET /healthz', path: '/healthz', method: 'GET' };

export const API_INTERPRET: Route = {
  name: 'POST /api/interpret',
  path: '/api/interpret',
  method: 'POST',
  headers: { 'content-type': 'application/json' },
  body: JSON.stringify(BENCH_CASE),
};

const unescapeHtml = (s: string) =>
  s
    .replace(/&quot;/g, '"')
    .replace(/&#39;/g, "'")
    .replace(/&lt;/g, '<')
    .replace(/&gt;/g, '>')
    .replace(/&amp;/g, '&');
const hidden = (html: string, name: string) =>
  unescapeHtml(
    html.match(new RegExp(`<input type="hidden" name="${name}" value="([^"]*)"`))?.[1] ?? '',
  );
const openStep = (html: string) =>
  html.match(/<li class="entry entry--open" id="step-([a-z]+)">/)?.[1] ?? null;

/** The benchmark case as the page's form fields: `gas.ph` = '7.24', yes/no for a boolean. */
function caseFields(): Record<string, string> {
  const fields: Record<string, string> = { ventilated: 'ventilator' in BENCH_CASE ? 'yes' : 'no' };
  const walk = (group: object, prefix: string) => {
    for (const [key, value] of Object.entries(group)) {
      const name = prefix ? `${prefix}.${key}` : key;
      if (typeof value === 'object') walk(value, name);
      else fields[name] = typeof value === 'boolean' ? (value ? 'yes' : 'no') : String(value);
    }
  };
  walk(BENCH_CASE, '');
  return fields;
}

/**
 * The page's draft step: the steps are walked as a browser would, each open step answered from the benchmark
 * case (the page takes each step's own fields from the form and leaves the rest), and the answer to the last
 * step, whose reply is the draft note as an htmx fragment, is the request measured.
 */
export async function draftStep(base: string): Promise<Route> {
  const headers = {
    'content-type': 'application/x-www-form-urlencoded',
    'hx-request': 'true',
    'sec-fetch-site': 'same-origin',
  };
  const fields = caseFields();
  let html = await (await fetch(`${base}/`)).text();
  for (let steps = 0; steps < 20; steps++) {
    const step = openStep(html);
    if (!step) break;
    const body = new URLSearchParams({
      case: hidden(html, 'case'),
      done: hidden(html, 'done'),
      format: hidden(html, 'format'),
      step,
      action: 'next',
      ...fields,
    }).toString();
    const res = await fetch(`${base}/step`, { method: 'POST', headers, body });
    html = await res.text();
    if (res.status !== 200)
      throw new Error(`the page refused the ${step} step (${res.status}): check bench/requests.ts`);
    if (html.includes('id="draft-title"'))
      return { name: 'POST /step (draft)', path: '/step', method: 'POST', headers, body };
  }
  throw new Error('walking the steps did not reach the draft note: check bench/requests.ts');
}

/**
 * Requests over keep-alive connections, each connection sending its next as soon as it has the answer:
 * `amount` of them, or for `duration` seconds. The failures are counted.
 */
export async function send(
  base: string,
  route: Route,
  connections: number,
  until: { amount: number } | { duration: number },
) {
  const result = await autocannon({
    url: base + route.path,
    method: route.method,
    headers: route.headers,
    body: route.body,
    connections,
    ...until,
  });
  return {
    requests: result.requests.total,
    errors: result.errors + result.timeouts + result.non2xx,
  };
}

/** One request; its time in ms from sending to the last byte of the answer. */
function timed(agent: Agent, base: string, route: Route): Promise<{ status: number; ms: number }> {
  return new Promise((resolve, reject) => {
    const start = performance.now();
    const req = request(
      base + route.path,
      { method: route.method, headers: route.headers, agent },
      (res) => {
        res.resume();
        res.on('end', () =>
          resolve({ status: res.statusCode ?? 0, ms: performance.now() - start }),
        );
        res.on('error', reject);
      },
    );
    req.on('error', reject);
    req.end(route.body);
  });
}

const percentile = (sorted: number[], p: number) =>
  sorted[Math.min(sorted.length - 1, Math.ceil((p / 100) * sorted.length) - 1)] ?? Number.NaN;

/**
 * Latency at a fixed rate: each request sent on its schedule whether or not the one before has been answered
 * (so a slow answer does not hide the ones queued behind it), timed from sending to the answer's last byte.
 * A server that falls a second's worth of requests behind has not held the rate: the sending stops there.
 */
export async function atRate(base: string, route: Route, perSecond: number, count: number) {
  const agent = new Agent({ keepAlive: true, maxSockets: 32 });
  const latencies: number[] = [];
  const errors: string[] = [];
  const pending: Promise<void>[] = [];
  const start = performance.now();
  while (pending.length < count) {
    if (pending.length - latencies.length - errors.length > perSecond) break;
    const wait = start + (pending.length * 1000) / perSecond - performance.now();
    if (wait > 0) await new Promise((resolve) => setTimeout(resolve, wait));
    pending.push(
      timed(agent, base, route).then(
        ({ status, ms }) => {
          if (status >= 200 && status < 300) latencies.push(ms);
          else errors.push(`status ${status}`);
        },
        (error: Error) => {
          errors.push(error.message);
        },
      ),
    );
  }
  await Promise.all(pending);
  const rate = (pending.length * 1000) / (performance.now() - start);
  agent.destroy();
  latencies.sort((a, b) => a - b);
  return {
    p50: percentile(latencies, 50),
    p99: percentile(latencies, 99),
    errors,
    rate,
    sent: pending.length,
  };
}
