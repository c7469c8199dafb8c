// The 64 KiB body limit over real HTTP (Node's parser, @hono/node-server): a declared Content-Length is judged
// from the header, a chunked body of unknown length is counted as it arrives. Both must answer 413 above the
// limit and let a case through below it.
import type { AddressInfo } from 'node:net';
import { serve, type ServerType } from '@hono/node-server';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createApp } from '../../server/app.ts';
import { BODY_LIMIT_BYTES } from '../../server/errors.ts';

let server: ServerType;
let base = '';
beforeAll(async () => {
  await new Promise<void>((resolve) => {
    server = serve(
      { fetch: createApp().fetch, port: 0, hostname: '127.0.0.1' },
      (info: AddressInfo) => {
        base = `http://127.0.0.1:${info.port}`;
        resolve();
      },
    );
  });
});
afterAll(
  () =>
    new Promise<void>((resolve) => {
      server.close(() => resolve());
    }),
);

const CASE = { gas: { ph: 7.31, pco2: 48, hco3: 23.5 } };
const padded = (bytes: number) => JSON.stringify({ ...CASE, padding: 'x'.repeat(bytes) });
const chunked = (text: string) =>
  new ReadableStream<Uint8Array>({
    start(controller) {
      const bytes = new TextEncoder().encode(text);
      for (let i = 0; i < bytes.length; i += 4096) controller.enqueue(bytes.slice(i, i + 4096));
      controller.close();
    },
  });
const post = (
  body: string | ReadableStream<Uint8Array>,
  path = '/api/interpret',
  type = 'application/json',
) =>
  fetch(base + path, {
    method: 'POST',
    headers: { 'content-type': type },
    body,
    duplex: 'half',
  } as RequestInit);

describe('the body limit over HTTP', () => {
  it('a case with a declared length below the limit is read', async () => {
    const res = await post(JSON.stringify(CASE));
    expect(res.status).toBe(200);
    expect((await res.json()).note.line).toMatch(/^ABG pH 7.31/);
  });

  it('a declared length over 64 KiB is refused with 413 before the body is read', async () => {
    const res = await post(padded(BODY_LIMIT_BYTES));
    expect(res.status).toBe(413);
    expect((await res.json()).errors[0].message).toMatch(/64 KiB/);
  });

  it('a chunked body is counted: 413 over the limit, read under it', async () => {
    const over = await post(chunked(padded(BODY_LIMIT_BYTES)));
    expect(over.status).toBe(413);
    const under = await post(chunked(JSON.stringify(CASE)));
    expect(under.status).toBe(200);
  });

  it("the page's forms have the same limit, both ways", async () => {
    const form = new URLSearchParams({
      case: padded(BODY_LIMIT_BYTES),
      step: 'gas',
      action: 'next',
    }).toString();
    expect((await post(form, '/step', 'application/x-www-form-urlencoded')).status).toBe(413);
    expect((await post(chunked(form), '/step', 'application/x-www-form-urlencoded')).status).toBe(
      413,
    );
  });
});
