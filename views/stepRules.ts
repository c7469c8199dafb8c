// The seven steps of the page and the rules that belong to each: the choices it asks besides the table's numbers,
// when it is skipped, what it remarks, the rules across its fields, and what its answer changes elsewhere. The
// number questions are not listed here: they are the rows of calc's table of fields with the step's id.
import { FIELDS, type FieldError, type FieldSpec, type Findings } from '../calc/index.ts';
import { earlierGases, getPath, setPath, type FormValues, type Json } from './paths.ts';
import { keptOf } from './unitDoubt.ts';
import type { ChoiceField } from './fields.ts';
import {
  OXYGENATION_PATHS,
  gasLabel,
  sampleOf,
  type StepContext,
  type StepSpec,
} from './stepContext.ts';

const earlierCount = (ctx: StepContext) => earlierGases(ctx.answers).length;
const reads = (ctx: StepContext, code: string) =>
  !!ctx.findings?.disorders.some((d) => d.code === code);
const followUpRemark = (ctx: StepContext, text: string) => (earlierCount(ctx) ? [text] : []);
const arterial = (ctx: StepContext) => ctx.sample === 'arterial';

/** An option whose value in the case is the value it sends. */
const same = (value: string, label: string) => ({ value, label, json: value });

const yesNo = (yes: string, no: string) => [
  { value: 'yes', label: 'Yes', json: true, said: yes },
  { value: 'no', label: 'No', json: false, said: no },
];

const sample: StepSpec = {
  id: 'sample',
  title: 'Sample',
  question: 'What kind of sample is it?',
  paste: 'box',
  beforeGas: true,
  before: [
    {
      kind: 'choice',
      name: 'sample',
      label: 'Sample type',
      required: 'Choose the sample type',
      quick: true,
      options: [
        same('arterial', 'Arterial'),
        same('venous', 'Venous'),
        same('capillary', 'Capillary'),
      ],
    },
  ],
  settle: ({ before, answers, done }) => {
    const now = answers.sample;
    if (now !== 'arterial' && now !== undefined) {
      for (const path of OXYGENATION_PATHS) setPath(answers, path, undefined);
      return {};
    }
    // an arterial sample asks for PaO2 and FiO2, which were not asked before
    const was = done.includes('sample') ? sampleOf(before) : null;
    if (was === null || was === 'arterial') return {};
    return { reopen: (['gas', 'oxygen'] as const).filter((s) => done.includes(s)) };
  },
};

const gas: StepSpec = {
  id: 'gas',
  title: 'Gas',
  question: 'Enter the gas as the analyser printed it.',
  paste: 'link',
  why: (ctx) =>
    `any two of pH, ${gasLabel(ctx.sample, 'CO2')} and HCO3 give the reading; the rest sharpens it.`,
  before: [
    {
      kind: 'choice',
      name: 'units.pressure',
      label: 'Pressure unit',
      fallback: 'mmHg',
      passOver: true,
      silent: true,
      options: [same('mmHg', 'mmHg'), same('kPa', 'kPa')],
    },
  ],
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
  settle: ({ before, answers }) => {
    const was = String(getPath(before, 'units.pressure') ?? 'mmHg');
    const now = String(getPath(answers, 'units.pressure') ?? 'mmHg');
    if (was === now) return {};
    // the earlier gases were entered in the old unit and are not converted behind the clinician's back
    if (earlierGases(answers).length)
      return {
        refuse: {
          path: 'units.pressure',
          message: `The earlier gases of this case are in ${was}: enter the follow-up gas in ${was} too, or start a new case`,
        },
      };
    // other pressures in the case were entered in the old unit: ask for them again in the new one
    const reopen = (FIELDS as readonly FieldSpec[])
      .filter((f) => f.quantity === 'pressure' && getPath(answers, f.path) !== undefined)
      .flatMap((f) => (f.step && f.step !== 'gas' ? [f.step] : []));
    return { reopen: [...new Set(reopen)] };
  },
  lacking: (ctx) =>
    arterial(ctx) && getPath(ctx.answers, 'gas.po2') == null
      ? `${gasLabel(ctx.sample, 'O2')} was not on the text: add it if you have it, or go on without it`
      : null,
  confirm: (answers, form, findings) => {
    const error = unitQuestion(answers, form, findings);
    return error
      ? { error, typed: { unitAsked: String(getPath(answers, 'units.pressure') ?? 'mmHg') } }
      : null;
  },
};

const chemistry: StepSpec = {
  id: 'chemistry',
  title: 'Chemistry',
  question: 'Chemistry from the same time, if you have it.',
  skippable: true,
  why: (ctx) =>
    reads(ctx, 'metabolic_acidosis')
      ? 'a metabolic acidosis: Na, Cl and albumin give the anion gap, which sorts the cause.'
      : 'Na, Cl and albumin give the anion gap, which can show a second process hidden behind this one.',
  lacking: (ctx) =>
    getPath(ctx.answers, 'chemistry.na') == null || getPath(ctx.answers, 'chemistry.cl') == null
      ? 'Na and Cl are both needed for the anion gap: add what the text did not have'
      : null,
};

const timing: StepSpec = {
  id: 'timing',
  title: 'Timing',
  question: 'How long has this been going on?',
  openWhenSkipped: true,
  skippable: true,
  why: () => 'a respiratory process: acute or chronic decides how much HCO3 change to expect.',
  before: [
    {
      kind: 'choice',
      name: 'context.timing',
      label: 'Acute or chronic?',
      fallback: 'unknown',
      options: [
        same('acute', 'Acute (hours)'),
        same('chronic', 'Chronic (days or longer)'),
        same('unknown', 'Not sure'),
      ],
    },
  ],
  optionalLegend: "The patient's usual values, if known",
  skipReason: (ctx, done) =>
    done || ctx.respiratory !== false
      ? null
      : 'Timing not asked: these numbers show no respiratory process, and only a respiratory process is judged acute or chronic.',
};

const oxygen: StepSpec = {
  id: 'oxygen',
  title: 'Oxygen and ventilation',
  question: 'Oxygen and breathing support when the sample was taken.',
  skippable: true,
  why: (ctx) =>
    arterial(ctx)
      ? 'FiO2 gives the A-a gradient and P/F ratio. On a ventilator? I can work out a setting for a target.'
      : 'on a ventilator? I can work out a setting for a target.',
  hints: { 'oxygen.fio2': 'A fraction (0.4) or a percent (40). Room air is 0.21.' },
  // SpO2 with FiO2 gives the SpO2/FiO2 ratio; it is asked after the ventilator question (the table marks it
  // optional), so that the first three stay in reach
  after: [
    {
      kind: 'choice',
      name: 'ventilated',
      label: 'On a ventilator?',
      required: 'Say whether the patient is on a ventilator',
      options: yesNo('On a ventilator', 'Not on a ventilator'),
      // the case says "ventilated" by holding a ventilator group, even an empty one
      pseudo: {
        read: (answers) => (onVentilator(answers) ? 'yes' : 'no'),
        shown: (answers) => (onVentilator(answers) ? 'yes' : ''),
        write: (answers, value) => {
          if (value === 'no') delete answers.ventilator;
          else if (!onVentilator(answers)) answers.ventilator = {};
        },
      },
    },
  ],
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
  settle: ({ answers }) => (onVentilator(answers) ? {} : { undo: ['ventilator'] }),
};

const onVentilator = (answers: Json) =>
  answers.ventilator !== null && typeof answers.ventilator === 'object';

const ventilator: StepSpec = {
  id: 'ventilator',
  title: 'Ventilator',
  question: 'Ventilator settings and the target.',
  skippable: true,
  why: () => 'VT, RR and height give the rate or volume that reaches the target PaCO2.',
  after: [
    {
      kind: 'choice',
      name: 'patient.sex',
      label: 'Sex (for predicted body weight)',
      options: [same('female', 'Female'), same('male', 'Male')],
    },
  ],
  optionalLegend: 'Target: a pH or a PaCO2',
  skipReason: (ctx) =>
    onVentilator(ctx.answers) ? null : 'No ventilator questions: not on a ventilator.',
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

// Known conditions change targets and the plan (the SpO2 target, air trapping, the usual PaCO2, the ketoacidosis
// pattern): the page asks for the one that matters most; the API takes a list, which the page keeps as it is when
// the answer is one of it (a pasted or recorded case may hold several).
const CONDITION_OPTIONS: [string, string][] = [
  ['', 'None known'],
  ['copd', 'COPD'],
  ['chronic_hypercapnia', 'Chronic hypercapnia (a CO2 retainer)'],
  ['obesity_hypoventilation', 'Obesity hypoventilation'],
  ['neuromuscular', 'Neuromuscular or chest wall disease'],
  ['asthma', 'Asthma'],
  ['diabetes', 'Diabetes'],
  ['chronic_kidney_disease', 'Chronic kidney disease'],
  ['heart_failure', 'Heart failure'],
];
const conditionsOf = (answers: Json): string[] => {
  const list = getPath(answers, 'context.conditions');
  return Array.isArray(list) ? list.filter((x): x is string => typeof x === 'string') : [];
};
const conditions: ChoiceField = {
  kind: 'choice',
  name: 'context.conditions',
  label: 'Known condition that changes the targets',
  options: CONDITION_OPTIONS.map(([value, label]) => ({
    value,
    label,
    json: value || undefined,
    // read back in a sentence: "Known COPD", "Known asthma"
    said: value
      ? `Known ${/^[A-Z]{2}/.test(label) ? label : label.charAt(0).toLowerCase() + label.slice(1)}`
      : 'No known condition',
  })),
  pseudo: {
    read: (answers) => conditionsOf(answers)[0] ?? '',
    shown: (answers) => conditionsOf(answers)[0] ?? '',
    write: (answers, value) => {
      if (!value) setPath(answers, 'context.conditions', undefined);
      else if (!conditionsOf(answers).includes(value))
        setPath(answers, 'context.conditions', [value]);
    },
  },
};

const male = (answers: Json) => getPath(answers, 'patient.sex') === 'male';
const notPregnant = (answers: Json) =>
  male(answers) || getPath(answers, 'patient.pregnant') === false;

const patient: StepSpec = {
  id: 'patient',
  title: 'Patient',
  question: 'About the patient.',
  skippable: true,
  why: (ctx) =>
    arterial(ctx)
      ? 'age sets the expected A-a gradient; pregnancy and known conditions change what is normal and the targets.'
      : 'an age under 16, pregnancy and known conditions change the rules the reading uses.',
  after: [
    {
      kind: 'choice',
      name: 'patient.pregnant',
      label: 'Pregnant?',
      when: (ctx) => !male(ctx.answers),
      options: [
        ...yesNo('Pregnant', 'Not pregnant'),
        { value: '', label: 'Not known or not applicable', json: undefined },
      ],
    },
    conditions,
  ],
  optionalLegend: 'If pregnant',
  // weeks of pregnancy change the reading only in a pregnancy: not asked for a man or a patient said not pregnant
  hides: (f, ctx) => f.path === 'patient.pregnancyWeeks' && notPregnant(ctx.answers),
  remarks: (ctx) => (male(ctx.answers) ? ['Pregnancy not asked: male patient.'] : []),
  finish: (answers) => {
    if (male(answers)) setPath(answers, 'patient.pregnant', undefined);
    if (notPregnant(answers)) setPath(answers, 'patient.pregnancyWeeks', undefined);
  },
};

export const SPECS: readonly StepSpec[] = [
  sample,
  gas,
  chemistry,
  timing,
  oxygen,
  ventilator,
  patient,
];

export function unitQuestion(
  answers: Json,
  form: FormValues,
  findings: Findings | null,
): FieldError | null {
  if (!findings?.flags.some((x) => x.code === 'unit_ambiguous')) return null;
  const unit = String(getPath(answers, 'units.pressure') ?? 'mmHg');
  if (form.unitAsked === unit || keptOf(form).has('gas.pco2')) return null;
  const other = unit === 'mmHg' ? 'kPa' : 'mmHg';
  const pco2 = getPath(answers, 'gas.pco2');
  const ph = getPath(answers, 'gas.ph');
  return {
    path: 'units.pressure',
    message: `PCO2 ${pco2} ${unit} with pH ${ph} looks like ${other}: check the unit on the printout. To keep ${unit}, press Next again.`,
  };
}
