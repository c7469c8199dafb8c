// The steps of the page, assembled from the step table (stepRules.ts) and calc's table of fields. A step's number
// questions are the table's rows with that `step`, in table order (the `optional` ones under "if you have them"):
// a new row with a step shows on the page with no change in views/. What the table cannot say is in the step
// table: the choices (sample, timing, ventilated, sex, pregnant), labels that depend on the sample, and each
// step's hooks (when it is skipped, what it remarks, the rules that cross fields, what an answer changes).
import { FIELDS, type FieldSpec } from '../calc/index.ts';
import type { units as U } from '../calc/index.ts';
import { numberField, type ChoiceField, type FieldDef, type Group } from './fields.ts';
import {
  asked,
  fieldLabel,
  isStepId,
  type Choice,
  type StepContext,
  type StepDef,
  type StepId,
  type StepSpec,
} from './stepContext.ts';
import { SPECS } from './stepRules.ts';

export type { FieldDef, Group, NumberField, ChoiceField } from './fields.ts';
export type { FormValues, Json } from './paths.ts';
export { allFields, ownedPaths } from './answers.ts';
export * from './stepContext.ts';
export { unitQuestion } from './stepRules.ts';

/** The step that asks the gas (the table's pH row): answered only with a gas in the case. */
export const GAS_STEP: StepId = (FIELDS as readonly FieldSpec[]).find((f) => f.path === 'gas.ph')!
  .step!;

/** The step that holds the paste box: a paste starts a case there. */
export const PASTE_STEP: StepId = SPECS.find((s) => s.paste === 'box')!.id;

const ALL_CHOICES = SPECS.flatMap((s) =>
  [...(s.before ?? []), ...(s.after ?? [])].map((c) => ({ step: s.id, choice: c })),
);

/** Kinds of value whose unit is chosen once for the case, by a choice named units.<kind> (the pressure unit). */
const CASE_WIDE = new Map(
  ALL_CHOICES.filter(({ choice }) => choice.name.startsWith('units.')).map(
    ({ choice }) => [choice.name.slice('units.'.length) as U.Quantity, choice.name] as const,
  ),
);

const choicesOf = (list: Choice[] | undefined, ctx: StepContext): FieldDef[] =>
  (list ?? []).filter((c) => c.when?.(ctx) ?? true).map(({ when: _when, ...c }) => c);

/** A step's form: its choices and the table's rows for it, the optional ones in a group of their own. */
function groupsOf(spec: StepSpec, ctx: StepContext): Group[] {
  const before = choicesOf(spec.before, ctx);
  const after = choicesOf(spec.after, ctx);
  const choices = new Set([...before, ...after].map((c) => c.name));
  const rows = (FIELDS as readonly FieldSpec[]).filter(
    (f) => f.step === spec.id && asked(f, ctx) && !spec.hides?.(f, ctx),
  );
  const number = (f: FieldSpec) =>
    numberField(f, ctx.units, {
      label: fieldLabel(f, ctx.sample),
      hint: spec.hints?.[f.path],
      caseWide: CASE_WIDE,
      choices,
    });
  const main = [...before, ...rows.filter((f) => !f.optional).map(number), ...after];
  const optional = rows.filter((f) => f.optional).map(number);
  const groups: Group[] = [];
  if (main.length) groups.push({ fields: main });
  if (optional.length)
    groups.push({
      legend:
        spec.optionalLegend ?? (optional.length === 1 ? 'If you have it' : 'If you have them'),
      fields: optional,
    });
  return groups;
}

export const STEPS = Object.fromEntries(
  SPECS.map((spec) => [
    spec.id,
    {
      ...spec,
      groups: (ctx: StepContext) => groupsOf(spec, ctx),
      skipReason: spec.skipReason ?? (() => null),
      remarks: spec.remarks ?? (() => []),
    } satisfies StepDef,
  ]),
) as Record<StepId, StepDef>;

/** A choice of the steps by the case path it answers (the sample type, the pressure unit). */
export function choiceOf(path: string): ChoiceField | null {
  const found = ALL_CHOICES.find((c) => c.choice.name === path);
  if (!found) return null;
  const { when: _when, ...choice } = found.choice;
  return choice;
}

/** The step that asks for a case path: a field's own step, the step of a choice, or the step named like its group. */
export function stepOf(path: string): StepId | null {
  const field = (FIELDS as readonly FieldSpec[]).find((f) => f.path === path);
  if (field?.step) return field.step;
  const choice = ALL_CHOICES.find((c) => c.choice.name === path);
  if (choice) return choice.step;
  return isStepId(path) ? path : null;
}

/**
 * A PCO2 that fits the other pressure unit better (the core's unit screen) is asked about at the field,
 * once; pressing Next again with the same unit keeps it, and the core then withholds the reading and says why.
 */
