// The ventilation part of the note's view model.
import { type Ctx, has } from './viewShared.ts';

export function ventilationView({ f, fmt, withheld }: Ctx) {
  const c = f.case;
  const g = c.gas;
  const d = f.derived;
  const v = c.ventilator,
    fw = f.ventilation;
  const ventilation =
    fw && v && !withheld
      ? {
          vt: fmt.withUnit(v.vt, 0, 'mL'),
          rr: fmt.withUnit(v.rr, 0, '/min'),
          pplat: fmt.withUnit(v.pplat, 0, 'cmH2O'),
          peep: fmt.withUnit(c.oxygen.peep, 0, 'cmH2O'),
          sex: c.patient.sex,
          height: fmt.withUnit(c.patient.heightCm, 0, 'cm'),
          pbw: fmt.withUnit(d.predictedBodyWeightKg, 1, 'kg'),
          vtPerKg: fmt.withUnitFixed(d.vtPerKgPbw, 1, 'mL/kg PBW'),
          drivingPressure: fmt.withUnit(d.drivingPressure, 0, 'cmH2O'),
          deadSpace: fmt.withUnit(d.deadSpaceMl, 0, 'mL'),
          deadSpaceSource: fw.deadSpaceSource,
          deadSpaceFraction: fmt.plain(v.deadSpaceFraction, 2),
          apparatus:
            has(v.deadSpaceMl) && v.deadSpaceMl > 0 ? fmt.withUnit(v.deadSpaceMl, 0, 'mL') : null,
          ve: fmt.withUnit(d.minuteVentilation, 1, 'L/min'),
          va: fmt.withUnit(d.alveolarVentilation, 1, 'L/min'),
          vco2: fmt.withUnit(d.co2Production, 0, 'mL/min'),
          ventilatoryRatio: fmt.plain(d.ventilatoryRatio, 2),
          target: has(d.targetPco2)
            ? {
                pco2: fmt.pressure(d.targetPco2),
                simple: fmt.pressure(d.targetPco2Simple),
                form: fw.targetForm,
                source: fw.targetSource,
                ph: fmt.ph(v.targetPh),
              }
            : null,
          targetRequested: fw.targetSource !== null,
          suggestedRr: fmt.withUnit(d.suggestedRr, 0, '/min'),
          suggestedVt: fmt.withUnit(d.suggestedVt, 0, 'mL'),
          suggestedVtPerKg: fmt.withUnitFixed(d.suggestedVtPerKgPbw, 1, 'mL/kg PBW'),
          direction: has(d.targetPco2)
            ? fmt.pressureNumber(d.targetPco2) === fmt.pressureNumber(g.pco2)
              ? ('same' as const)
              : d.targetPco2 < g.pco2
                ? ('lower' as const)
                : ('raise' as const)
            : null,
          compensationTarget: fmt.pressureBand(fw.compensationTarget),
          usual: fmt.pressure(fw.usualPco2),
          usualEstimated: f.reference.usual?.estimated.pco2 === true,
          // what the target is and what it replaced (clinical-scope sections 8 and 10)
          targetBasis: fw.targetBasis,
          requestedTarget: fmt.pressure(fw.requestedTarget),
          compliance: fmt.withUnit(d.compliance, 1, 'mL/cmH2O'),
          ti: fmt.withUnit(v.inspiratoryTime, 1, 's'),
          te: fmt.withUnit(d.expiratoryTime, 1, 's'),
          etco2: fmt.pressure(v.etco2),
          alveolarDeadSpaceFraction: fmt.fixed(d.alveolarDeadSpaceFraction, 2),
          obstruction: fw.obstruction,
          rrRoute: fw.rrRoute
            ? {
                offered: fw.rrRoute.offered,
                above35: fw.rrRoute.limits.includes('rr_above_35'),
                noExpiration: fw.rrRoute.limits.includes('no_expiratory_time'),
                te: fmt.withUnit(d.suggestedExpiratoryTime, 1, 's'),
                raises: has(v.rr) && fw.rrRoute.value > v.rr,
              }
            : null,
          vtRoute: fw.vtRoute
            ? {
                offered: fw.vtRoute.offered,
                aboveKg: fw.vtRoute.limits.includes('vt_above_8_ml_per_kg'),
                belowKg: fw.vtRoute.limits.includes('vt_below_4_ml_per_kg'),
                pressures:
                  fw.vtRoute.limits.includes('plateau_above_30') ||
                  fw.vtRoute.limits.includes('driving_pressure_above_15'),
                plateau: fmt.withUnit(d.predictedPlateau, 0, 'cmH2O'),
                driving: fmt.withUnit(d.predictedDrivingPressure, 0, 'cmH2O'),
                kgUnchecked: fw.vtRoute.unchecked.includes('per_kg'),
                plateauUnchecked: fw.vtRoute.unchecked.includes('plateau'),
              }
            : null,
          best: fw.best
            ? {
                rr: fmt.withUnit(fw.best.rr, 0, '/min'),
                vt: fmt.withUnit(fw.best.vt, 0, 'mL'),
                pco2: fmt.pressure(fw.best.pco2),
                ph: fmt.ph(fw.best.ph),
                reaches: fw.best.reachesTarget,
                limitedBy: fw.best.vtLimitedBy,
                raisesRr: has(v.rr) && fw.best.rr > v.rr,
              }
            : null,
          ardsnetStep: fw.ardsnetStep,
          beyondVentilator: fw.beyondVentilator,
          ph: fmt.ph(g.ph),
        }
      : null;

  return ventilation;
}
