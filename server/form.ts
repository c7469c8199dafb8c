// A form post's fields, read once at the edge: strings only (these forms send no files), each without the invisible
// and bidirectional control characters (calc's withoutInvisible), so that no typed, pasted or edited text carries
// one into the case, the note, the handover, the page or the map.
import type { Context } from 'hono';
import { withoutInvisible } from '../calc/index.ts';
import type { FormValues } from '../views/paths.ts';

/** The form's string fields without invisible controls; 'malformed' for a body that cannot be read as a form. */
export async function formStrings(c: Context): Promise<FormValues | 'malformed'> {
  let body: Awaited<ReturnType<typeof c.req.parseBody>>;
  try {
    body = await c.req.parseBody();
  } catch {
    // a multipart body without its boundary, or garbage: the client's fault, answered as such
    return 'malformed';
  }
  const out: FormValues = {};
  for (const [key, value] of Object.entries(body))
    if (typeof value === 'string') out[withoutInvisible(key)] = withoutInvisible(value);
  return out;
}
