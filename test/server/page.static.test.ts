// The stylesheet is kept in parts, one for each part of the page (views/static/css), and served as one file in the
// order of the parts' numbered names: one request, one cascade, and no inline style for the strict CSP.
import { readdirSync, readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { createApp } from '../../server/app.ts';

const CSS = new URL('../../views/static/css/', import.meta.url);
const app = createApp();

describe('the stylesheet', () => {
  it('is every part, in the order of their numbers, joined into the one file the page links', async () => {
    const names = readdirSync(CSS).filter((n) => n.endsWith('.css'));
    expect(names.length).toBeGreaterThan(1);
    const ordered = [...names].sort((a, b) => Number.parseInt(a, 10) - Number.parseInt(b, 10));
    const res = await app.request('/static/gasline.css');
    expect(res.status).toBe(200);
    expect(res.headers.get('content-type')).toBe('text/css; charset=utf-8');
    const served = await res.text();
    expect(served).toBe(ordered.map((n) => readFileSync(new URL(n, CSS), 'utf8')).join('\n'));
    // each part is under the house limit of 500 lines
    for (const n of names)
      expect(readFileSync(new URL(n, CSS), 'utf8').split('\n').length, n).toBeLessThanOrEqual(500);
    // an unchanged sheet is not sent again
    const again = await app.request('/static/gasline.css', {
      headers: { 'if-none-match': res.headers.get('etag')! },
    });
    expect(again.status).toBe(304);
    const page = await (await app.request('/')).text();
    expect(page.match(/<link rel="stylesheet"[^>]*>/g)).toEqual([
      '<link rel="stylesheet" href="/static/gasline.css">',
    ]);
    expect(page).not.toMatch(/<style|style="/);
  });
});
