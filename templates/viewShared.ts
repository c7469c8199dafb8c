// What every part of the note's view model works from: the findings, the formatter in the clinician's units,
// and the switches the parts share. The parts (viewAcidBase, viewOxygen, viewVentilation, viewPlan) each turn
// one section of the findings into display-ready strings; view.ts puts them together.
import type { Disorder, Findings } from '../calc/index.ts';
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

/** Free text from the request (labels, times): one line, and inert in Markdown. */
export function freeText(value: string | null, md: boolean): Text {
  if (!value) return null;
  const line = value
    .replace(/[\u0000-\u001f\u007f]+/g, ' ')
    .replace(/\s+/g, ' ')
    .trim();
  if (!line) return null;
  return md ? line.replace(/([\\`*_[\]<>#|~])/g, '\\$1') : line;
}
