// Several processes on one port (Node's cluster): the server keeps no state, so any worker answers any request.
// WORKERS sets the count (default: the number of CPU cores). The primary checks the settings before it forks;
// a worker that dies is replaced after a back-off that doubles with each quick failure, and after
// RESTART_LIMIT quick failures in a row the primary stops everything and exits 1, so that a supervisor sees it.
// SIGTERM or SIGINT stops every worker gracefully (each finishes its requests) and the primary exits 0.
//
// Each worker accepts its own connections from the one listening socket (cluster.SCHED_NONE). Node's default on
// Linux is round-robin: the primary accepts every connection and hands it to a worker over IPC, one at a time per
// worker, each handed connection waiting for the worker's next turn of its event loop. Under load a worker's turns
// are long, so connections queue in the primary: with 1,000 connections, hundreds waited there more than 10 s
// after a worker was killed (their clients reconnect at once), and some at a cold start (bench/README.md).
// NODE_CLUSTER_SCHED_POLICY=rr brings round-robin back.
import cluster, { type Worker } from 'node:cluster';
import { availableParallelism } from 'node:os';
import { readConfig } from './config.ts';

/** quick failures in a row after which the primary gives up */
export const RESTART_LIMIT = 5;
/** a worker that ran this long was not a quick failure: the count starts again */
const STABLE_MS = 30_000;
/** the first restart's delay, doubled for each quick failure in a row, up to BACKOFF_MAX_MS */
const BACKOFF_FIRST_MS = 250;
const BACKOFF_MAX_MS = 8_000;

const requested =
  process.env.WORKERS === undefined ? availableParallelism() : Number(process.env.WORKERS);
if (!Number.isInteger(requested) || requested < 1 || requested > 64) {
  console.error(`WORKERS must be a whole number from 1 to 64 (got "${process.env.WORKERS}")`);
  process.exit(2);
}

if (cluster.isPrimary) {
  if (process.env.NODE_CLUSTER_SCHED_POLICY === undefined)
    cluster.schedulingPolicy = cluster.SCHED_NONE;
  const checked = readConfig(process.env, { severalProcesses: true });
  if (!checked.ok) {
    console.error(checked.error);
    process.exit(2);
  }
  const shutdownMs = checked.config.limits.shutdownMs;
  let stopping = false;
  /** 0 for a stop asked for, 1 when the workers kept failing */
  let exitCode = 0;
  let quickFailures = 0;
  const startedAt = new Map<Worker, number>();
  const fork = () => startedAt.set(cluster.fork(), Date.now());

  console.log(`Gasline: starting ${requested} worker processes`);
  for (let i = 0; i < requested; i++) fork();

  const workers = () => Object.values(cluster.workers ?? {}).filter((w) => w !== undefined);
  cluster.on('exit', (worker, code, signal) => {
    const lived = Date.now() - (startedAt.get(worker) ?? 0);
    startedAt.delete(worker);
    if (stopping) {
      if (workers().length === 0) process.exit(exitCode);
      return;
    }
    quickFailures = lived >= STABLE_MS ? 1 : quickFailures + 1;
    if (quickFailures >= RESTART_LIMIT) {
      console.error(
        `Gasline: workers failed ${quickFailures} times in a row, each within ${STABLE_MS / 1000} s of starting: stopping (exit 1)`,
      );
      stopping = true;
      exitCode = 1;
      for (const w of workers()) w.process.kill('SIGTERM');
      setTimeout(() => process.exit(1), shutdownMs + 2000).unref();
      if (workers().length === 0) process.exit(1);
      return;
    }
    const delay = Math.min(BACKOFF_FIRST_MS * 2 ** (quickFailures - 1), BACKOFF_MAX_MS);
    console.error(
      `worker ${worker.process.pid} exited (${signal ?? code}); starting another in ${delay} ms`,
    );
    setTimeout(() => {
      if (!stopping) fork();
    }, delay);
  });

  const stop = (signal: string) => {
    if (stopping) return;
    stopping = true;
    console.log(`Gasline: ${signal}, stopping the workers gracefully`);
    for (const worker of workers()) worker.process.kill('SIGTERM');
    if (workers().length === 0) process.exit(0);
    // each worker keeps its own deadline; this one is only a backstop for a worker that does not end
    setTimeout(() => {
      for (const worker of workers()) worker.process.kill('SIGKILL');
      process.exit(0);
    }, shutdownMs + 2000).unref();
  };
  process.on('SIGINT', () => stop('SIGINT'));
  process.on('SIGTERM', () => stop('SIGTERM'));
} else {
  await import('./main.ts');
}
