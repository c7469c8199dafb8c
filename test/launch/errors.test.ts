// Launches that cannot go on, each a clear page with the status it deserves (never a 500) and the manual path
// (the first step and the paste box) still open: a bad or refused issuer, a server without PKCE S256, a stray,
// replayed, forged or expired callback, a refused consent, a record without a gas, a gas with one value, a server
// that is down.
import { EncryptJWT } from 'jose';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { Agent, TEST_KEY, formFields, startLaunch, type Running } from './harness.ts';

const MANUAL = 'Or paste the results';
const text = (html: string) =>
  html
    .replace(/<[^>]+>/g, ' ')
    .replace(/\s+/g, ' ')
    .replace(/&#39;/g, "'")
    .replace(/&quot;/g, '"')
    .replace(/&amp;/g, '&');

async function page(response: Response) {
  const html = await response.text();
  return { status: response.status, html, text: text(html) };
}

describe('the launch refuses what it must, clearly', () => {
  let run: Running;
  beforeAll(async () => {
    run = await startLaunch({ autoApprove: {} });
  });
  afterAll(() => run.close());
  const launchUrl = (iss: string) => `${run.origin}/launch?iss=${encodeURIComponent(iss)}`;

  it('a launch without iss, with http to a non-loopback host, or with a query in iss is a 400 page', async () => {
    for (const [url, words] of [
      [`${run.origin}/launch`, 'no iss'],
      [launchUrl('http://ehr.example.org/fhir'), 'must use https'],
      [launchUrl(`${run.record.fhirBase}?x=1`), 'must not carry'],
      [launchUrl('not a url'), 'not a URL'],
    ] as const) {
      const p = await page(await new Agent().get(url));
      expect(p.status, url).toBe(400);
      expect(p.text).toContain(words);
      expect(p.text).toContain('This launch could not start');
      expect(p.text).toContain(MANUAL);
    }
  });

  it('a server that is down is a 504 page naming it, with the manual path', async () => {
    const p = await page(await new Agent().get(launchUrl('http://127.0.0.1:9/fhir')));
    expect(p.status).toBe(504);
    expect(p.text).toContain("The record's SMART configuration did not answer");
    expect(p.text).toContain(MANUAL);
  });

  it('a stray callback (no launch under way in this browser) is a 400 page, not a 500', async () => {
    const p = await page(await new Agent().get(`${run.origin}/callback?code=abc&state=def`));
    expect(p.status).toBe(400);
    expect(p.text).toContain('No launch from this browser is waiting for it');
    expect(p.text).toContain(MANUAL);
  });

  it('a callback with another state is refused, and the transaction is used up', async () => {
    const agent = new Agent();
    const start = await agent.get(launchUrl(run.record.fhirBase), false);
    expect(start.status).toBe(302);
    const p = await page(await agent.get(`${run.origin}/callback?code=abc&state=not-the-one`));
    expect(p.status).toBe(400);
    expect(p.text).toContain('does not belong to the launch under way');
    // the cookie was cleared with that answer
    expect(agent.cookieHeader(new URL(run.origin))).toBe('');
  });

  it('a replayed callback is a 400: from the same browser (cookie gone) and with the old cookie sent again (code used)', async () => {
    const agent = new Agent();
    const start = await agent.get(launchUrl(run.record.fhirBase), false);
    const cookie = agent.cookieHeader(new URL(run.origin));
    // the record approves at once and sends the browser back with a code
    const approved = await fetch(start.headers.get('location')!, { redirect: 'manual' });
    const callback = approved.headers.get('location')!;
    expect((await page(await agent.get(callback))).status).toBe(200);
    const again = await page(await agent.get(callback));
    expect(again.status).toBe(400);
    expect(again.text).toContain('No launch from this browser is waiting for it');
    const withOldCookie = await page(await fetch(callback, { headers: { cookie } }));
    expect(withOldCookie.status).toBe(400);
    expect(withOldCookie.text).toContain('The record refused the sign-in code');
  });

  it('a refused consent is a 403 page that says so', async () => {
    const agent = new Agent();
    const start = await agent.get(launchUrl(run.record.fhirBase), false);
    const state = new URL(start.headers.get('location')!).searchParams.get('state')!;
    const p = await page(
      await agent.get(`${run.origin}/callback?error=access_denied&state=${state}`),
    );
    expect(p.status).toBe(403);
    expect(p.text).toContain('Access was not granted in the record');
    expect(p.text).toContain(MANUAL);
  });

  it('an expired or forged transaction cookie is a 400 page', async () => {
    const key = new Uint8Array(Buffer.from(TEST_KEY, 'base64url'));
    const expired = await new EncryptJWT({
      use: 'transaction',
      state: 's',
      verifier: 'v',
      iss: run.record.fhirBase,
    })
      .setProtectedHeader({ alg: 'dir', enc: 'A256GCM' })
      .setIssuedAt(Math.floor(Date.now() / 1000) - 1200)
      .setExpirationTime(Math.floor(Date.now() / 1000) - 600)
      .encrypt(key);
    const late = await page(
      await fetch(`${run.origin}/callback?code=c&state=s`, {
        headers: { cookie: `gasline_launch=${expired}` },
      }),
    );
    expect(late.status).toBe(400);
    expect(late.text).toContain('took longer than 10 minutes');
    const forged = await page(
      await fetch(`${run.origin}/callback?code=c&state=s`, {
        headers: { cookie: 'gasline_launch=eyJhbGciOiJkaXIifQ..x.y.z' },
      }),
    );
    expect(forged.status).toBe(400);
  });

  it('the redirect URI comes from PUBLIC_URL, whatever Host the request carries', async () => {
    const response = await fetch(launchUrl(run.record.fhirBase), {
      redirect: 'manual',
      headers: { host: 'attacker.example' },
    });
    const q = new URL(response.headers.get('location')!).searchParams;
    expect(q.get('redirect_uri')).toBe(`${run.origin}/callback`);
  });

  it('a record without a gas says so, and the manual path stays open', async () => {
    const p = await page(await new Agent().get(`${run.record.origin}/ehr/launch?patient=pt-3`));
    expect(p.status).toBe(200);
    expect(p.text).toContain('No blood gas for this patient in the record in the last 48 hours');
    expect(p.text).toContain(MANUAL);
  });

  it('a gas with pH alone is shown with what is missing, and confirming it says what is needed', async () => {
    const agent = new Agent();
    const shown = await page(await agent.get(`${run.record.origin}/ehr/launch?patient=pt-4`));
    expect(shown.status).toBe(200);
    expect(shown.text).toMatch(/Not in the payload: PaCO2, HCO3/);
    const form = formFields(shown.html, '/launch/confirm');
    const confirmed = await page(
      await agent.post(`${run.origin}/launch/confirm`, { ...form, action: 'confirm' }, true),
    );
    expect(confirmed.status).toBe(422);
    expect(confirmed.text).toMatch(/at least two of pH, PaCO2 and HCO3/);
    expect(confirmed.text).toContain('Enter by hand instead');
  });
});

describe('servers that do not follow the rules, or fail midway', () => {
  it('a server whose discovery offers no PKCE S256 is refused before any redirect (502)', async () => {
    const run = await startLaunch({ autoApprove: {}, pkceMethods: ['plain'] });
    try {
      const agent = new Agent();
      const p = await page(
        await agent.get(`${run.origin}/launch?iss=${encodeURIComponent(run.record.fhirBase)}`),
      );
      expect(p.status).toBe(502);
      expect(p.text).toContain('does not offer PKCE with S256');
      expect(agent.visited.some((u) => u.includes('/auth/'))).toBe(false);
    } finally {
      await run.close();
    }
  });

  it('a FHIR server that fails after sign-in is a 504 page naming the status', async () => {
    const run = await startLaunch({ autoApprove: {} });
    try {
      run.record.failWith = 503;
      const p = await page(await new Agent().get(`${run.record.origin}/ehr/launch?patient=pt-1`));
      expect(p.status).toBe(504);
      expect(p.text).toContain("The record's FHIR server answered a read with status 503");
      expect(p.text).toContain(MANUAL);
    } finally {
      await run.close();
    }
  });

  it('an issuer outside SMART_ISSUERS is refused; the one listed gets a start button on the first step', async () => {
    const run = await startLaunch({
      autoApprove: {},
      env: { SMART_ISSUERS: 'https://ehr.example.org/fhir' },
    });
    try {
      const refused = await page(
        await new Agent().get(`${run.record.origin}/ehr/launch?patient=pt-1`),
      );
      expect(refused.status).toBe(400);
      expect(refused.text).toContain('not one Gasline is set up to launch from');
      const home = await page(await fetch(`${run.origin}/`));
      expect(home.html).toContain(
        `href="/launch?iss=${encodeURIComponent('https://ehr.example.org/fhir')}"`,
      );
    } finally {
      await run.close();
    }
  });
});
