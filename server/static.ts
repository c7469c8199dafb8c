// The page's own files: a fixed list, read once, served from this server only (no CDN, no path from the URL).
import { readFileSync, readdirSync } from 'node:fs';
import { createRequire } from 'node:module';
import { createHash } from 'node:crypto';
import { fileURLToPath } from 'node:url';
import { Hono } from 'hono';

const require = createRequire(import.meta.url);
const viewsStatic = (name: string) =>
  fileURLToPath(new URL(`../views/static/${name}`, import.meta.url));

// the stylesheet is kept in parts, one for each part of the page (views/static/css, in the order of their
// numbered names), and served as one file: the same cascade as one sheet, one request, no inline style (CSP)
const STYLE_PARTS = () =>
  readdirSync(viewsStatic('css'))
    .filter((name) => name.endsWith('.css'))
    .sort((a, b) => a.localeCompare(b, 'en', { numeric: true }))
    .map((name) => viewsStatic(`css/${name}`));

/** URL path to the file (or files, joined) on disk and its media type. htmx comes straight from its package. */
export const STATIC_FILES: Record<string, { files: () => string[]; type: string }> = {
  '/static/gasline.css': { files: STYLE_PARTS, type: 'text/css; charset=utf-8' },
  '/static/gasline.js': {
    files: () => [viewsStatic('gasline.js')],
    type: 'text/javascript; charset=utf-8',
  },
  '/static/favicon.svg': { files: () => [viewsStatic('favicon.svg')], type: 'image/svg+xml' },
  '/static/htmx.min.js': {
    files: () => [require.resolve('htmx.org/dist/htmx.min.js')],
    type: 'text/javascript; charset=utf-8',
  },
};

interface Loaded {
  body: Uint8Array<ArrayBuffer>;
  etag: string;
  type: string;
}

/** The files' bytes, one after another; parts of a stylesheet are joined by a line break. */
function bodyOf(files: string[]): Uint8Array<ArrayBuffer> {
  if (files.length === 1) return new Uint8Array(readFileSync(files[0]!));
  return new Uint8Array(Buffer.from(files.map((f) => readFileSync(f, 'utf8')).join('\n'), 'utf8'));
}

export function staticRoutes(options: { cache?: boolean } = {}): Hono {
  const cache = options.cache ?? true;
  const loaded = new Map<string, Loaded>();
  const load = (path: string): Loaded => {
    const hit = cache ? loaded.get(path) : undefined;
    if (hit) return hit;
    const entry = STATIC_FILES[path]!;
    const body = bodyOf(entry.files());
    const item = {
      body,
      type: entry.type,
      etag: `"${createHash('sha256').update(body).digest('base64url').slice(0, 22)}"`,
    };
    if (cache) loaded.set(path, item);
    return item;
  };
  const app = new Hono();
  for (const path of Object.keys(STATIC_FILES)) {
    app.get(path, (c) => {
      const item = load(path);
      const headers = {
        'content-type': item.type,
        etag: item.etag,
        'cache-control': 'no-cache',
        'x-content-type-options': 'nosniff',
      };
      if (c.req.header('if-none-match') === item.etag) return c.body(null, 304, headers);
      return c.body(item.body, 200, headers);
    });
  }
  return app;
}
