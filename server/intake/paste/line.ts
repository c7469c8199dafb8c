// A line with labels: each label's value read (value.ts) and kept as a candidate, a skipped label or a question.
// A line of labels and no values is a header for the row below it. A label counts only where the line reads like
// a result line: it starts the line, or has a unit, or the line has other results.
import { FIELD, type FieldPath } from '../../../calc/index.ts';
import type { Candidate, Collector } from './collect.ts';
import {
  TEMPERATURE_CORRECTED,
  findLabels,
  type LabelMatch,
  type LabelTarget,
  type Variant,
} from './labels.ts';
import type { UnitToken } from './units.ts';
import { readQualifiers, readSegment, type Qualifiers, type SegmentValue } from './value.ts';

export interface Header {
  labels: {
    path: FieldPath | null;
    unit: UnitToken | null;
    variant: Variant | undefined;
    skip?: string;
  }[];
  raw: string;
  line: number;
}

export interface LineContext {
  raw: string;
  /** the normalised line */
  norm: string;
  /** the normalised line with any shorthand blanked out */
  scan: string;
  lineNo: number;
  /** something on the line was already used (a sample type, the shorthand) */
  used: boolean;
  /** the line is under a "temperature corrected" heading */
  correctedSection: boolean;
  capsConvention: boolean;
  col: Collector;
}

interface Parsed {
  match: LabelMatch;
  q: Qualifiers;
  seg: SegmentValue;
  text: string;
}

const CORRECTED_SECTION =
  /temperature[-\s]*corrected|temp\.?\s*corr(?:ected)?|corrected\s+(?:to|for)\s+(?:the\s+)?(?:patient(?:'s)?\s+)?temp|at\s+patient(?:'s)?\s+temp/i;
const STANDARD_SECTION = /(?:at|@)\s*37(?:[.,]0)?\s*°?\s*C|uncorrected/i;
const GAS_PRESSURE_OR_PH: ReadonlySet<string> = new Set(['gas.ph', 'gas.pco2', 'gas.po2']);
const LINE_PREFIX_OK = /^[\s\-*•·>|:#]*$/;
const ALVEOLAR = 'alveolar PO2: Gasline works it out';

/** Read one line's labels; says whether a corrected section goes on and whether the line is a header. */
export function readLabelLine(ctx: LineContext): {
  correctedSection: boolean;
  header: Header | null;
} {
  const { raw, norm, scan, col } = ctx;
  let used = ctx.used;
  const lineCorrected = CORRECTED_SECTION.test(norm);
  const labels = findLabels(scan);
  if (!labels.length) {
    let correctedSection = ctx.correctedSection;
    if (STANDARD_SECTION.test(norm)) correctedSection = false;
    else if (lineCorrected) {
      correctedSection = true;
      used = true;
    }
    if (!used) col.ignored.push(raw.trim());
    return { correctedSection, header: null };
  }
  const source = (a: number, b: number) => raw.slice(a, b).trim();
  const parsed: Parsed[] = labels.map((match, i) => {
    const q = readQualifiers(scan, match.end);
    const segEnd = labels[i + 1]?.start ?? scan.length;
    const seg = readSegment(scan.slice(q.end, Math.max(q.end, segEnd)), q.unit);
    return { match, q, seg, text: source(match.start, segEnd) };
  });
  // a header row: two or more labels and no value anywhere
  if (!used && parsed.length >= 2 && parsed.every((p) => p.seg.kind === 'none'))
    return { correctedSection: ctx.correctedSection, header: headerOf(parsed, ctx) };

  const clean = parsed.filter((p) => p.seg.kind === 'value').length;
  const prefixOk = LINE_PREFIX_OK.test(scan.slice(0, labels[0]!.start));
  const prefixText = raw.slice(0, labels[0]!.start).trim();
  const fragments: string[] = [];
  if (prefixText && /\d/.test(prefixText)) fragments.push(prefixText);
  const corrected = lineCorrected || ctx.correctedSection;
  parsed.forEach((p, i) => {
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
    readLabel(p, p.match.def.target, corrected || p.q.corrected, ctx);
  });
  col.ignored.push(...(used ? fragments : [raw.trim()]));
  return { correctedSection: ctx.correctedSection, header: null };
}

function headerOf(parsed: Parsed[], ctx: LineContext): Header {
  return {
    raw: ctx.raw,
    line: ctx.lineNo,
    labels: parsed.map((p) => {
      const t = p.match.def.target;
      const none = { path: null, unit: null, variant: undefined };
      if ('skip' in t) return { ...none, skip: t.skip };
      if ('ask' in t) return { ...none, skip: 'asked about only when written beside its value' };
      if (p.q.corrected || (ctx.correctedSection && GAS_PRESSURE_OR_PH.has(t.field)))
        return { ...none, skip: TEMPERATURE_CORRECTED };
      return { path: t.field, unit: p.q.unit, variant: t.variant };
    }),
  };
}

/** One accepted label with a value or a question: skipped, asked, or a candidate. */
function readLabel(p: Parsed, t: LabelTarget, corrected: boolean, ctx: LineContext): void {
  const { col, lineNo } = ctx;
  const seg = p.seg;
  if (seg.kind === 'none') return;
  // a PO2 or pH that is not the measured 37 °C arterial value
  const notMeasured = p.q.alveolar ? ALVEOLAR : corrected ? TEMPERATURE_CORRECTED : null;
  const skip = (reason: string) => col.skipped.push({ sourceText: p.text, reason, line: lineNo });
  if ('skip' in t) skip(t.skip);
  else if ('ask' in t) {
    if (seg.kind === 'value' && t.ask === 'capsPAO2' && notMeasured) skip(notMeasured);
    else askLabel(p, t.ask, ctx);
  } else if (GAS_PRESSURE_OR_PH.has(t.field) && notMeasured) skip(notMeasured);
  else if (seg.kind === 'question')
    col.questions.push({
      path: t.field,
      reason: `${FIELD[t.field].label}: ${seg.reason}`,
      ...(seg.value !== undefined ? { value: seg.value } : {}),
      sourceText: p.text,
    });
  else col.candidates.push(candidate(p, t.field, seg.value, t.variant, ctx));
}

const candidate = (
  p: Parsed,
  path: FieldPath,
  value: number,
  variant: Variant | undefined,
  ctx: LineContext,
): Candidate => ({
  path,
  value,
  unit: p.seg.kind === 'value' ? p.seg.unit : null,
  headerUnit: false,
  variant,
  sourceText: p.text,
  line: ctx.lineNo,
});

/** A base deficit (its sign) or "PAO2" (alveolar or arterial): asked about, never filled; PAO2 read where the
 * paste writes every label in capitals. */
function askLabel(p: Parsed, ask: 'baseDeficit' | 'capsPAO2', ctx: LineContext): void {
  const { col } = ctx;
  const seg = p.seg;
  const path = ask === 'baseDeficit' ? 'gas.baseExcess' : 'gas.po2';
  if (seg.kind !== 'value') {
    if (seg.kind === 'question')
      col.questions.push({ path, reason: seg.reason, sourceText: p.text });
    return;
  }
  if (ask === 'baseDeficit')
    col.questions.push({
      path,
      reason: `base deficit ${seg.value} read: base excess is usually its negative (${-seg.value}); confirm`,
      options: [String(-seg.value)],
      value: seg.value,
      sourceText: p.text,
    });
  else if (ctx.capsConvention)
    col.candidates.push(candidate(p, 'gas.po2', seg.value, undefined, ctx));
  else
    col.questions.push({
      path,
      reason: `"PAO2" can mean the alveolar PO2: confirm that ${seg.value} is the arterial PaO2`,
      options: ['arterial PaO2', 'alveolar PAO2'],
      value: seg.value,
      sourceText: p.text,
    });
}
