// The rooms point one way (house style): views/ never imports server/; nothing outside calc/ imports a calc file
// other than calc/index.ts; server/intake/ imports only calc/index.ts (besides its own files and packages). Read
// from the import lines of the source files themselves.
import { readdirSync, readFileSync } from 'node:fs';
import { dirname, join, relative, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';

const ROOT = fileURLToPath(new URL('../../', import.meta.url));
const SOURCE = /\.(ts|mts|js|mjs)$/;

/** Every module specifier a source text names: static imports and exports (over several lines too), bare side-effect imports, and dynamic imports of a literal. */
function specifiers(text: string): string[] {
  const code = text.replace(/\/\*[\s\S]*?\*\//g, '').replace(/^\s*\/\/.*$/gm, '');
  const found: string[] = [];
  for (const re of [
    /^\s*(?:import|export)\s[^;'"]*?\bfrom\s*['"]([^'"]+)['"]/gm,
    /^\s*import\s*['"]([^'"]+)['"]/gm,
    /\bimport\s*\(\s*['"]([^'"]+)['"]\s*\)/g,
  ])
    for (const m of code.matchAll(re)) found.push(m[1]!);
  return found;
}

function filesUnder(dir: string, skip: string[] = []): string[] {
  return readdirSync(join(ROOT, dir), { withFileTypes: true }).flatMap((e) => {
    const path = join(dir, e.name);
    if (skip.includes(path)) return [];
    if (e.isDirectory()) return e.name === 'node_modules' ? [] : filesUnder(path, skip);
    return SOURCE.test(e.name) ? [path] : [];
  });
}

interface Arrow {
  from: string;
  /** the project file imported, relative to the root; null for a package or a Node built-in */
  to: string | null;
  specifier: string;
}

function arrowsOf(files: string[]): Arrow[] {
  return files.flatMap((from) =>
    specifiers(readFileSync(join(ROOT, from), 'utf8')).map((specifier) => ({
      from,
      specifier,
      to: specifier.startsWith('.')
        ? relative(ROOT, resolve(ROOT, dirname(from), specifier))
            .split('\\')
            .join('/')
        : null,
    })),
  );
}

const inRoom = (path: string | null, room: string) => !!path?.startsWith(`${room}/`);
const show = (a: Arrow) => `${a.from} -> ${a.specifier}`;

/** The arrows that break the rules every room follows. */
function forbidden(arrows: Arrow[]): string[] {
  return arrows
    .filter(
      (a) =>
        (inRoom(a.from, 'views') && inRoom(a.to, 'server')) ||
        (!inRoom(a.from, 'calc') && inRoom(a.to, 'calc') && a.to !== 'calc/index.ts'),
    )
    .map(show);
}

describe('the rooms point one way', () => {
  it('reads the import lines it is meant to read', () => {
    const text = [
      "import { a } from '../server/x.ts';",
      'import {\n  b,\n  type C,\n} from "../calc/units.ts";',
      "import type { D } from '../calc/index.ts';",
      "export * from './own.ts';",
      "export { e } from '../calc/schema.ts';",
      "import '../server/side.ts';",
      "const f = await import('../server/late.ts');",
      "// import { g } from '../server/commented.ts';",
      "const text = 'not an import'; const other = 'from there';",
    ].join('\n');
    expect(specifiers(text)).toEqual([
      '../server/x.ts',
      '../calc/units.ts',
      '../calc/index.ts',
      './own.ts',
      '../calc/schema.ts',
      '../server/side.ts',
      '../server/late.ts',
    ]);
    const arrows = arrowsOf(['views/render.ts']).concat([
      { from: 'views/x.ts', to: 'server/page.ts', specifier: '../server/page.ts' },
      { from: 'templates/x.ts', to: 'calc/units.ts', specifier: '../calc/units.ts' },
      { from: 'calc/x.ts', to: 'calc/units.ts', specifier: './units.ts' },
    ]);
    expect(forbidden(arrows)).toEqual([
      'views/x.ts -> ../server/page.ts',
      'templates/x.ts -> ../calc/units.ts',
    ]);
  });

  it('views/, templates/ and server/ (but server/intake/) import no server file from views and no calc file but its index', () => {
    const files = [
      ...filesUnder('views'),
      ...filesUnder('templates'),
      ...filesUnder('server', ['server/intake']),
    ];
    expect(files).toContain('views/render.ts');
    expect(files).toContain('server/page.ts');
    expect(files.some((f) => f.startsWith('server/intake/'))).toBe(false);
    expect(forbidden(arrowsOf(files))).toEqual([]);
  });

  it('server/intake/ imports only calc/index.ts, besides its own files and packages', () => {
    const arrows = arrowsOf(filesUnder('server/intake'));
    expect(arrows.length).toBeGreaterThan(0);
    const outside = arrows.filter(
      (a) => a.to !== null && !inRoom(a.to, 'server/intake') && a.to !== 'calc/index.ts',
    );
    expect(outside.map(show)).toEqual([]);
  });
});
