// npm run bench: the server's CPU cost per request and the other figures of bench/README.md, against their
// targets. BENCH_SHORT=1 gives a smoke run (CI); BENCH_NODE_FLAGS replaces the start script's Node flags. Targets
// are printed with pass or fail, never asserted in unit tests.
import { execFileSync } from 'node:child_process';
import { loadavg } from 'node:os';
import { gzipSync } from 'node:zlib';
import { BENCH_CASE } from './case.ts';
import { reportCluster } from './cluster.ts';
import { API_INTERPRET, HEALTHZ, atRate, draftStep, send, type Route } from './requests.ts';
import {
  build,
  cpuMs,
  freePort,
  rssMb,
  startCommand,
  startServer,
  stopServer,
  type StartCommand,
} from './server.ts';

const SHORT = process.env.BENCH_SHORT === '1';
const pick = (full: number, short: number) => (SHORT ? short : full);

const ROUNDS = pick(7, 1);
/** connections for the cost figures: the server always has a request waiting, without a long queue */
const CONNECTIONS = 4;
interface Plan {
  route: Route;
  /** requests before the first round, for the JIT */
  firstWarm: number;
  /** each round: a few requests to leave the previous route behind, then the measured ones */
  warm: number;
  measured: number;
}
// each measured batch is 0.5 s or more of the server's CPU: 50 or more clock ticks
const plans = (draft: Route): Plan[] => [
  { route: HEALTHZ, firstWarm: pick(5000, 200), warm: pick(1000, 50), measured: pick(8000, 300) },
  {
    route: API_INTERPRET,
    firstWarm: pick(2000, 100),
    warm: pick(200, 20),
    measured: pick(1000, 100),
  },
  { route: draft, firstWarm: pick(500, 50), warm: pick(50, 10), measured: pick(250, 50) },
];
const RATE = 100; // requests per second for the latency figures: steady, not the most the server can take
const LATENCY_REQUESTS = pick(2000, 100);

const rows: { pass: boolean | null }[] = [];
function record(figure: string, value: string, target: string, pass: boolean | null) {
  rows.push({ pass });
  const verdict = pass === null ? '' : pass ? 'PASS' : 'FAIL';
  console.log(`${figure.padEnd(50)} ${value.padStart(22)}   ${target.padEnd(14)} ${verdict}`);
}

/** the machine's load average over 1, 5 and 15 minutes: other work there inflates every figure */
const load = () =>
  loadavg()
    .map((x) => x.toFixed(1))
    .join(', ');
const median = (xs: number[]) => xs.slice().sort((a, b) => a - b)[Math.floor(xs.length / 2)]!;
const spread = (xs: number[], digits: number) =>
  `${median(xs).toFixed(digits)}${xs.length > 1 ? ` (${Math.min(...xs).toFixed(digits)}-${Math.max(...xs).toFixed(digits)})` : ''}`;

/** The calculation core alone, in a process with the server's Node flags: CPU µs per interpret() call. */
function coreMicroseconds(command: StartCommand): number[] {
  return Array.from({ length: pick(3, 1) }, () =>
    Number(
      execFileSync(
        process.execPath,
        [
          ...command.flags,
          new URL('./core.mjs', import.meta.url).pathname,
          JSON.stringify(BENCH_CASE),
          String(pick(100_000, 5_000)),
        ],
        { encoding: 'utf8' },
      ),
    ),
  );
}

/** The server's CPU time over a fixed number of requests after a warm-up, in ms per request. */
async function cpuPerRequest(pid: number, base: string, plan: Plan) {
  await send(base, plan.route, CONNECTIONS, { amount: plan.warm });
  const before = cpuMs(pid);
  const { errors } = await send(base, plan.route, CONNECTIONS, { amount: plan.measured });
  const ms = (cpuMs(pid) - before) / plan.measured;
  if (errors) throw new Error(`${plan.route.name}: ${errors} of the measured requests failed`);
  return ms;
}

/** Each route's CPU ms per request, one figure a round; the rounds interleave the routes. */
async function costs(pid: number, base: string, plan: Plan[]) {
  for (const p of plan) await send(base, p.route, CONNECTIONS, { amount: p.firstWarm });
  const figures = new Map<Route, number[]>(plan.map((p) => [p.route, []]));
  for (let round = 0; round < ROUNDS; round++)
    for (const p of plan) figures.get(p.route)!.push(await cpuPerRequest(pid, base, p));
  return figures;
}

async function pageWeight(base: string): Promise<{ bytes: number; gzip: number } | null> {
  const res = await fetch(`${base}/`);
  if (!res.ok || !(res.headers.get('content-type') ?? '').includes('html')) return null;
  const html = await res.text();
  const assets = [...html.matchAll(/(?:src|href)="(\/[^"/][^"]*)"/g)].map((m) => m[1]!);
  let bytes = Buffer.byteLength(html);
  let gzip = gzipSync(html).length;
  for (const path of new Set(assets)) {
    const r = await fetch(base + path);
    if (!r.ok) continue;
    const body = Buffer.from(await r.arrayBuffer());
    bytes += body.length;
    gzip += gzipSync(body).length;
  }
  return { bytes, gzip };
}

/** (a) The server's CPU per request, and its ratio to /healthz's from the same run. */
async function reportCosts(pid: number, base: string, draft: Route) {
  const figures = await costs(pid, base, plans(draft));
  const bare = median(figures.get(HEALTHZ)!);
  const api = figures.get(API_INTERPRET)!;
  const step = figures.get(draft)!;
  const label = ROUNDS > 1 ? ` (median of ${ROUNDS}; range)` : '';
  record(`(a) CPU ms/request${label}: ${HEALTHZ.name}`, spread(figures.get(HEALTHZ)!, 3), '', null);
  record(`(a) ${API_INTERPRET.name}`, spread(api, 3), '<= 1.0 ms', median(api) <= 1);
  const ratio = median(api) / bare;
  record(`(a) ${API_INTERPRET.name} / healthz`, ratio.toFixed(1), '<= 6', ratio <= 6);
  record(`(a) ${draft.name}`, spread(step, 3), '<= 3 ms', median(step) <= 3);
  record(`(a) ${draft.name} / healthz`, (median(step) / bare).toFixed(1), '(information)', null);
}

/**
 * (b) Latency at a fixed rate, after a second of the same; and the server's CPU per request at that rate, which
 * includes waking up for each request alone, for information.
 */
async function reportLatency(pid: number, base: string, route: Route) {
  await atRate(base, route, RATE, RATE);
  const before = cpuMs(pid);
  const f = await atRate(base, route, RATE, LATENCY_REQUESTS);
  const ms = (cpuMs(pid) - before) / f.sent;
  const at = `(b) ${route.name} at ${f.rate.toFixed(0)}/s`;
  record(`${at}: p50 / p99 ms`, `${f.p50.toFixed(2)} / ${f.p99.toFixed(2)}`, '(information)', null);
  record(`${at}: CPU ms/request`, ms.toFixed(3), '(information)', null);
  if (f.sent < LATENCY_REQUESTS)
    console.log(`    ${RATE}/s not held: a second behind after ${f.sent} requests, stopped there`);
  if (f.errors.length)
    record(`(b) ${route.name} errors`, `${f.errors.length} (${f.errors[0]})`, '0', false);
}

/**
 * (c) Soak: the interpret route under steady load at 32 connections, after a warm-up at the same load (so that
 * the heap's growth to its working size is not counted as a leak). The resident memory is read every second;
 * growth is the highest reading of the last quarter less the highest of the first, since one reading may fall
 * anywhere in the young generation's cycle of filling and emptying (up to its size: 64 MB a semi-space with
 * --max-semi-space-size=64).
 */
async function reportSoak(pid: number, base: string) {
  const seconds = pick(60, 3);
  await send(base, API_INTERPRET, 32, { duration: pick(10, 1) });
  const rss = [rssMb(pid)];
  const sampler = setInterval(() => rss.push(rssMb(pid)), 1000);
  const soak = await send(base, API_INTERPRET, 32, { duration: seconds });
  clearInterval(sampler);
  rss.push(rssMb(pid));
  const quarter = Math.max(1, Math.floor(rss.length / 4));
  const first = Math.max(...rss.slice(0, quarter));
  const last = Math.max(...rss.slice(-quarter));
  record(
    `(c) soak ${seconds} s, errors`,
    `${soak.errors} of ${soak.requests.toLocaleString('en')}`,
    '0',
    soak.errors === 0,
  );
  record(
    '(c) soak RSS growth MB',
    `${(last - first).toFixed(1)} (${first.toFixed(0)} -> ${last.toFixed(0)})`,
    '< 30 MB',
    last - first < 30,
  );
}

/** (d) The first screen: the page and everything it loads. */
async function reportPageWeight(base: string) {
  const weight = await pageWeight(base);
  if (!weight) throw new Error('GET / did not answer a page');
  record('(d) first screen bytes', weight.bytes.toLocaleString('en'), '', null);
  const kb = 60 * 1024;
  record(
    '(d) first screen gzip bytes',
    weight.gzip.toLocaleString('en'),
    '<= 60 KB gzip',
    weight.gzip <= kb,
  );
}

async function main() {
  const command = startCommand();
  console.log(
    `Gasline benchmark${SHORT ? ' (short smoke run: figures are not meaningful)' : ''}, node ${process.version}, ` +
      `server: node ${[...command.flags, ...command.entry].join(' ')}, ` +
      `load average ${load()}\n`,
  );
  build(command);
  const port = await freePort();
  // a start script that compiles when the sources are newer does so now, before a start is timed
  await stopServer(await startServer(command, port));

  const core = coreMicroseconds(command);
  record('core: interpret() CPU µs per call', spread(core, 1), '(information)', null);

  const started = performance.now();
  const server = await startServer(command, port);
  const startMs = performance.now() - started;
  record('start to listening, ms', startMs.toFixed(0), '< 1000 ms', startMs < 1000);
  const base = `http://127.0.0.1:${port}`;
  try {
    const draft = await draftStep(base);
    await reportCosts(server.pid!, base, draft);
    for (const route of [API_INTERPRET, draft]) await reportLatency(server.pid!, base, route);
    await reportSoak(server.pid!, base);
    await reportPageWeight(base);
  } finally {
    await stopServer(server);
  }
  await reportCluster(command, record, pick(1000, 200), pick(10, 2));
  console.log(`\nload average at the end: ${load()}`);
  const judged = rows.filter((r) => r.pass !== null).length;
  const missed = rows.filter((r) => r.pass === false).length;
  console.log(
    `\n${judged - missed} targets met, ${missed} missed${SHORT ? ' (short run: not judged)' : ''}`,
  );
}

main().catch((err) => {
  console.error(err);
  process.exit(1);
});
