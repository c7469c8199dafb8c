// A steady load for the process tests and the benchmark's cluster figures: `connections` keep-alive connections, each sending the next request as
// soon as the last is answered, and a count of what became of every request. "answered" is any HTTP answer
// (a reading, or a fast 503); "refused" a new connection the server no longer accepts (it has stopped listening:
// nothing was sent); "unaccepted" a new connection reset before any answer: it reached the listening socket's
// queue as the socket closed, and no server code ever read it; "lost" a request sent on a connection the server
// had already taken (a reused keep-alive connection) and never answered; "timedOut" a request not answered within
// the time given (the load's timeoutMs).
import { Agent, request } from 'node:http';

export interface Tally {
  sent: number;
  answered: number;
  statuses: Record<number, number>;
  refused: number;
  unaccepted: number;
  lost: number;
  timedOut: number;
  errors: Record<string, number>;
}

const BODY = JSON.stringify({ gas: { ph: 7.31, pco2: 48, po2: 80, hco3: 23.5 } });

type Failure = { error: NodeJS.ErrnoException; reused: boolean };

function once(
  base: string,
  agent: Agent,
  timeoutMs: number,
): Promise<number | Failure | 'timeout'> {
  return new Promise((resolve) => {
    const req = request(
      `${base}/api/interpret`,
      {
        method: 'POST',
        agent,
        headers: { 'content-type': 'application/json', 'content-length': Buffer.byteLength(BODY) },
      },
      (res) => {
        res.resume();
        res.on('end', () => resolve(res.statusCode ?? 0));
        res.on('error', (error) => resolve({ error, reused: true }));
      },
    );
    req.on('error', (error) => resolve({ error, reused: req.reusedSocket }));
    req.setTimeout(timeoutMs, () => {
      resolve('timeout');
      req.destroy();
    });
    req.end(BODY);
  });
}

export interface Load {
  tally: Tally;
  /** requests sent and not yet ended, now */
  inFlight(): number;
  /** stop sending; resolves once every request sent has ended */
  finish(): Promise<Tally>;
  /** resolves when `n` requests have been answered */
  answered(n: number): Promise<void>;
}

/** `connections` connections sending requests one after another until finish(); a request unanswered after
 *  timeoutMs (default 10 s, as autocannon's) is counted as timed out and its connection dropped. */
export function startLoad(base: string, connections: number, timeoutMs = 10_000): Load {
  const agent = new Agent({ keepAlive: true, maxSockets: connections });
  const tally: Tally = {
    sent: 0,
    answered: 0,
    statuses: {},
    refused: 0,
    unaccepted: 0,
    lost: 0,
    timedOut: 0,
    errors: {},
  };
  let going = true;
  const waiters: { n: number; resolve: () => void }[] = [];
  const loop = async () => {
    while (going) {
      tally.sent++;
      const outcome = await once(base, agent, timeoutMs);
      if (outcome === 'timeout') {
        tally.timedOut++;
        continue;
      }
      if (typeof outcome === 'number') {
        tally.answered++;
        tally.statuses[outcome] = (tally.statuses[outcome] ?? 0) + 1;
        for (const w of waiters.filter((w) => tally.answered >= w.n)) w.resolve();
        continue;
      }
      const code = outcome.error.code ?? outcome.error.message;
      tally.errors[code] = (tally.errors[code] ?? 0) + 1;
      if (code === 'ECONNREFUSED') {
        // the server no longer listens: this connection's work is over
        tally.refused++;
        return;
      }
      if (outcome.reused) tally.lost++;
      else tally.unaccepted++;
    }
  };
  const loops = Array.from({ length: connections }, loop);
  return {
    tally,
    inFlight: () =>
      tally.sent - tally.answered - tally.refused - tally.unaccepted - tally.lost - tally.timedOut,
    answered: (n) =>
      new Promise((resolve) => {
        if (tally.answered >= n) resolve();
        else waiters.push({ n, resolve });
      }),
    finish: async () => {
      going = false;
      await Promise.all(loops);
      agent.destroy();
      return tally;
    },
  };
}
