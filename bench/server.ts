// The server under test: started as package.json's start script starts it, and read from outside through /proc
// (its CPU time and memory), so that the benchmark's own work is never counted.
import { execFileSync, execSync, spawn, type ChildProcess } from 'node:child_process';
import { readFileSync, readdirSync, readlinkSync } from 'node:fs';
import { createServer } from 'node:net';
import { fileURLToPath } from 'node:url';

const root = fileURLToPath(new URL('..', import.meta.url));

export interface StartCommand {
  /** shell commands run once before the server starts (a build), from the script's `a && b &&` part */
  before: string[];
  /** Node's flags, e.g. a heap size */
  flags: string[];
  /** the entry file and its arguments */
  entry: string[];
}

/**
 * How the server starts: package.json's start script, `[build && ...] node [--flags] entry`, run without npm so
 * that the process measured is the server itself. BENCH_NODE_FLAGS replaces the flags (an empty value: none), to
 * compare them. A start script of another shape is refused here; change this function to match it.
 */
export function startCommand(env: NodeJS.ProcessEnv = process.env): StartCommand {
  const pkg = JSON.parse(readFileSync(`${root}package.json`, 'utf8'));
  const script: string = pkg.scripts.start;
  const parts = script.split('&&').map((part) => part.trim());
  const [node, ...args] = parts.at(-1)!.split(/\s+/);
  const firstEntry = args.findIndex((arg) => !arg.startsWith('-'));
  if (node !== 'node' || firstEntry < 0)
    throw new Error(`bench/server.ts does not know how to run the start script "${script}"`);
  const flags =
    env.BENCH_NODE_FLAGS === undefined
      ? args.slice(0, firstEntry)
      : env.BENCH_NODE_FLAGS.split(/\s+/).filter(Boolean);
  return { before: parts.slice(0, -1), flags, entry: args.slice(firstEntry) };
}

/** Runs the start script's build part, if it has one. */
export function build(command: StartCommand) {
  for (const step of command.before) execSync(step, { cwd: root, stdio: 'inherit' });
}

export function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const probe = createServer();
    probe.listen(0, '127.0.0.1', () => {
      const address = probe.address();
      probe.close(() =>
        typeof address === 'object' && address
          ? resolve(address.port)
          : reject(new Error('no port')),
      );
    });
  });
}

/** The server on 127.0.0.1:port without its request log, once it prints "listening" (60 s at most: it may compile). */
export async function startServer(
  command: StartCommand,
  port: number,
  options: { env?: Record<string, string>; listening?: number } = {},
): Promise<ChildProcess> {
  const child = spawn(process.execPath, [...command.flags, ...command.entry], {
    cwd: root,
    env: {
      ...process.env,
      PORT: String(port),
      HOST: '127.0.0.1',
      REQUEST_LOG: 'off',
      ...options.env,
    },
    stdio: ['ignore', 'pipe', 'inherit'],
  });
  let heard = 0;
  try {
    await new Promise<void>((resolve, reject) => {
      const timer = setTimeout(() => reject(new Error('the server did not start in 60 s')), 60_000);
      child.stdout!.on('data', (chunk: Buffer) => {
        heard += chunk.toString().split('listening').length - 1;
        if (heard >= (options.listening ?? 1)) {
          clearTimeout(timer);
          resolve();
        }
      });
      child.on('exit', (code) => {
        clearTimeout(timer);
        reject(new Error(`the server exited with ${code}`));
      });
    });
  } catch (error) {
    child.kill('SIGTERM');
    throw error;
  }
  return child;
}

export async function stopServer(child: ChildProcess) {
  if (child.exitCode !== null) return;
  const exited = new Promise((resolve) => child.once('exit', resolve));
  child.kill('SIGTERM');
  await exited;
}

let ticksPerSecond: number | undefined;
function clockTicks(): number {
  ticksPerSecond ??= Number(execFileSync('getconf', ['CLK_TCK'], { encoding: 'utf8' }).trim());
  return ticksPerSecond;
}

/**
 * The process's CPU time so far in ms: user + system, all its threads (the garbage collector's helpers too),
 * from /proc/<pid>/stat in clock ticks (10 ms each where CLK_TCK is 100).
 */
export function cpuMs(pid: number): number {
  const stat = readFileSync(`/proc/${pid}/stat`, 'utf8');
  // the fields after the command name, which is in parentheses and may hold spaces: utime is field 14, stime 15
  const fields = stat.slice(stat.lastIndexOf(')') + 2).split(' ');
  return ((Number(fields[11]) + Number(fields[12])) / clockTicks()) * 1000;
}

/** Resident memory in MB, from /proc/<pid>/status. */
export function rssMb(pid: number): number {
  const status = readFileSync(`/proc/${pid}/status`, 'utf8');
  return Number(/VmRSS:\s+(\d+)/.exec(status)?.[1] ?? 0) / 1024;
}

/** Established TCP connections a process holds, from /proc (Linux): its socket descriptors' inodes matched with
 *  the kernel's table of TCP sockets (IPv4), state 01 being ESTABLISHED. */
export function connectionsHeldBy(pid: number): number {
  const inodes = new Set<string>();
  for (const fd of readdirSync(`/proc/${pid}/fd`)) {
    try {
      const inode = /^socket:\[(\d+)\]$/.exec(readlinkSync(`/proc/${pid}/fd/${fd}`))?.[1];
      if (inode) inodes.add(inode);
    } catch {
      // a descriptor closed between the listing and the read
    }
  }
  return readFileSync(`/proc/${pid}/net/tcp`, 'utf8')
    .split('\n')
    .slice(1)
    .map((row) => row.trim().split(/\s+/))
    .filter((f) => f[3] === '01' && inodes.has(f[9]!)).length;
}
