// Running the real server in a child process for the process tests: a free port, a start that waits for the
// "listening" lines (generously: the machine is shared and each process compiles its TypeScript), and a stop.
import { spawn, type ChildProcess } from 'node:child_process';
import { afterAll } from 'vitest';
import { freePort } from '../../bench/server.ts';

/** A port free on 127.0.0.1 now: the benchmark's own. */
export { freePort };

const root = new URL('../..', import.meta.url).pathname;
const children: ChildProcess[] = [];
afterAll(() => {
  for (const child of children) if (child.exitCode === null) child.kill('SIGKILL');
});

/** How long a start may take on a shared two-core machine (each process compiles with tsx). */
export const START_MS = 90_000;

export interface Running {
  child: ChildProcess;
  out: () => string;
  err: () => string;
  base: string;
  /** the exit code (or signal) once the process has ended */
  exited: Promise<number | string>;
}

/** Spawn a server script; with readyCount 0, do not wait for it to listen. */
export async function start(
  script: string,
  env: Record<string, string>,
  readyCount = 1,
): Promise<Running> {
  const port = env.PORT ?? String(await freePort());
  const child = spawn(process.execPath, ['--import', 'tsx', script], {
    cwd: root,
    env: { ...process.env, ...env, PORT: port },
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  children.push(child);
  let out = '';
  let err = '';
  child.stdout!.on('data', (b: Buffer) => {
    out += b.toString();
  });
  child.stderr!.on('data', (b: Buffer) => {
    err += b.toString();
  });
  const exited = new Promise<number | string>((resolve) =>
    child.once('exit', (code, signal) => resolve(code ?? signal ?? 'unknown')),
  );
  if (readyCount > 0)
    await listening(
      () => out,
      readyCount,
      exited,
      () => err,
    );
  const host = env.HOST ?? '127.0.0.1';
  return { child, out: () => out, err: () => err, base: `http://${host}:${port}`, exited };
}

/** Wait until the output holds `count` "listening" lines. */
export function listening(
  out: () => string,
  count: number,
  exited?: Promise<unknown>,
  err: () => string = () => '',
): Promise<void> {
  return new Promise<void>((resolve, reject) => {
    const started = Date.now();
    const poll = setInterval(() => {
      if ((out().match(/listening on/g) ?? []).length >= count) {
        clearInterval(poll);
        resolve();
      } else if (Date.now() - started > START_MS) {
        clearInterval(poll);
        reject(new Error(`not listening (${count}) in ${START_MS / 1000} s: ${out()} ${err()}`));
      }
    }, 50);
    exited?.then((code) => {
      clearInterval(poll);
      reject(new Error(`exited ${code}: ${err()}`));
    });
  });
}

export const stop = async (r: Running): Promise<number | string> => {
  r.child.kill('SIGTERM');
  return r.exited;
};
