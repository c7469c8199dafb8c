// The plan part of the note's view model: which next steps and tests apply to this reading.
import { reference as R } from '../calc/index.ts';
import { type Ctx, has } from './viewShared.ts';

export function planView(
  { f, withheld, hasDisorder }: Ctx,
  ventilation: { target: unknown; suggestedRr: unknown; suggestedVt: unknown } | null,
  anionGap: unknown,
) {
  const c = f.case;
  const g = c.gas;
  const d = f.derived;
  const m = f.metabolic;
  const o = f.oxygenation;
  const ch = c.chemistry;
  const v = c.ventilator;
  const fw = f.ventilation;
  const vn = f.venous;
  const arterial = c.sample === 'arterial';
  const metabolicAcidosis = hasDisorder('metabolic_acidosis');
  const raisedGap = hasDisorder('metabolic_acidosis', 'high_anion_gap');
  const raisedGapTests: string[] = [];
  if (raisedGap) {
    if (!has(g.lactate)) raisedGapTests.push('lactate');
    raisedGapTests.push('ketones');
    if (!has(ch.glucose)) raisedGapTests.push('glucose');
    if (!has(ch.creatinine) || !has(ch.urea)) raisedGapTests.push('renal');
    if (!has(ch.osmolality)) raisedGapTests.push('osmolality');
    raisedGapTests.push('toxicology');
  }
  const normalGap = hasDisorder('metabolic_acidosis', 'normal_anion_gap');
  const alkalosis = hasDisorder('metabolic_alkalosis');
  const respiratoryAcidosis = hasDisorder('respiratory_acidosis');
  const inconsistent = f.consistency !== null && !f.consistency.consistent;
  // A route is offered in the plan only inside lung-protective limits (ARDS Network 2000; Amato 2015;
  // RR above 35/min, common practice): a larger breath is not offered when plateau or driving pressure is already high.
  const V = R.VENTILATION;
  const pressureLimited =
    (has(v?.pplat) && (v?.pplat as number) > V.plateauMax) ||
    (has(d.drivingPressure) && d.drivingPressure > V.drivingPressureMax);
  const vtIncrease = has(d.suggestedVt) && has(v?.vt) && d.suggestedVt > (v?.vt as number);
  const vtTooBig = has(d.suggestedVtPerKgPbw) && d.suggestedVtPerKgPbw > V.vtHighPerKg;
  const route = {
    rr: has(d.suggestedRr) && d.suggestedRr <= V.rrMax,
    vt: has(d.suggestedVt) && !vtTooBig && !(vtIncrease && pressureLimited),
    vtReason: !has(d.suggestedVt)
      ? null
      : vtTooBig
        ? ('per_kg' as const)
        : vtIncrease && pressureLimited
          ? ('pressure' as const)
          : null,
    vtUnchecked: has(d.suggestedVt) && !has(d.suggestedVtPerKgPbw),
  };
  const plan = {
    route,
    ventilator:
      !!ventilation?.target &&
      (ventilation.suggestedRr !== null || ventilation.suggestedVt !== null),
    needAnionGap: metabolicAcidosis && !anionGap && !withheld,
    raisedGap,
    raisedGapTests,
    toxicAlcohols:
      m.osmolarGapRaised === true
        ? ('raised' as const)
        : raisedGap
          ? ('conditional' as const)
          : null,
    normalGap,
    urineAnionGap: normalGap && !has(d.urineAnionGap),
    alkalosis,
    urineChloride: alkalosis && !has(c.urine.cl),
    potassium: alkalosis && !has(ch.k),
    lactate: m.lactateBand === 'raised' || m.lactateBand === 'high',
    hypoventilation: respiratoryAcidosis && !fw && f.phStatus === 'acidaemia',
    oxygen: arterial && o.level === 'respiratory_failure',
    arterialGas: c.sample !== 'arterial' && !withheld && !(vn?.hypercapniaUnlikely ?? false),
    verify: inconsistent,
    targetConcern: f.flags.some((x) => x.code === 'target_pco2_above_compensation')
      ? ('above_compensation' as const)
      : f.flags.some((x) => x.code === 'target_pco2_below_baseline')
        ? ('below_baseline' as const)
        : null,
  };

  return { plan, inconsistent };
}
