// The case as the page holds it: plain JSON addressed by the case's own paths ("gas.ph"), and what a form sends.
export type Json = Record<string, unknown>;
export type FormValues = Record<string, string | undefined>;

export const isObject = (x: unknown): x is Json =>
  x !== null && typeof x === 'object' && !Array.isArray(x);

export function getPath(obj: Json, path: string): unknown {
  let cur: unknown = obj;
  for (const key of path.split('.')) {
    if (cur === null || typeof cur !== 'object') return undefined;
    cur = (cur as Json)[key];
  }
  return cur;
}

// the case's own rule: an empty ventilator group says "on a ventilator, no settings yet", so it stays
const KEPT_WHEN_EMPTY = new Set(['ventilator']);

/** Set a value at a path; undefined removes it, and a group left empty goes too (except a top-level group that means something empty). */
export function setPath(obj: Json, path: string, value: unknown): void {
  const keys = path.split('.');
  const parents: Json[] = [];
  let cur = obj;
  for (const key of keys.slice(0, -1)) {
    parents.push(cur);
    const next = cur[key];
    if (next === null || typeof next !== 'object') {
      if (value === undefined) return;
      cur[key] = {};
    }
    cur = cur[key] as Json;
  }
  const last = keys.at(-1)!;
  if (value === undefined) delete cur[last];
  else cur[last] = value;
  if (value !== undefined) return;
  for (let i = keys.length - 2; i >= 0; i--) {
    const parent = parents[i]!;
    const key = keys[i]!;
    const child = parent[key] as Json;
    if (Object.keys(child).length === 0 && !(i === 0 && KEPT_WHEN_EMPTY.has(key)))
      delete parent[key];
    else break;
  }
}

const NUMBER = /^[-+]?(\d+([.,]\d*)?|[.,]\d+)$/;

/** A typed number; a comma is taken as the decimal mark. Anything else goes to the schema as typed, for its message. */
export function readNumber(raw: string | undefined): unknown {
  const text = (raw ?? '').trim().replace(/\u2212/g, '-');
  if (text === '') return undefined;
  if (NUMBER.test(text)) return Number(text.replace(',', '.'));
  return text;
}

/** The earlier gases of a case, when it holds any. */
export const earlierGases = (answers: Json): Json[] =>
  Array.isArray(answers.previous) ? answers.previous.filter(isObject) : [];

/** Remove the case's top-level groups left empty (but one whose emptiness means something). */
export function dropEmptyGroups(answers: Json): void {
  for (const [key, value] of Object.entries(answers))
    if (isObject(value) && Object.keys(value).length === 0 && !KEPT_WHEN_EMPTY.has(key))
      delete answers[key];
}
