// Overload: when the event loop lags, a request waits behind every request already queued. Node's own
// monitorEventLoopDelay measures that lag; once its mean has been above the limit in SUSTAINED samples in a row
// (one slow request, a cold start's first renders, a collection pause, are a single long turn, not a queue), a
// request is answered at once with 503 and Retry-After instead of queueing for seconds, until a sample is below.
// A cap on the requests in progress (MAX_IN_FLIGHT) refuses a burst the same way as it arrives, before its lag
// can be measured. /healthz is always answered, so that a liveness probe does not restart a process that is only
// busy.
import type { Context, MiddlewareHandler } from 'hono';
import { monitorEventLoopDelay } from 'node:perf_hooks';

/** how often the lag is read, in ms: short enough to react within a fraction of a second */
const SAMPLE_MS = 250;
/** samples in a row above the limit before requests are refused: about three quarters of a second of lag */
const SUSTAINED = 3;
/** the histogram's resolution in ms, subtracted from what it reads (it is the timer's own period) */
const RESOLUTION_MS = 10;

export interface LoopWatch {
  /** the event loop's mean delay in the last sample is above the limit */
  lagging(): boolean;
  stop(): void;
}

export function watchEventLoop(limitMs: number): LoopWatch {
  const histogram = monitorEventLoopDelay({ resolution: RESOLUTION_MS });
  histogram.enable();
  let lagging = false;
  // the histogram is never reset (a reset also forgets the time of its last tick, so that the next delay, the one
  // that matters under load, would go unrecorded): each sample's mean comes from the running count and mean
  let count = 0;
  let total = 0;
  let above = 0;
  const timer = setInterval(() => {
    const nowCount = histogram.count;
    const nowTotal = histogram.mean * nowCount;
    if (nowCount > count) {
      const meanMs = (nowTotal - total) / (nowCount - count) / 1e6 - RESOLUTION_MS;
      above = meanMs > limitMs ? above + 1 : 0;
      lagging = above >= SUSTAINED;
    }
    count = nowCount;
    total = nowTotal;
  }, SAMPLE_MS);
  timer.unref();
  return {
    lagging: () => lagging,
    stop: () => {
      clearInterval(timer);
      histogram.disable();
    },
  };
}

/** Seconds a refused client is asked to wait (Retry-After). */
export const RETRY_AFTER_SECONDS = 1;

const busyAnswer = (c: Context) =>
  c.json(
    {
      ok: false,
      errors: [{ path: '(server)', message: 'The server is busy: try again in a moment' }],
    },
    503,
    { 'retry-after': String(RETRY_AFTER_SECONDS), 'cache-control': 'no-store' },
  );

/**
 * 503 with Retry-After at once while busy() says so, or while maxInFlight requests are already in progress in
 * this process (a burst is refused as it arrives, before the lag it would cause can be measured); /healthz always
 * goes on.
 */
export function shedWhenBusy(busy: () => boolean, maxInFlight = Infinity): MiddlewareHandler {
  let inFlight = 0;
  return async (c, next) => {
    if (c.req.path === '/healthz') return next();
    if (busy() || inFlight >= maxInFlight) return busyAnswer(c);
    inFlight++;
    try {
      await next();
    } finally {
      inFlight--;
    }
  };
}
