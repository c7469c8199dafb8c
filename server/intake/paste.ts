// Paste intake: an analyser printout, lab result lines or the trade shorthand pH/PaCO2/PaO2/HCO3 as text
// -> a draft case, what was read (to confirm), what must be asked, and what was left unused.
// Pure: no I/O. A value is filled only when its field and unit are clear; anything else becomes a question.
// Nothing here converts a unit: the case carries the clinician's units and calc/ converts once, at its edge.
import {
  FIELD,
  acidBase,
  inRange,
  resolveUnits,
  units as U,
  type FieldPath,
  type FieldSpec,
  type PressureUnit,
  type Units,
} from '../../calc/index.ts';

const { hendersonPco2, hydrogenIon } = acidBase;
const kpaToMmHg = (kpa: number) => kpa * U.MMHG_PER_KPA;
import type { CaseInput as IntakeCase } from '../../calc/index.ts';
import { missingGas, setCaseValue, type Question, type Sample } from './case.ts';

/** The case fields the paste reader fills. */
type CasePath =
  | 'gas.ph'
  | 'gas.pco2'
  | 'gas.po2'
  | 'gas.hco3'
  | 'gas.baseExcess'
  | 'gas.sao2'
  | 'gas.lactate'
  | 'gas.hb'
  | 'chemistry.na'
  | 'chemistry.k'
  | 'chemistry.cl'
  | 'chemistry.albumin'
  | 'chemistry.glucose'
  | 'chemistry.urea'
  | 'chemistry.creatinine'
  | 'chemistry.osmolality'
  | 'oxygen.fio2'
  | 'oxygen.spo2'
  | 'context.temperatureC';

// ---------- public shapes ----------

/** Where the unit of a read value came from. */
export type UnitSource =
  | 'text' // written beside the value
  | 'printout' // written on another pressure line or in a column header of the same paste
  | 'magnitude' // the only unit in which the number is plausible
  | 'implied'; // the quantity has one unit in practice (pH none, Na mmol/L, FiO2 fraction or percent)

export interface ReadValue {
  path: CasePath;
  value: number;
  /** the unit as read: 'mmHg', 'kPa', 'mmol/L', '%', 'fraction', 'g/dL', ... ('' for pH) */
  unit: string;
  sourceText: string;
  /** 1-based line of the (tag-stripped) paste */
  line: number;
  unitFrom: UnitSource;
  note?: string;
}

/** A label that was recognised but deliberately not used, with the reason. */
export interface Skipped {
  sourceText: string;
  reason: string;
  line: number;
}

export interface PasteResult {
  /** a partial case of the interface contract; units set from what was read */
  case: IntakeCase;
  read: ReadValue[];
  questions: Question[];
  /** lines (or parts of lines) that gave nothing */
  ignored: string[];
  skipped: Skipped[];
  /** of pH, PaCO2 and HCO3 (the schema needs two), the ones neither read nor asked about */
  missing: CasePath[];
}

/** The trade shorthand pH/PaCO2/PaO2/HCO3, as written; null for a place holder such as '-'. */
export interface Shorthand {
  ph: number;
  pco2: number | null;
  po2: number | null;
  hco3: number | null;
  /** the pressure unit written after it, if any */
  unit: PressureUnit | null;
  sourceText: string;
}

export const MAX_PASTE_CHARS = 50_000; // with the rest of the form, within the 64 KiB body limit

// ---------- text preparation ----------

// One character for one character, so a position in the normalised line is the same in the original.
const CHAR_MAP: Record<string, string> = {
  '\u2212': '-',
  '\u2013': '-',
  '\u2014': '-',
  '\u2010': '-',
  '\u2011': '-',
  '\u00a0': ' ',
  '\u2009': ' ',
  '\u202f': ' ',
  '\u2082': '2',
  '\u2083': '3',
  '\u207b': '-',
  '\u207a': '+',
  '\u00b5': 'u',
  '\u03bc': 'u',
  '\uff05': '%',
  '\u2264': '<',
  '\u2265': '>',
};
const normalizeChars = (s: string): string =>
  s.replace(
    /[\u2212\u2013\u2014\u2010\u2011\u00a0\u2009\u202f\u2082\u2083\u207b\u207a\u00b5\u03bc\uff05\u2264\u2265]/g,
    (ch) => CHAR_MAP[ch] ?? ch,
  );

// A tag never spans lines here: a stray "<" in a printout ("K <3.0") must not swallow the lines after it.
const HTML_TAG =
  /<\/?(?:html|head|body|table|thead|tbody|tr|td|th|p|div|br|span|li|ul|ol|pre|font|b|strong|em|h[1-6]|section|article|a|img|meta|title|style|script)(?:\s[^<>\n]{0,500})?\/?>/i;
const ANY_TAG =
  /<\/?[A-Za-z][\w-]{0,20}(?:\s[^<>\n]{0,500})?\/?>|<!--[^\n]{0,500}?-->|<!doctype[^<>\n]{0,100}>/gi;

/** Remove <script>...</script> (or style) blocks in one pass. */
function dropBlocks(text: string, tag: 'script' | 'style'): string {
  const lower = text.toLowerCase();
  let out = '';
  let i = 0;
  for (;;) {
    const start = lower.indexOf(`<${tag}`, i);
    const end = start < 0 ? -1 : lower.indexOf(`</${tag}`, start);
    if (start < 0 || end < 0) return out + text.slice(i);
    const close = lower.indexOf('>', end);
    out += `${text.slice(i, start)} `;
    i = close < 0 ? text.length : close + 1;
  }
}

/** Results copied from a web page arrive as HTML: keep the text, one table row per line. */
function stripHtml(text: string): string {
  if (!HTML_TAG.test(text)) return text;
  return dropBlocks(dropBlocks(text, 'script'), 'style')
    .replace(/<br\s*\/?>/gi, '\n')
    .replace(/<\/(?:p|div|tr|li|h[1-6]|table|title|pre|ul|ol)\s*>/gi, '\n')
    .replace(/<\/(?:td|th)\s*>/gi, '\t')
    .replace(ANY_TAG, '')
    .replace(/&nbsp;/gi, ' ')
    .replace(/&lt;/gi, '<')
    .replace(/&gt;/gi, '>')
    .replace(/&micro;/gi, 'µ')
    .replace(/&#(\d{1,6});/g, (_, d: string) => String.fromCodePoint(Math.min(Number(d), 0x10ffff)))
    .replace(/&amp;/gi, '&');
}

// ---------- numbers and units ----------

const NUM = String.raw`\d+(?:[.,]\d+)?`;

/** A decimal comma with one or two digits is a decimal; three digits could be a thousands separator. */
function parseNumber(token: string): number | 'ambiguous' {
  const comma = /^(\d+),(\d+)$/.exec(token);
  if (comma) return comma[2]!.length === 3 ? 'ambiguous' : Number(`${comma[1]}.${comma[2]}`);
  return Number(token);
}

type UnitToken =
  | 'kPa'
  | 'mmHg'
  | 'mmol/L'
  | 'mg/dL'
  | 'g/dL'
  | 'g/L'
  | 'umol/L'
  | 'mOsm/kg'
  | 'mOsm/L'
  | '%'
  | 'nmol/L';

const UNIT_PATTERNS: readonly [UnitToken, RegExp][] = [
  ['kPa', /^kpa(?![a-z])/i],
  ['mmHg', /^(?:mm\s?hg|mm\[hg\]|torr)(?![a-z])/i],
  // osmolality in mmol/kg is the same number as mOsm/kg
  ['mOsm/kg', /^(?:mosm|mmol)\s?\/\s?kg(?:\s?h2o)?(?![a-z])/i],
  ['mOsm/L', /^mosm\s?\/\s?l(?![a-z])/i],
  ['mmol/L', /^(?:mmol\s?\/\s?l|meq\s?\/\s?l)(?![a-z])/i],
  ['umol/L', /^umol\s?\/\s?l(?![a-z])/i],
  ['nmol/L', /^nmol\s?\/\s?l(?![a-z])/i],
  ['mg/dL', /^(?:mg\s?\/\s?dl|mg\s?%)(?![a-z])/i],
  ['g/dL', /^gm?\s?\/\s?dl(?![a-z])/i],
  ['g/L', /^g\s?\/\s?l(?![a-z])/i],
  ['%', /^%/],
];

function unitAt(s: string): { unit: UnitToken; length: number } | null {
  for (const [unit, re] of UNIT_PATTERNS) {
    const m = re.exec(s);
    if (m) return { unit, length: m[0].length };
  }
  return null;
}

const UNIT_ANYWHERE =
  /(?<![a-z])(?:kpa|mm\s?hg|mm\[hg\]|torr|(?:mosm|mmol)\s?\/\s?kg(?:\s?h2o)?|mosm\s?\/\s?l|mmol\s?\/\s?l|meq\s?\/\s?l|umol\s?\/\s?l|nmol\s?\/\s?l|mg\s?\/\s?dl|mg\s?%|gm?\s?\/\s?dl|g\s?\/\s?l)(?![a-z])|%/gi;

// ---------- labels ----------

type Variant = 'actual' | 'plain' | 'standard' | 'so2' | 'o2hb' | 'bun';
type LabelTarget =
  | { field: CasePath; variant?: Variant }
  | { skip: string }
  | { ask: 'baseDeficit' | 'capsPAO2' };

interface LabelDef {
  re: RegExp;
  target: LabelTarget;
}

const L = (source: string, flags: string, target: LabelTarget): LabelDef => ({
  re: new RegExp(String.raw`(?<![A-Za-z0-9])(?:${source})(?![A-Za-z0-9])`, `g${flags}`),
  target,
});

const TEMPERATURE_CORRECTED = 'temperature-corrected value; the 37 °C value is the one read';

// Realistic, generic label spellings. The c-, ct-, F- and s- prefixes and the (B), (ecf), (P), (T) marks are the
// quantity symbols of the IFCC/CLSI blood-gas recommendations (CLSI C46; from memory), not one maker's print.
// Order matters only between matches of equal length at one place.
const LABELS: readonly LabelDef[] = [
  // recognised and deliberately not read
  L(
    String.raw`(?:std\.?|st\.?|standard)\s?HCO3-?|HCO3-?\s?(?:std|st)|HCO3-?\s?\(\s*(?:P\s*,\s*)?st(?:d|andard)?\s*\)|SBC|standard\s+bicarbonate|st(?:d|andard)?\.?\s+bicarb(?:onate)?`,
    'i',
    { skip: 'standard bicarbonate is not the actual HCO3' },
  ),
  L(
    String.raw`t\s?CO2|total\s+CO2|CO2,?\s+total|CO2\s+content|carbon\s+dioxide(?:,?\s+total)?`,
    'i',
    {
      skip: 'total CO2 is not the blood-gas HCO3 (it runs about 1-2 mmol/L higher); enter it as HCO3 by hand if that is meant',
    },
  ),
  L(String.raw`CO2`, '', {
    skip: 'total CO2 is not the blood-gas HCO3 (it runs about 1-2 mmol/L higher); enter it as HCO3 by hand if that is meant',
  }),
  L(String.raw`E\s?T\s?CO2|P\s?ET\s?CO2`, 'i', { skip: 'end-tidal CO2 is not the blood PaCO2' }),
  L(String.raw`p[aA]?O2\s?\/\s?F[iI]O2|P\s?\/\s?F(?:\s+ratio)?`, '', {
    skip: 'ratio: Gasline works it out from PaO2 and FiO2',
  }),
  L(String.raw`A\s?-\s?a(?:\s?DO2|\s+gradient)?|AaDO2|a\s?\/\s?A(?:\s+ratio)?`, '', {
    skip: 'alveolar-arterial values: Gasline works them out',
  }),
  L(String.raw`AG|AnGap|anion\s+gap`, '', {
    skip: 'anion gap: Gasline works it out from Na, Cl and HCO3',
  }),
  L(String.raw`anion\s+gap`, 'i', { skip: 'anion gap: Gasline works it out from Na, Cl and HCO3' }),
  L(
    String.raw`calc(?:ulated)?\.?\s+osm(?:olality|olarity)?|osm(?:olality|olarity)?\s*\(\s*calc(?:ulated)?\.?\s*\)|osmolarity|osm(?:olal|olar)?\s+gap`,
    'i',
    { skip: 'calculated osmolality is not the measured osmolality' },
  ),
  L(String.raw`S\s?c?v\s?O2`, 'i', { skip: 'venous saturation is not SaO2' }),
  // asked, never filled
  L(String.raw`base\s+deficit`, 'i', { ask: 'baseDeficit' }),
  L(String.raw`PA\s?O2`, '', { ask: 'capsPAO2' }),
  // read
  L(String.raw`pH|PH`, '', { field: 'gas.ph' }),
  L(
    String.raw`[pP]\s?[aAvV]?\s?[cC][oO]2|carbon\s+dioxide,?\s+partial\s+pressure|partial\s+pressure\s+of\s+carbon\s+dioxide`,
    '',
    { field: 'gas.pco2' },
  ),
  L(String.raw`[pP]\s?[aAvV]?\s?[oO]2`, '', { field: 'gas.po2' }),
  L(
    String.raw`[caCA]?HCO3-?(?:\s?\(\s*(?:P|B|a|act)\s*(?:,\s*c)?\s*\))?(?:\s?act(?:ual)?)?|act(?:ual)?\.?\s?HCO3-?|actual\s+bicarbonate|bicarbonate|bicarb`,
    'i',
    { field: 'gas.hco3' },
  ),
  L(String.raw`BE\s?\(\s*(?:B|b|act|blood)\s*\)|BEb|BE-b|ABE|cBase\s?\(\s*B\s*\)`, '', {
    field: 'gas.baseExcess',
    variant: 'actual',
  }),
  L(
    String.raw`act(?:ual)?\.?\s+base\s+excess|base\s+excess\s*\(\s*(?:B|blood|act(?:ual)?)\s*\)`,
    'i',
    { field: 'gas.baseExcess', variant: 'actual' },
  ),
  L(
    String.raw`BE\s?\(\s*(?:ecf|st|std)\s*\)|BE-?ecf|SBE|cBase\s?\(\s*ecf\s*\)|standard\s+base\s+excess|base\s+excess\s*\(\s*(?:ecf|std|st)\s*\)`,
    'i',
    { field: 'gas.baseExcess', variant: 'standard' },
  ),
  L(String.raw`BE|B\.E\.`, '', { field: 'gas.baseExcess', variant: 'plain' }),
  L(String.raw`base\s+excess|cBase`, 'i', { field: 'gas.baseExcess', variant: 'plain' }),
  L(
    String.raw`[sS]\s?[aA]?\s?[oO]2|O2\s?sat(?:uration)?|sat(?:uration)?\s?O2|oxygen\s+saturation`,
    'i',
    { field: 'gas.sao2', variant: 'so2' },
  ),
  L(String.raw`F?O2\s?Hb|HbO2|oxyh(?:a)?emoglobin`, 'i', { field: 'gas.sao2', variant: 'o2hb' }),
  L(String.raw`SpO2`, 'i', { field: 'oxygen.spo2' }),
  L(String.raw`c?t?Hb|THb|Hgb|HGB|HB`, '', { field: 'gas.hb' }),
  L(String.raw`ha?emoglobin(?:\s+total)?|total\s+ha?emoglobin`, 'i', { field: 'gas.hb' }),
  L(String.raw`c?Lac(?:t(?:ate)?)?|lactic\s+acid`, 'i', { field: 'gas.lactate' }),
  L(String.raw`c?Glu(?:c(?:ose)?)?`, 'i', { field: 'chemistry.glucose' }),
  // capitals only with a sign or an equals sign after them: a bare NA is "not available"
  L(String.raw`c?Na\+?|NA\+|NA(?=\s*[=:])`, '', { field: 'chemistry.na' }),
  L(String.raw`sodium`, 'i', { field: 'chemistry.na' }),
  L(String.raw`c?K\+?`, '', { field: 'chemistry.k' }),
  L(String.raw`potassium`, 'i', { field: 'chemistry.k' }),
  L(String.raw`c?Cl-?|CL-|CL(?=\s*[=:])`, '', { field: 'chemistry.cl' }),
  L(String.raw`chloride`, 'i', { field: 'chemistry.cl' }),
  L(String.raw`alb(?:umin)?`, 'i', { field: 'chemistry.albumin' }),
  L(String.raw`BUN|(?:blood\s+)?urea\s+nitrogen`, 'i', { field: 'chemistry.urea', variant: 'bun' }),
  L(String.raw`urea`, 'i', { field: 'chemistry.urea' }),
  L(String.raw`c?crea(?:t(?:inine)?)?`, 'i', { field: 'chemistry.creatinine' }),
  L(String.raw`Cr`, '', { field: 'chemistry.creatinine' }),
  L(
    String.raw`(?:measured\s+|serum\s+)?osm(?:o(?:lality)?)?(?:\s*\(\s*meas(?:ured)?\.?\s*\))?`,
    'i',
    { field: 'chemistry.osmolality' },
  ),
  L(String.raw`F\s?[iI]\s?O2|FO2\s?\(\s*I\s*\)`, '', { field: 'oxygen.fio2' }),
];

interface LabelMatch {
  start: number;
  end: number;
  def: LabelDef;
  order: number;
}

function findLabels(line: string): LabelMatch[] {
  const all: LabelMatch[] = [];
  LABELS.forEach((def, order) => {
    def.re.lastIndex = 0;
    for (let m = def.re.exec(line); m; m = def.re.exec(line)) {
      all.push({ start: m.index, end: m.index + m[0].length, def, order });
      if (m[0].length === 0) def.re.lastIndex++;
    }
  });
  // earliest first; at one place the longest; then table order
  all.sort((a, b) => a.start - b.start || b.end - b.start - (a.end - a.start) || a.order - b.order);
  const kept: LabelMatch[] = [];
  for (const m of all) if (!kept.length || m.start >= kept[kept.length - 1]!.end) kept.push(m);
  return kept;
}

// ---------- one label's value ----------

interface Qualifiers {
  end: number;
  corrected: boolean;
  alveolar: boolean;
  unit: UnitToken | null;
}

/** Parenthesised marks right after a label: (T), (37 °C), (kPa), (A), (P), a reference range ... */
function readQualifiers(line: string, from: number): Qualifiers {
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

type SegmentValue =
  | { kind: 'value'; value: number; unit: UnitToken | null }
  | { kind: 'none' }
  | { kind: 'question'; reason: string; value?: number };

const FLAG_TOKENS =
  /^(?:H|L|HH|LL|A|N|C|c|\*+|!+|↑+|↓+|high|low|crit(?:ical)?|abn(?:ormal)?|normal|calc(?:ulated)?\.?|est(?:imated)?\.?|meas(?:ured)?\.?|ref(?:erence)?\.?|range|ref\.?\s*range|n|r|flag|result|value|units?|[:=|;,.\-/])$/i;
const RANGE = String.raw`[-+]?${NUM}(?:-|\s+-\s+|\s+to\s+)[-+]?${NUM}`;

/** The text after a label (and its qualifiers) up to the next label. */
function readSegment(segment: string, qualifierUnit: UnitToken | null): SegmentValue {
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

// ---------- the shorthand ----------

// three or more numbers joined by "/", the first a pH: "7.31/48" alone is not the shorthand
const SHORTHAND_RUN = new RegExp(
  String.raw`(?<![\w.\/])${NUM}(?:\s*\/\s*(?:[-+]?${NUM}|[-xX?])){2,}(?![\w.\/])`,
  'g',
);
const PH_LIKE = /^\d[.,]\d{1,3}$/;

interface ShorthandRun {
  start: number;
  end: number;
  parts: string[];
  unit: PressureUnit | null;
}

function shorthandRuns(line: string): ShorthandRun[] {
  const runs: ShorthandRun[] = [];
  SHORTHAND_RUN.lastIndex = 0;
  for (let m = SHORTHAND_RUN.exec(line); m; m = SHORTHAND_RUN.exec(line)) {
    const parts = m[0].split('/').map((p) => p.trim());
    const ph = Number(parts[0]!.replace(',', '.'));
    if (!PH_LIKE.test(parts[0]!) || ph < FIELD['gas.ph'].range[0] || ph > FIELD['gas.ph'].range[1])
      continue;
    let end = m.index + m[0].length;
    const u = /^\s*[([]?\s*(kpa|mm\s?hg|torr)\s*[)\]]?(?![a-z])/i.exec(line.slice(end));
    const unit: PressureUnit | null = u ? (/kpa/i.test(u[1]!) ? 'kPa' : 'mmHg') : null;
    if (u) end += u[0].length;
    runs.push({ start: m.index, end, parts, unit });
  }
  return runs;
}

const shorthandNumber = (part: string): number | null => {
  if (/^[-xX?]$/.test(part)) return null;
  const n = parseNumber(part.replace(/^\+/, ''));
  return n === 'ambiguous' ? Number.NaN : n;
};

/** The first pH/PaCO2/PaO2/HCO3 shorthand in the text (four numbers, pH first), or null. Values as written. */
export function parseShorthand(text: string): Shorthand | null {
  const prepared = normalizeChars(stripHtml(String(text ?? '')).slice(0, MAX_PASTE_CHARS));
  for (const line of prepared.split(/\r\n|\r|\n/)) {
    for (const run of shorthandRuns(line)) {
      if (run.parts.length !== 4) continue;
      const [ph, pco2, po2, hco3] = run.parts.map(shorthandNumber) as [
        number,
        number | null,
        number | null,
        number | null,
      ];
      if ([ph, pco2, po2, hco3].some((v) => Number.isNaN(v))) continue;
      return {
        ph,
        pco2,
        po2,
        hco3,
        unit: run.unit,
        sourceText: line.slice(run.start, run.end).trim(),
      };
    }
  }
  return null;
}

// ---------- plausibility and units ----------

interface Window {
  min: number;
  max: number;
}
// Windows in which a bare number is a believable adult result in that unit. They only decide which unit a
// number without one is in; a number inside two windows is asked about (our own limits, common practice).
const WINDOWS = {
  pco2: { mmHg: { min: 10, max: 150 }, kPa: { min: 1.3, max: 20 } },
  po2: { mmHg: { min: 15, max: 700 }, kPa: { min: 2, max: 93 } },
  albumin: { 'g/dL': { min: 0.8, max: 6.5 }, 'g/L': { min: 8, max: 65 } },
  // Hb in mmol/L (Hb monomer, about 16.1 g/mmol; from memory) is used in some countries and is asked about
  hb: {
    'g/dL': { min: 3, max: 25 },
    'g/L': { min: 30, max: 250 },
    'mmol/L': { min: 1.8, max: 15.5 },
  },
  glucose: { 'mmol/L': { min: 0.5, max: 60 }, 'mg/dL': { min: 20, max: 1500 } },
  creatinine: { 'mg/dL': { min: 0.15, max: 25 }, 'umol/L': { min: 15, max: 2500 } },
  // "Urea" in mg/dL may be urea itself or urea nitrogen (BUN): asked about, never taken as one or the other
  urea: { 'mmol/L': { min: 0.5, max: 60 }, 'mg/dL': { min: 3, max: 360 } },
} satisfies Record<string, Record<string, Window>>;

const inWindow = (v: number, w: Window): boolean => v >= w.min && v <= w.max;

const RANGE_OF = FIELD as Partial<Record<CasePath, FieldSpec>>;

const LABEL_OF: Record<CasePath, string> = {
  'gas.ph': 'pH',
  'gas.pco2': 'PaCO2',
  'gas.po2': 'PaO2',
  'gas.hco3': 'HCO3',
  'gas.baseExcess': 'Base excess',
  'gas.sao2': 'SaO2',
  'gas.lactate': 'Lactate',
  'gas.hb': 'Hb',
  'chemistry.na': 'Na',
  'chemistry.k': 'K',
  'chemistry.cl': 'Cl',
  'chemistry.albumin': 'Albumin',
  'chemistry.glucose': 'Glucose',
  'chemistry.urea': 'Urea',
  'chemistry.creatinine': 'Creatinine',
  'chemistry.osmolality': 'Osmolality',
  'oxygen.fio2': 'FiO2',
  'oxygen.spo2': 'SpO2',
  'context.temperatureC': 'Temperature',
};

/** Is the value inside the schema's range once read in these units? (the same check the API makes) */
function passesSchema(path: CasePath, value: number, units: Partial<Units>): boolean {
  const field = FIELD[path as FieldPath];
  return !field || inRange(field, value, resolveUnits(units));
}

// ---------- collecting ----------

interface Candidate {
  path: CasePath;
  value: number;
  unit: UnitToken | null;
  /** the unit came from a column header rather than beside the value */
  headerUnit: boolean;
  variant: Variant | undefined;
  sourceText: string;
  line: number;
}

interface Collector {
  candidates: Candidate[];
  questions: Question[];
  skipped: Skipped[];
  ignored: string[];
  samples: { sample: Sample; sourceText: string; line: number }[];
}

const SAMPLE_WORDS: readonly [Sample, RegExp][] = [
  ['arterial', /(?<![A-Za-z])(?:arterial|ABG)(?![A-Za-z])/],
  ['arterial', /(?<![A-Za-z])arterial(?![A-Za-z])/i],
  [
    'venous',
    /(?<![A-Za-z])(?:(?:mixed|central|peripheral)\s+)?venous(?![A-Za-z])|(?<![A-Za-z])VBG(?![A-Za-z])/i,
  ],
  ['capillary', /(?<![A-Za-z])capillary(?![A-Za-z])|(?<![A-Za-z])CBG(?![A-Za-z])/i],
];

const CORRECTED_SECTION =
  /temperature[-\s]*corrected|temp\.?\s*corr(?:ected)?|corrected\s+(?:to|for)\s+(?:the\s+)?(?:patient(?:'s)?\s+)?temp|at\s+patient(?:'s)?\s+temp/i;
const STANDARD_SECTION = /(?:at|@)\s*37(?:[.,]0)?\s*°?\s*C|uncorrected/i;
const GAS_PRESSURE_OR_PH: ReadonlySet<CasePath> = new Set(['gas.ph', 'gas.pco2', 'gas.po2']);
const LINE_PREFIX_OK = /^[\s\-*•·>|:#]*$/;

interface Header {
  labels: {
    path: CasePath | null;
    unit: UnitToken | null;
    variant: Variant | undefined;
    skip?: string;
  }[];
  raw: string;
  line: number;
}

export function parsePaste(text: string): PasteResult {
  const input = String(text ?? '');
  const result: PasteResult = {
    case: { gas: {} },
    read: [],
    questions: [],
    ignored: [],
    skipped: [],
    missing: [],
  };
  if (input.length > MAX_PASTE_CHARS) {
    result.questions.push({
      path: '(text)',
      reason: `The text is longer than ${MAX_PASTE_CHARS} characters: paste the result lines only`,
    });
    result.missing = missingGas(result.case) as CasePath[];
    return result;
  }
  const rawLines = stripHtml(input).split(/\r\n|\r|\n/);
  const col: Collector = { candidates: [], questions: [], skipped: [], ignored: [], samples: [] };
  const capsConvention = /(?<![A-Za-z])PACO2(?![A-Za-z0-9])/.test(input);
  let correctedSection = false;
  let header: Header | null = null;

  rawLines.forEach((raw, index) => {
    const lineNo = index + 1;
    const norm = normalizeChars(raw);
    if (!norm.trim()) {
      correctedSection = false;
      if (header) {
        col.ignored.push(header.raw.trim());
        header = null;
      }
      return;
    }
    const source = (a: number, b: number) => raw.slice(a, b).trim();
    let used = false;
    const fragments: string[] = [];

    for (const [sample, re] of SAMPLE_WORDS) {
      if (re.test(norm) && !col.samples.some((s) => s.line === lineNo && s.sample === sample)) {
        col.samples.push({ sample, sourceText: raw.trim(), line: lineNo });
        used = true;
      }
    }
    const lineCorrected = CORRECTED_SECTION.test(norm);

    // a row of numbers under a header of labels
    if (header) {
      const pending: Header = header;
      header = null;
      const cells = norm
        .trim()
        .split(/\s*[|\t;]\s*|\s{2,}|\s+/)
        .filter(Boolean);
      if (
        findLabels(norm).length === 0 &&
        cells.length === pending.labels.length &&
        cells.every((c) => new RegExp(`^[-+]?${NUM}(?:HH|LL|H|L|\\*)?$`).test(c))
      ) {
        cells.forEach((cell, i) => {
          const label = pending.labels[i]!;
          const numberText = cell.replace(/(?:HH|LL|H|L|\*)$/, '');
          const n = parseNumber(numberText.replace(/^[-+]/, ''));
          const sourceText = `${pending.raw.trim()} / ${raw.trim()} (column ${i + 1})`;
          if (label.skip) {
            col.skipped.push({ sourceText, reason: label.skip, line: lineNo });
            return;
          }
          if (!label.path) return;
          if (n === 'ambiguous') {
            col.questions.push({
              path: label.path,
              reason: `"${numberText}" could be a decimal comma or a thousands separator`,
              sourceText,
            });
            return;
          }
          col.candidates.push({
            path: label.path,
            value: numberText.startsWith('-') ? -n : n,
            unit: label.unit,
            headerUnit: label.unit !== null,
            variant: label.variant,
            sourceText,
            line: lineNo,
          });
        });
        return;
      }
      col.ignored.push(pending.raw.trim());
    }

    // the shorthand pH/PaCO2/PaO2/HCO3
    let scan = norm;
    for (const run of shorthandRuns(norm)) {
      used = true;
      const sourceText = source(run.start, run.end);
      scan = scan.slice(0, run.start) + ' '.repeat(run.end - run.start) + scan.slice(run.end);
      if (run.parts.length !== 4) {
        col.questions.push({
          path: 'gas',
          reason: `${run.parts.length} numbers separated by "/": the shorthand pH/PaCO2/PaO2/HCO3 has four; enter the values one by one`,
          sourceText,
        });
        continue;
      }
      const values = run.parts.map(shorthandNumber);
      if (values.some((v) => Number.isNaN(v))) {
        col.questions.push({
          path: 'gas',
          reason: 'a number in the shorthand could be a decimal comma or a thousands separator',
          sourceText,
        });
        continue;
      }
      const paths: CasePath[] = ['gas.ph', 'gas.pco2', 'gas.po2', 'gas.hco3'];
      paths.forEach((path, i) => {
        const v = values[i];
        if (v === null || v === undefined) return;
        const unit = path === 'gas.pco2' || path === 'gas.po2' ? run.unit : null;
        col.candidates.push({
          path,
          value: v,
          unit,
          headerUnit: false,
          variant: undefined,
          sourceText,
          line: lineNo,
        });
      });
    }

    const labels = findLabels(scan);
    if (!labels.length) {
      if (STANDARD_SECTION.test(norm)) correctedSection = false;
      else if (lineCorrected) {
        correctedSection = true;
        used = true;
      }
      if (!used) col.ignored.push(raw.trim());
      return;
    }

    interface Parsed {
      match: LabelMatch;
      q: Qualifiers;
      seg: SegmentValue;
      text: string;
    }
    const parsed: Parsed[] = labels.map((match, i) => {
      const q = readQualifiers(scan, match.end);
      const segEnd = labels[i + 1]?.start ?? scan.length;
      const seg = readSegment(scan.slice(q.end, Math.max(q.end, segEnd)), q.unit);
      return { match, q, seg, text: source(match.start, segEnd) };
    });

    // a header row: two or more labels and no value anywhere
    if (!used && parsed.length >= 2 && parsed.every((p) => p.seg.kind === 'none')) {
      header = {
        raw,
        line: lineNo,
        labels: parsed.map((p) => {
          const t = p.match.def.target;
          if ('skip' in t) return { path: null, unit: null, variant: undefined, skip: t.skip };
          if ('ask' in t)
            return {
              path: null,
              unit: null,
              variant: undefined,
              skip: 'asked about only when written beside its value',
            };
          if (p.q.corrected || (correctedSection && GAS_PRESSURE_OR_PH.has(t.field)))
            return { path: null, unit: null, variant: undefined, skip: TEMPERATURE_CORRECTED };
          return { path: t.field, unit: p.q.unit, variant: t.variant };
        }),
      };
      return;
    }

    // a label counts when the line reads like a result line: it starts the line, or has a unit, or the line has other results
    const clean = parsed.filter((p) => p.seg.kind === 'value').length;
    const prefixOk = LINE_PREFIX_OK.test(scan.slice(0, labels[0]!.start));
    const prefixText = raw.slice(0, labels[0]!.start).trim();
    if (prefixText && /\d/.test(prefixText)) fragments.push(prefixText);

    parsed.forEach((p, i) => {
      const t = p.match.def.target;
      const seg = p.seg;
      if (seg.kind === 'none') return;
      const accepted =
        (i === 0 && prefixOk) ||
        (seg.kind === 'value' ? clean >= 2 || seg.unit !== null : clean >= 1);
      if (!accepted) {
        fragments.push(p.text);
        return;
      }
      used = true;
      if ('skip' in t) {
        col.skipped.push({ sourceText: p.text, reason: t.skip, line: lineNo });
        return;
      }
      const corrected = p.q.corrected || lineCorrected || correctedSection;
      if ('ask' in t) {
        if (seg.kind !== 'value') {
          col.questions.push({
            path: t.ask === 'baseDeficit' ? 'gas.baseExcess' : 'gas.po2',
            reason: seg.reason,
            sourceText: p.text,
          });
          return;
        }
        if (t.ask === 'baseDeficit') {
          col.questions.push({
            path: 'gas.baseExcess',
            reason: `base deficit ${seg.value} read: base excess is usually its negative (${-seg.value}); confirm`,
            options: [String(-seg.value)],
            value: seg.value,
            sourceText: p.text,
          });
          return;
        }
        if (p.q.alveolar) {
          col.skipped.push({
            sourceText: p.text,
            reason: 'alveolar PO2: Gasline works it out',
            line: lineNo,
          });
          return;
        }
        if (corrected) {
          col.skipped.push({ sourceText: p.text, reason: TEMPERATURE_CORRECTED, line: lineNo });
          return;
        }
        const candidate: Candidate = {
          path: 'gas.po2',
          value: seg.value,
          unit: seg.unit,
          headerUnit: false,
          variant: undefined,
          sourceText: p.text,
          line: lineNo,
        };
        if (capsConvention) col.candidates.push(candidate);
        else
          col.questions.push({
            path: 'gas.po2',
            reason: `"PAO2" can mean the alveolar PO2: confirm that ${seg.value} is the arterial PaO2`,
            options: ['arterial PaO2', 'alveolar PAO2'],
            value: seg.value,
            sourceText: p.text,
          });
        return;
      }
      if (GAS_PRESSURE_OR_PH.has(t.field)) {
        if (p.q.alveolar) {
          col.skipped.push({
            sourceText: p.text,
            reason: 'alveolar PO2: Gasline works it out',
            line: lineNo,
          });
          return;
        }
        if (corrected) {
          col.skipped.push({ sourceText: p.text, reason: TEMPERATURE_CORRECTED, line: lineNo });
          return;
        }
      }
      if (seg.kind === 'question') {
        col.questions.push({
          path: t.field,
          reason: `${LABEL_OF[t.field]}: ${seg.reason}`,
          ...(seg.value !== undefined ? { value: seg.value } : {}),
          sourceText: p.text,
        });
        return;
      }
      col.candidates.push({
        path: t.field,
        value: seg.value,
        unit: seg.unit,
        headerUnit: false,
        variant: t.variant,
        sourceText: p.text,
        line: lineNo,
      });
    });
    col.ignored.push(...(used ? fragments : [raw.trim()]));
  });
  if (header) col.ignored.push((header as Header).raw.trim());

  resolve(col, result);
  return result;
}

// ---------- deciding ----------

const VARIANT_RANK: Record<Variant, number> = {
  actual: 0,
  so2: 0,
  plain: 1,
  bun: 1,
  o2hb: 2,
  standard: 3,
};
const VARIANT_NOTE: Partial<Record<Variant, string>> = {
  standard: 'standard base excess (no actual base excess on the paste)',
  o2hb: 'oxyhaemoglobin fraction (no sO2 on the paste); it runs slightly below sO2 when COHb or MetHb is raised',
};
const VARIANT_SKIP: Partial<Record<Variant, string>> = {
  standard: 'standard base excess: the actual base excess is read',
  o2hb: 'oxyhaemoglobin fraction: sO2 is read (they differ when COHb or MetHb is raised)',
  plain: 'a second base excess: the actual base excess is read',
};

function resolve(col: Collector, result: PasteResult): void {
  const c = result.case;
  const questions = result.questions;
  const pending = new Set<string>();
  const ask = (q: Question) => {
    questions.push(q);
    pending.add(q.path);
  };
  const fill = (
    cand: Candidate,
    value: number,
    unit: string,
    unitFrom: UnitSource,
    units?: Partial<Units>,
    note?: string,
  ) => {
    setCaseValue(c, cand.path, value);
    if (units) c.units = { ...c.units, ...units };
    result.read.push({
      path: cand.path,
      value,
      unit,
      sourceText: cand.sourceText,
      line: cand.line,
      unitFrom,
      ...(note ? { note } : {}),
    });
  };

  for (const q of col.questions) ask(q);
  result.skipped.push(...col.skipped);
  result.ignored.push(...col.ignored);

  // one value per field: best label variant first, then every reading of it must agree
  const byPath = new Map<CasePath, Candidate[]>();
  for (const cand of col.candidates) {
    const list = byPath.get(cand.path);
    if (list) list.push(cand);
    else byPath.set(cand.path, [cand]);
  }
  const chosen = new Map<CasePath, Candidate>();
  for (const [path, list] of byPath) {
    if (pending.has(path)) {
      for (const cand of list)
        result.skipped.push({
          sourceText: cand.sourceText,
          reason: 'not used while the question about this value is open',
          line: cand.line,
        });
      continue;
    }
    const best = list.reduce(
      (m, x) => Math.min(m, x.variant ? VARIANT_RANK[x.variant] : 1),
      Infinity,
    );
    const top = list.filter((x) => (x.variant ? VARIANT_RANK[x.variant] : 1) === best);
    const inTop = new Set(top);
    for (const x of list)
      if (!inTop.has(x))
        result.skipped.push({
          sourceText: x.sourceText,
          reason: VARIANT_SKIP[x.variant ?? 'plain'] ?? 'a less direct reading of the same value',
          line: x.line,
        });
    const distinct = new Map<string, Candidate>();
    for (const x of top) distinct.set(`${x.value}|${x.unit ?? ''}`, x);
    const values = new Set(top.map((x) => x.value));
    const unitsSeen = new Set(top.map((x) => x.unit).filter((u) => u !== null));
    if (values.size > 1 || unitsSeen.size > 1) {
      const shown = [...distinct.values()].slice(0, 6);
      ask({
        path,
        reason: `${LABEL_OF[path]} is written more than once with different values (${shown.map((x) => `${x.value}${x.unit ? ` ${x.unit}` : ''}`).join(', ')}${distinct.size > shown.length ? ', ...' : ''}): which one is this sample?`,
        options: [...values].slice(0, 6).map(String),
        sourceText: top
          .slice(0, 6)
          .map((x) => x.sourceText)
          .join(' | '),
      });
      continue;
    }
    const withUnit = top.find((x) => x.unit !== null) ?? top[0]!;
    chosen.set(path, withUnit);
  }

  decidePressures(chosen, result, ask, fill);

  for (const [path, cand] of chosen) {
    if (path === 'gas.pco2' || path === 'gas.po2') continue;
    decideOne(path, cand, ask, fill);
  }

  addHendersonSuggestion(result);
  decideSample(col, result, ask);
  result.missing = missingGas(c, pending) as CasePath[];
}

type Ask = (q: Question) => void;
type Fill = (
  cand: Candidate,
  value: number,
  unit: string,
  unitFrom: UnitSource,
  units?: Partial<Units>,
  note?: string,
) => void;

const outside = (path: CasePath, cand: Candidate, unit: string): Question => {
  const range = RANGE_OF[path];
  const shown = range
    ? ` (plausible range ${range.range[0]}-${range.range[1]}${range.unit ? ` ${range.unit}` : ''})`
    : '';
  return {
    path,
    reason: `${LABEL_OF[path]} ${cand.value}${unit ? ` ${unit}` : ''} is not plausible${shown}: check the value and its unit`,
    value: cand.value,
    sourceText: cand.sourceText,
  };
};

const wrongUnit = (path: CasePath, cand: Candidate, expected: string): Question => ({
  path,
  reason: `${LABEL_OF[path]} ${cand.value} is given in ${cand.unit}; expected ${expected}`,
  value: cand.value,
  sourceText: cand.sourceText,
});

/** PaCO2 and PaO2 share the pressure unit of the case: decided together. */
function decidePressures(
  chosen: Map<CasePath, Candidate>,
  _result: PasteResult,
  ask: Ask,
  fill: Fill,
): void {
  const cands = (['gas.pco2', 'gas.po2'] as const)
    .map((p) => chosen.get(p))
    .filter((x): x is Candidate => !!x);
  if (!cands.length) return;
  const bad = cands.filter((x) => x.unit !== null && x.unit !== 'kPa' && x.unit !== 'mmHg');
  for (const x of bad) ask(wrongUnit(x.path, x, 'kPa or mmHg'));
  const pressures = cands.filter((x) => !bad.includes(x));
  if (!pressures.length) return;
  const explicit = new Set(
    pressures.map((x) => x.unit).filter((u): u is 'kPa' | 'mmHg' => u === 'kPa' || u === 'mmHg'),
  );
  const windowOf = (x: Candidate) => (x.path === 'gas.pco2' ? WINDOWS.pco2 : WINDOWS.po2);
  const options = ['mmHg', 'kPa'];

  if (explicit.size === 2) {
    for (const x of pressures)
      ask({
        path: x.path,
        reason: `one pressure line says kPa and another mmHg: confirm the unit of ${LABEL_OF[x.path]} ${x.value}`,
        options,
        value: x.value,
        sourceText: x.sourceText,
      });
    return;
  }
  if (explicit.size === 1) {
    const unit = [...explicit][0]!;
    for (const x of pressures) {
      if (x.unit !== null) {
        if (passesSchema(x.path, x.value, { pressure: unit }))
          fill(x, x.value, unit, x.headerUnit ? 'printout' : 'text', { pressure: unit });
        else ask(outside(x.path, x, unit));
      } else if (inWindow(x.value, windowOf(x)[unit])) {
        fill(x, x.value, unit, 'printout', { pressure: unit });
      } else {
        ask({
          path: x.path,
          reason: `${LABEL_OF[x.path]} ${x.value} has no unit and is not plausible in ${unit}, the unit of the other pressure`,
          options,
          value: x.value,
          sourceText: x.sourceText,
        });
      }
    }
    return;
  }
  // no unit anywhere: the unit in which every pressure is plausible
  const fits = (['mmHg', 'kPa'] as const).filter((u) =>
    pressures.every((x) => inWindow(x.value, windowOf(x)[u])),
  );
  if (fits.length === 1) {
    const unit = fits[0]!;
    for (const x of pressures) fill(x, x.value, unit, 'magnitude', { pressure: unit });
    return;
  }
  for (const x of pressures) {
    const reason =
      fits.length === 2
        ? `${LABEL_OF[x.path]} ${x.value} has no unit: ${x.value} mmHg and ${x.value} kPa (${Math.round(kpaToMmHg(x.value))} mmHg) are both possible`
        : `${LABEL_OF[x.path]} ${x.value} has no unit, and the pressures together are not plausible in either mmHg or kPa`;
    ask({ path: x.path, reason, options, value: x.value, sourceText: x.sourceText });
  }
}

function decideOne(path: CasePath, cand: Candidate, ask: Ask, fill: Fill): void {
  const { value, unit } = cand;
  const from: UnitSource = cand.headerUnit ? 'printout' : 'text';
  const single = (allowed: UnitToken | null, label: string) => {
    if (unit !== null && unit !== allowed) {
      ask(wrongUnit(path, cand, allowed ?? 'no unit'));
      return;
    }
    if (!passesSchema(path, value, {})) {
      ask(outside(path, cand, label));
      return;
    }
    fill(cand, value, label, unit === null ? 'implied' : from);
  };
  const byWindow = (
    windows: Record<string, Window>,
    choose: (u: string) => { label: string; units?: Partial<Units> } | null,
    what: string,
  ) => {
    if (unit !== null) {
      const chosen = choose(unit);
      if (!chosen) {
        ask(wrongUnit(path, cand, what));
        return;
      }
      if (!passesSchema(path, value, chosen.units ?? {})) {
        ask(outside(path, cand, chosen.label));
        return;
      }
      fill(cand, value, chosen.label, from, chosen.units);
      return;
    }
    const fits = Object.keys(windows).filter((u) => inWindow(value, windows[u]!));
    const usable = fits.map((u) => ({ u, c: choose(u) })).filter((x) => x.c !== null);
    if (fits.length === 1 && usable.length === 1) {
      const c = usable[0]!.c!;
      if (!passesSchema(path, value, c.units ?? {})) {
        ask(outside(path, cand, c.label));
        return;
      }
      fill(cand, value, c.label, 'magnitude', c.units);
      return;
    }
    ask({
      path,
      reason:
        fits.length > 1
          ? `${LABEL_OF[path]} ${value} has no unit and fits ${fits.join(' or ')}`
          : `${LABEL_OF[path]} ${value} has no unit and is not plausible in ${Object.keys(windows).join(' or ')}`,
      options: Object.keys(windows),
      value,
      sourceText: cand.sourceText,
    });
  };

  switch (path) {
    case 'gas.ph':
      if (unit !== null) {
        ask(wrongUnit(path, cand, 'no unit'));
        return;
      }
      if (!passesSchema(path, value, {})) {
        ask(outside(path, cand, ''));
        return;
      }
      fill(cand, value, '', 'implied');
      return;
    case 'gas.hco3':
    case 'gas.baseExcess':
    case 'chemistry.na':
    case 'chemistry.k':
    case 'chemistry.cl': {
      const note = cand.variant ? VARIANT_NOTE[cand.variant] : undefined;
      if (unit !== null && unit !== 'mmol/L') {
        ask(wrongUnit(path, cand, 'mmol/L'));
        return;
      }
      if (!passesSchema(path, value, {})) {
        ask(outside(path, cand, 'mmol/L'));
        return;
      }
      fill(cand, value, 'mmol/L', unit === null ? 'implied' : from, undefined, note);
      return;
    }
    case 'gas.lactate':
      if (unit === 'mg/dL') {
        ask({
          path,
          reason: `Lactate ${value} mg/dL: the case takes lactate in mmol/L (mmol/L = mg/dL / 9.01, molar mass 90.08); enter it converted`,
          value,
          sourceText: cand.sourceText,
        });
        return;
      }
      // blood-gas analysers report lactate in mmol/L (common practice); the one unit the case takes
      single('mmol/L', 'mmol/L');
      return;
    case 'gas.sao2':
    case 'oxygen.spo2': {
      if (unit !== null && unit !== '%') {
        ask(wrongUnit(path, cand, '%'));
        return;
      }
      if (value > 0 && value <= 1) {
        ask({
          path,
          reason: `${LABEL_OF[path]} ${value} looks like a fraction: is it ${Math.round(value * 1000) / 10} %?`,
          options: [String(Math.round(value * 1000) / 10)],
          value,
          sourceText: cand.sourceText,
        });
        return;
      }
      if (!passesSchema(path, value, {})) {
        ask(outside(path, cand, '%'));
        return;
      }
      const note = cand.variant ? VARIANT_NOTE[cand.variant] : undefined;
      fill(cand, value, '%', unit === null ? 'implied' : from, undefined, note);
      return;
    }
    case 'chemistry.osmolality':
      if (unit === 'mOsm/L') {
        ask({
          path,
          reason: `Osmolality ${value} mOsm/L: osmolarity is usually calculated; the case takes the measured osmolality in mOsm/kg`,
          value,
          sourceText: cand.sourceText,
        });
        return;
      }
      single('mOsm/kg', 'mOsm/kg');
      return;
    case 'oxygen.fio2': {
      if (unit !== null && unit !== '%') {
        ask(wrongUnit(path, cand, '% or a fraction'));
        return;
      }
      if (unit === '%' && value <= 1) {
        ask({
          path,
          reason: `FiO2 ${value} % is not plausible: was it a fraction?`,
          value,
          sourceText: cand.sourceText,
        });
        return;
      }
      if (!passesSchema(path, value, {})) {
        ask({
          path,
          reason: `FiO2 ${value} is neither a fraction (0.21-1.00) nor a percent (21-100)`,
          value,
          sourceText: cand.sourceText,
        });
        return;
      }
      fill(cand, value, value > 1 ? '%' : 'fraction', unit === null ? 'implied' : from);
      return;
    }
    case 'gas.hb':
      if (unit === 'mmol/L') {
        ask({
          path,
          reason: `Hb ${value} mmol/L: the case takes Hb in g/dL or g/L; enter it converted`,
          value,
          sourceText: cand.sourceText,
        });
        return;
      }
      byWindow(
        WINDOWS.hb,
        (u) => (u === 'g/dL' || u === 'g/L' ? { label: u, units: { hb: u } } : null),
        'g/dL or g/L',
      );
      return;
    case 'chemistry.albumin':
      byWindow(
        WINDOWS.albumin,
        (u) => (u === 'g/dL' || u === 'g/L' ? { label: u, units: { albumin: u } } : null),
        'g/dL or g/L',
      );
      return;
    case 'chemistry.glucose':
      byWindow(
        WINDOWS.glucose,
        (u) => (u === 'mg/dL' || u === 'mmol/L' ? { label: u, units: { glucose: u } } : null),
        'mmol/L or mg/dL',
      );
      return;
    case 'chemistry.creatinine':
      byWindow(
        WINDOWS.creatinine,
        (u) =>
          u === 'mg/dL'
            ? { label: 'mg/dL', units: { creatinine: 'mg/dL' } }
            : u === 'umol/L'
              ? { label: 'µmol/L', units: { creatinine: 'umol/L' } }
              : null,
        'µmol/L or mg/dL',
      );
      return;
    case 'chemistry.urea': {
      const isBun = cand.variant === 'bun';
      if (isBun) {
        if (unit !== null && unit !== 'mg/dL') {
          ask({
            path,
            reason: `BUN ${value} ${unit}: urea nitrogen is taken in mg/dL; enter urea in mmol/L by hand if that is meant`,
            value,
            sourceText: cand.sourceText,
          });
          return;
        }
        if (!passesSchema(path, value, { urea: 'bun-mg/dL' })) {
          ask(outside(path, cand, 'mg/dL'));
          return;
        }
        fill(cand, value, 'mg/dL (BUN)', unit === null ? 'implied' : from, { urea: 'bun-mg/dL' });
        return;
      }
      if (unit === 'mg/dL') {
        ask({
          path,
          reason: `Urea ${value} mg/dL: is it urea nitrogen (BUN) or urea itself (BUN = urea x 0.467)?`,
          options: ['BUN mg/dL', 'urea mg/dL'],
          value,
          sourceText: cand.sourceText,
        });
        return;
      }
      byWindow(
        WINDOWS.urea,
        (u) => (u === 'mmol/L' ? { label: 'mmol/L (urea)', units: { urea: 'urea-mmol/L' } } : null),
        'mmol/L',
      );
      return;
    }
    default:
      return;
  }
}

/** For an open PaCO2 unit question, the Henderson equation with the pH and HCO3 read may point to one unit. */
function addHendersonSuggestion(result: PasteResult): void {
  const ph = result.case.gas.ph,
    hco3 = result.case.gas.hco3;
  if (typeof ph !== 'number' || typeof hco3 !== 'number') return;
  const expected = hendersonPco2(hydrogenIon(ph), hco3); // mmHg
  for (const q of result.questions) {
    if (q.path !== 'gas.pco2' || q.value === undefined || !q.options?.includes('kPa')) continue;
    // within 10%: the consistency limit of clinical-scope section 2
    const near = (mmHg: number) => Math.abs(mmHg - expected) / expected <= 0.1;
    const hits = [near(q.value) ? 'mmHg' : null, near(kpaToMmHg(q.value)) ? 'kPa' : null].filter(
      (x): x is string => x !== null,
    );
    if (hits.length === 1) {
      q.suggested = hits[0]!;
      q.reason += ` (with the pH and HCO3 read, ${hits[0]} fits the Henderson equation)`;
    }
  }
}

function decideSample(col: Collector, result: PasteResult, ask: Ask): void {
  const kinds = [...new Set(col.samples.map((s) => s.sample))];
  // asked only once a value of the gas itself was read (lactate or Hb alone do not need it)
  const g = result.case.gas;
  const anyGas = [g.ph, g.pco2, g.po2, g.hco3, g.baseExcess, g.sao2].some((v) => v !== undefined);
  if (kinds.length === 1) {
    result.case.sample = kinds[0]!;
    return;
  }
  if (kinds.length > 1) {
    ask({
      path: 'sample',
      reason: `the paste names more than one sample type (${kinds.join(', ')}): which one is this gas?`,
      options: kinds,
      sourceText: col.samples.map((s) => s.sourceText).join(' | '),
    });
    return;
  }
  if (anyGas)
    ask({
      path: 'sample',
      reason:
        'the paste does not say whether the sample is arterial, venous or capillary (without it the gas is read as arterial)',
      options: ['arterial', 'venous', 'capillary'],
    });
}
