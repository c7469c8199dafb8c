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
        }
      : null;

  return ventilation;
}
