// A fresh clone as a hospital would deploy it: npm ci (which builds, through prepare), pruned to production
// dependencies, made read-only, then npm start as an unprivileged user: it must start without compiling, answer
// /healthz and interpret a case, and leave the tree as it found it. Slow (an install), so it runs in CI
// (CI=true) or when asked (GASLINE_DEPLOY_TEST=1), and says plainly when it is skipped.
import { execFileSync, spawn, type ChildProcess } from 'node:child_process';
import {
  chmodSync,
  existsSync,
  mkdirSync,
  mkdtempSync,
  readdirSync,
  rmSync,
  statSync,
} from 'node:fs';
import { createServer } from 'node:net';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';

const root = new URL('../..', import.meta.url).pathname;
const wanted = process.env.CI === 'true' || process.env.GASLINE_DEPLOY_TEST === '1';
if (!wanted)
  console.warn(
    '[deploy] SKIPPED test/deploy/freshClone.test.ts: set GASLINE_DEPLOY_TEST=1 to run it (CI always does).',
  );

/** As root, the server runs as nobody, so that the read-only bits bind it; otherwise as the current user. */
const NOBODY = process.getuid?.() === 0 ? { uid: 65534, gid: 65534 } : {};

function snapshot(dir: string, out = new Map<string, number>()): Map<string, number> {
  for (const name of readdirSync(dir)) {
    const path = join(dir, name);
    const st = statSync(path);
    if (st.isDirectory()) snapshot(path, out);
    else out.set(path, st.mtimeMs);
  }
  return out;
}

const freePort = () =>
  new Promise<number>((resolve) => {
    const s = createServer().listen(0, '127.0.0.1', () => {
      const port = (s.address() as { port: number }).port;
      s.close(() => resolve(port));
    });
  });

describe.skipIf(!wanted)('a fresh clone, built, pruned, read-only', { timeout: 600_000 }, () => {
  const work = mkdtempSync(join(tmpdir(), 'gasline-clone-'));
  const app = join(work, 'app');
  let server: ChildProcess | null = null;
  afterAll(() => {
    server?.kill('SIGTERM');
    execFileSync('chmod', ['-R', 'u+w', work]);
    rmSync(work, { recursive: true, force: true });
  });

  it('installs and builds, then keeps production dependencies only', () => {
    const run = (cmd: string, args: string[]) =>
      execFileSync(cmd, args, { cwd: app, stdio: 'pipe', env: { ...process.env, CI: 'true' } });
    execFileSync('git', ['clone', '--quiet', '--no-hardlinks', root, app]);
    run('npm', ['ci', '--no-audit', '--no-fund', '--prefer-offline']);
    expect(existsSync(join(app, 'dist', '.built'))).toBe(true);
    expect(existsSync(join(app, 'dist', 'server', 'main.js'))).toBe(true);
    run('npm', ['prune', '--omit=dev', '--no-audit', '--no-fund']);
    expect(existsSync(join(app, 'node_modules', 'typescript'))).toBe(false);
    expect(existsSync(join(app, 'node_modules', 'vitest'))).toBe(false);
    expect(existsSync(join(app, 'node_modules', 'hono'))).toBe(true);
  });

  it('starts from the read-only tree without compiling, answers /healthz and interprets a case', async () => {
    execFileSync('chmod', ['-R', 'a-w,a+rX', app]);
    chmodSync(work, 0o755);
    const before = snapshot(app);
    const home = join(work, 'home');
    mkdirSync(home);
    if (NOBODY.uid !== undefined) execFileSync('chown', [`${NOBODY.uid}:${NOBODY.gid}`, home]);
    const port = await freePort();
    let out = '';
    server = spawn('npm', ['start'], {
      cwd: app,
      ...NOBODY,
      env: {
        PATH: process.env.PATH,
        HOME: home,
        PORT: String(port),
        npm_config_update_notifier: 'false',
      },
      stdio: ['ignore', 'pipe', 'pipe'],
    });
    server.stdout!.on('data', (b: Buffer) => {
      out += b.toString();
    });
    server.stderr!.on('data', (b: Buffer) => {
      out += b.toString();
    });
    const started = Date.now();
    while (!out.includes('listening on') && Date.now() - started < 30_000) {
      if (server.exitCode !== null) throw new Error(`npm start exited: ${out}`);
      await new Promise((r) => setTimeout(r, 100));
    }
    expect(out).toContain('listening on');
    expect(out).not.toMatch(/compiled|built into/i);
    const base = `http://127.0.0.1:${port}`;
    expect(await (await fetch(`${base}/healthz`)).json()).toEqual({ ok: true });
    const res = await fetch(`${base}/api/interpret`, {
      method: 'POST',
      headers: { 'content-type': 'application/json' },
      body: JSON.stringify({
        gas: { ph: 7.24, pco2: 26, hco3: 11 },
        chemistry: { na: 138, cl: 102, albumin: 3.8 },
      }),
    });
    const body = (await res.json()) as {
      ok: boolean;
      disorders: { code: string }[];
      note: { line: string };
    };
    expect(res.status).toBe(200);
    expect(body.disorders[0]!.code).toBe('metabolic_acidosis');
    expect(body.note.line).toMatch(/metabolic acidosis/i);
    expect((await fetch(`${base}/`)).status).toBe(200);
    expect(snapshot(app)).toEqual(before);
  });
});
