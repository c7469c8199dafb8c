// Checks that hold for every note, whatever the case: no leaked placeholders, no empty headings or
// bullets, every number with its unit, the cautions present.
import type { Note } from '../../templates/index.ts';

/** Words that must never reach a note: a missing value printed as text. */
export const LEAKS = /\b(undefined|null|NaN|Infinity)\b|\[object Object\]/;

/** The cautions every note carries (clinical-scope section 9), by a phrase of each. */
export const CAUTION_PHRASES = [
  /licensed clinician/i,
  /air bubbles/i,
  /delay to analysis/i,
  /temperature correction/i,
  /this patient's/i,
  /local protocols/i,
  /critical-value polic/i,
  /steady state/i,
  /senior review/i,
];

/** The body of one plain-text section of a note, up to the next upper-case heading ('' when it is absent). */
export function section(text: string, heading: string): string {
  const start = text.indexOf(`\n${heading}\n`);
  if (start < 0) return '';
  const rest = text.slice(start + heading.length + 2);
  const next = rest.search(/\n[A-Z][A-Z0-9 ()/,-]+\n/);
  return next < 0 ? rest : rest.slice(0, next);
}

/** Heading level of a line (1 = top), or 0 when it is not a heading. */
function headingLevel(line: string, markdown: boolean): number {
  if (markdown) return /^(#{1,6}) \S/.exec(line)?.[1]?.length ?? 0;
  if (/^[A-Z][A-Z0-9 ()/,-]+$/.test(line)) return 1; // "INTERPRETATION"
  if (/^[A-Z][A-Za-z ]+:$/.test(line)) return 2; // "Result:"
  return 0;
}

/** Headings with nothing under them before the next heading of the same or a higher rank, or the end. */
export function emptyHeadings(text: string, markdown: boolean): string[] {
  const lines = text.split('\n');
  const out: string[] = [];
  lines.forEach((line, i) => {
    const level = headingLevel(line, markdown);
    if (!level) return;
    const next = lines.slice(i + 1).find((l) => l.trim() !== '');
    const nextLevel = next === undefined ? 0 : headingLevel(next, markdown);
    if (next === undefined || (nextLevel > 0 && nextLevel <= level)) out.push(line);
  });
  return out;
}

/** Bullets with no text, or text that is only punctuation. */
export const danglingBullets = (text: string): string[] =>
  text.split('\n').filter((l) => /^\s*[-*]\s*[.,;:]*\s*$/.test(l));

// Units the note prints (UCUM-style labels as clinicians write them).
const UNIT = String.raw`(?:mmHg|kPa|mmol/L|nmol/L|mOsm/kg|g/dL|g/L|mg/dL|µmol/L|mL/kg PBW|mL/min|mL/dL|mL|L/min|cmH2O|kg|cm|%|/min|min|years|°C|m|s|h)(?![A-Za-z])`;
const NUMBER = String.raw`-?\d+(?:\.\d+)?`;

/**
 * Numbers printed without a unit. Dimensionless quantities are allowed where the trade writes them bare:
 * pH, FiO2, the delta ratio, the SpO2/FiO2 and ventilatory ratios, VD/VT, a failure "type", a year, a date or time.
 */
export function unitlessNumbers(text: string): string[] {
  const out: string[] = [];
  // sentences about a dimensionless ratio are left out whole
  const sentences = text
    .split(/(?<=\.)\s+|\n/)
    .filter((s) => !/delta ratio|SpO2\/FiO2|ventilatory ratio|VD\/VT/i.test(s));
  const token = new RegExp(String.raw`(?<![\w.\-/])(${NUMBER}(?:-${NUMBER})?)(?![\w.]*\d)`, 'g');
  for (const s of sentences) {
    const clean = s
      .replace(/\d{4}-\d{2}-\d{2}( \d{2}:\d{2})?/g, ' ')
      .replace(/\b\d{1,2}:\d{2}\b/g, ' ');
    for (const m of clean.matchAll(token)) {
      const before = clean.slice(0, m.index).trimEnd();
      const after = clean.slice((m.index ?? 0) + m[0].length);
      if (new RegExp(String.raw`^\s?${UNIT}`).test(after)) continue;
      if (/(pH|pH of|pH about|FiO2|FiO2 above|type)$/.test(before)) continue;
      if (/^\s?global/.test(after)) continue; // "2024 global definition"
      // "61 to 48 mmHg", "4-6 mmHg": the first number of a range shares the unit of the second
      if (new RegExp(String.raw`^ to ${NUMBER} ?${UNIT}`).test(after)) continue;
      // a pH range or a pH limit: "pH 7.22 to 7.31", "pH 7.10 (below 7.20)"
      if (/pH( of)? \d\.\d\d( is)? (to|\(?(below|above|at or above)( the limit of)?)$/.test(before))
        continue;
      // the signed change after a pH pair: "pH 7.22 to 7.31 (+0.09)"
      if (/pH \d\.\d\d to \d\.\d\d \([+-]$/.test(before)) continue;
      out.push(`${m[0]} in "${s.trim()}"`);
    }
  }
  return out;
}

/** Every general problem of one rendered note. */
export function noteProblems(note: Note): string[] {
  const md = note.format === 'markdown';
  const problems: string[] = [];
  for (const [part, text] of [
    ['line', note.line],
    ['text', note.text],
    ['full', note.full],
    ['handover', note.handover],
  ] as const) {
    if (!text.trim()) problems.push(`${part} is empty`);
    const leak = text.match(LEAKS);
    if (leak) problems.push(`${part} prints "${leak[0]}"`);
    for (const h of emptyHeadings(text, md)) problems.push(`${part} has an empty heading "${h}"`);
    for (const b of danglingBullets(text)) problems.push(`${part} has a dangling bullet "${b}"`);
    if (/ {2,}/.test(text.replace(/^ +/gm, ''))) problems.push(`${part} has doubled spaces`);
    if (/\s[,.;:](?!\d)/.test(text)) problems.push(`${part} has a space before punctuation`);
    for (const n of unitlessNumbers(text)) problems.push(`${part}: number without a unit: ${n}`);
  }
  if (note.line.includes('\n')) problems.push('line spans more than one line');
  for (const phrase of CAUTION_PHRASES) {
    if (!phrase.test(note.text)) problems.push(`text lacks the caution ${phrase}`);
    if (!phrase.test(note.full)) problems.push(`full lacks the caution ${phrase}`);
  }
  if (!/decision support/i.test(note.handover)) problems.push('handover lacks its caution line');
  return problems;
}
