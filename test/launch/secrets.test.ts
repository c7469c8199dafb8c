// Where the launch's secrets go, and where they never go: the transaction and the filing grant only in encrypted,
// HttpOnly, SameSite=Lax cookies (Secure with the __Host- prefix over https), the grant no longer than the token;
// any process with the same key answers the callback; and no token, code or state in a log line, in the console or
// in any file written while a launch runs.
import { rmSync, writeFileSync } from 'node:fs';
import { homedir, tmpdir } from 'node:os';
import { join } from 'node:path';
import { Hono } from 'hono';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { MAX_COOKIE_VALUE, setRecord, setTransaction } from '../../server/launch/cookies.ts';
import { readSettings } from '../../server/launch/index.ts';
import {
  Agent,
  changedSince,
  filesHolding,
  CLIENT_ID,
  TEST_KEY,
  formFields,
  startApp,
  startLaunch,
  toDraft,
  type Running,
} from './harness.ts';

const root = new URL('../..', import.meta.url).pathname;

describe('secrets of a launch', () => {
  let run: Running;
  const consoleLines: string[] = [];
  const started = Date.now();
  const secrets: string[] = [];
  let agent: Agent;
  beforeAll(async () => {
    for (const method of ['log', 'info', 'warn', 'error', 'debug'] as const)
      vi.spyOn(console, method).mockImplementation((...args: unknown[]) => {
        consoleLines.push(args.map(String).join(' '));
      });
    run = await startLaunch({ autoApprove: {}, tokenSeconds: 120 });
    agent = new Agent();
    const shown = await agent.get(`${run.record.origin}/ehr/launch?patient=pt-1&encounter=enc-1`);
    const html = await shown.text();
    for (const url of agent.visited) {
      const q = new URL(url).searchParams;
      for (const key of ['code', 'state', 'launch', 'code_challenge'])
        if (q.get(key)) secrets.push(q.get(key)!);
    }
    const confirmed = await agent.post(
      `${run.origin}/launch/confirm`,
      { ...formFields(html, '/launch/confirm'), action: 'confirm' },
      true,
    );
    const draft = await toDraft(agent, run.origin, await confirmed.text());
    const filed = await agent.post(`${run.origin}/launch/file`, formFields(draft, '/preview'));
    expect(filed.status).toBe(200);
    secrets.push(...run.record.issued);
  });
  afterAll(async () => {
    vi.restoreAllMocks();
    await run.close();
  });

  it('sets the transaction cookie HttpOnly, SameSite=Lax, for ten minutes, and clears it at the callback', () => {
    const set = agent.setCookies.filter((c) => c.startsWith('gasline_launch='));
    expect(set[0]).toMatch(/HttpOnly/);
    expect(set[0]).toMatch(/SameSite=Lax/);
    expect(set[0]).toMatch(/Max-Age=600/);
    expect(set[0]).toMatch(/Path=\//);
    expect(set[0]).not.toMatch(/Secure/); // PUBLIC_URL is http on loopback here
    expect(set.at(-1)).toMatch(/Max-Age=0/);
  });

  it('keeps the filing grant no longer than the token (expires_in 120 s), encrypted: no token, state or code in it', () => {
    const record = agent.setCookies.find((c) => c.startsWith('gasline_record='))!;
    expect(record).toMatch(/HttpOnly/);
    expect(record).toMatch(/SameSite=Lax/);
    expect(record).toMatch(/Max-Age=120/);
    const value = record.split(';')[0]!.slice('gasline_record='.length);
    expect(value.split('.')).toHaveLength(5); // compact JWE
    expect(JSON.parse(Buffer.from(value.split('.')[0]!, 'base64url').toString())).toEqual({
      alg: 'dir',
      enc: 'A256GCM',
    });
    const decoded = value
      .split('.')
      .map((part) => Buffer.from(part, 'base64url').toString('latin1'))
      .join(' ');
    for (const secret of secrets) {
      expect(value).not.toContain(secret);
      expect(decoded).not.toContain(secret);
    }
  });

  it('logs request lines of method, path, status and time only: no token, code, state, query or value', () => {
    expect(run.logs.length).toBeGreaterThan(4);
    for (const line of run.logs) expect(line).toMatch(/^(GET|POST) \/[a-z/]* \d{3} \d+\.\dms$/);
    for (const line of [...run.logs, ...consoleLines])
      for (const secret of secrets) expect(line).not.toContain(secret);
  });

  it('writes no file holding a token, code or state (the project, the temporary folder, the home folder)', () => {
    // the scan must see a file written now: a decoy with a marker of its own
    const decoy = join(tmpdir(), `gasline-scan-check-${process.pid}`);
    const marker = `scan-marker-${Math.random()}`;
    writeFileSync(decoy, marker);
    const files = [root, tmpdir(), homedir()].flatMap((dir) => changedSince(dir, started - 1000));
    expect(files).toContain(decoy);
    expect(filesHolding(files, [marker])).toEqual([decoy]);
    expect(filesHolding(files, run.record.issued)).toEqual([]);
    rmSync(decoy);
  });
});

describe('cookies over https, several processes, a token that has expired', () => {
  it('over https the cookies carry Secure and the __Host- prefix', async () => {
    const settings = readSettings({
      SMART_CLIENT_ID: CLIENT_ID,
      PUBLIC_URL: 'https://gasline.hospital.example',
      SMART_COOKIE_KEY: TEST_KEY,
    });
    if (!settings.ok || !settings.launch) throw new Error('settings');
    const app = new Hono().get('/', async (c) => {
      await setTransaction(c, settings.launch!, {
        state: 's',
        verifier: 'v',
        iss: 'https://ehr.example.org/fhir',
      });
      return c.text('ok');
    });
    const cookie = (await app.request('/')).headers.get('set-cookie')!;
    expect(cookie).toMatch(/^__Host-gasline_launch=/);
    expect(cookie).toMatch(/; Secure/);
    expect(cookie).toMatch(/; HttpOnly/);
    expect(cookie).toMatch(/; SameSite=Lax/);
  });

  it('another process with the same SMART_COOKIE_KEY answers the callback; one with a key of its own cannot', async () => {
    const run = await startLaunch({ autoApprove: {} });
    const logs: string[] = [];
    const twin = await startApp(
      () => ({ SMART_CLIENT_ID: CLIENT_ID, PUBLIC_URL: run.origin, SMART_COOKIE_KEY: TEST_KEY }),
      logs,
    );
    const stranger = await startApp(
      () => ({ SMART_CLIENT_ID: CLIENT_ID, PUBLIC_URL: run.origin }),
      logs,
    );
    try {
      const callbackAt = async (origin: string) => {
        const agent = new Agent();
        const start = await agent.get(
          `${run.origin}/launch?iss=${encodeURIComponent(run.record.fhirBase)}`,
          false,
        );
        const approved = await fetch(start.headers.get('location')!, { redirect: 'manual' });
        const callback = new URL(approved.headers.get('location')!);
        return agent.get(`${origin}${callback.pathname}${callback.search}`);
      };
      expect((await callbackAt(twin.origin)).status).toBe(200);
      const refused = await callbackAt(stranger.origin);
      expect(refused.status).toBe(400);
    } finally {
      await twin.close();
      await stranger.close();
      await run.close();
    }
  });

  it('filing after the token has expired is refused with a clear message, even if the browser still sends the cookie', async () => {
    const run = await startLaunch({ autoApprove: {}, tokenSeconds: 1 });
    try {
      const agent = new Agent();
      const shown = await (await agent.get(`${run.record.origin}/ehr/launch?patient=pt-2`)).text();
      const confirmed = await agent.post(
        `${run.origin}/launch/confirm`,
        { ...formFields(shown, '/launch/confirm'), action: 'confirm' },
        true,
      );
      const draft = await toDraft(agent, run.origin, await confirmed.text());
      expect(agent.setCookies.find((c) => c.startsWith('gasline_record='))).toMatch(/Max-Age=1\b/);
      await new Promise((resolve) => setTimeout(resolve, 2100));
      const filed = await agent.post(`${run.origin}/launch/file`, formFields(draft, '/preview'));
      expect(filed.status).toBe(403);
      expect(await filed.text()).toContain('The launch from the record has ended');
      expect(run.record.documents).toHaveLength(0);
    } finally {
      await run.close();
    }
  });
});

describe('a filing grant too large for a cookie', () => {
  const settings = readSettings({
    SMART_CLIENT_ID: CLIENT_ID,
    PUBLIC_URL: 'http://127.0.0.1:3000',
    SMART_COOKIE_KEY: TEST_KEY,
  });
  const grantWith = (tokenLength: number, related: number) => ({
    iss: 'https://ehr.example.org/fhir',
    token: 'x'.repeat(tokenLength),
    patient: 'pt-1',
    related: Array.from({ length: related }, (_, i) => `Observation/lab-result-${1000 + i}`),
  });
  const kept = async (tokenLength: number, related: number) => {
    if (!settings.ok || !settings.launch) throw new Error('settings');
    let header = '';
    let outcome = '';
    const app = new Hono().get('/', async (c) => {
      outcome = await setRecord(c, settings.launch!, grantWith(tokenLength, related), 300);
      return c.text('ok');
    });
    header = (await app.request('/')).headers.get('set-cookie') ?? '';
    return { outcome, length: header.split(';')[0]!.length };
  };

  it('keeps everything when it fits, the first (newest) results when not, and nothing when the token alone is too large', async () => {
    expect(await kept(1200, 10)).toMatchObject({ outcome: 'all' });
    const some = await kept(1200, 120);
    expect(some.outcome).toBe('some');
    expect(some.length).toBeLessThanOrEqual(MAX_COOKIE_VALUE + 'gasline_record='.length);
    expect(await kept(4000, 0)).toEqual({ outcome: 'none', length: 0 });
  });
});
