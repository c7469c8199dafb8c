// npm run build: compile the TypeScript once into dist/ and copy the templates and the page's files beside it.
// npm start runs dist/ and never compiles; `npm install` builds through the prepare script. In a production
// install (npm ci --omit=dev) TypeScript is absent: with --if-possible the build is then skipped, not failed.
import { execFileSync } from 'node:child_process';
import {
  cpSync,
  existsSync,
  mkdirSync,
  readdirSync,
  rmSync,
  statSync,
  writeFileSync,
} from 'node:fs';
import { dirname, join, relative } from 'node:path';
import { fileURLToPath } from 'node:url';

const root = join(dirname(fileURLToPath(import.meta.url)), '..');
const dist = join(root, 'dist');
const tsc = join(root, 'node_modules', 'typescript', 'bin', 'tsc');
const ASSET = /\.(njk|css|js|json|svg|png|ico|txt)$/;

function copyAssets(dir) {
  for (const name of readdirSync(dir)) {
    const path = join(dir, name);
    if (statSync(path).isDirectory()) copyAssets(path);
    else if (ASSET.test(name)) {
      const target = join(dist, relative(root, path));
      mkdirSync(dirname(target), { recursive: true });
      cpSync(path, target);
    }
  }
}

if (!existsSync(tsc)) {
  if (process.argv.includes('--if-possible')) {
    console.log(
      existsSync(join(dist, '.built'))
        ? 'Gasline: TypeScript is not installed (a production install): the existing build in dist/ is used'
        : 'Gasline: TypeScript is not installed and there is no build in dist/: run npm install (with dev dependencies) and npm run build',
    );
    process.exit(0);
  }
  console.error('Gasline: TypeScript is not installed: run npm install first');
  process.exit(1);
}

const started = performance.now();
rmSync(dist, { recursive: true, force: true });
execFileSync(process.execPath, [tsc, '-p', join(root, 'tsconfig.build.json')], {
  stdio: 'inherit',
});
for (const dir of ['templates', 'views']) copyAssets(join(root, dir));
writeFileSync(join(dist, '.built'), `${new Date().toISOString()}\n`);
console.log(`Gasline: built into dist/ in ${(performance.now() - started).toFixed(0)} ms`);
