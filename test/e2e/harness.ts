// The browser harness: the real server on a free loopback port, one headless Chromium per test file,
// axe-core on demand, screenshots into the ignored screenshots/ folder, and a record of every request
// and CSP violation so that a test can prove nothing left the machine and nothing was blocked.
import { existsSync, mkdirSync, readFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import type { AddressInfo } from 'node:net';
import { fileURLToPath } from 'node:url';
import { serve, type ServerType } from '@hono/node-server';
import {
  chromium,
  type Browser,
  type BrowserContext,
  type BrowserContextOptions,
  type Page,
} from 'playwright-core';
import { expect } from 'vitest';
import { createApp } from '../../server/app.ts';

export const CHROMIUM = process.env.CHROMIUM_PATH || '/usr/bin/chromium';
export const HAVE_CHROMIUM = existsSync(CHROMIUM);
export const IN_CI = process.env.CI === 'true';

/** Skip plainly when there is no browser; in CI a missing browser fails the run instead. */
export function browserGate(file: string): boolean {
  if (HAVE_CHROMIUM) return true;
  if (IN_CI) return true; // beforeAll then fails with the reason
  console.warn(
    `[e2e] SKIPPED ${file}: no Chromium at ${CHROMIUM} (install Debian's chromium, or set CHROMIUM_PATH). With CI=true this fails instead.`,
  );
  return false;
}

export const ARGS = [
  '--headless',
  '--no-sandbox',
  '--disable-gpu',
  '--disable-background-networking',
  '--disable-component-update',
  '--no-first-run',
  '--disable-sync',
  '--disable-quic',
];

const require = createRequire(import.meta.url);
const AXE_SOURCE = readFileSync(require.resolve('axe-core/axe.min.js'), 'utf8');
export const SCREENSHOTS = fileURLToPath(new URL('../../screenshots/', import.meta.url));

export interface Harness {
  browser: Browser;
  server: ServerType;
  origin: string;
  close(): Promise<void>;
}

export async function startHarness(): Promise<Harness> {
  if (!HAVE_CHROMIUM)
    throw new Error(`CI=true and no Chromium at ${CHROMIUM}: the browser tests must run in CI`);
  const server = serve({
    fetch: createApp({ log: undefined }).fetch,
    port: 0,
    hostname: '127.0.0.1',
  });
  await new Promise<void>((resolve, reject) => {
    server.once('listening', () => resolve());
    server.once('error', reject);
  });
  const { port } = server.address() as AddressInfo;
  const browser = await chromium.launch({ executablePath: CHROMIUM, args: ARGS });
  return {
    browser,
    server,
    origin: `http://127.0.0.1:${port}`,
    async close() {
      await browser.close();
      await new Promise<void>((resolve) => server.close(() => resolve()));
    },
  };
}

export interface Session {
  context: BrowserContext;
  page: Page;
  /** every URL the page asked for */
  requests: string[];
  /** full page loads (an htmx swap is not one) */
  navigations: () => number;
  /** a screenshot of the whole page, or with full: false of what the viewport shows now */
  shot(name: string, options?: { full?: boolean }): Promise<void>;
  /** axe-core: no serious or critical violation; with tags, no violation at all of those tags */
  axe(label: string, tags?: string[]): Promise<void>;
  cspViolations(): Promise<string[]>;
}

/** A fresh context (its own storage) and page; the CSP stays on, so the test sees what a clinician's browser enforces. */
export async function openSession(
  h: Harness,
  scenario: string,
  options: BrowserContextOptions = {},
): Promise<Session> {
  const context = await h.browser.newContext({
    viewport: { width: 1280, height: 900 },
    ...options,
  });
  if (options.javaScriptEnabled !== false)
    await context.grantPermissions(['clipboard-read', 'clipboard-write'], { origin: h.origin });
  const page = await context.newPage();
  page.setDefaultTimeout(5000); // a missing control fails fast with its locator, not at the test timeout
  const requests: string[] = [];
  page.on('request', (r) => requests.push(r.url()));
  let navigations = 0;
  page.on('framenavigated', (frame) => {
    if (frame === page.mainFrame()) navigations++;
  });
  const errors: string[] = [];
  page.on('pageerror', (e) => errors.push(e.message));
  if (options.javaScriptEnabled !== false) {
    await page.addInitScript(() => {
      const w = window as unknown as { __csp: string[] };
      w.__csp = [];
      document.addEventListener('securitypolicyviolation', (e) =>
        w.__csp.push(`${e.violatedDirective} ${e.blockedURI}`),
      );
    });
  }
  mkdirSync(SCREENSHOTS, { recursive: true });
  let n = 0;
  return {
    context,
    page,
    requests,
    navigations: () => navigations,
    async shot(name, options = {}) {
      n += 1;
      await page.screenshot({
        path: `${SCREENSHOTS}${scenario}-${String(n).padStart(2, '0')}-${name}.png`,
        fullPage: options.full ?? true,
      });
    },
    async axe(label, tags) {
      // evaluated through the debugging protocol, which the page's CSP does not govern
      const loaded = await page.evaluate(
        () => typeof (window as unknown as { axe?: unknown }).axe !== 'undefined',
      );
      if (!loaded) await page.evaluate(AXE_SOURCE);
      const found = await page.evaluate(async (only) => {
        const axe = (
          window as unknown as {
            axe: {
              run(
                ctx: Document,
                o: object,
              ): Promise<{
                violations: {
                  id: string;
                  impact: string | null;
                  help: string;
                  nodes: { target: string[] }[];
                }[];
              }>;
            };
          }
        ).axe;
        const result = await axe.run(document, {
          resultTypes: ['violations'],
          ...(only ? { runOnly: { type: 'tag', values: only } } : {}),
        });
        return result.violations.map((v) => ({
          id: v.id,
          impact: v.impact,
          help: v.help,
          targets: v.nodes.map((x) => x.target.join(' ')).slice(0, 3),
        }));
      }, tags ?? null);
      const severe = tags
        ? found
        : found.filter((v) => v.impact === 'serious' || v.impact === 'critical');
      expect(severe, `axe at ${label}`).toEqual([]);
      expect(errors, `script errors at ${label}`).toEqual([]);
    },
    async cspViolations() {
      return page.evaluate(() => (window as unknown as { __csp: string[] }).__csp);
    },
  };
}

/** Wait until a step is the open one, and return the id of the focused element. */
export async function waitOpen(page: Page, step: string): Promise<void> {
  await page.locator(`li.entry--open#step-${step}`).waitFor();
}

export const focusedId = (page: Page) => page.evaluate(() => document.activeElement?.id ?? '');

/** The case as a clinician would post it to the API, and the note the API writes for it. */
export async function apiNote(origin: string, body: unknown, format: 'text' | 'markdown' = 'text') {
  const res = await fetch(`${origin}/api/interpret?format=${format}`, {
    method: 'POST',
    headers: { 'content-type': 'application/json' },
    body: JSON.stringify(body),
  });
  const json = (await res.json()) as { ok: boolean; note: { text: string; handover: string } };
  if (!json.ok) throw new Error(`the API refused the case: ${JSON.stringify(json)}`);
  return json.note;
}
