// A step's form and the case: how submitted fields are written into the case, what an open form shows, and how
// an answered step reads back as short phrases. Nothing here knows a step or a field by name: the step table
// (steps.ts) and the fields' own definitions (fields.ts) say what is special.
import type { FieldError } from '../calc/index.ts';
import type { FieldDef, Group, UnitChoice } from './fields.ts';
import { getPath, readNumber, setPath, type FormValues, type Json } from './paths.ts';
import type { StepContext, StepDef } from './steps.ts';

export const allFields = (groups: Group[]): FieldDef[] => groups.flatMap((g) => g.fields);

/** The paths a step's form owns (its fields and their unit choices). */
export function ownedPaths(groups: Group[]): string[] {
  return allFields(groups).flatMap((f) =>
    f.kind === 'number' && f.unitChoice ? [f.name, f.unitChoice.name] : [f.name],
  );
}

/**
 * How an answer is given: with Next, by skipping the step (its numbers cleared, its choices left as they were), or
 * with Finish (what was typed is taken, and a required choice left open stays unanswered instead of refused).
 */
export type AnswerMode = 'next' | 'skip' | 'finish';

/** Write a step's submitted fields into a copy of the answers. UI-level errors (a required choice) come back too. */
export function applyStep(
  step: StepDef,
  answers: Json,
  form: FormValues,
  ctx: StepContext,
  mode: AnswerMode = 'next',
): { answers: Json; errors: FieldError[] } {
  const next = structuredClone(answers);
  const errors: FieldError[] = [];
  const skip = mode === 'skip';
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
    const required = field.required ?? `${field.label}: choose one`;
    if (skip || (mode === 'finish' && (raw === undefined || raw === ''))) continue;
    if ((raw === undefined || raw === '') && field.required) {
      errors.push({ path: field.name, message: field.required });
      continue;
    }
    if (field.pseudo) {
      // not a path of the case: only an offered answer can be written (a question not sent, unless required, is
      // left as the case has it)
      if (raw === undefined) continue;
      if (field.options.some((o) => o.value === raw)) field.pseudo.write(next, raw);
      else errors.push({ path: field.name, message: required });
      continue;
    }
    if (raw === undefined) {
      setPath(next, field.name, undefined);
      continue;
    }
    // an unknown value goes to the schema as sent, so its message names the allowed values
    const option = field.options.find((o) => o.value === raw);
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
  if ('kind' in field && field.kind === 'choice' && field.pseudo)
    return field.pseudo.shown(answers);
  const value = getPath(answers, name);
  if (value === undefined || value === null) {
    if (!('kind' in field)) return field.fallback;
    return (field.kind === 'choice' && field.fallback) || '';
  }
  if ('kind' in field && field.kind === 'choice')
    return field.options.find((o) => o.json === value)?.value ?? String(value);
  return String(value);
}

/** An answered step read back as short phrases ("pH 7.28", "PaCO2 7.6 kPa", "BUN 34 mg/dL"). */
export function summary(step: StepDef, ctx: StepContext): string[] {
  const out: string[] = [];
  for (const field of allFields(step.groups(ctx))) {
    if (field.kind === 'choice') {
      if (field.silent) continue;
      const value = field.pseudo
        ? field.pseudo.read(ctx.answers)
        : getPath(ctx.answers, field.name);
      if (value === undefined || value === null) continue;
      const option = field.pseudo
        ? field.options.find((o) => o.value === value)
        : field.options.find((o) => o.json === value);
      out.push(option?.said ?? option?.label ?? String(value));
      continue;
    }
    const value = getPath(ctx.answers, field.name);
    if (value === undefined || value === null) continue;
    if (field.unitChoice) {
      const chosen = String(
        getPath(ctx.answers, field.unitChoice.name) ?? field.unitChoice.fallback,
      );
      const unit = field.unitChoice.options.find((o) => o.value === chosen);
      out.push(unit ? `${unit.name} ${value} ${unit.unit}` : `${field.label} ${value} ${chosen}`);
      continue;
    }
    out.push(`${field.label} ${value}${field.unit ? ` ${field.unit}` : ''}`);
  }
  return out;
}
