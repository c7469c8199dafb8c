// (e)-(g) The cluster under many connections (the review's figures): `npm run start:cluster`'s processes with two
// workers, and CONNECTIONS keep-alive connections each sending POST /api/interpret as soon as its last answer
// came (bench/load.ts counts what became of every request). (e) every request answered, a reading or a fast 503,
// none timed out (10 s); (f) SIGTERM to the primary under that load: nothing lost, exit 0; (g) SIGKILL to one
// worker under that load: what is lost is at most the requests in flight on the connections that worker held
// (one each), and nothing times out.
import { execFileSync, type ChildProcess } from 'node:child_process';
import { startLoad, type Tally } from './load.ts';
import { connectionsHeldBy, freePort, startServer, type StartCommand } from './server.ts';

type Record = (figure: string, value: string, target: string, pass: boolean | null) => void;

const WORKERS = 2;
const env = { GASLINE_ENTRY: 'cluster', WORKERS: String(WORKERS) };
const sleep = (ms: number) => new Promise((resolve) => setTimeout(resolve, ms));
const exited = (child: ChildProcess) =>
  new Promise<number | string>((resolve) => {
    if (child.exitCode !== null) resolve(child.exitCode);
    else child.once('exit', (code, signal) => resolve(code ?? signal ?? 'unknown'));
  });
const summary = (t: Tally) =>
  `${t.answered.toLocaleString('en')} answered (${(t.statuses[503] ?? 0).toLocaleString('en')} of them 503) of ${t.sent.toLocaleString('en')}`;
const failures = (t: Tally) => t.lost + t.unaccepted + t.timedOut;

async function cluster(command: StartCommand) {
  const port = await freePort();
  const child = await startServer(command, port, { env, listening: WORKERS });
  return { child, base: `http://127.0.0.1:${port}` };
}

const workersOf = (pid: number) =>
  execFileSync('ps', ['-o', 'pid=', '--ppid', String(pid)], { encoding: 'utf8' })
    .split('\n')
    .map((s) => Number(s.trim()))
    .filter((n) => n > 0);

export async function reportCluster(
  command: StartCommand,
  record: Record,
  connections: number,
  seconds: number,
) {
  const at = `${connections.toLocaleString('en')} connections, cluster of ${WORKERS}`;
  // (e) steady load
  {
    const { child, base } = await cluster(command);
    const load = startLoad(base, connections);
    await sleep(seconds * 1000);
    const t = await load.finish();
    child.kill('SIGTERM');
    await exited(child);
    record(`(e) ${at}, ${seconds} s`, summary(t), '(information)', null);
    record(
      '(e) unanswered: lost / reset / timed out',
      `${t.lost} / ${t.unaccepted + t.refused} / ${t.timedOut}`,
      '0 / 0 / 0',
      failures(t) + t.refused === 0,
    );
  }
  // (f) SIGTERM to the primary under load
  {
    const { child, base } = await cluster(command);
    const load = startLoad(base, connections);
    await sleep((seconds * 1000) / 2);
    const inFlight = load.inFlight();
    child.kill('SIGTERM');
    const code = await exited(child);
    const t = await load.finish();
    record(`(f) SIGTERM under load (${inFlight} in flight)`, summary(t), '(information)', null);
    record(
      '(f) SIGTERM: lost (taken, never answered), exit code',
      `${t.lost}, exit ${code}`,
      '0, exit 0',
      t.lost === 0 && code === 0,
    );
    record(
      '(f) SIGTERM: new connections reset / refused',
      `${t.unaccepted} / ${t.refused}`,
      '(information)',
      null,
    );
  }
  // (g) SIGKILL to one worker under load
  {
    const { child, base } = await cluster(command);
    const load = startLoad(base, connections);
    await sleep((seconds * 1000) / 2);
    const victim = workersOf(child.pid!)[0]!;
    // each connection has one request in flight at most: what the worker can lose is what it holds
    const held = connectionsHeldBy(victim);
    process.kill(victim, 'SIGKILL');
    await sleep((seconds * 1000) / 2);
    const t = await load.finish();
    child.kill('SIGTERM');
    await exited(child);
    record(`(g) SIGKILL of a worker under load`, summary(t), '(information)', null);
    record(
      '(g) SIGKILL: lost + reset, connections the worker held',
      `${t.lost + t.unaccepted}, ${held}`,
      '<= held',
      t.lost + t.unaccepted <= held,
    );
    record(
      '(g) SIGKILL: timed out / refused',
      `${t.timedOut} / ${t.refused}`,
      '0 / 0',
      t.timedOut === 0 && t.refused === 0,
    );
  }
}
