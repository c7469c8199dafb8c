// The steps of the page: which questions each asks, how its form fields become parts of the case,
// and how an answered step reads back as a message. Field names are the case's own paths
// ("gas.ph"), so a schema error's path points straight at its field.
// Labels and units come from the schema's ranges; no range is repeated here.
import {
  FIELD,
  enteredUnit,
  resolveUnits,
  type FieldPath,
  type ParsedCase,
} from '../calc/index.ts';
import type { units as U, FieldError } from '../calc/index.ts';

export type Json = Record<string, unknown>;

export const STEP_IDS = [
  'sample',
  'gas',
  'chemistry',
  'timing',
  'oxygen',
  'ventilator',
  'patient',
] as const;
export type StepId = (typeof STEP_IDS)[number];
export const isStepId = (s: string): s is StepId => (STEP_IDS as readonly string[]).includes(s);

export interface Option {
  value: string;
  label: string;
  json: unknown;
}

export interface UnitChoice {
  name: string;
  label: string;
  options: { value: string; label: string }[];
  fallback: string;
}

export type FieldDef =
  | {
      kind: 'number';
      name: string;
      label: string;
      unit: string;
      unitChoice?: UnitChoice;
      negative?: boolean;
      hint?: string;
    }
  | {
      kind: 'choice';
      name: string;
      label: string;
      options: Option[];
      required?: string;
      hint?: string;
      quick?: boolean;
    };

export interface Group {
  legend?: string;
  fields: FieldDef[];
}

/** What a step needs to know about the case so far. */
export interface StepContext {
  answers: Json;
  sample: 'arterial' | 'venous' | 'capillary';
  units: U.Units;
  /** a respiratory process is present in the numbers so far (null: not yet known) */
  respiratory: boolean | null;
}

export interface StepDef {
  id: StepId;
  title: string;
  question: string;
  skippable?: boolean;
  groups(ctx: StepContext): Group[];
  /** why the step is not asked for this case, or null when it is */
  skipReason(ctx: StepContext, done: boolean): string | null;
  /** short remarks shown with the form: a question left out, and why */
  remarks(ctx: StepContext): string[];
  /** extra work after the fields are written: pseudo-fields, cross-field rules */
  finish?(answers: Json, form: FormValues, ctx: StepContext, errors: FieldError[]): void;
}

export type FormValues = Record<string, string | undefined>;

// ---------- paths ----------

export function getPath(obj: Json, path: string): unknown {
  let cur: unknown = obj;
  for (const key of path.split('.')) {
    if (cur === null || typeof cur !== 'object') return undefined;
    cur = (cur as Json)[key];
  }
  return cur;
}

/** Set a value at a path; undefined removes it, and a group left empty goes too (the ventilator excepted: empty means ventilated). */
export function setPath(obj: Json, path: string, value: unknown): void {
  const keys = path.split('.');
  const parents: Json[] = [];
  let cur = obj;
  for (const key of keys.slice(0, -1)) {
    parents.push(cur);
    const next = cur[key];
    if (next === null || typeof next !== 'object') {
      if (value === undefined) return;
      cur[key] = {};
    }
    cur = cur[key] as Json;
  }
  const last = keys.at(-1)!;
  if (value === undefined) delete cur[last];
  else cur[last] = value;
  if (value !== undefined) return;
  for (let i = keys.length - 2; i >= 0; i--) {
    const parent = parents[i]!;
    const key = keys[i]!;
    const child = parent[key] as Json;
    if (Object.keys(child).length === 0 && !(i === 0 && key === 'ventilator')) delete parent[key];
    else break;
  }
}

// ---------- values ----------

const NUMBER = /^[-+]?(\d+([.,]\d*)?|[.,]\d+)$/;

/** A typed number; a comma is taken as the decimal mark. Anything else goes to the schema as typed, for its message. */
export function readNumber(raw: string | undefined): unknown {
  const text = (raw ?? '').trim().replace(/\u2212/g, '-');
  if (text === '') return undefined;
  if (NUMBER.test(text)) return Number(text.replace(',', '.'));
  return text;
}

export const sampleOf = (answers: Json): StepContext['sample'] => {
  const s = answers.sample;
  return s === 'venous' || s === 'capillary' ? s : 'arterial';
};

export function contextOf(answers: Json, respiratory: boolean | null): StepContext {
  // the answers have passed the schema before any step reads them
  return {
    answers,
    sample: sampleOf(answers),
    units: resolveUnits((answers.units ?? null) as ParsedCase['units']),
    respiratory,
  };
}

const kpa = (ctx: StepContext) => ctx.units.pressure === 'kPa';
const num = (
  name: FieldPath,
  ctx: StepContext,
  extra: Partial<Extract<FieldDef, { kind: 'number' }>> = {},
): FieldDef => ({
  kind: 'number',
  name,
  label: FIELD[name].label,
  unit: enteredUnit(FIELD[name], ctx.units),
  negative: FIELD[name].range[0] < 0,
  ...extra,
});

/** Laboratories reporting kPa mostly report SI units elsewhere too; the clinician sees and can change the choice. */
const siFirst = (ctx: StepContext, si: string, conventional: string) =>
  kpa(ctx) ? si : conventional;

export const gasLabel = (sample: StepContext['sample'], gas: 'CO2' | 'O2') =>
  sample === 'arterial' ? `Pa${gas}` : sample === 'venous' ? `Pv${gas}` : `Pc${gas}`;

const arterial = (ctx: StepContext) => ctx.sample === 'arterial';

/** How many earlier gases the case holds (a follow-up gas has at least one). */
const earlierCount = (ctx: StepContext) =>
  Array.isArray(ctx.answers.previous) ? ctx.answers.previous.length : 0;
const followUpRemark = (ctx: StepContext, text: string) => (earlierCount(ctx) ? [text] : []);

// ---------- the steps ----------

const sample: StepDef = {
  id: 'sample',
  title: 'Sample',
  question: 'What kind of sample is it?',
  groups: () => [
    {
      fields: [
        {
          // one press answers: each choice is its own submit button
          kind: 'choice',
          name: 'sample',
          label: 'Sample type',
          required: 'Choose the sample type',
          quick: true,
          options: [
            { value: 'arterial', label: 'Arterial', json: 'arterial' },
            { value: 'venous', label: 'Venous', json: 'venous' },
            { value: 'capillary', label: 'Capillary', json: 'capillary' },
          ],
        },
      ],
    },
  ],
  skipReason: () => null,
  remarks: () => [],
};

const gas: StepDef = {
  id: 'gas',
  title: 'Gas',
  question: 'Enter the gas as the analyser printed it.',
  groups: (ctx) => {
    const main: FieldDef[] = [
      {
        kind: 'choice',
        name: 'units.pressure',
        label: 'Pressure unit',
        options: [
          { value: 'mmHg', label: 'mmHg', json: 'mmHg' },
          { value: 'kPa', label: 'kPa', json: 'kPa' },
        ],
      },
      num('gas.ph', ctx),
      num('gas.pco2', ctx, { label: gasLabel(ctx.sample, 'CO2') }),
    ];
    if (arterial(ctx)) main.push(num('gas.po2', ctx));
    main.push(num('gas.hco3', ctx));
    const optional: FieldDef[] = [num('gas.baseExcess', ctx)];
    if (arterial(ctx)) optional.push(num('gas.sao2', ctx));
    optional.push(
      num('gas.lactate', ctx),
      num('gas.hb', ctx, {
        unit: '',
        unitChoice: {
          name: 'units.hb',
          label: 'Hb unit',
          options: [
            { value: 'g/dL', label: 'g/dL' },
            { value: 'g/L', label: 'g/L' },
          ],
          fallback: siFirst(ctx, 'g/L', 'g/dL'),
        },
      }),
      num('context.temperatureC', ctx, {
        label: 'Patient temperature',
      }),
    );
    return [{ fields: main }, { legend: 'If you have them', fields: optional }];
  },
  skipReason: () => null,
  remarks: (ctx) => [
    ...followUpRemark(
      ctx,
      `A follow-up gas: enter it in ${ctx.units.pressure}, like the earlier one. Chemistry, patient and context are kept from before: change them if they have changed.`,
    ),
    `Two of pH, ${gasLabel(ctx.sample, 'CO2')} and HCO3 are enough: the third is worked out.`,
    ...(arterial(ctx)
      ? []
      : [
          `No ${gasLabel(ctx.sample, 'O2')} or saturation asked: the PO2 of a ${ctx.sample} sample does not show arterial oxygenation.`,
        ]),
  ],
};

const chemistry: StepDef = {
  id: 'chemistry',
  title: 'Chemistry',
  question: 'Chemistry from the same time, if you have it.',
  skippable: true,
  groups: (ctx) => [
    {
      fields: [
        num('chemistry.na', ctx),
        num('chemistry.k', ctx),
        num('chemistry.cl', ctx),
        num('chemistry.albumin', ctx, {
          unit: '',
          unitChoice: {
            name: 'units.albumin',
            label: 'Albumin unit',
            options: [
              { value: 'g/dL', label: 'g/dL' },
              { value: 'g/L', label: 'g/L' },
            ],
            fallback: siFirst(ctx, 'g/L', 'g/dL'),
          },
        }),
        num('chemistry.glucose', ctx, {
          unit: '',
          unitChoice: {
            name: 'units.glucose',
            label: 'Glucose unit',
            options: [
              { value: 'mmol/L', label: 'mmol/L' },
              { value: 'mg/dL', label: 'mg/dL' },
            ],
            fallback: siFirst(ctx, 'mmol/L', 'mg/dL'),
          },
        }),
        num('chemistry.urea', ctx, {
          label: 'Urea or BUN',
          unit: '',
          unitChoice: {
            name: 'units.urea',
            label: 'Urea unit',
            options: [
              { value: 'urea-mmol/L', label: 'urea mmol/L' },
              { value: 'bun-mg/dL', label: 'BUN mg/dL' },
            ],
            fallback: siFirst(ctx, 'urea-mmol/L', 'bun-mg/dL'),
          },
        }),
        num('chemistry.osmolality', ctx, {
          label: 'Measured osmolality',
        }),
        num('chemistry.creatinine', ctx, {
          unit: '',
          unitChoice: {
            name: 'units.creatinine',
            label: 'Creatinine unit',
            options: [
              { value: 'umol/L', label: 'µmol/L' },
              { value: 'mg/dL', label: 'mg/dL' },
            ],
            fallback: siFirst(ctx, 'umol/L', 'mg/dL'),
          },
        }),
      ],
    },
  ],
  skipReason: () => null,
  remarks: () => [],
};

const timing: StepDef = {
  id: 'timing',
  title: 'Timing',
  question: 'How long has this been going on?',
  groups: (ctx) => [
    {
      fields: [
        {
          kind: 'choice',
          name: 'context.timing',
          label: 'Acute or chronic?',
          options: [
            { value: 'acute', label: 'Acute (hours)', json: 'acute' },
            { value: 'chronic', label: 'Chronic (days or longer)', json: 'chronic' },
            { value: 'unknown', label: 'Not sure', json: 'unknown' },
          ],
        },
      ],
    },
    {
      legend: "The patient's usual values, if known",
      fields: [
        num('context.baseline.pco2', ctx, { label: 'Usual PaCO2' }),
        num('context.baseline.hco3', ctx, { label: 'Usual HCO3' }),
        num('context.baseline.ph', ctx, { label: 'Usual pH' }),
      ],
    },
  ],
  skipReason: (ctx, done) =>
    done || ctx.respiratory !== false
      ? null
      : 'Timing not asked: these numbers show no respiratory process, and only a respiratory process is judged acute or chronic.',
  remarks: () => [],
};

const oxygen: StepDef = {
  id: 'oxygen',
  title: 'Oxygen and ventilation',
  question: 'Oxygen and breathing support when the sample was taken.',
  groups: (ctx) => {
    const fields: FieldDef[] = [];
    if (arterial(ctx))
      fields.push({
        kind: 'number',
        name: 'oxygen.fio2',
        label: 'FiO2',
        unit: '',
        hint: 'A fraction (0.4) or a percent (40). Room air is 0.21.',
      });
    fields.push(num('oxygen.peep', ctx, { label: 'PEEP or CPAP' }), {
      kind: 'choice',
      name: 'ventilated',
      label: 'On a ventilator?',
      required: 'Say whether the patient is on a ventilator',
      options: [
        { value: 'yes', label: 'Yes', json: true },
        { value: 'no', label: 'No', json: false },
      ],
    });
    // SpO2 with FiO2 gives the SpO2/FiO2 ratio; after the ventilator question, so that the first three stay in reach
    return arterial(ctx)
      ? [{ fields }, { legend: 'If you have it', fields: [num('oxygen.spo2', ctx)] }]
      : [{ fields }];
  },
  skipReason: () => null,
  remarks: (ctx) => [
    ...followUpRemark(
      ctx,
      'Give the settings when this gas was taken; the earlier gas keeps its own.',
    ),
    ...(arterial(ctx)
      ? []
      : [
          `No FiO2 asked: oxygenation (A-a gradient, P/F ratio) is not assessed from a ${ctx.sample} sample.`,
        ]),
  ],
  finish: (answers, form) => {
    const v = form.ventilated;
    if (v === 'yes') {
      if (!answers.ventilator || typeof answers.ventilator !== 'object') answers.ventilator = {};
    } else if (v === 'no') delete answers.ventilator;
  },
};

const ventilator: StepDef = {
  id: 'ventilator',
  title: 'Ventilator',
  question: 'Ventilator settings and the target.',
  groups: (ctx) => [
    {
      fields: [
        num('ventilator.vt', ctx),
        num('ventilator.rr', ctx),
        num('ventilator.pplat', ctx),
        num('patient.heightCm', ctx),
        {
          kind: 'choice',
          name: 'patient.sex',
          label: 'Sex (for predicted body weight)',
          options: [
            { value: 'female', label: 'Female', json: 'female' },
            { value: 'male', label: 'Male', json: 'male' },
          ],
        },
      ],
    },
    {
      legend: 'Target (one of the two)',
      fields: [num('ventilator.targetPh', ctx), num('ventilator.targetPco2', ctx)],
    },
  ],
  skipReason: (ctx) =>
    ctx.answers.ventilator && typeof ctx.answers.ventilator === 'object'
      ? null
      : 'No ventilator questions: not on a ventilator.',
  remarks: (ctx) =>
    followUpRemark(
      ctx,
      'Give the settings when this gas was taken: the note compares the change in PaCO2 with what a change of settings predicts.',
    ),
  finish: (answers, _form, _ctx, errors) => {
    if (
      getPath(answers, 'ventilator.targetPh') !== undefined &&
      getPath(answers, 'ventilator.targetPco2') !== undefined
    ) {
      errors.push({
        path: 'ventilator.targetPco2',
        message: 'Give a target pH or a target PaCO2, not both',
      });
    }
  },
};

const patient: StepDef = {
  id: 'patient',
  title: 'Patient',
  question: 'About the patient.',
  groups: (ctx) => {
    const fields: FieldDef[] = [num('patient.ageYears', ctx)];
    if (getPath(ctx.answers, 'patient.sex') !== 'male') {
      fields.push({
        kind: 'choice',
        name: 'patient.pregnant',
        label: 'Pregnant?',
        options: [
          { value: 'yes', label: 'Yes', json: true },
          { value: 'no', label: 'No', json: false },
          { value: '', label: 'Not known or not applicable', json: undefined },
        ],
      });
    }
    return [{ fields }];
  },
  skipReason: () => null,
  remarks: (ctx) =>
    getPath(ctx.answers, 'patient.sex') === 'male' ? ['Pregnancy not asked: male patient.'] : [],
};

export const STEPS: Record<StepId, StepDef> = {
  sample,
  gas,
  chemistry,
  timing,
  oxygen,
  ventilator,
  patient,
};

export const allFields = (groups: Group[]): FieldDef[] => groups.flatMap((g) => g.fields);

/** The paths a step's form owns (its fields and their unit choices). */
export function ownedPaths(groups: Group[]): string[] {
  return allFields(groups).flatMap((f) =>
    f.kind === 'number' && f.unitChoice ? [f.name, f.unitChoice.name] : [f.name],
  );
}

/** Write a step's submitted fields into a copy of the answers. UI-level errors (a required choice) come back too. */
export function applyStep(
  step: StepDef,
  answers: Json,
  form: FormValues,
  ctx: StepContext,
  skip = false,
): { answers: Json; errors: FieldError[] } {
  const next = structuredClone(answers);
  const errors: FieldError[] = [];
  for (const field of allFields(step.groups(ctx))) {
    if (field.kind === 'number') {
      setPath(next, field.name, skip ? undefined : readNumber(form[field.name]));
      if (field.unitChoice) {
        const unit = form[field.unitChoice.name];
        if (!skip && unit !== undefined && unit !== '') setPath(next, field.unitChoice.name, unit);
      }
      continue;
    }
    const raw = form[field.name];
    if (field.name === 'ventilated') {
      if (raw !== 'yes' && raw !== 'no')
        errors.push({ path: field.name, message: field.required ?? `${field.label}: choose one` });
      continue;
    }
    const option = field.options.find((o) => o.value === (raw ?? ''));
    if ((raw === undefined || raw === '') && field.required) {
      errors.push({ path: field.name, message: field.required });
      continue;
    }
    if (raw === undefined) {
      setPath(next, field.name, undefined);
      continue;
    }
    // an unknown value goes to the schema as sent, so its message names the allowed values
    setPath(next, field.name, option ? option.json : raw);
  }
  step.finish?.(next, form, ctx, errors);
  return { answers: next, errors };
}

/** The values to show in an open form: what was typed (after an error) or what the case holds. */
export function formValue(
  field: FieldDef | UnitChoice,
  answers: Json,
  typed: FormValues | null,
): string {
  const name = field.name;
  if (typed && name in typed) return typed[name] ?? '';
  if (name === 'ventilated')
    return answers.ventilator && typeof answers.ventilator === 'object' ? 'yes' : '';
  const value = getPath(answers, name);
  if (value === undefined || value === null) {
    if ('fallback' in field) return field.fallback;
    if (name === 'units.pressure') return 'mmHg';
    if (name === 'context.timing') return 'unknown';
    return '';
  }
  if ('kind' in field && field.kind === 'choice')
    return field.options.find((o) => o.json === value)?.value ?? String(value);
  return String(value);
}

/** An answered step read back as short phrases ("pH 7.28", "PaCO2 7.6 kPa"). */
export function summary(
  step: StepDef,
  ctx: StepContext,
  done: { ventilatedAnswered: boolean },
): string[] {
  const out: string[] = [];
  for (const field of allFields(step.groups(ctx))) {
    if (field.name === 'ventilated') {
      if (done.ventilatedAnswered)
        out.push(ctx.answers.ventilator ? 'On a ventilator' : 'Not on a ventilator');
      continue;
    }
    const value = getPath(ctx.answers, field.name);
    if (value === undefined || value === null) continue;
    if (field.kind === 'choice') {
      const option = field.options.find((o) => o.json === value);
      if (field.name === 'sample' || field.name === 'context.timing')
        out.push(option?.label ?? String(value));
      else if (field.name === 'patient.pregnant') out.push(value ? 'Pregnant' : 'Not pregnant');
      else if (field.name !== 'units.pressure') out.push(option?.label ?? String(value));
      continue;
    }
    let unit = field.unit;
    if (field.unitChoice) {
      const chosen = String(
        getPath(ctx.answers, field.unitChoice.name) ?? field.unitChoice.fallback,
      );
      unit = field.unitChoice.options.find((o) => o.value === chosen)?.label ?? chosen;
    }
    if (field.name === 'chemistry.urea' && unit.includes(' ')) {
      const [what, u] = unit.split(' ');
      out.push(`${what === 'BUN' ? 'BUN' : 'Urea'} ${value} ${u}`);
      continue;
    }
    out.push(`${field.label} ${value}${unit ? ` ${unit}` : ''}`);
  }
  return out;
}
