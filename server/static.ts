// The page's own files: a fixed list, read once, served from this server only (no CDN, no path from the URL).
import { readFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import { createHash } from 'node:crypto';
import { fileURLToPath } from 'node:url';
import { Hono } from 'hono';

const require = createRequire(import.meta.url);
const viewsStatic = (name: string) =>
  fileURLToPath(new URL(`../views/static/${name}`, import.meta.url));

/** URL path to file on disk and its media type. htmx comes straight from its package. */
export const STATIC_FILES: Record<string, { file: () => string; type: string }> = {
  '/static/gasline.css': {
    file: () => viewsStatic('gasline.css'),
    type: 'text/css; charset=utf-8',
  },
  '/static/gasline.js': {
    file: () => viewsStatic('gasline.js'),
    type: 'text/javascript; charset=utf-8',
  },
  '/static/favicon.svg': { file: () => viewsStatic('favicon.svg'), type: 'image/svg+xml' },
  '/static/htmx.min.js': {
    file: () => require.resolve('htmx.org/dist/htmx.min.js'),
    type: 'text/javascript; charset=utf-8',
  },
};

interface Loaded {
  body: Uint8Array<ArrayBuffer>;
  etag: string;
  type: string;
}

export function staticRoutes(options: { cache?: boolean } = {}): Hono {
  const cache = options.cache ?? true;
  const loaded = new Map<string, Loaded>();
  const load = (path: string): Loaded => {
    const hit = cache ? loaded.get(path) : undefined;
    if (hit) return hit;
    const entry = STATIC_FILES[path]!;
    const body = new Uint8Array(readFileSync(entry.file()));
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
