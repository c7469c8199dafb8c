// The process under load (the review's items 7 and 8): SIGTERM stops accepting, finishes what is in progress and
// exits 0, in one process and in a cluster, losing no request; a worker killed with SIGKILL loses only the
// requests it held, and the primary starts another; a worker that keeps failing makes the primary exit 1 after
// backing off; settings that cannot work stop the primary before it forks. Every check here is a count of
// answers or an exit code, never a time. (1,000 connections are in the benchmark: npm run bench.)
import { createServer, Socket } from 'node:net';
import { execFileSync } from 'node:child_process';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { request } from 'node:http';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it, vi } from 'vitest';
import { START_MS, freePort, listening, start } from './processHarness.ts';
import { startLoad } from '../../bench/load.ts';
import { connectionsHeldBy } from '../../bench/server.ts';

vi.setConfig({ testTimeout: 4 * START_MS });
const CONNECTIONS = 20;

describe('SIGTERM under load', () => {
  it.each([
    ['one process', 'server/main.ts', 1],
    ['a cluster of 2', 'server/cluster.ts', 2],
  ])(
    '%s: every request sent is answered, and the process exits 0',
    async (_name, script, ready) => {
      const r = await start(
        script,
        { WORKERS: '2', REQUEST_LOG: 'off', SHUTDOWN_SECONDS: '5' },
        ready,
      );
      const load = startLoad(r.base, CONNECTIONS);
      await load.answered(200);
      r.child.kill('SIGTERM');
      const code = await r.exited;
      const tally = await load.finish();
      expect(code).toBe(0);
      expect(tally.lost, JSON.stringify(tally)).toBe(0);
      // every request sent was answered, refused (a new connection after the stop), or reset as the listening
      // socket closed before any server code read it (unaccepted); one unanswered for 10 s is counted, not excused
      expect(tally.answered + tally.refused + tally.unaccepted + tally.timedOut).toBe(tally.sent);
      expect(tally.answered).toBeGreaterThanOrEqual(200);
      console.log(`SIGTERM under load (${_name}): ${JSON.stringify(tally)}`);
    },
  );

  it('a slow client (headers never finished) does not keep the process past its deadline', async () => {
    const r = await start('server/main.ts', { REQUEST_LOG: 'off', SHUTDOWN_SECONDS: '1' });
    const port = Number(new URL(r.base).port);
    const slow = new Socket();
    await new Promise<void>((resolve) => slow.connect(port, '127.0.0.1', resolve));
    slow.write('POST /api/interpret HTTP/1.1\r\nHost: 127.0.0.1\r\n');
    slow.on('error', () => {});
    const idle = new Socket();
    await new Promise<void>((resolve) => idle.connect(port, '127.0.0.1', resolve));
    idle.on('error', () => {});
    r.child.kill('SIGTERM');
    expect(await r.exited).toBe(0);
    slow.destroy();
    idle.destroy();
  });
});

describe('a cluster whose worker dies', () => {
  it('SIGKILL under load loses only the requests in flight, and another worker starts', async () => {
    const r = await start('server/cluster.ts', { WORKERS: '2', REQUEST_LOG: 'off' }, 2);
    const workers = execFileSync('ps', ['-o', 'pid=', '--ppid', String(r.child.pid)], {
      encoding: 'utf8',
    })
      .split('\n')
      .map((s) => Number(s.trim()))
      .filter((n) => n > 0);
    expect(workers).toHaveLength(2);
    const load = startLoad(r.base, CONNECTIONS);
    await load.answered(200);
    process.kill(workers[0]!, 'SIGKILL');
    // the primary replaces it: a third "listening" line
    await listening(r.out, 3);
    const before = load.tally.answered;
    await load.answered(before + 200);
    const tally = await load.finish();
    // each connection has one request in flight at most: the killed worker held at most that many
    // (a request that timed out on a machine busy with other work counts against the same bound)
    expect(
      tally.lost + tally.unaccepted + tally.timedOut,
      JSON.stringify(tally),
    ).toBeLessThanOrEqual(CONNECTIONS);
    expect(tally.refused).toBe(0);
    expect(tally.answered + tally.lost + tally.unaccepted + tally.timedOut).toBe(tally.sent);
    expect(r.err()).toMatch(/worker \d+ exited \(SIGKILL\); starting another in \d+ ms/);
    console.log(`SIGKILL of a worker under load: ${JSON.stringify(tally)}`);
    r.child.kill('SIGTERM');
    expect(await r.exited).toBe(0);
  });

  it('a worker that keeps failing: restarts with a growing back-off, then the primary exits 1', async () => {
    // the port is held by another program, so every worker fails as it starts listening
    const port = await freePort();
    const holder = createServer().listen(port, '127.0.0.1');
    try {
      const r = await start(
        'server/cluster.ts',
        { WORKERS: '2', PORT: String(port), REQUEST_LOG: 'off' },
        0,
      );
      expect(await r.exited).toBe(1);
      const delays = [...r.err().matchAll(/starting another in (\d+) ms/g)].map((m) =>
        Number(m[1]),
      );
      // two workers fail side by side: the quick failures in a row are counted across them
      expect(delays.sort((a, b) => a - b)).toEqual([250, 500, 1000, 2000]);
      expect(r.err()).toMatch(/workers failed 5 times in a row.*exit 1/);
    } finally {
      holder.close();
    }
  });
});

describe('a cluster: connections go straight to the workers', () => {
  it('under a burst of new connections the primary holds none of them', async () => {
    const r = await start('server/cluster.ts', { WORKERS: '2', REQUEST_LOG: 'off' }, 2);
    const primary = r.child.pid!;
    let most = 0;
    let samples = 0;
    const sampler = setInterval(() => {
      most = Math.max(most, connectionsHeldBy(primary));
      samples++;
    }, 2);
    const body = JSON.stringify({ gas: { ph: 7.31, pco2: 48, po2: 80, hco3: 23.5 } });
    // three bursts of 300 new connections at once, one request each (no keep-alive agent): every one passes the
    // listening socket
    const burst = () =>
      Promise.all(
        Array.from(
          { length: 300 },
          () =>
            new Promise<number>((resolve) => {
              const req = request(
                `${r.base}/api/interpret`,
                { method: 'POST', agent: false, headers: { 'content-type': 'application/json' } },
                (res) => {
                  res.resume();
                  res.on('end', () => resolve(res.statusCode ?? 0));
                },
              );
              req.on('error', () => resolve(0));
              req.end(body);
            }),
        ),
      );
    const statuses = [...(await burst()), ...(await burst()), ...(await burst())];
    clearInterval(sampler);
    expect(statuses.filter((s) => s === 200 || s === 503)).toHaveLength(900);
    expect(samples).toBeGreaterThan(0);
    // with round-robin (NODE_CLUSTER_SCHED_POLICY=rr) the primary accepts each one and queues it for a worker
    expect(most).toBe(0);
    r.child.kill('SIGTERM');
    expect(await r.exited).toBe(0);
  });
});

describe('the primary checks the settings before it forks', () => {
  const folders: string[] = [];
  afterAll(() => {
    for (const dir of folders) rmSync(dir, { recursive: true, force: true });
  });

  it.each([
    [
      'a department template that fails',
      () => {
        const dir = mkdtempSync(join(tmpdir(), 'gasline-bad-'));
        folders.push(dir);
        // an invented broken template: it calls something that is not there
        writeFileSync(join(dir, 'line.njk'), '{{ nothing.here() }}');
        return { NOTE_TEMPLATES: dir };
      },
      /cannot render the invented example/,
    ],
    ['a setting out of range', () => ({ SHUTDOWN_SECONDS: '60' }), /SHUTDOWN_SECONDS must be/],
  ])('%s: exit 2, no worker started', async (_name, env, message) => {
    const r = await start('server/cluster.ts', { WORKERS: '2', ...env() }, 0);
    expect(await r.exited).toBe(2);
    expect(r.err()).toMatch(message);
    expect(r.out()).not.toMatch(/starting \d+ worker/);
  });
});
