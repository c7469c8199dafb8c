// The request log: method, path, status and time, one line a request. The path is the URL's own percent-encoded
// form with anything but printable ASCII dropped and a length cap, so that no request can write a line (or a
// terminal escape) of its own into the log, and a case value carried in a query never appears: only the path.
import type { MiddlewareHandler } from 'hono';

/** The longest path written to the log; a longer one is cut and ends in "...". */
export const LOGGED_PATH_CHARS = 120;
const UNPRINTABLE = /[^\x21-\x7e]/g;

/** The path as the log shows it: percent-encoded, printable ASCII only, at most LOGGED_PATH_CHARS characters. */
export function loggedPath(url: string): string {
  let path: string;
  try {
    path = new URL(url).pathname;
  } catch {
    path = '(unreadable)';
  }
  const printable = path.replace(UNPRINTABLE, '');
  return printable.length > LOGGED_PATH_CHARS
    ? `${printable.slice(0, LOGGED_PATH_CHARS)}...`
    : printable;
}

export const requestLog =
  (log: (line: string) => void): MiddlewareHandler =>
  async (c, next) => {
    const start = performance.now();
    await next();
    const method = c.req.method.replace(UNPRINTABLE, '').slice(0, 16);
    log(
      `${method} ${loggedPath(c.req.url)} ${c.res.status} ${(performance.now() - start).toFixed(1)}ms`,
    );
  };
