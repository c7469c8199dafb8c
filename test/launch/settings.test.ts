// The launch's settings as a hospital's IT team sets them: each mistake refused at start-up with a message naming
// the setting; the frame protection unchanged unless FRAME_ANCESTORS lists the record's origins.
import { describe, expect, it } from 'vitest';
import { createApp } from '../../server/app.ts';
import { readSettings } from '../../server/launch/index.ts';

const KEY = 'a'.repeat(64);
const base = { SMART_CLIENT_ID: 'gasline', PUBLIC_URL: 'https://gasline.hospital.example' };
const error = (env: Record<string, string>, options = {}) => {
  const r = readSettings(env, options);
  return r.ok ? null : r.error;
};

describe('launch settings', () => {
  it('no SMART_CLIENT_ID: no launch, and nothing else is required', () => {
    const r = readSettings({});
    expect(r.ok && r.launch).toBe(null);
  });

  it('refuses what cannot work, naming the setting', () => {
    expect(error({ SMART_CLIENT_ID: 'gasline' })).toMatch(/PUBLIC_URL is not/);
    expect(error({ ...base, PUBLIC_URL: 'http://gasline.hospital.example' })).toMatch(
      /PUBLIC_URL must use https/,
    );
    expect(error({ ...base, SMART_FILE_BACK: 'yes' })).toMatch(/SMART_FILE_BACK must be on or off/);
    expect(error({ ...base, SMART_COOKIE_KEY: 'short' })).toMatch(
      /SMART_COOKIE_KEY must be 32 random bytes/,
    );
    expect(error({ ...base, SMART_ISSUERS: 'http://ehr.example.org/fhir' })).toMatch(
      /SMART_ISSUERS entry/,
    );
    expect(error({ ...base, FRAME_ANCESTORS: 'https://ehr.example.org/path' })).toMatch(
      /must be an origin/,
    );
    expect(error(base, { severalProcesses: true })).toMatch(/set SMART_COOKIE_KEY/);
  });

  it('takes a key as hex or base64url, builds the redirect URI from PUBLIC_URL, and says what it does', () => {
    for (const key of [
      KEY,
      Buffer.alloc(32, 9).toString('base64url'),
      Buffer.alloc(32, 9).toString('base64'),
    ]) {
      const r = readSettings(
        { ...base, PUBLIC_URL: 'https://gasline.hospital.example/', SMART_COOKIE_KEY: key },
        { severalProcesses: true },
      );
      if (!r.ok || !r.launch) throw new Error(r.ok ? 'no launch' : r.error);
      expect(r.launch.cookieKey).toHaveLength(32);
      expect(r.launch.redirectUri).toBe('https://gasline.hospital.example/callback');
      expect(r.launch.secureCookies).toBe(true);
      expect(r.launch.sharedKey).toBe(true);
    }
    const local = readSettings({ ...base, PUBLIC_URL: 'http://127.0.0.1:3000' });
    if (!local.ok || !local.launch) throw new Error('local');
    expect(local.launch.sharedKey).toBe(false);
    expect(local.launch.secureCookies).toBe(false);
    expect(local.messages.join(' ')).toMatch(/no SMART_COOKIE_KEY/);
  });
});

describe('FRAME_ANCESTORS', () => {
  it('by default the page may not be framed at all (CSP frame-ancestors none and X-Frame-Options DENY)', async () => {
    const res = await createApp().request('/healthz');
    expect(res.headers.get('content-security-policy')).toMatch(/frame-ancestors 'none'/);
    expect(res.headers.get('x-frame-options')).toBe('DENY');
  });

  it('with origins listed, only those may frame it, and X-Frame-Options (which cannot list them) is left out', async () => {
    const r = readSettings({
      FRAME_ANCESTORS: 'https://ehr.hospital.example, https://portal.hospital.example:8443',
    });
    if (!r.ok) throw new Error(r.error);
    const res = await createApp({ frameAncestors: r.frameAncestors }).request('/healthz');
    expect(res.headers.get('content-security-policy')).toMatch(
      /frame-ancestors https:\/\/ehr\.hospital\.example https:\/\/portal\.hospital\.example:8443/,
    );
    expect(res.headers.get('x-frame-options')).toBeNull();
  });

  it('without a launch set up, /launch and /callback answer with a page that says so (404), not JSON', async () => {
    const res = await createApp().request('/launch?iss=https://ehr.example.org/fhir');
    expect(res.status).toBe(404);
    expect(res.headers.get('content-type')).toMatch(/text\/html/);
    expect(await res.text()).toContain('not set up on this server');
  });
});
