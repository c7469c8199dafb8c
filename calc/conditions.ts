// Known conditions a clinician can state for the patient (interface contract: context.conditions): the one list.
// They change what a gas means (a "normal" PaCO2 in an asthma attack, a raised-AG acidosis in known diabetes) and
// the targets and plan that follow.
export const CONDITIONS = [
  'chronic_hypercapnia',
  'copd',
  'asthma',
  'obesity_hypoventilation',
  'neuromuscular',
  'diabetes',
  'chronic_kidney_disease',
  'heart_failure',
] as const;

export type Condition = (typeof CONDITIONS)[number];
