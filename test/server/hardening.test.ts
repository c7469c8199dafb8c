// The outside review's items 4, 5, 6 and 10 through app.request: the request log cannot be forged, every API
// and error answer says Cache-Control: no-store, errors are bounded, HSTS is off unless turned on, only the
// allowed host names are answered (DNS rebinding), and the optional CSP report endpoint logs the directive only.
// (OWASP Logging, HTTP Headers and Host header cheat sheets; RFC 9111 for no-store; RFC 9110 15.5.20 for 421.)
import { describe, expect, it } from 'vitest';
import { createApp } from '../../server/app.ts';
import { LOGGED_PATH_CHARS, loggedPath } from '../../server/log.ts';
import { MAX_LISTED_ERRORS, boundedErrors } from '../../server/errors.ts';
import { allowedHostNames, HSTS_VALUE } from '../../server/security.ts';
import { reportedDirectives } from '../../server/cspReport.ts';
import { TemplateError } from '../../templates/index.ts';

const GAS = { gas: { ph: 7.31, pco2: 48, hco3: 23.5 } };
const json = (body: unknown, type = 'application/json') => ({
  method: 'POST',
  headers: { 'content-type': type },
  body: typeof body === 'string' ? body : JSON.stringify(body),
});

describe('4. log forging', () => {
  it('a path with encoded line breaks and escapes stays on one line, encoded', async () => {
    const lines: string[] = [];
    const app = createApp({ log: (line) => lines.push(line) });
    // hono decodes %0A in c.req.path: a log of c.req.path would write a line of the client's own
    await app.request('/x%0AGET%20/healthz%20200%200.1ms%0D%1B[31m%E2%80%AE');
    expect(lines).toHaveLength(1);
    expect(lines[0]).not.toMatch(/[\r\n\u001b\u202e]/);
    expect(lines[0]).toMatch(
      /^GET \/x%0AGET%20\/healthz%20200%200\.1ms%0D%1B\[31m%E2%80%AE 404 \d+\.\dms$/,
    );
  });

  it('a long path is cut', async () => {
    const lines: string[] = [];
    const app = createApp({ log: (line) => lines.push(line) });
    await app.request(`/${'a'.repeat(5000)}`);
    const path = lines[0]!.split(' ')[1]!;
    expect(path).toHaveLength(LOGGED_PATH_CHARS + 3);
    expect(path.endsWith('...')).toBe(true);
  });

  it('the query (where a case value could travel) is never logged', () => {
    expect(loggedPath('http://localhost/api/interpret?ph=7.137')).toBe('/api/interpret');
  });
});

describe('5. Cache-Control: no-store on every API and error answer', () => {
  const app = createApp();
  const throwing = createApp({
    renderer: {
      render: () => {
        throw new TemplateError('plan.njk', 'Template render error');
      },
      flagMessage: () => '',
    },
    errorLog: () => {},
  });
  const cases: [string, () => Promise<Response> | Response, number][] = [
    ['GET /healthz', () => app.request('/healthz'), 200],
    ['a reading', () => app.request('/api/interpret', json(GAS)), 200],
    ['a 422', () => app.request('/api/interpret', json({ gas: { ph: 9.1 } })), 422],
    ['a 400', () => app.request('/api/interpret', json('{"gas":')), 400],
    ['a 415', () => app.request('/api/interpret', json('x', 'text/plain')), 415],
    ['a 413', () => app.request('/api/interpret', json(`"${'x'.repeat(70 * 1024)}"`)), 413],
    ['a 404', () => app.request('/api/nothing'), 404],
    [
      'a 403',
      () =>
        app.request('/step', {
          method: 'POST',
          headers: {
            'content-type': 'application/x-www-form-urlencoded',
            origin: 'https://attacker.example',
          },
          body: 'step=sample',
        }),
      403,
    ],
    ['a 500', () => throwing.request('/api/interpret', json(GAS)), 500],
  ];
  it.each(cases)('%s', async (_name, send, status) => {
    const res = await send();
    expect(res.status).toBe(status);
    expect(res.headers.get('cache-control')).toBe('no-store');
  });

  it('static files keep their own revalidation', async () => {
    const page = await (await app.request('/')).text();
    const asset = page.match(/<link rel="stylesheet" href="([^"]+)"/)?.[1];
    expect(asset).toBeTruthy();
    expect((await app.request(asset!)).headers.get('cache-control')).toBe('no-cache');
  });
});

describe('6. bounded errors', () => {
  it('6,000 unknown keys: 20 errors, then "and 5,980 more", in a few kilobytes', async () => {
    const app = createApp();
    const gas: Record<string, number> = { ph: 7.31, pco2: 48, hco3: 23.5 };
    for (let i = 0; i < 6000; i++) gas[`k${i}`] = 1;
    const res = await app.request('/api/interpret', json({ gas }));
    expect(res.status).toBe(422);
    const text = await res.text();
    const body = JSON.parse(text);
    expect(body.errors).toHaveLength(MAX_LISTED_ERRORS + 1);
    expect(body.errors.at(-1)).toEqual({
      path: '(more)',
      message: 'and 5980 more errors: fix these first',
    });
    expect(text.length).toBeLessThan(5000);
  });

  it('a short list is left as it is, with its paths cleaned of invisible controls', () => {
    expect(boundedErrors([{ path: 'gas.k\u202e1', message: 'Unknown key' }])).toEqual([
      { path: 'gas.k1', message: 'Unknown key' },
    ]);
    expect(
      boundedErrors(Array.from({ length: 21 }, () => ({ path: 'p', message: 'm' }))).at(-1),
    ).toEqual({ path: '(more)', message: 'and 1 more error: fix these first' });
  });
});

describe('10. headers', () => {
  it('HSTS is off by default and on with the setting', async () => {
    expect((await createApp().request('/healthz')).headers.get('strict-transport-security')).toBe(
      null,
    );
    expect(
      (await createApp({ hsts: true }).request('/healthz')).headers.get(
        'strict-transport-security',
      ),
    ).toBe(HSTS_VALUE);
  });

  it('the host names come from PUBLIC_URL, ALLOWED_ORIGINS and ALLOWED_HOSTS', () => {
    expect(
      allowedHostNames(
        ['https://Gasline.Hospital.example/', 'https://ward.example:8443'],
        ['gasline.internal'],
      ),
    ).toEqual(['gasline.hospital.example', 'ward.example', 'gasline.internal']);
  });

  it('a name not on the list is refused with 421 (DNS rebinding); localhost, addresses and listed names pass', async () => {
    const app = createApp({ allowedHosts: ['gasline.hospital.example'] });
    const refused = await app.request('http://rebind.attacker.example/api/interpret', json(GAS));
    expect(refused.status).toBe(421);
    expect(refused.headers.get('cache-control')).toBe('no-store');
    for (const origin of [
      'http://localhost:3000',
      'http://127.0.0.1:3000',
      'http://[::1]:3000',
      'http://10.1.2.3:3000',
      'https://gasline.hospital.example',
      'https://GASLINE.hospital.example',
    ])
      expect((await app.request(`${origin}/healthz`)).status, origin).toBe(200);
  });

  it('CSP reports are off by default', async () => {
    const app = createApp();
    expect((await app.request('/')).headers.get('content-security-policy')).not.toContain(
      'report-uri',
    );
    expect((await app.request('/csp-report', json({}, 'application/csp-report'))).status).toBe(404);
  });

  it('with CSP_REPORTS on, a report is taken and only its directive is logged', async () => {
    const logged: string[] = [];
    const app = createApp({ cspReports: true, errorLog: (line) => logged.push(line) });
    expect((await app.request('/')).headers.get('content-security-policy')).toContain(
      'report-uri /csp-report',
    );
    const classic = {
      'csp-report': {
        'document-uri': 'https://gasline.example/?ph=7.137',
        'effective-directive': 'script-src-elem',
        'script-sample': 'alert(7.137)',
      },
    };
    const modern = [
      {
        type: 'csp-violation',
        url: 'https://gasline.example/step',
        body: { effectiveDirective: 'style-src-attr', sample: '7.137' },
      },
    ];
    const forged = { 'csp-report': { 'effective-directive': 'x\nGET / 200 1.0ms' } };
    for (const [body, type] of [
      [classic, 'application/csp-report'],
      [modern, 'application/reports+json'],
      [forged, 'application/csp-report'],
    ] as const)
      expect((await app.request('/csp-report', json(body, type))).status).toBe(204);
    expect(logged).toEqual([
      'csp violation: script-src-elem',
      'csp violation: style-src-attr',
      'csp violation: unknown',
    ]);
    expect((await app.request('/csp-report', json('{', 'application/csp-report'))).status).toBe(
      400,
    );
  });

  it('a violated-directive with its sources is logged by name', () => {
    expect(
      reportedDirectives({ 'csp-report': { 'violated-directive': "img-src 'self'" } }),
    ).toEqual(['img-src']);
  });
});
