// The view model: Findings turned into display-ready strings and plain switches for the .njk files.
// All choosing of numbers and units happens here and in the view* files beside it; all wording and order live in
// the templates.
import { reference as R, units as U } from '../calc/index.ts';
import type { Disorder, Findings, Flag } from '../calc/index.ts';
import { formatter } from './format.ts';
import { co2Label, flagView, limits, o2Label, type FlagView } from './flagView.ts';
import { context, has, type NoteFormat } from './viewShared.ts';
import {
  anionGapView,
  chemistryView,
  compensationView,
  deltaRatioView,
  metabolicDetailView,
  referenceView,
} from './viewAcidBase.ts';
import { oxygenationView, venousView } from './viewOxygen.ts';
import { ventilationView } from './viewVentilation.ts';
import { trendView } from './viewTrend.ts';
import { planView } from './viewPlan.ts';

export type { NoteFormat } from './viewShared.ts';
export { VENOUS_AGREEMENT } from './viewOxygen.ts';

const disorderView = (d: Disorder) => ({
  code: d.code,
  detail: d.detail,
  role: d.role,
  basis: d.basis,
});
export type DisorderView = ReturnType<typeof disorderView>;
export type NoteView = ReturnType<typeof buildView>;

export function buildView(f: Findings, format: NoteFormat) {
  const fmt = formatter(f.units);
  const x = context(f, fmt, format);
  const { md, withheld } = x;
  const c = f.case;
  const g = c.gas;
  const d = f.derived;
  const m = f.metabolic;
  const arterial = c.sample === 'arterial';
  const flags = f.flags.map((fl: Flag) => flagView(fl, f, fmt));
  const visible = (section: FlagView['section']) =>
    flags.filter((y) => y.section === section && !y.inText);
  // in a withheld case, a value worked out from the doubtful pressure is not shown
  const safe = (field: 'ph' | 'pco2' | 'hco3') =>
    !withheld || (g.computed !== field && field !== 'pco2');
  const compensation = compensationView(x);
  const anionGap = anionGapView(x);
  const deltaRatio = deltaRatioView(x);
  const ventilation = ventilationView(x);
  const venous = venousView(x);
  const oxygenation = oxygenationView(x);
  const trend = trendView(x);
  const { plan, inconsistent } = planView(x, ventilation, anionGap);
  const minutes = f.ventilation?.recheckMinutes ?? R.VENTILATION.recheckMinutes;
  const recheck = `${fmt.plain(minutes.low, 0)}-${fmt.plain(minutes.high, 0)} min`;

  return {
    md,
    withheld,
    sample: c.sample,
    arterial,
    kpa: fmt.kpa,
    bun: f.units.urea === 'bun-mg/dL',
    label: { co2: co2Label(c.sample), o2: o2Label(c.sample) },
    unit: {
      pressure: fmt.pressureUnit,
      step10: fmt.pressure(10),
      // acute buffering, HCO3 mmol/L per unit of PaCO2 (Berend 2014 acute rule), in the clinician's unit
      buffer: `${fmt.plain(R.PHYSIOLOGY.acuteBufferPerMmHg * (fmt.kpa ? U.MMHG_PER_KPA : 1), 2)} mmol/L per ${fmt.pressureUnit}`,
      deadSpacePerKg: fmt.withUnit(R.PHYSIOLOGY.anatomicDeadSpaceMlPerKg, 1, 'mL/kg PBW'),
    },
    gas: {
      ph: safe('ph') ? fmt.ph(g.ph) : null,
      phStatus: f.phStatus,
      hPlus: safe('ph') ? fmt.withUnit(d.hPlus, 1, 'nmol/L') : null,
      pco2: withheld ? null : fmt.pressure(g.pco2),
      hco3: safe('hco3') ? fmt.mmol(g.hco3) : null,
      po2: withheld ? null : fmt.pressure(g.po2),
      computed: withheld ? null : g.computed,
      lactate: fmt.mmol(g.lactate),
      lactateBand: m.lactateBand,
      baseExcess: fmt.mmol(g.baseExcess),
      sbe: fmt.mmol(d.standardBaseExcess),
      sao2: fmt.withUnit(g.sao2, 0, '%'),
      hb: fmt.field('gas.hb', g.hb),
    },
    withheldInfo: withheld
      ? {
          entered: fmt.pressureAsEntered(g.pco2),
          unit: fmt.pressureUnit,
          other: fmt.kpa ? 'mmHg' : 'kPa',
        }
      : null,
    primary: withheld ? null : f.disorders[0] ? disorderView(f.disorders[0]) : null,
    added: withheld ? [] : f.disorders.slice(1).map(disorderView),
    disorders: withheld ? [] : f.disorders.map(disorderView),
    compensation,
    reference: referenceView(x),
    consistency:
      inconsistent && f.consistency
        ? {
            reported: fmt.mmol(f.consistency.reported),
            calculated: fmt.mmol(f.consistency.calculated),
          }
        : null,
    anionGap,
    deltaRatio,
    ...metabolicDetailView(x),
    chemistry: chemistryView(f, fmt),
    oxygenation,
    venous,
    ventilation,
    limits: limits(f, fmt),
    recheck,
    plan,
    critical: flags.filter((x) => x.code === 'critical_value'),
    flags,
    // a ventilation check with no ventilation section to sit in goes under the interpretation
    checks: ventilation
      ? {
          interpretation: visible('interpretation'),
          oxygenation: visible('oxygenation'),
          ventilation: visible('ventilation'),
        }
      : {
          interpretation: [...visible('interpretation'), ...visible('ventilation')],
          oxygenation: visible('oxygenation'),
          ventilation: [],
        },
    trend,
    conditions: c.context.conditions,
    patient: {
      age: fmt.withUnit(c.patient.ageYears, 0, 'years'),
      pregnant: c.patient.pregnant,
      under16: has(c.patient.ageYears) && c.patient.ageYears < 16,
    },
  };
}
