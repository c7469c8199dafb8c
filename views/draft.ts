// The draft under the answered steps: the note and handover (from the department's templates), the cautions, the
// H+/CO2 chart, the explain view and the follow-up form. Built from the findings the request already holds.
import { marked } from 'marked';
import sanitizeHtml from 'sanitize-html';
import {
  FIELD,
  MAX_PREVIOUS_GASES,
  enteredUnit,
  units as U,
  type Findings,
} from '../calc/index.ts';
import { contextOf, fieldLabel } from './stepContext.ts';
import type { NoteRenderer } from '../templates/index.ts';
import { acidBaseChart } from './chart.ts';
import { earlierGases, type Json } from './paths.ts';
import type { Format } from './flow.ts';

export interface DraftOptions {
  format: Format;
  /** the clinician's own edits of the draft, kept across a preview */
  edited: { note?: string; handover?: string } | null;
  /** the follow-up form, refused with its message and what was typed */
  followUp: { error: string; typed: string } | null;
  /** filing the draft back into the record, when the launch allows it, and what the last filing gave */
  fileBack: { filed: { ok: boolean; message: string } | null } | null;
  autofocus: boolean;
  /** when the current gas was taken, as the clinician gave it */
  taken: string;
}

const SEVERITY_LABEL = { critical: 'Critical', warning: 'Check', info: 'Note' } as const;

/** A number as shown in the explain view: rounded for reading only (the core keeps its own precision). */
const shown = (value: number) => String(Math.round(value * 100) / 100);

/** A value with its unit; a pressure also in kPa when that is the clinician's unit. */
function valueText(value: number, unit: string, units: U.Units): string {
  const main = `${shown(value)}${unit ? ` ${unit}` : ''}`;
  if (unit === 'mmHg' && units.pressure === 'kPa')
    return `${main} (${U.fromCanonical('pressure', value, units).toFixed(1)} kPa)`;
  return main;
}

/** Rows enough for the text, so the whole note shows without scrolling inside the box. */
function rowsFor(text: string, min: number, max: number): number {
  const rows = text
    .split('\n')
    .reduce((n, line) => n + Math.max(1, Math.ceil(line.length / 70)), 0);
  return Math.min(max, Math.max(min, rows + 1));
}

const PREVIEW_TAGS = [
  ...['p', 'br', 'strong', 'em', 'b', 'i', 'ul', 'ol', 'li', 'blockquote', 'code', 'pre', 'hr'],
  ...['h1', 'h2', 'h3', 'h4', 'h5', 'h6', 'table', 'thead', 'tbody', 'tr', 'th', 'td', 'del'],
];

/** Markdown to HTML for the preview, then sanitised: the clinician's text may hold anything. */
export function markdownPreview(text: string): string {
  const html = marked.parse(text, { async: false, gfm: true, breaks: false });
  return sanitizeHtml(html, { allowedTags: PREVIEW_TAGS, allowedAttributes: {} });
}

/** The H+/CO2 chart and its words. */
function chartView(f: Findings) {
  const chart = acidBaseChart(f);
  return { svg: chart.svg, lines: chart.text.split('\n').filter((line) => line.trim() !== '') };
}

/** The three values that make a gas, asked on the draft so that a later gas is a few key presses away. */
const FOLLOW_UP_FIELDS = ['gas.ph', 'gas.pco2', 'gas.hco3'] as const;

function followUpView(answers: Json, followUp: DraftOptions['followUp']) {
  const count = earlierGases(answers).length;
  const ctx = contextOf(answers, null);
  return {
    can: count < MAX_PREVIOUS_GASES,
    count,
    max: MAX_PREVIOUS_GASES,
    error: followUp?.error ?? null,
    value: followUp?.typed ?? '',
    fields: FOLLOW_UP_FIELDS.map((path) => ({
      id: `followup-${path.replace('.', '-')}`,
      name: path,
      label: fieldLabel(FIELD[path], ctx.sample),
      unit: enteredUnit(FIELD[path], ctx.units),
    })),
  };
}

/** When the draft was written, for the printed page (the browser shows it in local time). */
const draftedAt = (now: Date) => ({
  iso: now.toISOString(),
  text: `${now.toISOString().slice(0, 16).replace('T', ' ')} UTC`,
});

export function draftView(f: Findings, answers: Json, renderer: NoteRenderer, o: DraftOptions) {
  const { format, edited } = o;
  const note = renderer.render(f, { format });
  const text = edited?.note ?? note.text;
  const handover = edited?.handover ?? note.handover;
  return {
    // the one line above the box reads as plain words whatever the box's format
    format,
    line: format === 'text' ? note.line : renderer.render(f, { format: 'text' }).line,
    text,
    // the note as the server wrote it, beside the box: the page's script tells the clinician's edits from it
    drafted: draftedAt(new Date()),
    // the full reasoning, one toggle away; the same as the chart-ready note until that is written shorter
    full: note.full,
    fullDiffers: note.full !== note.text,
    taken: o.taken,
    handover,
    withheld: f.withheld,
    rows: {
      text: rowsFor(text, 6, 60),
      full: rowsFor(note.full, 6, 80),
      handover: rowsFor(handover, 4, 30),
    },
    edited: !!edited,
    previewHtml: format === 'markdown' ? markdownPreview(text) : null,
    flags: f.flags.map((flag) => ({
      severity: flag.severity,
      label: SEVERITY_LABEL[flag.severity],
      message: renderer.flagMessage(flag, f),
    })),
    chart: chartView(f),
    explain: Object.values(f.explain).map((e) => ({
      key: e.key,
      label: e.label,
      value: valueText(e.value, e.unit, f.units),
      formula: e.formula,
      source: e.source,
      inputs: e.inputs.map((i) => `${i.name} ${valueText(i.value, i.unit, f.units)}`).join('; '),
    })),
    followUp: followUpView(answers, o.followUp),
    fileBack: o.fileBack,
    autofocus: o.autofocus,
  };
}
