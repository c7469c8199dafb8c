// Reading the page's HTML in tests: the hidden state, the open step, a text area.
import type { Hono } from 'hono';

export const unescapeHtml = (s: string) =>
  s
    .replace(/&quot;/g, '"')
    .replace(/&#39;/g, "'")
    .replace(/&lt;/g, '<')
    .replace(/&gt;/g, '>')
    .replace(/&amp;/g, '&');

export function hidden(html: string, name: string): string {
  const m = html.match(new RegExp(`<input type="hidden" name="${name}" value="([^"]*)"`));
  if (!m) throw new Error(`no hidden ${name} in the page`);
  return unescapeHtml(m[1]!);
}

export type State = {
  case: string;
  done: string;
  format: string;
  finished?: string;
  taken?: string;
};
/** The state a form carries: always the case, the answered steps and the format; Finish and the gas's time when set. */
export const stateOf = (html: string): State => {
  const state: State = {
    case: hidden(html, 'case'),
    done: hidden(html, 'done'),
    format: hidden(html, 'format'),
  };
  for (const name of ['finished', 'taken'] as const)
    if (html.includes(`<input type="hidden" name="${name}" value="`))
      state[name] = hidden(html, name);
  return state;
};
export const caseOf = (html: string) => JSON.parse(hidden(html, 'case')) as Record<string, unknown>;
export const openId = (html: string) =>
  html.match(/<li class="entry entry--open" id="step-([a-z]+)">/)?.[1] ?? null;
/** The open step's section (the form being asked). */
export const openStep = (html: string) =>
  html.match(
    /<li class="entry entry--open" id="step-([a-z]+)">([\s\S]*?)<\/li>\s*(?=<li|<\/ol>)/,
  )?.[0] ?? '';
export const textareaOf = (html: string, id: string) =>
  unescapeHtml(
    html.match(new RegExp(`<textarea id="${id}"[^>]*>([\\s\\S]*?)</textarea>`))?.[1] ?? '',
  );

export type Fields = Record<string, string>;

/** A form post as the page sends it (an htmx request unless htmx is false), read back as HTML. */
export const poster =
  (app: Pick<Hono, 'request'>) =>
  async (path: string, fields: Fields, htmx = true) => {
    const res = await app.request(path, {
      method: 'POST',
      headers: {
        'content-type': 'application/x-www-form-urlencoded',
        ...(htmx ? { 'hx-request': 'true' } : {}),
      },
      body: new URLSearchParams(fields).toString(),
    });
    return { status: res.status, html: await res.text(), headers: res.headers };
  };

/** The first screen, then an arterial sample and a gas typed in mmHg (the gas fields as the form names them). */
export async function typedGas(app: Pick<Hono, 'request'>, gas: Fields): Promise<string> {
  const post = poster(app);
  let html = await (await app.request('/')).text();
  for (const [step, fields] of [
    ['sample', { sample: 'arterial' }],
    ['gas', { 'units.pressure': 'mmHg', ...gas }],
  ] as const)
    html = (await post('/step', { ...stateOf(html), step, action: 'next', ...fields })).html;
  return html;
}

/**
 * Answer the open steps one after another, each step named in `answers` with its fields, any other skipped, until
 * the step `until` is open (null: until no step is, the draft). At most 20 steps: the caller checks where it ended.
 */
export async function walkSteps(
  app: Pick<Hono, 'request'>,
  html: string,
  until: string | null,
  answers: Record<string, Fields>,
): Promise<string> {
  const post = poster(app);
  for (
    let id = openId(html), n = 0;
    id !== null && id !== until && n < 20;
    id = openId(html), n++
  ) {
    const fields = answers[id] ? { ...answers[id], action: 'next' } : { action: 'skip' };
    html = (await post('/step', { ...stateOf(html), step: id, ...fields })).html;
  }
  return html;
}
