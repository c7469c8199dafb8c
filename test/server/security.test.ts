// Headers and the origin check on form posts (OWASP secure headers guidance, common practice).
import { describe, expect, it } from 'vitest';
import { createApp } from '../../server/app.ts';

const app = createApp({ allowedOrigins: ['https://gasline.example.org'] });

describe('security headers on every response', () => {
  it.each(['/', '/healthz', '/api/nothing'])('%s', async (path) => {
    const res = await app.request(path);
    const csp = res.headers.get('content-security-policy') ?? '';
    expect(csp).toContain("default-src 'self'");
    expect(csp).toContain("script-src 'self'");
    expect(csp).toContain("style-src 'self'");
    expect(csp).toContain("frame-ancestors 'none'");
    expect(csp).not.toMatch(/unsafe-inline|unsafe-eval/);
    expect(res.headers.get('x-content-type-options')).toBe('nosniff');
    expect(res.headers.get('referrer-policy')).toBe('no-referrer');
    expect(res.headers.get('x-frame-options')).toBe('DENY');
    expect(res.headers.get('permissions-policy')).toMatch(
      /camera=\(\).*microphone=\(\).*geolocation=\(\)/,
    );
  });
});

describe('origin check on form posts', () => {
  const form = (headers: Record<string, string>) =>
    app.request('/step', {
      method: 'POST',
      headers: { 'content-type': 'application/x-www-form-urlencoded', ...headers },
      body: 'step=sample&sample=arterial',
    });

  it('a post from another site is refused with 403', async () => {
    expect(
      (await form({ origin: 'https://attacker.example', 'sec-fetch-site': 'cross-site' })).status,
    ).toBe(403);
    expect((await form({ origin: 'https://attacker.example' })).status).toBe(403);
    expect((await form({ 'sec-fetch-site': 'cross-site' })).status).toBe(403);
  });

  it('a post from this page passes', async () => {
    expect(
      (await form({ origin: 'http://localhost', 'sec-fetch-site': 'same-origin' })).status,
    ).not.toBe(403);
    expect((await form({ 'sec-fetch-site': 'same-origin' })).status).not.toBe(403);
    expect((await form({ origin: 'http://localhost' })).status).not.toBe(403);
  });

  it('the public origin behind a TLS proxy can be allowed', async () => {
    expect((await form({ origin: 'https://gasline.example.org' })).status).not.toBe(403);
  });

  it('JSON to the API is not a form post and is not refused by origin', async () => {
    const res = await app.request('/api/interpret', {
      method: 'POST',
      headers: { 'content-type': 'application/json', origin: 'https://other.example' },
      body: JSON.stringify({ gas: { ph: 7.4, pco2: 40, hco3: 24 } }),
    });
    expect(res.status).toBe(200);
  });
});

describe('a form body that cannot be read', () => {
  it.each(['/step', '/open', '/preview', '/paste', '/followup'])(
    '%s answers 400, not 500 (found by the HTTP fuzz)',
    async (path) => {
      for (const type of ['multipart/form-data', 'multipart/form-data; boundary=xyz']) {
        const res = await app.request(path, {
          method: 'POST',
          headers: { 'content-type': type },
          body: 'garbage',
        });
        expect(res.status, `${path} ${type}`).toBe(400);
      }
    },
  );
});
