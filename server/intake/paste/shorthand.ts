// The trade shorthand pH/PaCO2/PaO2/HCO3 ("7.31/48/72/23 mmHg"): a run of numbers joined by "/" whose first is a
// believable pH (calc's range for pH), with the pressure unit written after it, if any.
import { FIELD, type PressureUnit } from '../../../calc/index.ts';
import { NUM, normalizeChars, parseNumber, stripHtml } from './text.ts';
import { MAX_PASTE_CHARS, type Shorthand } from './types.ts';

// three or more numbers joined by "/", the first a pH: "7.31/48" alone is not the shorthand
const SHORTHAND_RUN = new RegExp(
  String.raw`(?<![\w.\/])${NUM}(?:\s*\/\s*(?:[-+]?${NUM}|[-xX?])){2,}(?![\w.\/])`,
  'g',
);
const PH_LIKE = /^\d[.,]\d{1,3}$/;

export interface ShorthandRun {
  start: number;
  end: number;
  parts: string[];
  unit: PressureUnit | null;
}

export function shorthandRuns(line: string): ShorthandRun[] {
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

export const shorthandNumber = (part: string): number | null => {
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
