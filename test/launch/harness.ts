// The app with its launch on, on a loopback port, beside the test record (SMART server and FHIR endpoint), and a
// small cookie-keeping client that follows redirects across the two, as a browser would for these GETs and posts.
import { readdirSync, readFileSync, statSync } from 'node:fs';
import type { AddressInfo } from 'node:net';
import { join } from 'node:path';
import { serve, type ServerType } from '@hono/node-server';
import type { Hono } from 'hono';
import { createApp } from '../../server/app.ts';
import { readSettings } from '../../server/launch/index.ts';
import { inventedRecord } from './fixtures.ts';
import { startSmartServer, type SmartOptions, type SmartServer } from './smartServer.ts';

export const CLIENT_ID = 'gasline-test-client';
export const TEST_KEY = Buffer.alloc(32, 7).toString('base64url');

export interface Running {
  origin: string;
  record: SmartServer;
  /** every request line the app logged */
  logs: string[];
  close(): Promise<void>;
}

export interface LaunchTestOptions
  extends Partial<Omit<SmartOptions, 'clientId' | 'redirectUri' | 'appLaunch'>> {
  /** settings besides the defaults; a function to use the record's address */
  env?: Record<string, string> | ((record: SmartServer) => Record<string, string>);
}

/** Start an app on a port, its settings built from env once the port is known. */
export async function startApp(env: (origin: string) => Record<string, string>, logs: string[]) {
  let app: Hono | null = null;
  const server: ServerType = serve({
    fetch: (req) => app!.fetch(req),
    port: 0,
    hostname: '127.0.0.1',
  });
  await new Promise<void>((resolve) => server.once('listening', () => resolve()));
  const origin = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
  const settings = readSettings(env(origin));
  if (!settings.ok) throw new Error(settings.error);
  app = createApp({ launch: settings.launch, log: (line) => logs.push(line) });
  return {
    origin,
    close: () => new Promise<void>((resolve) => server.close(() => resolve())),
  };
}

export async function startLaunch(o: LaunchTestOptions = {}): Promise<Running> {
  const logs: string[] = [];
  // the record first (its app addresses filled in below, read by it at request time), then the app
  const options: SmartOptions = {
    data: inventedRecord(),
    ...o,
    clientId: CLIENT_ID,
    redirectUri: '',
    appLaunch: '',
  };
  const record = await startSmartServer(options);
  const app = await startApp(
    (origin) => ({
      SMART_CLIENT_ID: CLIENT_ID,
      PUBLIC_URL: origin,
      SMART_FILE_BACK: 'on',
      SMART_COOKIE_KEY: TEST_KEY,
      ...(typeof o.env === 'function' ? o.env(record) : o.env),
    }),
    logs,
  );
  options.redirectUri = `${app.origin}/callback`;
  options.appLaunch = `${app.origin}/launch`;
  return {
    origin: app.origin,
    record,
    logs,
    async close() {
      await app.close();
      await record.close();
    },
  };
}

/** A client that keeps cookies by host (ports aside, as browsers do) and follows redirects. */
export class Agent {
  readonly jar = new Map<string, Map<string, string>>();
  /** every Set-Cookie header received, as sent */
  readonly setCookies: string[] = [];
  /** the URLs visited, redirects included */
  readonly visited: string[] = [];

  private remember(url: URL, response: Response) {
    const jar = this.jar.get(url.hostname) ?? new Map<string, string>();
    this.jar.set(url.hostname, jar);
    for (const line of response.headers.getSetCookie()) {
      this.setCookies.push(line);
      const [pair] = line.split(';');
      const [name, ...rest] = pair!.split('=');
      const gone = /max-age=0/i.test(line) || /expires=thu, 01 jan 1970/i.test(line);
      if (gone) jar.delete(name!.trim());
      else jar.set(name!.trim(), rest.join('='));
    }
  }

  cookieHeader(url: URL): string {
    return [...(this.jar.get(url.hostname) ?? new Map())].map(([k, v]) => `${k}=${v}`).join('; ');
  }

  async request(href: string, init: RequestInit = {}, follow = true): Promise<Response> {
    let url = new URL(href);
    let next: RequestInit = init;
    for (let hops = 0; hops < 10; hops++) {
      this.visited.push(url.href);
      const headers = new Headers(next.headers);
      const cookies = this.cookieHeader(url);
      if (cookies) headers.set('cookie', cookies);
      const response = await fetch(url, { ...next, headers, redirect: 'manual' });
      this.remember(url, response);
      const location = response.headers.get('location');
      if (!follow || response.status < 300 || response.status > 399 || !location) return response;
      await response.body?.cancel();
      url = new URL(location, url);
      next = {};
    }
    throw new Error('too many redirects');
  }

  get(href: string, follow = true) {
    return this.request(href, {}, follow);
  }

  post(href: string, fields: Record<string, string>, multipart = false) {
    if (multipart) {
      const body = new FormData();
      for (const [k, v] of Object.entries(fields)) body.set(k, v);
      return this.request(href, { method: 'POST', body });
    }
    return this.request(href, { method: 'POST', body: new URLSearchParams(fields) });
  }
}

const htmlText = (s: string) =>
  s
    .replace(/&quot;/g, '"')
    .replace(/&#39;/g, "'")
    .replace(/&lt;/g, '<')
    .replace(/&gt;/g, '>')
    .replace(/&amp;/g, '&');
const attr = (tag: string, name: string) => {
  const m = new RegExp(`\\s${name}="([^"]*)"`).exec(tag);
  return m ? htmlText(m[1]!) : null;
};

/** The values a browser would send from the form whose action is the one given (inputs, checked choices, selects, text areas). */
export function formFields(html: string, action: string): Record<string, string> {
  const start = html.indexOf(`action="${action}"`);
  if (start < 0) throw new Error(`no form posting to ${action}`);
  const form = html.slice(start, html.indexOf('</form>', start));
  const fields: Record<string, string> = {};
  for (const [tag] of form.matchAll(/<input\b[^>]*>/g)) {
    const name = attr(tag, 'name');
    const type = attr(tag, 'type') ?? 'text';
    if (!name || ((type === 'radio' || type === 'checkbox') && !/\schecked\b/.test(tag))) continue;
    fields[name] = attr(tag, 'value') ?? '';
  }
  for (const m of form.matchAll(/<select[^>]*name="([^"]+)"[^>]*>([\s\S]*?)<\/select>/g)) {
    const selected =
      /<option value="([^"]*)" selected>/.exec(m[2]!) ?? /<option value="([^"]*)"/.exec(m[2]!);
    if (selected) fields[m[1]!] = htmlText(selected[1]!);
  }
  for (const m of form.matchAll(/<textarea[^>]*name="([^"]+)"[^>]*>([\s\S]*?)<\/textarea>/g))
    fields[m[1]!] = htmlText(m[2]!);
  return fields;
}

/** Answer the steps left after a confirm (timing acute, not ventilated, the rest as prefilled) until the draft shows. */
export async function toDraft(agent: Agent, origin: string, html: string): Promise<string> {
  let page = html;
  // the draft shows from the first gas on: walk on while a question is open
  for (let i = 0; i < 8 && page.includes('<form class="step-form"'); i++) {
    const f = formFields(page, '/step');
    const step = f.step!;
    const answers: Record<string, string> =
      step === 'timing'
        ? { 'context.timing': 'acute' }
        : step === 'oxygen'
          ? { ventilated: 'no' }
          : {};
    const response = await agent.post(`${origin}/step`, { ...f, ...answers, action: 'next' });
    page = await response.text();
    if (response.status !== 200) throw new Error(`step ${step} answered ${response.status}`);
  }
  return page;
}

/** Files under dir changed since a time (node_modules and .git aside), a few levels deep. */
export function changedSince(dir: string, since: number, depth = 4): string[] {
  if (depth < 0) return [];
  let names: string[];
  try {
    names = readdirSync(dir);
  } catch {
    return [];
  }
  return names.flatMap((name) => {
    if (name === 'node_modules' || name === '.git') return [];
    const path = join(dir, name);
    try {
      const st = statSync(path);
      if (st.isDirectory()) return changedSince(path, since, depth - 1);
      return st.isFile() && st.mtimeMs >= since && st.size < 20_000_000 ? [path] : [];
    } catch {
      return [];
    }
  });
}

/** The files (of those given) that hold any of the secrets, as text. */
export function filesHolding(files: string[], secrets: string[]): string[] {
  return files.filter((file) => {
    try {
      const content = readFileSync(file, 'latin1');
      return secrets.some((secret) => content.includes(secret));
    } catch {
      return false;
    }
  });
}
