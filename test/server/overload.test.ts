// Timeouts and overload (the review's item 9): a client that never finishes its headers is answered 408 and
// closed (Node's headersTimeout, about 10 s), a process holds at most MAX_CONNECTIONS connections (Node's
// maxConnections), and while the event loop lags (Node's monitorEventLoopDelay) a request is answered 503 with
// Retry-After at once. No check here is a speed: the lag is made by holding the loop 300 ms at a time against a
// limit of 100 ms.
import { Socket } from 'node:net';
import { describe, expect, it, vi } from 'vitest';
import { createApp } from '../../server/app.ts';
import { RETRY_AFTER_SECONDS, shedWhenBusy, watchEventLoop } from '../../server/overload.ts';
import { Hono } from 'hono';
import { START_MS, start } from './processHarness.ts';

vi.setConfig({ testTimeout: 3 * START_MS });

describe('503 with Retry-After while the event loop lags', () => {
  it('answers at once while busy, and /healthz still passes', async () => {
    let busy = true;
    const app = createApp({ busy: () => busy });
    const res = await app.request('/api/interpret', { method: 'POST' });
    expect(res.status).toBe(503);
    expect(res.headers.get('retry-after')).toBe(String(RETRY_AFTER_SECONDS));
    expect(res.headers.get('cache-control')).toBe('no-store');
    expect((await app.request('/healthz')).status).toBe(200);
    busy = false;
    expect((await app.request('/api/interpret', { method: 'POST' })).status).toBe(415);
  });

  it('past maxInFlight requests in progress, the next is answered 503 at once, and taken again once one ends', async () => {
    let release: () => void = () => {};
    const held = new Promise<void>((resolve) => {
      release = resolve;
    });
    const app = new Hono();
    app.use(shedWhenBusy(() => false, 2));
    app.get('/slow', async (c) => {
      await held;
      return c.text('done');
    });
    const first = app.request('/slow');
    const second = app.request('/slow');
    const third = await app.request('/slow');
    expect(third.status).toBe(503);
    expect(third.headers.get('retry-after')).toBe(String(RETRY_AFTER_SECONDS));
    release();
    expect([(await first).status, (await second).status]).toEqual([200, 200]);
    expect((await app.request('/slow')).status).toBe(200);
  });

  it('the watch says lagging while the loop is held 300 ms at a time, against a 100 ms limit and not a 5 s one', async () => {
    const low = watchEventLoop(100);
    const high = watchEventLoop(5000);
    const seen = { low: false, high: false };
    try {
      // a loop that keeps running long turns, as under a flood of requests; every turn lets the timers run
      for (let turn = 0; turn < 20 && !seen.low; turn++) {
        const until = Date.now() + 300;
        while (Date.now() < until) {
          // one long turn: no timer runs
        }
        await new Promise((resolve) => setTimeout(resolve, 0));
        seen.low ||= low.lagging();
        seen.high ||= high.lagging();
      }
      expect(seen).toEqual({ low: true, high: false });
    } finally {
      low.stop();
      high.stop();
    }
  });
});

const connect = (port: number) =>
  new Promise<Socket>((resolve, reject) => {
    const socket = new Socket();
    socket.on('error', () => {});
    socket.connect(port, '127.0.0.1', () => resolve(socket));
    socket.once('error', reject);
  });
const closed = (socket: Socket) =>
  new Promise<string>((resolve) => {
    let data = '';
    socket.on('data', (b) => {
      data += b.toString();
    });
    socket.on('close', () => resolve(data));
  });

describe('Node limits on the real server', () => {
  it('a connection cap, and 408 for headers never finished', async () => {
    const r = await start('server/main.ts', { REQUEST_LOG: 'off', MAX_CONNECTIONS: '10' });
    const port = Number(new URL(r.base).port);
    try {
      // a slow client: the request line and one header, then nothing
      const slow = await connect(port);
      const slowEnd = closed(slow);
      slow.write('GET /healthz HTTP/1.1\r\nHost: 127.0.0.1\r\n');
      // nine more hold the cap; the next five are closed by the server without an answer
      const held = await Promise.all(Array.from({ length: 9 }, () => connect(port)));
      const over = await Promise.all(Array.from({ length: 5 }, () => connect(port)));
      const overEnds = await Promise.all(over.map(closed));
      expect(overEnds).toEqual(['', '', '', '', '']);
      expect(await slowEnd).toMatch(/^HTTP\/1\.1 408 /);
      for (const socket of held) socket.destroy();
    } finally {
      r.child.kill('SIGTERM');
      expect(await r.exited).toBe(0);
    }
  });
});
