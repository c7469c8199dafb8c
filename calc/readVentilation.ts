// The ventilation part of a reading: PBW, VT per kg, pressures, dead space, the target PaCO2 and the settings to reach it.
import { VENTILATOR_RANGES } from './schema.ts';
import type { CanonicalCase } from './canonical.ts';
import { NORMAL, VENTILATION } from './reference.ts';
import { hydrogenIon } from './acidBase.ts';
import { wintersPco2, type Classification, type ReferencePoint } from './compensation.ts';
import {
  alveolarVentilation,
  co2ProductionEstimate,
  drivingPressure,
  estimatedDeadSpace,
  minuteVentilation,
  predictedBodyWeight,
  rrForTarget,
  targetPco2Buffered,
  targetPco2Simple,
  ventilatoryRatio,
  vtForTarget,
  vtPerKg,
} from './ventilation.ts';
import { flag, type Flag } from './flags.ts';
import { explanation, input, round } from './explain.ts';
import { type N, type Derived, type Ventilation, has, type Explainers } from './findings.ts';

export function ventilationPart(
  c: CanonicalCase,
  d: Derived,
  explain: Explainers,
  flags: Flag[],
  cl: Classification,
  ref: ReferencePoint,
): Ventilation | null {
  const v = c.ventilator;
  if (!v) return null;
  const g = c.gas,
    p = c.patient,
    peep = c.oxygen.peep;
  const out: Ventilation = {
    ventilated: true,
    deadSpaceSource: null,
    targetSource: null,
    targetForm: null,
    recheckMinutes: { ...VENTILATION.recheckMinutes },
    compensationTarget: null,
    usualPco2: null,
  };
  let pbw: N = null;
  if (p.sex && has(p.heightCm)) {
    if (p.heightCm < 130)
      flags.push(flag('pbw_not_applicable', 'warning', { heightCm: p.heightCm }));
    else {
      pbw = predictedBodyWeight(p.sex, p.heightCm);
      d.predictedBodyWeightKg = pbw;
      explain.predictedBodyWeightKg = () =>
        explanation(
          'predictedBodyWeightKg',
          'Predicted body weight',
          round(pbw!, 1),
          'kg',
          `${p.sex === 'male' ? '50' : '45.5'} + 0.91 x (height cm - 152.4)`,
          [input('Height', p.heightCm!, 'cm')],
          'ardsnet2000',
        );
    }
  }
  if (has(v.vt) && pbw !== null) {
    d.vtPerKgPbw = vtPerKg(v.vt, pbw);
    explain.vtPerKgPbw = () =>
      explanation(
        'vtPerKgPbw',
        'VT per kg PBW',
        round(d.vtPerKgPbw!, 1),
        'mL/kg',
        'VT / PBW',
        [input('VT', v.vt!, 'mL'), input('PBW', round(pbw, 1), 'kg')],
        'ardsnet2000',
      );
    if (d.vtPerKgPbw > VENTILATION.vtHighPerKg)
      flags.push(
        flag('vt_above_8_ml_per_kg', 'warning', {
          which: 'current',
          vt: v.vt,
          vtPerKg: round(d.vtPerKgPbw, 1),
        }),
      );
  }
  if (has(v.rr) && v.rr > VENTILATION.rrMax)
    flags.push(flag('rr_above_35', 'warning', { which: 'current', rr: v.rr }));
  if (has(v.pplat)) {
    if (v.pplat > VENTILATION.plateauMax)
      flags.push(flag('plateau_above_30', 'warning', { pplat: v.pplat }));
    if (has(peep)) {
      d.drivingPressure = drivingPressure(v.pplat, peep);
      explain.drivingPressure = () =>
        explanation(
          'drivingPressure',
          'Driving pressure',
          round(d.drivingPressure!, 0),
          'cmH2O',
          'Pplat - PEEP',
          [input('Pplat', v.pplat!, 'cmH2O'), input('PEEP', peep, 'cmH2O')],
          'amato2015',
        );
      if (d.drivingPressure > VENTILATION.drivingPressureMax)
        flags.push(
          flag('driving_pressure_above_15', 'warning', {
            drivingPressure: round(d.drivingPressure, 0),
          }),
        );
    }
  }
  // dead space: a measured VD/VT first, else the anatomic estimate plus apparatus
  let vd: N = null;
  if (has(v.deadSpaceFraction) && has(v.vt)) {
    vd = v.deadSpaceFraction * v.vt;
    out.deadSpaceSource = 'measured_fraction';
    explain.deadSpaceMl = () =>
      explanation(
        'deadSpaceMl',
        'Dead space',
        round(vd!, 0),
        'mL',
        'VD = VD/VT x VT',
        [input('VD/VT', v.deadSpaceFraction!, ''), input('VT', v.vt!, 'mL')],
        'west',
      );
  } else if (pbw !== null) {
    vd = estimatedDeadSpace(pbw, v.deadSpaceMl ?? 0);
    out.deadSpaceSource = 'estimated';
    explain.deadSpaceMl = () =>
      explanation(
        'deadSpaceMl',
        'Dead space (estimate)',
        round(vd!, 0),
        'mL',
        '2.2 mL/kg x PBW + apparatus dead space',
        [input('PBW', round(pbw, 1), 'kg'), input('Apparatus', v.deadSpaceMl ?? 0, 'mL')],
        'radford1955',
      );
  }
  d.deadSpaceMl = vd;
  if (has(v.rr) && has(v.vt)) {
    d.minuteVentilation = minuteVentilation(v.rr, v.vt);
    explain.minuteVentilation = () =>
      explanation(
        'minuteVentilation',
        'Minute ventilation',
        round(d.minuteVentilation!, 1),
        'L/min',
        'VE = RR x VT',
        [input('RR', v.rr!, '/min'), input('VT', v.vt!, 'mL')],
        'west',
      );
    if (vd !== null) {
      if (v.vt - vd <= 0)
        flags.push(flag('dead_space_exceeds_vt', 'warning', { vt: v.vt, deadSpace: round(vd, 0) }));
      else {
        const va = alveolarVentilation(v.rr, v.vt, vd);
        d.alveolarVentilation = va;
        d.co2Production = co2ProductionEstimate(g.pco2, va);
        explain.alveolarVentilation = () =>
          explanation(
            'alveolarVentilation',
            'Alveolar ventilation',
            round(va, 1),
            'L/min',
            'VA = RR x (VT - VD)',
            [input('RR', v.rr!, '/min'), input('VT', v.vt!, 'mL'), input('VD', round(vd, 0), 'mL')],
            'west',
          );
        explain.co2Production = () =>
          explanation(
            'co2Production',
            'CO2 production (estimate)',
            round(d.co2Production!, 0),
            'mL/min',
            'VCO2 = PaCO2 x VA / 0.863',
            [input('PaCO2', round(g.pco2, 1), 'mmHg'), input('VA', round(va, 2), 'L/min')],
            'west',
          );
      }
    }
    if (pbw !== null) {
      d.ventilatoryRatio = ventilatoryRatio(v.rr * v.vt, g.pco2, pbw);
      explain.ventilatoryRatio = () =>
        explanation(
          'ventilatoryRatio',
          'Ventilatory ratio',
          round(d.ventilatoryRatio!, 2),
          '',
          '(VE mL/min x PaCO2) / (PBW x 100 x 37.5)',
          [
            input('VE', v.rr! * v.vt!, 'mL/min'),
            input('PaCO2', round(g.pco2, 1), 'mmHg'),
            input('PBW', round(pbw, 1), 'kg'),
          ],
          'sinha2009',
        );
    }
  }

  // the target PaCO2 (clinical-scope section 8)
  let target: N = null;
  if (has(v.targetPco2)) {
    target = v.targetPco2;
    out.targetSource = 'target_pco2';
    out.targetForm = 'as_given';
  } else if (has(v.targetPh)) {
    const hTarget = hydrogenIon(v.targetPh);
    d.targetPco2Simple = targetPco2Simple(hTarget, g.hco3);
    explain.targetPco2Simple = () =>
      explanation(
        'targetPco2Simple',
        'Target PaCO2 (HCO3 held constant)',
        round(d.targetPco2Simple!, 1),
        'mmHg',
        'PaCO2_t = [H+]_t x HCO3 / 24',
        [input('[H+] at target pH', round(hTarget, 1), 'nmol/L'), input('HCO3', g.hco3, 'mmol/L')],
        'henderson',
      );
    target = targetPco2Buffered(hTarget, g.hco3, g.pco2);
    out.targetSource = 'target_ph';
    out.targetForm = 'acute_buffering';
    if (target === null)
      flags.push(flag('target_not_reachable', 'warning', { targetPh: v.targetPh }));
    else
      explain.targetPco2 = () =>
        explanation(
          'targetPco2',
          'Target PaCO2 (acute buffering)',
          round(target!, 1),
          'mmHg',
          'PaCO2_t = [H+]_t x (HCO3 - 0.1 x PaCO2) / (24 - 0.1 x [H+]_t)',
          [
            input('Target pH', v.targetPh!, ''),
            input('[H+] at target pH', round(hTarget, 1), 'nmol/L'),
            input('HCO3', g.hco3, 'mmol/L'),
            input('PaCO2 now', round(g.pco2, 1), 'mmHg'),
          ],
          'targetPco2',
        );
  } else flags.push(flag('no_ventilation_target', 'info', {}));
  d.targetPco2 = target;
  if (target === null) return out;
  if (target < VENTILATOR_RANGES.targetPco2.min) {
    // a target below the lowest plausible PaCO2 is not a ventilator setting to suggest
    flags.push(
      flag('target_not_reachable', 'warning', {
        targetPh: v.targetPh,
        targetPco2: round(target, 1),
      }),
    );
    d.targetPco2 = null;
    delete explain.targetPco2;
    return out;
  }
  if (c.sample !== 'arterial')
    flags.push(flag('suggestion_from_venous_pco2', 'warning', { sample: c.sample }));

  if (has(v.rr) && has(v.vt)) {
    const rr = Math.round(rrForTarget(v.rr, g.pco2, target));
    d.suggestedRr = rr;
    explain.suggestedRr = () =>
      explanation(
        'suggestedRr',
        'RR at unchanged VT',
        rr,
        '/min',
        'RR_new = RR x PaCO2 now / PaCO2 target',
        [
          input('RR', v.rr!, '/min'),
          input('PaCO2 now', round(g.pco2, 1), 'mmHg'),
          input('PaCO2 target', round(target, 1), 'mmHg'),
        ],
        'west',
      );
    if (rr > VENTILATION.rrMax)
      flags.push(flag('rr_above_35', 'warning', { which: 'suggested', rr }));
    if (vd !== null && v.vt - vd > 0) {
      const vt = Math.round(vtForTarget(v.vt, vd, g.pco2, target) / 10) * 10;
      d.suggestedVt = vt;
      explain.suggestedVt = () =>
        explanation(
          'suggestedVt',
          'VT at unchanged RR',
          vt,
          'mL',
          'VT_new = VD + (VT - VD) x PaCO2 now / PaCO2 target',
          [
            input('VT', v.vt!, 'mL'),
            input('VD', round(vd, 0), 'mL'),
            input('PaCO2 now', round(g.pco2, 1), 'mmHg'),
            input('PaCO2 target', round(target, 1), 'mmHg'),
          ],
          'west',
        );
      if (pbw !== null) {
        d.suggestedVtPerKgPbw = vt / pbw;
        if (d.suggestedVtPerKgPbw > VENTILATION.vtHighPerKg)
          flags.push(
            flag('vt_above_8_ml_per_kg', 'warning', {
              which: 'suggested',
              vt,
              vtPerKg: round(d.suggestedVtPerKgPbw, 1),
            }),
          );
      }
    }
    const lungProtective = d.vtPerKgPbw !== null && d.vtPerKgPbw <= VENTILATION.vtHighPerKg;
    // permissive hypercapnia is worth weighing only when neither route reaches the target within limits
    const hardToReach =
      rr > VENTILATION.rrMax &&
      (d.suggestedVtPerKgPbw === null || d.suggestedVtPerKgPbw > VENTILATION.vtHighPerKg);
    if (lungProtective && hardToReach && target < g.pco2)
      flags.push(
        flag('permissive_hypercapnia_possible', 'info', {
          pco2: round(g.pco2, 1),
          target: round(target, 1),
        }),
      );
  }

  // a target below what the patient needs (clinical-scope section 8)
  const metabolicAcidosis = cl.disorders.some((x) => x.code === 'metabolic_acidosis');
  if (metabolicAcidosis && g.hco3 < NORMAL.hco3.low) {
    out.compensationTarget = wintersPco2(g.hco3);
    if (target > out.compensationTarget.high)
      flags.push(
        flag('target_pco2_above_compensation', 'warning', {
          target: round(target, 1),
          expectedLow: round(out.compensationTarget.low, 1),
          expectedHigh: round(out.compensationTarget.high, 1),
        }),
      );
  }
  const usual = usualPco2(c, cl, ref);
  out.usualPco2 = usual;
  if (usual !== null && target < usual)
    flags.push(
      flag('target_pco2_below_baseline', 'warning', {
        target: round(target, 1),
        usual: round(usual, 1),
        estimated: ref.kind !== 'baseline' || ref.estimated.pco2,
      }),
    );
  return out;
}

/** The patient's usual PaCO2 in chronic hypercapnia: stated, estimated from the baseline, or from the chronic HCO3. */
export function usualPco2(c: CanonicalCase, cl: Classification, ref: ReferencePoint): N {
  if (ref.kind === 'baseline') return ref.pco2 > NORMAL.pco2.high ? ref.pco2 : null;
  const chronicHypercapnia = cl.disorders.some(
    (x) =>
      x.code === 'respiratory_acidosis' &&
      (x.detail === 'chronic' || x.detail === 'acute_on_chronic'),
  );
  if (!chronicHypercapnia) return null;
  // invert the chronic rule (Berend 2014): usual PaCO2 = 40 + (HCO3 - 24) x 10 / 3.5, an estimate
  const estimate = 40 + ((c.gas.hco3 - 24) * 10) / 3.5;
  return estimate > NORMAL.pco2.high ? Math.min(estimate, c.gas.pco2) : null;
}
