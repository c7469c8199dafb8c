// The real server process: default bind, the warning for a wider bind, the cluster start command, and
// that no value from a case reaches stdout, stderr or disk.
import { describe, expect, it, vi } from 'vitest';
import { readdirSync, readFileSync, statSync } from 'node:fs';
import { join } from 'node:path';
import { tmpdir } from 'node:os';
import { START_MS, start, stop } from './processHarness.ts';

const root = new URL('../..', import.meta.url).pathname;
// a start may be slow on a shared machine; nothing here measures a speed
vi.setConfig({ testTimeout: 3 * START_MS });

describe('binding', () => {
  it('binds 127.0.0.1 by default, without a warning', async () => {
    const r = await start('server/main.ts', {});
    expect(r.out()).toMatch(/listening on http:\/\/127\.0\.0\.1:\d+/);
    expect(r.err()).not.toMatch(/WARNING/);
    expect((await fetch(`${r.base}/healthz`)).status).toBe(200);
    await stop(r);
  });

  it('a HOST other than loopback-by-default prints the no-login warning', async () => {
    // 127.0.0.2 is still loopback, so nothing leaves the machine, but it is not the default bind
    const r = await start('server/main.ts', { HOST: '127.0.0.2' });
    expect(r.err()).toMatch(
      /WARNING: listening on 127\.0\.0\.2.*no login of its own.*hospital's authentication/,
    );
    await stop(r);
  });
});

describe('several processes (npm run start:cluster)', () => {
  it('starts the requested number of workers on one port and answers', async () => {
    const r = await start('server/cluster.ts', { WORKERS: '2' }, 2);
    expect(r.out()).toMatch(/starting 2 worker processes/);
    const answers = await Promise.all(
      Array.from({ length: 8 }, () => fetch(`${r.base}/healthz`).then((res) => res.status)),
    );
    expect(answers.every((s) => s === 200)).toBe(true);
    await stop(r);
  });
});

describe('no patient data at rest or in logs', () => {
  it('request logs hold method, path, status and time only', async () => {
    const started = Date.now();
    const r = await start('server/main.ts', {});
    // invented values chosen to be unmistakable in any output
    const marker = {
      ph: 7.137,
      pco2: 51.37,
      hco3: 16.913,
      na: 137.77,
      label: 'ZQX-previous-label',
    };
    const body = {
      gas: { ph: marker.ph, pco2: marker.pco2, hco3: marker.hco3 },
      chemistry: { na: marker.na, cl: 101 },
      previous: [{ label: marker.label, gas: { ph: 7.2, pco2: 45, hco3: 17 } }],
    };
    const ok = await fetch(`${r.base}/api/interpret`, {
      method: 'POST',
      headers: { 'content-type': 'application/json' },
      body: JSON.stringify(body),
    });
    expect(ok.status).toBe(200);
    const bad = await fetch(`${r.base}/api/interpret`, {
      method: 'POST',
      headers: { 'content-type': 'application/json' },
      body: JSON.stringify({ gas: { ph: 9.137, pco2: marker.pco2 } }),
    });
    expect(bad.status).toBe(422);
    const broken = await fetch(`${r.base}/api/interpret`, {
      method: 'POST',
      headers: { 'content-type': 'application/json' },
      body: `{"gas":{"ph":${marker.ph},`,
    });
    expect(broken.status).toBe(400);
    // the page: a step answered with the same values, and a pasted printout
    const step = await fetch(`${r.base}/step`, {
      method: 'POST',
      headers: { 'content-type': 'application/x-www-form-urlencoded', 'hx-request': 'true' },
      body: new URLSearchParams({
        case: JSON.stringify({ sample: 'arterial' }),
        done: 'sample',
        format: 'text',
        step: 'gas',
        action: 'next',
        'units.pressure': 'mmHg',
        'gas.ph': String(marker.ph),
        'gas.pco2': String(marker.pco2),
        'gas.hco3': String(marker.hco3),
      }).toString(),
    });
    expect(step.status).toBeLessThan(500);
    const paste = await fetch(`${r.base}/paste`, {
      method: 'POST',
      headers: { 'content-type': 'application/x-www-form-urlencoded' },
      body: new URLSearchParams({
        paste: `pH ${marker.ph}\npCO2 ${marker.pco2} mmHg\nHCO3 ${marker.hco3} mmol/L\nNa ${marker.na} mmol/L\n${marker.label}`,
      }).toString(),
    });
    expect(paste.status).toBeLessThan(500);
    await stop(r);

    const output = r.out() + r.err();
    for (const value of ['7.137', '51.37', '16.913', '137.77', '9.137', marker.label])
      expect(output).not.toContain(value);
    // each request line is method, path, status, time
    const lines = output.split('\n').filter((l) => l.startsWith('POST'));
    expect(lines).toHaveLength(5);
    for (const line of lines)
      expect(line).toMatch(/^POST \/(api\/interpret|step|paste) \d{3} \d+\.\dms$/);

    // nothing written to disk: no file in the project (outside node_modules) or the temp folder changed since
    // the server started holds any of the values
    const changed = (dir: string, depth: number): string[] => {
      const found: string[] = [];
      let entries: string[] = [];
      try {
        entries = readdirSync(dir);
      } catch {
        return found;
      }
      for (const name of entries) {
        if (name === 'node_modules' || name === '.git') continue;
        const path = join(dir, name);
        let st: ReturnType<typeof statSync>;
        try {
          st = statSync(path);
        } catch {
          continue;
        }
        if (st.isDirectory() && depth > 0) found.push(...changed(path, depth - 1));
        else if (st.isFile() && st.mtimeMs >= started && st.size < 5_000_000) found.push(path);
      }
      return found;
    };
    for (const file of [...changed(root, 4), ...changed(tmpdir(), 1)]) {
      let text = '';
      try {
        text = readFileSync(file, 'utf8');
      } catch {
        continue;
      }
      for (const value of ['51.37', '16.913', '137.77', marker.label])
        expect(text, file).not.toContain(value);
    }
  });
});
