// Files readable in one sitting (house style): no file of the page over 500 lines, the hard limit (300 the norm).
import { readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';

const VIEWS = fileURLToPath(new URL('../../views/', import.meta.url));
const SOURCE = /\.(ts|njk|css|js)$/;

const files = (dir: string): string[] =>
  readdirSync(dir, { withFileTypes: true }).flatMap((e) =>
    e.isDirectory() ? files(join(dir, e.name)) : SOURCE.test(e.name) ? [join(dir, e.name)] : [],
  );

describe('views/ in files readable in one sitting', () => {
  it('has no file over 500 lines', () => {
    const all = files(VIEWS);
    expect(all.length).toBeGreaterThan(10);
    const long = all
      .map((f) => ({ f: f.slice(VIEWS.length), lines: readFileSync(f, 'utf8').split('\n').length }))
      .filter((x) => x.lines > 500);
    expect(long).toEqual([]);
  });
});
