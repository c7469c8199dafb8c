// FHIR JSON without invisible and bidirectional control characters: a JSON escape (\u202e) decodes into one, so
// the parsed document is cleaned, every string and every key, once where it enters (calc's withoutInvisible).
import { withoutInvisible } from '../../calc/index.ts';

type Container = Record<string, unknown> | unknown[];
const isContainer = (x: unknown): x is Container => typeof x === 'object' && x !== null;
const emptyLike = (x: Container): Container => (Array.isArray(x) ? [] : {});

/**
 * A copy of a JSON value with every string and key cleaned; the value given is left as it was. A loop, not
 * recursion: a 64 KiB body may nest thousands deep, and the stack must not overflow.
 */
export function withoutInvisibleDeep(value: unknown): unknown {
  if (typeof value === 'string') return withoutInvisible(value);
  if (!isContainer(value)) return value;
  const root = emptyLike(value);
  const pending: [Container, Container][] = [[value, root]];
  for (let pair = pending.pop(); pair !== undefined; pair = pending.pop()) {
    const [from, to] = pair;
    const copy = (item: unknown): unknown => {
      if (typeof item === 'string') return withoutInvisible(item);
      if (!isContainer(item)) return item;
      const child = emptyLike(item);
      pending.push([item, child]);
      return child;
    };
    if (Array.isArray(from)) {
      for (const item of from) (to as unknown[]).push(copy(item));
      continue;
    }
    // defineProperty: a key "__proto__" stays an own property, as JSON.parse made it, never the prototype
    for (const [key, item] of Object.entries(from))
      Object.defineProperty(to, withoutInvisible(key), {
        value: copy(item),
        enumerable: true,
        writable: true,
        configurable: true,
      });
  }
  return root;
}
