// What a step is: its id, what it knows of the case so far (the sample, the units, whether the numbers show a
// respiratory process), the hooks a step may have, and the names of the values that depend on the sample.
import {
  resolveUnits,
  type FieldError,
  type FieldSpec,
  type Findings,
  type ParsedCase,
} from '../calc/index.ts';
import type { units as U } from '../calc/index.ts';
import type { ChoiceField, Group } from './fields.ts';
import type { FormValues, Json } from './paths.ts';

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

export type Sample = 'arterial' | 'venous' | 'capillary';

/** What a step needs to know about the case so far. */
export interface StepContext {
  answers: Json;
  sample: Sample;
  units: U.Units;
  /** a respiratory process is present in the numbers so far (null: not yet known) */
  respiratory: boolean | null;
  /** the reading so far, once the gas is in (what a step's question is for may depend on it) */
  findings: Findings | null;
}

/** An answer just written, for its step's `settle` hook: the case before and after, the steps answered before. */
export interface Answered {
  before: Json;
  answers: Json;
  done: readonly StepId[];
}

/** What an answer does beyond its own fields. */
export interface Settled {
  /** the answer is not taken, for this reason */
  refuse?: FieldError;
  /** answered steps whose question changed and must be looked at again */
  reopen?: StepId[];
  /** answered steps that no longer apply */
  undo?: StepId[];
}

/** A choice, asked when `when` says so. */
export type Choice = ChoiceField & { when?: (ctx: StepContext) => boolean };

export interface StepSpec {
  id: StepId;
  title: string;
  question: string;
  skippable?: boolean;
  /** choices asked before the step's number questions, and after them */
  before?: Choice[];
  after?: Choice[];
  /** the legend of the values asked "if you have them" */
  optionalLegend?: string;
  /** a line under a field's label */
  hints?: Readonly<Record<string, string>>;
  /** a paste starts a case: this step holds the paste box, or a link back to it */
  paste?: 'box' | 'link';
  /** answered before the gas: its answer may travel in a case that holds no gas yet */
  beforeGas?: boolean;
  /** the clinician may open this step although it was skipped */
  openWhenSkipped?: boolean;
  /** why the step is not asked for this case, or null when it is */
  skipReason?(ctx: StepContext, done: boolean): string | null;
  /** a number question of the table's rows for this step that cannot change the reading for this case: not asked */
  hides?(f: FieldSpec, ctx: StepContext): boolean;
  /** short remarks shown with the form: a question left out, and why */
  remarks?(ctx: StepContext): string[];
  /** why the step is asked now, in a few words: what its answer can change in the reading */
  why?(ctx: StepContext): string;
  /** rules across the step's own fields, after they are written */
  finish?(answers: Json, form: FormValues, ctx: StepContext, errors: FieldError[]): void;
  /** what the answer changes in the rest of the case and the flow */
  settle?(a: Answered): Settled;
  /** what the step, filled from outside (a paste), still lacks: said when it opens */
  lacking?(ctx: StepContext): string | null;
  /**
   * A question about an answer that passed every check, asked once before it is taken: the error to show and
   * what the form carries back so that the same answer sent again is taken.
   */
  confirm?(
    answers: Json,
    form: FormValues,
    findings: Findings | null,
  ): { error: FieldError; typed: FormValues } | null;
}

export interface StepDef extends StepSpec {
  groups(ctx: StepContext): Group[];
  skipReason(ctx: StepContext, done: boolean): string | null;
  remarks(ctx: StepContext): string[];
}

// ---------- the case so far ----------

export const sampleOf = (answers: Json): Sample => {
  const s = answers.sample;
  return s === 'venous' || s === 'capillary' ? s : 'arterial';
};

export function contextOf(
  answers: Json,
  respiratory: boolean | null,
  findings: Findings | null = null,
): StepContext {
  // the answers have passed the schema before any step reads them
  return {
    answers,
    sample: sampleOf(answers),
    units: resolveUnits((answers.units ?? null) as ParsedCase['units']),
    respiratory,
    findings,
  };
}

// ---------- labels and questions that depend on the sample ----------

export const gasLabel = (sample: Sample, gas: 'CO2' | 'O2') =>
  sample === 'arterial' ? `Pa${gas}` : sample === 'venous' ? `Pv${gas}` : `Pc${gas}`;

/** Pressures named by the sample they were measured in. */
const SAMPLE_LABELS: Readonly<Record<string, 'CO2' | 'O2'>> = {
  'gas.pco2': 'CO2',
  'gas.po2': 'O2',
};

/** Venous and capillary PO2 and saturation say nothing about oxygenation: asked and kept for arterial samples only. */
export const OXYGENATION_PATHS = ['gas.po2', 'gas.sao2', 'oxygen.fio2', 'oxygen.spo2'];

/** Is this field of the table asked for this sample? */
export const asked = (f: FieldSpec, ctx: StepContext) =>
  ctx.sample === 'arterial' || !OXYGENATION_PATHS.includes(f.path);

/** A field of the table as the case names it for this sample (read back in the log of earlier gases). */
export function caseLabel(f: FieldSpec, sample: Sample): string {
  const gas = SAMPLE_LABELS[f.path];
  return gas ? gasLabel(sample, gas) : f.label;
}

/** A field of the table as the page asks it for this sample. */
export function fieldLabel(f: FieldSpec, sample: Sample): string {
  const gas = SAMPLE_LABELS[f.path];
  return gas ? gasLabel(sample, gas) : (f.ask ?? f.label);
}
