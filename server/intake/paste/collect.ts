// Collecting: the paste read line by line into candidates (a field, a number, the unit written, where it was),
// with the questions, skipped labels, ignored lines and sample types found on the way. Nothing is decided here:
// which candidate wins and in which unit is decide.ts.
import type { FieldPath } from '../../../calc/index.ts';
import type { Question, Sample } from '../case.ts';
import { findLabels, type Variant } from './labels.ts';
import { readLabelLine, type Header } from './line.ts';
import { shorthandRuns, shorthandNumber } from './shorthand.ts';
import { NUM, normalizeChars, parseNumber, stripHtml } from './text.ts';
import type { Skipped } from './types.ts';
import type { UnitToken } from './units.ts';

export interface Candidate {
  path: FieldPath;
  value: number;
  unit: UnitToken | null;
  /** the unit came from a column header rather than beside the value */
  headerUnit: boolean;
  variant: Variant | undefined;
  sourceText: string;
  line: number;
}

export interface Collector {
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

const NUMBER_CELL = new RegExp(`^[-+]?${NUM}(?:HH|LL|H|L|\\*)?$`);
const SHORTHAND_PATHS: readonly FieldPath[] = ['gas.ph', 'gas.pco2', 'gas.po2', 'gas.hco3'];

/** Read every line of the text (tags stripped) into a collector. */
export function collect(text: string): Collector {
  const col: Collector = { candidates: [], questions: [], skipped: [], ignored: [], samples: [] };
  // a paste that writes PACO2 in capitals writes PAO2 for the arterial PO2 too
  const capsConvention = /(?<![A-Za-z])PACO2(?![A-Za-z0-9])/.test(text);
  let correctedSection = false;
  let header: Header | null = null;

  stripHtml(text)
    .split(/\r\n|\r|\n/)
    .forEach((raw, index) => {
      const lineNo = index + 1;
      const norm = normalizeChars(raw);
      if (!norm.trim()) {
        correctedSection = false;
        if (header) col.ignored.push(header.raw.trim());
        header = null;
        return;
      }
      let used = false;
      for (const [sample, re] of SAMPLE_WORDS) {
        if (re.test(norm) && !col.samples.some((s) => s.line === lineNo && s.sample === sample)) {
          col.samples.push({ sample, sourceText: raw.trim(), line: lineNo });
          used = true;
        }
      }
      if (header) {
        const pending: Header = header;
        header = null;
        if (readHeaderRow(pending, raw, norm, lineNo, col)) return;
        col.ignored.push(pending.raw.trim());
      }
      const scan = readShorthand(raw, norm, lineNo, col);
      const line = readLabelLine({
        raw,
        norm,
        scan: scan.text,
        lineNo,
        used: used || scan.used,
        correctedSection,
        capsConvention,
        col,
      });
      correctedSection = line.correctedSection;
      header = line.header;
    });
  if (header) col.ignored.push((header as Header).raw.trim());
  return col;
}

/** A row of numbers under a header of labels: one value per column. False when the line is not such a row. */
function readHeaderRow(
  header: Header,
  raw: string,
  norm: string,
  lineNo: number,
  col: Collector,
): boolean {
  const cells = norm
    .trim()
    .split(/\s*[|\t;]\s*|\s{2,}|\s+/)
    .filter(Boolean);
  if (
    findLabels(norm).length > 0 ||
    cells.length !== header.labels.length ||
    !cells.every((c) => NUMBER_CELL.test(c))
  )
    return false;
  cells.forEach((cell, i) => {
    const label = header.labels[i]!;
    const numberText = cell.replace(/(?:HH|LL|H|L|\*)$/, '');
    const n = parseNumber(numberText.replace(/^[-+]/, ''));
    const sourceText = `${header.raw.trim()} / ${raw.trim()} (column ${i + 1})`;
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
  return true;
}

/** The shorthand runs of a line become candidates; the line is returned with them blanked out. */
function readShorthand(
  raw: string,
  norm: string,
  lineNo: number,
  col: Collector,
): { text: string; used: boolean } {
  let scan = norm;
  let used = false;
  for (const run of shorthandRuns(norm)) {
    used = true;
    const sourceText = raw.slice(run.start, run.end).trim();
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
    SHORTHAND_PATHS.forEach((path, i) => {
      const v = values[i];
      if (v === null || v === undefined) return;
      col.candidates.push({
        path,
        value: v,
        unit: path === 'gas.pco2' || path === 'gas.po2' ? run.unit : null,
        headerUnit: false,
        variant: undefined,
        sourceText,
        line: lineNo,
      });
    });
  }
  return { text: scan, used };
}
