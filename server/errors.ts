// Errors a client can cause, answered in the contract's shape; never a 500 for client input.
import type { Context } from 'hono';
import type { ContentfulStatusCode } from 'hono/utils/http-status';

export const BODY_LIMIT_BYTES = 64 * 1024;

export function jsonError(
  c: Context,
  status: ContentfulStatusCode,
  message: string,
  path = '(body)',
) {
  return c.json({ ok: false, errors: [{ path, message }] }, status);
}
