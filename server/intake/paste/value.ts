// One label's value: the marks right after the label (temperature, alveolar, a unit in brackets), then the text up
// to the next label read as one number with its unit, or as a question when it is not one clear result.
import { NUM, parseNumber } from './text.ts';
import { UNIT_ANYWHERE, unitAt, type UnitToken } from './units.ts';

export interface Qualifiers {
  end: number;
  corrected: boolean;
  alveolar: boolean;
  unit: UnitToken | null;
}

/** Parenthesised marks right after a label: (T), (37 °C), (kPa), (A), (P), a reference range ... */
export function readQualifiers(line: string, from: number): Qualifiers {
  const q: Qualifiers = { end: from, corrected: false, alveolar: false, unit: null };
  for (let guard = 0; guard < 6; guard++) {
    const rest = line.slice(q.end, q.end + 80); // qualifiers are short; a bounded look keeps long lines linear
    const at = /^\s*(?:@|at)\s*(\d+(?:[.,]\d+)?)\s*°?\s*C(?![A-Za-z])/i.exec(rest);
    if (at) {
      if (Number(at[1]!.replace(',', '.')) !== 37) q.corrected = true;
      q.end += at[0].length;
      continue;
    }
    const m = /^\s*[([]([^()[\]]{0,30})[)\]]/.exec(rest);
    if (!m) break;
    const content = m[1]!.trim();
    const temp = /^(\d+(?:[.,]\d+)?)\s*°?\s*C?$/i.exec(content);
    if (
      /^(?:t|temp\.?|temp\.?\s*corr(?:ected)?\.?|pt\.?\s*temp\.?|pat(?:ient)?\.?\s*temp\.?)$/i.test(
        content,
      )
    )
      q.corrected = true;
    else if (temp) {
      if (Number(temp[1]!.replace(',', '.')) !== 37) q.corrected = true;
    } else if (/^(?:A|A-a|a\/A|alv(?:eolar)?|alv\.)$/.test(content)) q.alveolar = true;
    else {
      const unit = unitAt(content);
      if (unit && unit.length === content.length) q.unit = unit.unit;
    }
    q.end += m[0].length;
  }
  return q;
}

export type SegmentValue =
  | { kind: 'value'; value: number; unit: UnitToken | null }
  | { kind: 'none' }
  | { kind: 'question'; reason: string; value?: number };

const FLAG_TOKENS =
  /^(?:H|L|HH|LL|A|N|C|c|\*+|!+|↑+|↓+|high|low|crit(?:ical)?|abn(?:ormal)?|normal|calc(?:ulated)?\.?|est(?:imated)?\.?|meas(?:ured)?\.?|ref(?:erence)?\.?|range|ref\.?\s*range|n|r|flag|result|value|units?|[:=|;,.\-/])$/i;
const RANGE = String.raw`[-+]?${NUM}(?:-|\s+-\s+|\s+to\s+)[-+]?${NUM}`;

/** The text after a label (and its qualifiers) up to the next label. */
export function readSegment(segment: string, qualifierUnit: UnitToken | null): SegmentValue {
  let s = segment;
  let unit: UnitToken | null = qualifierUnit;
  // before the value: separators, a unit in brackets, a reference range, a flag
  for (let guard = 0; guard < 8; guard++) {
    const sep = /^[\s:=|;]+/.exec(s);
    if (sep) {
      s = s.slice(sep[0].length);
      continue;
    }
    // "PH, ARTERIAL  7.22": the specimen or method written after the label
    const specimen =
      /^,?\s*(?:arterial|venous|capillary|art\.|ven\.|cap\.|whole\s+blood|blood|serum|plasma|POC|point[-\s]of[-\s]care|measured|meas\.|calc(?:ulated)?\.?)(?![A-Za-z])/i.exec(
        s,
      );
    if (specimen) {
      s = s.slice(specimen[0].length);
      continue;
    }
    const group = /^[([]([^()[\]]{0,40})[)\]]/.exec(s);
    if (group) {
      const u = unitAt(group[1]!.trim());
      if (u && u.length === group[1]!.trim().length && !unit) unit = u.unit;
      s = s.slice(group[0].length);
      continue;
    }
    const range = new RegExp(`^${RANGE}(?![\\d.,])`).exec(s);
    if (range) {
      s = s.slice(range[0].length);
      continue;
    }
    const flag = /^(?:H|L|HH|LL|\*+|!+|↑+|↓+)\s+/.exec(s);
    if (flag) {
      s = s.slice(flag[0].length);
      continue;
    }
    break;
  }
  const bound = new RegExp(`^([<>]=?)\\s*(${NUM})`).exec(s);
  if (bound)
    return {
      kind: 'question',
      reason: `"${bound[0]}" is a bound, not a value: enter the number by hand if it is meant`,
    };
  const m = new RegExp(`^([-+]?)(${NUM})(?![\\d/:])`).exec(s);
  if (!m) return { kind: 'none' };
  const parsed = parseNumber(m[2]!);
  if (parsed === 'ambiguous')
    return {
      kind: 'question',
      reason: `"${m[2]}" could be a decimal comma or a thousands separator: enter the number by hand`,
    };
  if (/^\d{1,2}[.,]\d{1,2}[.,]\d{2,4}/.test(s.slice(m[1]!.length))) return { kind: 'none' }; // a date, not a value
  const value = m[1] === '-' ? -parsed : parsed;
  let rest = s.slice(m[0].length);
  // a flag stuck to the number: 7.31L, 48*, 6.4H
  rest = rest.replace(/^(?:HH|LL|H|L|\*+|!+|↑+|↓+)(?![A-Za-z0-9])/, ' ');
  const direct = unitAt(rest.replace(/^\s+/, ''));
  if (direct) {
    if (unit && unit !== direct.unit)
      return {
        kind: 'question',
        reason: `two units (${unit} and ${direct.unit}) for one value`,
        value,
      };
    unit = direct.unit;
    rest = rest.replace(/^\s+/, '').slice(direct.length);
  }
  // after the value: flags, reference ranges, comments in brackets, a unit in a later column
  let leftover = rest;
  const groups = leftover.match(/[([][^()[\]]{0,60}[)\]]/g) ?? [];
  for (const g of groups) {
    const inner = g.slice(1, -1).trim();
    const u = unitAt(inner);
    if (u && u.length === inner.length && !unit) unit = u.unit;
  }
  leftover = leftover
    .replace(/[([][^()[\]]{0,60}[)\]]/g, ' ')
    .replace(new RegExp(RANGE, 'g'), ' ')
    .replace(new RegExp(`[<>]=?\\s*[-+]?${NUM}`, 'g'), ' ')
    .replace(/\d{1,2}[/.-]\d{1,2}[/.-]\d{2,4}/g, ' ')
    .replace(/\d{1,2}:\d{2}(?::\d{2})?/g, ' ')
    .replace(new RegExp(`${NUM}\\s*°\\s*[CF]`, 'gi'), ' ');
  let conflict: UnitToken | null = null;
  leftover = leftover.replace(UNIT_ANYWHERE, (u) => {
    const found = unitAt(u);
    if (found && !unit) unit = found.unit;
    else if (found && unit && found.unit !== unit) conflict = found.unit;
    return ' ';
  });
  if (conflict)
    return {
      kind: 'question',
      reason: `two units (${unit} and ${conflict}) beside one value`,
      value,
    };
  const tokens = leftover.split(/[\s\t]+/).filter((t) => t && !FLAG_TOKENS.test(t));
  if (tokens.some((t) => /\d/.test(t)))
    return {
      kind: 'question',
      reason: `more than one number after the label (${tokens.filter((t) => /\d/.test(t)).join(' ')}): which one is the result?`,
      value,
    };
  if (tokens.some((t) => /[A-Za-z]{2,}/.test(t)))
    return {
      kind: 'question',
      reason: `words after the value (${tokens.join(' ')}): check it is the result`,
      value,
    };
  return { kind: 'value', value, unit };
}
