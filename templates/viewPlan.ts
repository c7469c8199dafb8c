// The plan part of the note's view model: which next steps and tests apply to this reading.
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
  const glucose = m.glucose;
  const ketoacidosis = glucose?.ketoacidosisPattern === true;
  const raisedGapTests: string[] = [];
  if (raisedGap) {
    if (!has(g.lactate)) raisedGapTests.push('lactate');
    // the ketoacidosis pattern asks for ketones in its own bullet
    if (!ketoacidosis) raisedGapTests.push('ketones');
    if (!has(ch.glucose)) raisedGapTests.push('glucose');
    if (!has(ch.creatinine) || !has(ch.urea)) raisedGapTests.push('renal');
    if (!has(ch.osmolality)) raisedGapTests.push('osmolality');
    raisedGapTests.push('toxicology');
  }
  const normalGap = hasDisorder('metabolic_acidosis', 'normal_anion_gap');
  const u = c.urine;
  const hypoventilation = f.flags
    .filter((x) => x.code === 'relative_hypoventilation')
    .map((x) => x.values.reason as string);
  const alkalosis = hasDisorder('metabolic_alkalosis');
  const respiratoryAcidosis = hasDisorder('respiratory_acidosis');
  const inconsistent = f.consistency !== null && !f.consistency.consistent;
  // A route is offered in the plan only inside lung-protective limits, as the core judged it (calc/readVentilationRoutes:
  // VT 4-8 mL/kg PBW and the plateau and driving pressure the compliance predicts, ARDS Network 2000 and Amato 2015;
  // RR up to 35/min with an expiratory time left, common practice).
  const rrRoute = fw?.rrRoute ?? null;
  const vtRoute = fw?.vtRoute ?? null;
  const route = {
    rr: rrRoute?.offered === true,
    vt: vtRoute?.offered === true,
    vtReason: !vtRoute
      ? null
      : vtRoute.limits.includes('vt_above_8_ml_per_kg')
        ? ('per_kg' as const)
        : vtRoute.limits.includes('vt_below_4_ml_per_kg')
          ? ('below_range' as const)
          : vtRoute.limits.length
            ? ('pressure' as const)
            : null,
    vtUnchecked: vtRoute?.unchecked.includes('per_kg') === true,
    plateauUnchecked: vtRoute?.unchecked.includes('plateau') === true,
    rrReason: !rrRoute
      ? null
      : rrRoute.limits.includes('rr_above_35')
        ? ('above_35' as const)
        : rrRoute.limits.includes('no_expiratory_time')
          ? ('no_expiratory_time' as const)
          : null,
  };
  // raising the rate in obstruction: check for air trapping first (clinical-scope section 10)
  const raisesRate =
    (route.rr && has(d.suggestedRr) && has(v?.rr) && d.suggestedRr > (v?.rr as number)) ||
    (!route.rr && !route.vt && has(d.bestRr) && has(v?.rr) && d.bestRr > (v?.rr as number));
  const ox = f.oxygenation;
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
        ? raisedGap
          ? ('raised_with_gap' as const)
          : ('raised' as const)
        : raisedGap
          ? ('conditional' as const)
          : null,
    ethanolMeasured: has(ch.ethanol),
    ketoacidosis,
    hyperosmolar: glucose?.hyperosmolar === true,
    // a "normal" PaCO2 that is not normal for this patient: escalate (clinical-scope section 10)
    relativeHypoventilation: {
      any: hypoventilation.length > 0,
      metabolic: hypoventilation.includes('metabolic_acidosis'),
      pregnancy: hypoventilation.includes('pregnancy'),
      asthma: hypoventilation.includes('asthma'),
    },
    normalGap,
    // the urine anion gap is read in a normal-AG acidosis with no raised-AG one beside it
    urineAnionGap: normalGap && !raisedGap && !(has(u.na) && has(u.k) && has(u.cl)),
    alkalosis,
    urineChloride: alkalosis && !has(c.urine.cl),
    potassium: alkalosis && !has(ch.k),
    lactate: m.lactateBand === 'raised' || m.lactateBand === 'high',
    // the escalation bullet of a relative hypoventilation already says this, more urgently
    hypoventilation:
      respiratoryAcidosis && !fw && f.phStatus === 'acidaemia' && hypoventilation.length === 0,
    // at altitude with a normal A-a gradient the low PaO2 is the low inspired PO2 (clinical-scope section 10)
    oxygen: arterial && o.level === 'respiratory_failure' && !o.lowInspiredPo2,
    arterialGas: c.sample !== 'arterial' && !withheld && !(vn?.hypercapniaUnlikely ?? false),
    verify: inconsistent,
    targetConcern: f.flags.some((x) => x.code === 'target_pco2_above_compensation')
      ? ('above_compensation' as const)
      : f.flags.some((x) => x.code === 'target_pco2_below_baseline')
        ? ('below_baseline' as const)
        : null,
    /** the target in use replaces the one asked for: Winters' compensation or the usual PaCO2 */
    targetBasis: fw?.targetBasis ?? null,
    /** no single route within limits: the best setting within them (and whether it reaches the target) */
    best: !route.rr && !route.vt && fw?.best ? { reaches: fw.best.reachesTarget } : null,
    /** air trapping: obstruction and a rate rise on offer */
    airTrapping: fw?.obstruction && raisesRate ? fw.obstruction : null,
    ardsnet: fw?.ardsnetStep ?? null,
    beyondVentilator: fw?.beyondVentilator ?? null,
    /** severe hypoxaemia: prone positioning, PEEP/FiO2 strategy, neuromuscular blockade (PROSEVA 2013) */
    prone: arterial && ox.severeHypoxaemia,
    /** the SpO2 target to name, and too much oxygen for it (BTS 2017) */
    oxygenTarget: arterial && ox.target ? ox.target.basis : null,
    reduceOxygen: arterial && ox.aboveTarget,
    /** look for the cause of a gas-exchange defect (a raised A-a gradient, or P/F 300 or less on oxygen) */
    // (off the ventilator: on it, the team is already treating the lung)
    gasExchange: arterial && !fw && ox.gasExchangeImpaired && ox.level !== 'normal',
    hypoventilationOrLowInspired: arterial && ox.lowInspiredOrHypoventilation,
    carbonMonoxide: f.flags.some((x) => x.code === 'cohb_raised'),
    methaemoglobin: f.flags.some((x) => x.code === 'methb_raised'),
  };

  return { plan, inconsistent };
}
