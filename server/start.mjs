// npm start: run the compiled server in dist/ (npm run build makes it). Nothing is compiled here, so a
// read-only tree with production dependencies only starts as it is; a build older than the sources is
// said once, not rebuilt.
import { existsSync, readdirSync, statSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';

const root = join(dirname(fileURLToPath(import.meta.url)), '..');
const dist = join(root, 'dist');
const stamp = join(dist, '.built');
const SOURCES = ['calc', 'server', 'views', 'templates'];

function newest(dir) {
  let latest = 0;
  for (const name of readdirSync(dir)) {
    const path = join(dir, name);
    const st = statSync(path);
    latest = Math.max(latest, st.isDirectory() ? newest(path) : st.mtimeMs);
  }
  return latest;
}

if (!existsSync(stamp)) {
  console.error(
    'Gasline: no build in dist/: run npm run build (npm install does it too), then npm start',
  );
  process.exit(1);
}
const sources = SOURCES.map((d) => join(root, d)).filter((d) => existsSync(d));
if (sources.length && Math.max(...sources.map(newest)) > statSync(stamp).mtimeMs)
  console.warn(
    'Gasline: a source file is newer than the build in dist/: run npm run build to use it',
  );

await import(
  pathToFileURL(
    join(dist, 'server', process.env.GASLINE_ENTRY === 'cluster' ? 'cluster.js' : 'main.js'),
  ).href
);
