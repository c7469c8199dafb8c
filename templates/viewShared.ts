// What every part of the note's view model works from: the findings, the formatter in the clinician's units,
// and the switches the parts share. The parts (viewAcidBase, viewOxygen, viewVentilation, viewPlan) each turn
// one section of the findings into display-ready strings; view.ts puts them together.
import { withoutInvisible, type Disorder, type Findings } from '../calc/index.ts';
import type { Formatter, Text } from './format.ts';

export type NoteFormat = 'text' | 'markdown';
type N = number | null | undefined;

export const has = (x: N): x is number => typeof x === 'number' && Number.isFinite(x);

export interface Ctx {
  f: Findings;
  fmt: Formatter;
  md: boolean;
  /** the pressure's unit is in doubt: nothing computed from it is shown */
  withheld: boolean;
  hasDisorder(code: Disorder['code'], detail?: Disorder['detail']): boolean;
}

export function context(f: Findings, fmt: Formatter, format: NoteFormat): Ctx {
  return {
    f,
    fmt,
    md: format === 'markdown',
    withheld: f.withheld,
    hasDisorder: (code, detail) =>
      f.disorders.some((x) => x.code === code && (detail === undefined || x.detail === detail)),
  };
}

/**
 * Free text from the request (labels, times): one line, no invisible controls, and inert in Markdown: every
 * character a common renderer reads as markup is escaped, the ":" and "." of "https://" and "www." included, so
 * that no renderer (GitHub-style autolinks too) turns it into a link or HTML.
 */
export function freeText(value: string | null, md: boolean): Text {
  if (!value) return null;
  const line = withoutInvisible(value)
    .replace(/[\u0000-\u001f\u007f-\u009f]+/g, ' ')
    .replace(/\s+/g, ' ')
    .trim();
  if (!line) return null;
  if (!md) return line;
  // markup characters always; ":" and "." after a letter ("https:", "www.", "example.org"), so that times and
  // decimals ("04:10", "7.31") read as written while no scheme, domain or e-mail address (with its @) stays whole
  return line.replace(/([\\`*_[\]<>#|~()!&@])/g, '\\$1').replace(/(?<=[A-Za-z])([:.])/g, '\\$1');
}
