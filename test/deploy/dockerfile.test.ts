// The Dockerfile, read with a Dockerfile parser (no base image can be pulled here, so it is not built in the tests):
// several stages, production dependencies only in the image, a non-root user by number, a health check with Node
// rather than curl, and a command that runs the compiled server with node (npm writes under the home folder, which a
// read-only root filesystem refuses). Every path it copies exists.
import { existsSync, readFileSync } from 'node:fs';
import { DockerfileParser } from 'dockerfile-ast';
import { describe, expect, it } from 'vitest';

const root = new URL('../../', import.meta.url);
const dockerfile = DockerfileParser.parse(readFileSync(new URL('Dockerfile', root), 'utf8'));
// each instruction as its keyword and the rest of its text (flags such as --from included), continuations joined
const instructions = dockerfile.getInstructions().map((i) => ({
  keyword: i.getKeyword(),
  args: i
    .getTextContent()
    .replace(/\\\r?\n/g, ' ')
    .replace(/^\s*\S+\s+/, '')
    .trim(),
}));
const froms = dockerfile.getFROMs();
// the last stage is the image; its instructions follow the last FROM
const lastFrom = instructions.map((i) => i.keyword).lastIndexOf('FROM');
const image = instructions.slice(lastFrom);

describe('Dockerfile', () => {
  it('builds in one stage and runs from another', () => {
    expect(froms.length).toBeGreaterThanOrEqual(2);
    expect(froms[0]!.getBuildStage()).toBe('build');
    expect(
      image.some((i) => i.keyword === 'COPY' && /--from=build\s+\/app\/dist/.test(i.args)),
    ).toBe(true);
  });

  it('installs production dependencies only in the image, and nothing compiles there', () => {
    const runs = image.filter((i) => i.keyword === 'RUN').map((i) => i.args);
    expect(runs.some((r) => /npm ci\b.*--omit=dev/.test(r))).toBe(true);
    expect(runs.some((r) => /npm (install|i)\b(?!.*--omit=dev)|npm run build|tsc\b/.test(r))).toBe(
      false,
    );
  });

  it('runs as a non-root user, given by number', () => {
    const user = image.filter((i) => i.keyword === 'USER').at(-1)?.args ?? '';
    expect(user).toMatch(/^\d+(:\d+)?$/);
    expect(user.split(':')[0]).not.toBe('0');
  });

  it('checks its health with node against /healthz, without curl or wget', () => {
    const check = image.find((i) => i.keyword === 'HEALTHCHECK')!.args;
    expect(check).toMatch(/CMD \["node"/);
    expect(check).toContain('/healthz');
    expect(check).not.toMatch(/curl|wget/);
  });

  it('starts the compiled server with node: no npm, no TypeScript, nothing written at start', () => {
    const cmd = JSON.parse(image.find((i) => i.keyword === 'CMD')!.args) as string[];
    expect(cmd[0]).toBe('node');
    expect(cmd.at(-1)).toBe('dist/server/main.js');
    expect(cmd.join(' ')).not.toMatch(/npm|tsx|tsc/);
    expect(image.some((i) => i.keyword === 'VOLUME')).toBe(false);
  });

  it('copies only paths that exist, and .dockerignore keeps tests and local builds out of the context', () => {
    for (const copy of instructions.filter(
      (i) => i.keyword === 'COPY' && !i.args.includes('--from'),
    )) {
      const sources = copy.args
        .split(/\s+/)
        .filter((a) => !a.startsWith('--'))
        .slice(0, -1);
      for (const source of sources) expect(existsSync(new URL(source, root)), source).toBe(true);
    }
    const ignored = readFileSync(new URL('.dockerignore', root), 'utf8').split('\n');
    for (const entry of ['node_modules', 'dist', 'test', '.git']) expect(ignored).toContain(entry);
  });
});
