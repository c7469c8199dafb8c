// A paste on the first step: what the intake read (server/intake, called by the server), shown for the
// clinician to confirm, its questions asked as form controls, and on confirm the case and the steps it answers.
// Nothing unsure goes into the case: an open question leaves its value out and its step open for it.
// The text travels with the confirm form; a fingerprint of the text that was shown makes sure the values
// used are the ones the clinician saw.
import { createHash } from 'node:crypto';
import { interpret, type FieldError, type InterpretOptions } from '../calc/index.ts';
import { FIELD, type FieldPath, type FieldSpec } from '../calc/index.ts';
import type { FhirResult, PasteResult, Question } from '../server/intake/index.ts';
import { checkAnswers, contextFor, statuses, unitQuestion, type FlowState } from './flow.ts';
import {
  STEPS,
  gasLabel,
  getPath,
  sampleOf,
  setPath,
  type FormValues,
  type Json,
  type StepContext,
  type StepId,
} from './steps.ts';

/** What the server got from the intake for a text. */
export type RawIntake =
  | { kind: 'empty' }
  | { kind: 'too-long'; limit: number; length: number }
  | { kind: 'json-not-fhir' }
  | { kind: 'paste'; result: PasteResult }
  | { kind: 'fhir'; result: FhirResult };

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

export const fingerprint = (text: string): string =>
  createHash('sha256').update(text, 'utf8').digest('hex').slice(0, 32);

// ---------- labels ----------

function rangeOf(path: string): FieldSpec | null {
  return FIELD[path as FieldPath] ?? null;
}

/** The name of a case field as the steps call it. */
export function labelOf(path: string, sample: StepContext['sample']): string {
  if (path === 'gas.pco2') return gasLabel(sample, 'CO2');
  if (path === 'gas.po2') return gasLabel(sample, 'O2');
  if (path === 'oxygen.fio2') return 'FiO2';
  if (path === 'context.temperatureC') return 'Patient temperature';
  if (path === 'sample') return 'Sample type';
  if (path === 'gas' || path === 'units.pressure') return 'The gas';
  return rangeOf(path)?.label ?? path;
}

/** The step that asks for a case field. */
export function stepOf(path: string): StepId | null {
  if (path === 'sample') return 'sample';
  if (
    path === 'gas' ||
    path.startsWith('gas.') ||
    path === 'units.pressure' ||
    path === 'context.temperatureC'
  )
    return 'gas';
  if (path.startsWith('chemistry.')) return 'chemistry';
  if (path.startsWith('oxygen.')) return 'oxygen';
  return null;
}

const isObject = (x: unknown): x is Json =>
  x !== null && typeof x === 'object' && !Array.isArray(x);
const round2 = (v: number) => Math.round(v * 100) / 100;
const capital = (s: string) => s.charAt(0).toUpperCase() + s.slice(1);

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
  out.questions = r.questions;
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
  out.notes = r.notes;
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

// ---------- the questions as controls ----------

/** Options that set a value with its unit: [units key, units value, label shown]. */
const UNIT_OPTIONS: Record<string, Record<string, [string, string, string]>> = {
  'gas.pco2': { mmHg: ['pressure', 'mmHg', 'mmHg'], kPa: ['pressure', 'kPa', 'kPa'] },
  'gas.po2': { mmHg: ['pressure', 'mmHg', 'mmHg'], kPa: ['pressure', 'kPa', 'kPa'] },
  'gas.hb': { 'g/dL': ['hb', 'g/dL', 'g/dL'], 'g/L': ['hb', 'g/L', 'g/L'] },
  'chemistry.albumin': { 'g/dL': ['albumin', 'g/dL', 'g/dL'], 'g/L': ['albumin', 'g/L', 'g/L'] },
  'chemistry.glucose': {
    'mmol/L': ['glucose', 'mmol/L', 'mmol/L'],
    'mg/dL': ['glucose', 'mg/dL', 'mg/dL'],
  },
  'chemistry.creatinine': {
    'mg/dL': ['creatinine', 'mg/dL', 'mg/dL'],
    'umol/L': ['creatinine', 'umol/L', 'µmol/L'],
  },
  // urea in mg/dL may be urea itself or urea nitrogen: only the explicit "BUN mg/dL" answer is taken
  'chemistry.urea': {
    'mmol/L': ['urea', 'urea-mmol/L', 'urea mmol/L'],
    'BUN mg/dL': ['urea', 'bun-mg/dL', 'BUN mg/dL'],
  },
};

const SAMPLES = ['arterial', 'venous', 'capillary'];
export const LEAVE_OUT = 'leave-out';

export type Control =
  | {
      kind: 'choice';
      options: { value: string; label: string }[];
      leaveOut: boolean;
      effect: 'sample' | 'unit' | 'number';
    }
  | { kind: 'step' };

export function controlOf(q: Question): Control {
  const options = q.options ?? [];
  if (q.path === 'sample') {
    const valid = options.filter((o) => SAMPLES.includes(o));
    return valid.length
      ? {
          kind: 'choice',
          options: valid.map((o) => ({ value: o, label: capital(o) })),
          leaveOut: false,
          effect: 'sample',
        }
      : { kind: 'step' };
  }
  const units = UNIT_OPTIONS[q.path];
  if (units && q.value !== undefined) {
    const valid = options.filter((o) => units[o]);
    if (valid.length)
      return {
        kind: 'choice',
        options: valid.map((o) => ({ value: o, label: `${q.value} ${units[o]![2]}` })),
        leaveOut: true,
        effect: 'unit',
      };
  }
  const range = rangeOf(q.path);
  const unitFree = q.path === 'oxygen.fio2' || (range !== null && !range.quantity);
  if (unitFree && options.length && options.every((o) => /^-?\d+(\.\d+)?$/.test(o))) {
    const unit = q.path === 'oxygen.fio2' ? '' : (range?.unit ?? '');
    return {
      kind: 'choice',
      options: options.map((o) => ({ value: o, label: `${o}${unit ? ` ${unit}` : ''}` })),
      leaveOut: true,
      effect: 'number',
    };
  }
  return { kind: 'step' };
}

// ---------- the confirm view ----------

/** The values to look at before the case is used, and the questions as form controls. */
export function pasteView(
  intake: Intake,
  form: FormValues | null,
  errors: FieldError[] = [],
  remark: string | null = null,
) {
  const sample = sampleOf(intake.case);
  const known = intake.case.sample !== undefined;
  const notOxygenation = known && sample !== 'arterial';
  const read = [...intake.read]
    .sort((a, b) => order(a.path) - order(b.path))
    .map((r) => ({
      label: labelOf(r.path, sample),
      value: String(r.value),
      unit: r.unit === 'fraction' ? '(fraction)' : r.unit,
      from: r.sourceText,
      notes: [
        ...r.notes,
        ...(notOxygenation && OXYGENATION_PATHS.includes(r.path)
          ? [`not used: the PO2 and saturation of a ${sample} sample do not show oxygenation`]
          : []),
      ],
    }));
  const questions = intake.questions.map((q, i) => {
    const name = `answer-${i}`;
    const control = controlOf(q);
    const typed = form?.[name];
    const legend =
      q.path === 'sample'
        ? 'Sample type'
        : q.path === 'gas'
          ? 'The gas'
          : `${labelOf(q.path, sample)}${q.value !== undefined ? ` ${q.value}` : ''}`;
    const step = stepOf(q.path);
    // the intake's own words assume a default; the page asks instead and assumes nothing
    const reason =
      q.path === 'sample' && !q.sourceText && (q.options ?? []).length === 3
        ? `The ${intake.kind === 'fhir' ? 'codes do' : 'text does'} not say whether the sample is arterial, venous or capillary.`
        : capital(q.reason);
    const base = {
      id: `q-${i}`,
      name,
      legend,
      reason,
      sourceText: q.sourceText ?? null,
      stepTitle: step ? STEPS[step].title : null,
      error: errors.find((e) => e.path === name)?.message ?? null,
    };
    if (control.kind === 'step') return { ...base, kind: 'step' as const, options: [] };
    const options = [
      ...control.options,
      ...(control.leaveOut
        ? [
            {
              value: LEAVE_OUT,
              label: `Neither: leave it out, I will enter it at the ${(step ? STEPS[step].title : 'gas').toLowerCase()} step`,
            },
          ]
        : []),
    ];
    return {
      ...base,
      kind: 'choice' as const,
      suggested: q.suggested ?? null,
      options: options.map((o, j) => ({
        id: `q-${i}-${j}`,
        value: o.value,
        label: o.label,
        checked: typed === o.value,
      })),
    };
  });
  const missing = MISSING_CHECK.filter((p) => !(p === 'gas.po2' && notOxygenation))
    .filter(
      (p) => getPath(intake.case, p) === undefined && !intake.questions.some((q) => q.path === p),
    )
    .map((p) => labelOf(p, sample));
  const usable = intake.read.length > 0 || questions.some((q) => q.kind === 'choice');
  return {
    type: 'paste',
    id: 'paste',
    title: 'Check what was read',
    source: intake.kind === 'fhir' ? 'FHIR JSON' : 'the pasted text',
    text: intake.text,
    fingerprint: fingerprint(intake.text),
    remark,
    problems: intake.problems,
    errors: errors.filter((e) => !e.path.startsWith('answer-')).map((e) => e.message),
    sample:
      known && intake.sampleFrom
        ? { value: capital(String(intake.case.sample)), from: intake.sampleFrom }
        : null,
    read,
    questions,
    missing: read.length ? missing : [],
    setAside: intake.setAside,
    conversions: intake.conversions,
    notes: intake.notes,
    ignored: intake.ignored,
    canConfirm: usable,
  };
}

export type PasteView = ReturnType<typeof pasteView>;

const ORDER = [
  'gas.ph',
  'gas.pco2',
  'gas.po2',
  'gas.hco3',
  'gas.baseExcess',
  'gas.sao2',
  'gas.lactate',
  'gas.hb',
  'context.temperatureC',
  'chemistry.na',
  'chemistry.k',
  'chemistry.cl',
  'chemistry.albumin',
  'chemistry.glucose',
  'chemistry.urea',
  'chemistry.osmolality',
  'chemistry.creatinine',
  'oxygen.fio2',
  'oxygen.spo2',
];
const order = (path: string) => {
  const i = ORDER.indexOf(path);
  return i < 0 ? ORDER.length : i;
};
const OXYGENATION_PATHS = ['gas.po2', 'gas.sao2', 'oxygen.fio2', 'oxygen.spo2'];
/** Values a reading leans on; the confirm view says which of them the text did not have. */
const MISSING_CHECK = [
  'gas.ph',
  'gas.pco2',
  'gas.po2',
  'gas.hco3',
  'chemistry.na',
  'chemistry.k',
  'chemistry.cl',
  'chemistry.albumin',
];

// ---------- confirming ----------

export type ConfirmOutcome =
  | { ok: true; state: FlowState; announce: string; remarks: string[] }
  | { ok: false; errors: FieldError[] };

/** The case from what was read and the answers given; the steps it answers are marked answered. */
export function confirmPaste(
  state: FlowState,
  intake: Intake,
  form: FormValues,
  options?: InterpretOptions,
): ConfirmOutcome {
  const answers = structuredClone(intake.case);
  const errors: FieldError[] = [];
  const open = new Map<StepId, string[]>();
  const leaveOpen = (step: StepId | null, why: string) => {
    if (step) open.set(step, [...(open.get(step) ?? []), why]);
  };
  let pressureChosen = false;

  intake.questions.forEach((q, i) => {
    const name = `answer-${i}`;
    const control = controlOf(q);
    const raw = form[name] ?? '';
    const step = stepOf(q.path);
    if (control.kind === 'step') {
      leaveOpen(step, capital(q.reason));
      return;
    }
    if (raw === '' || raw === LEAVE_OUT) {
      leaveOpen(
        step,
        `${labelOf(q.path, sampleOf(answers))}: left out at the paste; enter it here if you have it`,
      );
      return;
    }
    if (!control.options.some((o) => o.value === raw)) {
      errors.push({ path: name, message: 'Choose one of the answers offered' });
      return;
    }
    if (control.effect === 'sample') {
      answers.sample = raw;
      return;
    }
    if (control.effect === 'number') {
      setPath(answers, q.path, Number(raw));
      return;
    }
    const [key, unit] = UNIT_OPTIONS[q.path]![raw]!;
    const held = getPath(answers, `units.${key}`);
    if (held !== undefined && held !== unit) {
      errors.push({
        path: name,
        message: `${labelOf(q.path, sampleOf(answers))} cannot be in ${unit}: other values of the case are in ${String(held)}, and the case holds one unit for them`,
      });
      return;
    }
    setPath(answers, `units.${key}`, unit);
    setPath(answers, q.path, q.value);
    if (key === 'pressure') pressureChosen = true;
  });
  if (errors.length) return { ok: false, errors };

  const dropped: string[] = [];
  const sample = sampleOf(answers);
  if (answers.sample !== undefined && sample !== 'arterial') {
    // as on the sample step: a venous or capillary PO2 or saturation says nothing about oxygenation
    for (const path of OXYGENATION_PATHS) {
      const v = getPath(answers, path);
      if (v !== undefined) {
        dropped.push(`${labelOf(path, sample)} ${String(v)}`);
        setPath(answers, path, undefined);
      }
    }
  }
  for (const group of ['gas', 'chemistry', 'oxygen', 'context', 'units']) {
    if (isObject(answers[group]) && Object.keys(answers[group] as Json).length === 0)
      delete answers[group];
  }
  if (!isObject(answers.gas)) {
    return {
      ok: false,
      errors: [
        {
          path: 'gas',
          message:
            'No gas value was read: at least two of pH, PaCO2 and HCO3 are needed. Add them to the text and read it again, or enter the gas by hand.',
        },
      ],
    };
  }
  const schema = checkAnswers(answers);
  if (schema.length)
    return {
      ok: false,
      errors: schema.map((e) => ({
        path: e.path,
        message: e.path.includes('.') ? `${labelOf(e.path, sample)}: ${e.message}` : e.message,
      })),
    };
  const result = interpret(answers, options);
  if (!result.ok) return { ok: false, errors: result.errors };

  const has = (path: string) =>
    getPath(answers, path) !== undefined && getPath(answers, path) !== null;
  const done: StepId[] = [];
  if (answers.sample !== undefined) done.push('sample');
  const unit = String(getPath(answers, 'units.pressure') ?? 'mmHg');
  const unitDoubt = unitQuestion(answers, pressureChosen ? { unitAsked: unit } : {}, options);
  if (unitDoubt) leaveOpen('gas', unitDoubt.message);
  if (sample === 'arterial' && !has('gas.po2'))
    leaveOpen(
      'gas',
      `${labelOf('gas.po2', sample)} was not on the text: add it if you have it, or go on without it`,
    );
  if (!open.has('gas')) done.push('gas');
  const chemistryRead = intake.read.some((r) => r.path.startsWith('chemistry.'));
  if (chemistryRead && (!has('chemistry.na') || !has('chemistry.cl')))
    leaveOpen(
      'chemistry',
      'Na and Cl are both needed for the anion gap: add what the text did not have',
    );
  if (chemistryRead && !open.has('chemistry')) done.push('chemistry');

  const next: FlowState = { ...state, answers, done };
  const list = statuses(next, contextFor(next, options));
  const first = list.find((s) => s.status === 'todo')?.id ?? null;
  const kept = new Set(
    [...intake.read.map((r) => r.path), ...intake.questions.map((q) => q.path)].filter(
      (p) => p !== 'sample' && p.includes('.') && has(p),
    ),
  ).size;
  const remarks: string[] = [];
  if (first) {
    const prefilled = intake.read
      .filter((r) => stepOf(r.path) === first && has(r.path))
      .map((r) => labelOf(r.path, sample));
    if (prefilled.length) remarks.push(`From the paste: ${prefilled.join(', ')}. Check and go on.`);
    remarks.push(...(open.get(first) ?? []));
  }
  if (dropped.length) remarks.push(`Not used, as the sample is ${sample}: ${dropped.join(', ')}.`);
  const announce = `Kept from the paste: ${kept} value${kept === 1 ? '' : 's'}.${dropped.length ? ` Not used for a ${sample} sample: ${dropped.join(', ')}.` : ''} ${first ? `Next: ${STEPS[first].title.toLowerCase()}.` : 'The draft note is ready below.'}`;
  return { ok: true, state: next, announce, remarks };
}
