// Errors a client can cause, answered in the contract's shape; never a 500 for client input.
import type { Context } from 'hono';
import type { ContentfulStatusCode } from 'hono/utils/http-status';
import { withoutInvisible } from '../calc/index.ts';

export const BODY_LIMIT_BYTES = 64 * 1024;

export function jsonError(
  c: Context,
  status: ContentfulStatusCode,
  message: string,
  path = '(body)',
) {
  return c.json({ ok: false, errors: [{ path, message }] }, status);
}

/** The most errors an answer lists; the rest are counted in one last entry ("and N more"). */
export const MAX_LISTED_ERRORS = 20;

export interface FieldError {
  path: string;
  message: string;
}

/**
 * At most MAX_LISTED_ERRORS errors, then one entry that counts the rest: thousands of unknown keys would
 * otherwise come back as half a megabyte. Each path and message is shown without invisible controls (an
 * unknown key is echoed in its path).
 */
export function boundedErrors(errors: readonly FieldError[]): FieldError[] {
  const listed = errors.slice(0, MAX_LISTED_ERRORS).map((e) => ({
    ...e,
    path: withoutInvisible(e.path),
    message: withoutInvisible(e.message),
  }));
  const rest = errors.length - listed.length;
  if (rest > 0)
    listed.push({
      path: '(more)',
      message: `and ${rest} more error${rest === 1 ? '' : 's'}: fix these first`,
    });
  return listed;
}
