// Helpers for the H+/CO2 chart's tests: an invented case through the core, and the attributes of an SVG element.
import { interpret, type Findings } from '../../calc/index.ts';

export function findingsOf(input: unknown): Findings {
  const f = interpret(input as Parameters<typeof interpret>[0]);
  if (!f.ok) throw new Error(`the invented case should be accepted: ${JSON.stringify(f)}`);
  return f;
}

/** The attributes of the first element of a kind whose start tag holds the given text. */
export function attrs(svg: string, tag: string, has: string): Record<string, string> {
  const m = svg.match(new RegExp(`<${tag} [^>]*${has}[^>]*>`));
  if (!m) throw new Error(`no <${tag}> with ${has}`);
  return Object.fromEntries([...m[0].matchAll(/([\w-]+)="([^"]*)"/g)].map((a) => [a[1], a[2]]));
}

export const num = (s: string | undefined) => Number(s);
