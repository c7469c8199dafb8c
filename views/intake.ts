// What an intake read from a pasted text or a FHIR payload, as the page shows it. The server calls the intake
// (server/intake) and hands its result in as data; the shapes below are what the page reads of it, so the page
// knows nothing of how the intake works. Nothing unsure goes into the case: a question leaves its value out.
import { FIELD, type FieldError, type FieldPath } from '../calc/index.ts';
import { setPath, type Json } from './paths.ts';
import { fieldLabel, sampleOf, type StepContext } from './steps.ts';

/** A reading an intake is not sure of: shown to the clinician, never filled into the case. */
export interface Question {
  /** the case field (or 'sample', 'units.pressure', 'gas') the question is about */
  path: string;
  reason: string;
  options?: string[];
  /** the option the other values point to; still only a suggestion */
  suggested?: string;
  value?: number;
  sourceText?: string;
}

/** A draft case as an intake fills it (any sample named in it). */
interface DraftCase {
  sample?: string | null;
}

/** What the paste intake gives back, as far as the page shows it. */
export interface PasteReading {
  case: DraftCase;
  read: readonly {
    path: string;
    value: number;
    unit: string;
    sourceText: string;
    /** where the unit came from: 'text', 'printout', 'magnitude' or 'implied' */
    unitFrom: string;
    note?: string;
  }[];
  questions: readonly Question[];
  ignored: readonly string[];
  skipped: readonly { sourceText: string; reason: string }[];
}

/** What the FHIR intake gives back, as far as the page shows it. */
export interface FhirReading {
  case: DraftCase;
  read: readonly {
    path: string;
    value: number;
    unit: string;
    sourceText: string;
    source: string;
  }[];
  conversions: readonly {
    path: string;
    source: string;
    from: { value: number; unit: string };
    to: { value: number; unit: string };
    reason: string;
  }[];
  /** errors with their path inside the payload */
  errors: readonly FieldError[];
  questions: readonly Question[];
  unused: readonly { code: string | null; display: string; reason: string; source: string }[];
  /** results the case does not hold, with their time and the reason (an older repeat, a value of another time) */
  earlier: readonly {
    path: string;
    value: number;
    unit: string;
    effective: string | null;
    reason: string;
  }[];
  notes: readonly string[];
}

/** What the server got from the intake for a text. */
export type RawIntake =
  | { kind: 'empty' }
  | { kind: 'too-long'; limit: number; length: number }
  | { kind: 'json-not-fhir' }
  | { kind: 'paste'; result: PasteReading }
  | { kind: 'fhir'; result: FhirReading };

export interface ReadItem {
  path: string;
  value: number;
  unit: string;
  sourceText: string;
  notes: string[];
}
export interface SetAside {
  text: string;
  reason: string;
}

/** One intake result, the same shape whatever the text was. */
export interface Intake {
  kind: RawIntake['kind'];
  text: string;
  case: Json;
  read: ReadItem[];
  questions: Question[];
  setAside: SetAside[];
  conversions: string[];
  notes: string[];
  ignored: string[];
  /** why nothing or not everything could be read */
  problems: string[];
  /** where the sample type came from, when it is known */
  sampleFrom: string | null;
}

// ---------- labels ----------

/** Questions about more than one value, by what they ask. */
const WHOLE: Readonly<Record<string, string>> = {
  sample: 'Sample type',
  gas: 'The gas',
  'units.pressure': 'The gas',
};

/** The name of a case field as the steps call it. */
export function labelOf(path: string, sample: StepContext['sample']): string {
  const field = FIELD[path as FieldPath];
  return field ? fieldLabel(field, sample) : (WHOLE[path] ?? path);
}

const round2 = (v: number) => Math.round(v * 100) / 100;

// ---------- from the intake's result ----------

const UNIT_FROM: Record<string, string | null> = {
  magnitude: 'unit not written: the only one that fits the number',
  printout: 'unit written elsewhere on the text',
  text: null,
  implied: null,
};
export function intakeOf(raw: RawIntake, text: string): Intake {
  const out: Intake = {
    kind: raw.kind,
    text,
    case: {},
    read: [],
    questions: [],
    setAside: [],
    conversions: [],
    notes: [],
    ignored: [],
    problems: [],
    sampleFrom: null,
  };
  if (raw.kind === 'empty') {
    out.problems.push('The text is empty: paste the results first.');
    return out;
  }
  if (raw.kind === 'too-long') {
    out.problems.push(
      `The text has ${raw.length} characters, more than ${raw.limit}: paste the result lines only.`,
    );
    return out;
  }
  if (raw.kind === 'json-not-fhir') {
    out.problems.push(
      'This is JSON but not FHIR (it has no resourceType): paste a FHIR Bundle, a list of Observations or one Observation, or the printout as text.',
    );
    return out;
  }
  if (raw.kind === 'paste') {
    const r = raw.result;
    out.case = structuredClone(r.case) as unknown as Json;
    if (r.case.sample) out.sampleFrom = 'named in the text';
    out.read = r.read.map((x) => ({
      path: x.path,
      value: x.value,
      unit: x.unit,
      sourceText: x.sourceText,
      notes: [UNIT_FROM[x.unitFrom], x.note].filter((n): n is string => !!n),
    }));
    for (const q of r.questions) {
      if (q.path === '(text)') out.problems.push(q.reason);
      else out.questions.push(q);
    }
    out.setAside = r.skipped.map((s) => ({ text: s.sourceText, reason: s.reason }));
    out.ignored = r.ignored.filter((line) => line.trim() !== '');
    if (!out.read.length && !out.questions.length && !out.problems.length)
      out.problems.push(
        'Nothing in the text could be read as a result: check that it holds the result lines (a label, the value, its unit).',
      );
    return out;
  }
  const r = raw.result;
  const c = structuredClone(r.case) as unknown as Json;
  const sample = sampleOf(c);
  const read: (ReadItem & { source: string })[] = r.read.map((x) => ({
    path: x.path,
    value: x.value,
    unit: x.unit,
    sourceText: x.sourceText,
    notes: [],
    source: x.source,
  }));
  for (const conv of r.conversions) {
    // a converted value is shown and kept at two decimals: what the clinician sees is what the case holds
    const shown = round2(conv.to.value);
    const item = read.find((x) => x.path === conv.path && x.source === conv.source);
    if (item && conv.to.unit !== '%') {
      item.value = shown;
      setPath(c, conv.path, shown);
    }
    if (item) item.notes.push(`converted from ${conv.from.value} ${conv.from.unit}`.trim());
    out.conversions.push(
      `${labelOf(conv.path, sample)} ${conv.from.value} ${conv.from.unit} read as ${conv.to.unit === '%' ? conv.to.value : shown} ${conv.to.unit}: ${conv.reason}`,
    );
  }
  for (const e of r.errors) {
    // a value the schema refuses is left out of the case and said where it came from
    const item = read.find((x) => e.path === x.source || e.path.startsWith(`${x.source}.`));
    if (item) {
      read.splice(read.indexOf(item), 1);
      setPath(c, item.path, undefined);
      out.setAside.push({ text: item.sourceText, reason: e.message });
    } else {
      out.problems.push(
        e.path.startsWith('entry') || e.path.startsWith('[')
          ? `${e.message} (at ${e.path})`
          : e.message,
      );
    }
  }
  out.case = c;
  if (c.sample !== undefined) out.sampleFrom = 'the specimen of the LOINC codes';
  out.read = read.map(({ source: _source, ...rest }) => rest);
  out.questions = [...r.questions];
  for (const u of r.unused)
    out.setAside.push({
      text: [u.code, u.display].filter(Boolean).join(' ') || u.source,
      reason: u.reason,
    });
  for (const s of r.earlier) {
    out.setAside.push({
      text: `${labelOf(s.path, sample)} ${s.value}${s.unit ? ` ${s.unit}` : ''}${s.effective ? ` (${s.effective})` : ''}`,
      reason: s.reason,
    });
  }
  out.notes = [...r.notes];
  if (!out.read.length && !out.questions.length && !out.problems.length)
    out.problems.push(
      'No result in this FHIR payload could be read: Gasline reads LOINC-coded Observations with UCUM units.',
    );
  return out;
}

/**
 * The clinician's own earlier answer on the first step meets the paste: kept when the paste does not say,
 * asked about when the paste says otherwise.
 */
export function withChosenSample(intake: Intake, chosen: unknown): Intake {
  if (chosen !== 'arterial' && chosen !== 'venous' && chosen !== 'capillary') return intake;
  const out = { ...intake, case: structuredClone(intake.case), questions: [...intake.questions] };
  const read = out.case.sample;
  if (read !== undefined && read !== chosen) {
    delete out.case.sample;
    out.sampleFrom = null;
    out.questions.unshift({
      path: 'sample',
      reason: `You chose ${chosen} on the first step; the text says ${String(read)}: which is it?`,
      options: [chosen, String(read)],
    });
    return out;
  }
  // the text does not say (its question names no source): the clinician's own answer stands
  const unsaid = out.questions.findIndex((q) => q.path === 'sample' && !q.sourceText);
  if (read === undefined && unsaid >= 0) {
    out.questions.splice(unsaid, 1);
    out.case.sample = chosen;
    out.sampleFrom = 'your answer on the first step';
  }
  return out;
}
