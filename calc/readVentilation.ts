// The ventilation part of a reading: PBW, VT per kg, pressures, dead space, the target PaCO2 and the settings to
// reach it.
import type { CanonicalCase } from './canonical.ts';
import { FIELD } from './fields.ts';
import { NORMAL, VENTILATION } from './reference.ts';
import { hydrogenIon } from './acidBase.ts';
import { wintersPco2 } from './compensation.ts';
import type { Classification } from './classify.ts';
import type { ReferencePoint } from './referencePoint.ts';
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
import { input, record, round } from './explain.ts';
import { type Book, type N, type Ventilation, has } from './findings.ts';

const P = 'mmHg';
type Vent = NonNullable<CanonicalCase['ventilator']>;

/** Predicted body weight, VT per kg and the pressures, with their flags. */
function mechanics(c: CanonicalCase, v: Vent, book: Book, flags: Flag[]) {
  const { sex, heightCm } = c.patient;
  const peep = c.oxygen.peep;
  let pbw: N = null;
  let vtPerKgPbw: N = null;
  if (sex && has(heightCm)) {
    if (heightCm < 130) flags.push(flag('pbw_not_applicable', 'warning', { heightCm }));
    else
      pbw = record(book, 'predictedBodyWeightKg', predictedBodyWeight(sex, heightCm), {
        label: 'Predicted body weight',
        unit: 'kg',
        decimals: 1,
        formula: `${sex === 'male' ? '50' : '45.5'} + 0.91 x (height cm - 152.4)`,
        inputs: [input('Height', heightCm, 'cm')],
        source: 'ardsnet2000',
      });
  }
  if (has(v.vt) && pbw !== null) {
    vtPerKgPbw = record(book, 'vtPerKgPbw', vtPerKg(v.vt, pbw), {
      label: 'VT per kg PBW',
      unit: 'mL/kg',
      decimals: 1,
      formula: 'VT / PBW',
      inputs: [input('VT', v.vt, 'mL'), input('PBW', round(pbw, 1), 'kg')],
      source: 'ardsnet2000',
    });
    if (vtPerKgPbw > VENTILATION.vtHighPerKg)
      flags.push(
        flag('vt_above_8_ml_per_kg', 'warning', {
          which: 'current',
          vt: v.vt,
          vtPerKg: round(vtPerKgPbw, 1),
        }),
      );
  }
  if (has(v.rr) && v.rr > VENTILATION.rrMax)
    flags.push(flag('rr_above_35', 'warning', { which: 'current', rr: v.rr }));
  if (has(v.pplat)) {
    if (v.pplat > VENTILATION.plateauMax)
      flags.push(flag('plateau_above_30', 'warning', { pplat: v.pplat }));
    if (has(peep)) {
      const driving = record(book, 'drivingPressure', drivingPressure(v.pplat, peep), {
        label: 'Driving pressure',
        unit: 'cmH2O',
        decimals: 0,
        formula: 'Pplat - PEEP',
        inputs: [input('Pplat', v.pplat, 'cmH2O'), input('PEEP', peep, 'cmH2O')],
        source: 'amato2015',
      });
      if (driving > VENTILATION.drivingPressureMax)
        flags.push(
          flag('driving_pressure_above_15', 'warning', { drivingPressure: round(driving, 0) }),
        );
    }
  }
  return { pbw, vtPerKgPbw };
}

/** Dead space (a measured VD/VT first, else the anatomic estimate plus apparatus), VE, VA and VCO2. */
function ventilationVolumes(
  c: CanonicalCase,
  v: Vent,
  pbw: N,
  book: Book,
  flags: Flag[],
  out: Ventilation,
): N {
  let vd: N = null;
  if (has(v.deadSpaceFraction) && has(v.vt)) {
    out.deadSpaceSource = 'measured_fraction';
    vd = record(book, 'deadSpaceMl', v.deadSpaceFraction * v.vt, {
      label: 'Dead space',
      unit: 'mL',
      decimals: 0,
      formula: 'VD = VD/VT x VT',
      inputs: [input('VD/VT', v.deadSpaceFraction, ''), input('VT', v.vt, 'mL')],
      source: 'west',
    });
  } else if (pbw !== null) {
    out.deadSpaceSource = 'estimated';
    vd = record(book, 'deadSpaceMl', estimatedDeadSpace(pbw, v.deadSpaceMl ?? 0), {
      label: 'Dead space (estimate)',
      unit: 'mL',
      decimals: 0,
      formula: '2.2 mL/kg x PBW + apparatus dead space',
      inputs: [input('PBW', round(pbw, 1), 'kg'), input('Apparatus', v.deadSpaceMl ?? 0, 'mL')],
      source: 'radford1955',
    });
  }
  if (!has(v.rr) || !has(v.vt)) return vd;
  const { rr, vt } = v;
  const pco2 = c.gas.pco2;
  record(book, 'minuteVentilation', minuteVentilation(rr, vt), {
    label: 'Minute ventilation',
    unit: 'L/min',
    decimals: 1,
    formula: 'VE = RR x VT',
    inputs: [input('RR', rr, '/min'), input('VT', vt, 'mL')],
    source: 'west',
  });
  if (vd !== null) {
    if (vt - vd <= 0)
      flags.push(flag('dead_space_exceeds_vt', 'warning', { vt, deadSpace: round(vd, 0) }));
    else {
      const va = record(book, 'alveolarVentilation', alveolarVentilation(rr, vt, vd), {
        label: 'Alveolar ventilation',
        unit: 'L/min',
        decimals: 1,
        formula: 'VA = RR x (VT - VD)',
        inputs: [input('RR', rr, '/min'), input('VT', vt, 'mL'), input('VD', round(vd, 0), 'mL')],
        source: 'west',
      });
      record(book, 'co2Production', co2ProductionEstimate(pco2, va), {
        label: 'CO2 production (estimate)',
        unit: 'mL/min',
        decimals: 0,
        formula: 'VCO2 = PaCO2 x VA / 0.863',
        inputs: [input('PaCO2', pco2, P), input('VA', round(va, 2), 'L/min')],
        source: 'west',
      });
    }
  }
  if (pbw !== null)
    record(book, 'ventilatoryRatio', ventilatoryRatio(rr * vt, pco2, pbw), {
      label: 'Ventilatory ratio',
      unit: '',
      decimals: 2,
      formula: '(VE mL/min x PaCO2) / (PBW x 100 x 37.5)',
      inputs: [
        input('VE', rr * vt, 'mL/min'),
        input('PaCO2', pco2, P),
        input('PBW', round(pbw, 1), 'kg'),
      ],
      source: 'sinha2009',
    });
  return vd;
}

/** The target PaCO2 (clinical-scope section 8): as given, or for a target pH with acute buffering. */
function targetOf(c: CanonicalCase, v: Vent, book: Book, flags: Flag[], out: Ventilation): N {
  const g = c.gas;
  if (has(v.targetPco2)) {
    out.targetSource = 'target_pco2';
    out.targetForm = 'as_given';
    return record(book, 'targetPco2', v.targetPco2, {
      label: 'Target PaCO2 (as given)',
      unit: P,
      decimals: 1,
      formula: 'as entered',
      inputs: [input('Target PaCO2', v.targetPco2, P)],
      source: 'commonPractice',
    });
  }
  if (!has(v.targetPh)) {
    flags.push(flag('no_ventilation_target', 'info', {}));
    return null;
  }
  out.targetSource = 'target_ph';
  out.targetForm = 'acute_buffering';
  const hTarget = hydrogenIon(v.targetPh);
  record(book, 'targetPco2Simple', targetPco2Simple(hTarget, g.hco3), {
    label: 'Target PaCO2 (HCO3 held constant)',
    unit: P,
    decimals: 1,
    formula: 'PaCO2_t = [H+]_t x HCO3 / 24',
    inputs: [
      input('[H+] at target pH', round(hTarget, 1), 'nmol/L'),
      input('HCO3', g.hco3, 'mmol/L'),
    ],
    source: 'henderson',
  });
  const target = targetPco2Buffered(hTarget, g.hco3, g.pco2);
  if (target === null) {
    flags.push(flag('target_not_reachable', 'warning', { targetPh: v.targetPh }));
    return null;
  }
  // a target below the lowest plausible PaCO2 is not a ventilator setting to suggest
  if (target < FIELD['ventilator.targetPco2'].range[0]) {
    flags.push(
      flag('target_not_reachable', 'warning', {
        targetPh: v.targetPh,
        targetPco2: round(target, 1),
      }),
    );
    return null;
  }
  return record(book, 'targetPco2', target, {
    label: 'Target PaCO2 (acute buffering)',
    unit: P,
    decimals: 1,
    formula: 'PaCO2_t = [H+]_t x (HCO3 - 0.1 x PaCO2) / (24 - 0.1 x [H+]_t)',
    inputs: [
      input('Target pH', v.targetPh, ''),
      input('[H+] at target pH', round(hTarget, 1), 'nmol/L'),
      input('HCO3', g.hco3, 'mmol/L'),
      input('PaCO2 now', g.pco2, P),
    ],
    source: 'targetPco2',
  });
}

/** The RR at unchanged VT and the VT at unchanged RR that should reach the target (West). */
function routes(
  c: CanonicalCase,
  v: Vent,
  target: number,
  vd: N,
  fit: ReturnType<typeof mechanics>,
  book: Book,
  flags: Flag[],
) {
  if (!has(v.rr) || !has(v.vt)) return;
  const pco2 = c.gas.pco2;
  const { pbw, vtPerKgPbw } = fit;
  const rr = record(book, 'suggestedRr', Math.round(rrForTarget(v.rr, pco2, target)), {
    label: 'RR at unchanged VT',
    unit: '/min',
    decimals: 0,
    formula: 'RR_new = RR x PaCO2 now / PaCO2 target',
    inputs: [
      input('RR', v.rr, '/min'),
      input('PaCO2 now', pco2, P),
      input('PaCO2 target', target, P),
    ],
    source: 'west',
  });
  if (rr > VENTILATION.rrMax)
    flags.push(flag('rr_above_35', 'warning', { which: 'suggested', rr }));
  let vtPerKgSuggested: N = null;
  if (vd !== null && v.vt - vd > 0) {
    const vt = record(
      book,
      'suggestedVt',
      Math.round(vtForTarget(v.vt, vd, pco2, target) / 10) * 10,
      {
        label: 'VT at unchanged RR',
        unit: 'mL',
        decimals: 0,
        formula: 'VT_new = VD + (VT - VD) x PaCO2 now / PaCO2 target',
        inputs: [
          input('VT', v.vt, 'mL'),
          input('VD', round(vd, 0), 'mL'),
          input('PaCO2 now', pco2, P),
          input('PaCO2 target', target, P),
        ],
        source: 'west',
      },
    );
    if (pbw !== null) {
      vtPerKgSuggested = record(book, 'suggestedVtPerKgPbw', vt / pbw, {
        label: 'Suggested VT per kg PBW',
        unit: 'mL/kg',
        decimals: 1,
        formula: 'VT_new / PBW',
        inputs: [input('VT_new', vt, 'mL'), input('PBW', round(pbw, 1), 'kg')],
        source: 'ardsnet2000',
      });
      if (vtPerKgSuggested > VENTILATION.vtHighPerKg)
        flags.push(
          flag('vt_above_8_ml_per_kg', 'warning', {
            which: 'suggested',
            vt,
            vtPerKg: round(vtPerKgSuggested, 1),
          }),
        );
    }
  }
  const lungProtective = vtPerKgPbw !== null && vtPerKgPbw <= VENTILATION.vtHighPerKg;
  // permissive hypercapnia is worth weighing only when neither route reaches the target within limits
  const hardToReach =
    rr > VENTILATION.rrMax &&
    (vtPerKgSuggested === null || vtPerKgSuggested > VENTILATION.vtHighPerKg);
  if (lungProtective && hardToReach && target < pco2)
    flags.push(
      flag('permissive_hypercapnia_possible', 'info', {
        pco2: round(pco2, 1),
        target: round(target, 1),
      }),
    );
}

export function ventilationPart(
  c: CanonicalCase,
  book: Book,
  flags: Flag[],
  cl: Classification,
  ref: ReferencePoint,
): { ventilation: Ventilation | null; deadSpace: N } {
  const v = c.ventilator;
  if (!v) return { ventilation: null, deadSpace: null };
  const g = c.gas;
  const out: Ventilation = {
    ventilated: true,
    deadSpaceSource: null,
    targetSource: null,
    targetForm: null,
    recheckMinutes: { ...VENTILATION.recheckMinutes },
    compensationTarget: null,
    usualPco2: null,
  };
  const fit = mechanics(c, v, book, flags);
  const vd = ventilationVolumes(c, v, fit.pbw, book, flags, out);
  const target = targetOf(c, v, book, flags, out);
  if (target === null) return { ventilation: out, deadSpace: vd };
  if (c.sample !== 'arterial')
    flags.push(flag('suggestion_from_venous_pco2', 'warning', { sample: c.sample }));
  routes(c, v, target, vd, fit, book, flags);

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
  return { ventilation: out, deadSpace: vd };
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
