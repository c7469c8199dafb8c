// The ventilation part of a reading: PBW, VT per kg, pressures, dead space, the target PaCO2 and the settings to
// reach it.
import type { CanonicalCase } from './canonical.ts';
import { NORMAL, VENTILATION } from './reference.ts';
import type { Classification } from './classify.ts';
import type { ReferencePoint } from './referencePoint.ts';
import {
  alveolarVentilation,
  co2ProductionEstimate,
  drivingPressure,
  estimatedDeadSpace,
  minuteVentilation,
  predictedBodyWeight,
  ventilatoryRatio,
  vtPerKg,
} from './ventilation.ts';
import { compliance, expiratoryTime } from './mechanics.ts';
import { alveolarDeadSpaceFraction, physiologicalDeadSpace } from './deadSpace.ts';
import { routesPart } from './readVentilationRoutes.ts';
import { targetInUse, targetOf } from './readVentilationTarget.ts';
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
  let crs: N = null;
  const c0 = has(v.vt) && has(v.pplat) && has(peep) ? compliance(v.vt, v.pplat, peep) : null;
  if (c0 !== null && has(v.vt) && has(v.pplat) && has(peep))
    crs = record(book, 'compliance', c0, {
      label: 'Compliance (respiratory system)',
      unit: 'mL/cmH2O',
      decimals: 1,
      formula: 'Crs = VT / (Pplat - PEEP)',
      inputs: [
        input('VT', v.vt, 'mL'),
        input('Pplat', v.pplat, 'cmH2O'),
        input('PEEP', peep, 'cmH2O'),
      ],
      source: 'mechanics',
    });
  if (has(v.rr) && has(v.inspiratoryTime))
    record(book, 'expiratoryTime', expiratoryTime(v.rr, v.inspiratoryTime), {
      label: 'Expiratory time',
      unit: 's',
      decimals: 1,
      formula: 'Te = 60 / RR - Ti',
      inputs: [input('RR', v.rr, '/min'), input('Ti', v.inspiratoryTime, 's')],
      source: 'expiratoryTime',
    });
  return { pbw, vtPerKgPbw, crs };
}

export type Mechanics = ReturnType<typeof mechanics>;

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
  } else if (pbw !== null && has(v.etco2) && has(v.vt) && endTidalUsable(c, v.etco2, flags)) {
    out.deadSpaceSource = 'end_tidal';
    vd = endTidalDeadSpace(c, v.vt, v.etco2, estimatedDeadSpace(pbw, v.deadSpaceMl ?? 0), book);
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

/** An end-tidal CO2 above the PaCO2 gives no alveolar dead space to use: said, and the estimate kept. */
function endTidalUsable(c: CanonicalCase, etco2: number, flags: Flag[]): boolean {
  if (c.sample === 'arterial' && etco2 <= c.gas.pco2) return true;
  if (c.sample === 'arterial')
    flags.push(
      flag('etco2_above_paco2', 'warning', { etco2: round(etco2, 1), pco2: round(c.gas.pco2, 1) }),
    );
  return false;
}

/** Physiological dead space: the anatomic estimate plus the alveolar dead space the end-tidal CO2 shows. */
function endTidalDeadSpace(
  c: CanonicalCase,
  vt: number,
  etco2: number,
  anatomic: number,
  book: Book,
) {
  const pco2 = c.gas.pco2;
  record(book, 'alveolarDeadSpaceFraction', alveolarDeadSpaceFraction(pco2, etco2), {
    label: 'Alveolar dead-space fraction',
    unit: '',
    decimals: 2,
    formula: '(PaCO2 - PetCO2) / PaCO2',
    inputs: [input('PaCO2', pco2, P), input('PetCO2', etco2, P)],
    source: 'enghoff',
  });
  return record(book, 'deadSpaceMl', physiologicalDeadSpace(vt, anatomic, pco2, etco2), {
    label: 'Dead space (physiological, from end-tidal CO2)',
    unit: 'mL',
    decimals: 0,
    formula: 'VD = VDanatomic + (VT - VDanatomic) x (PaCO2 - PetCO2) / PaCO2',
    inputs: [
      input('VT', vt, 'mL'),
      input('VD anatomic (2.2 mL/kg PBW + apparatus)', round(anatomic, 0), 'mL'),
      input('PaCO2', pco2, P),
      input('PetCO2', etco2, P),
    ],
    source: 'enghoff',
  });
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
  const out: Ventilation = {
    ventilated: true,
    deadSpaceSource: null,
    targetSource: null,
    targetForm: null,
    targetBasis: null,
    requestedTarget: null,
    recheckMinutes: { ...VENTILATION.recheckMinutes },
    compensationTarget: null,
    usualPco2: null,
    obstruction: null,
    rrRoute: null,
    vtRoute: null,
    best: null,
    ardsnetStep: null,
    beyondVentilator: null,
  };
  const fit = mechanics(c, v, book, flags);
  const vd = ventilationVolumes(c, v, fit.pbw, book, flags, out);
  out.obstruction = obstructionOf(c, v);
  const requested = targetOf(c, v, book, flags, out);
  const target = targetInUse(c, requested, cl, ref, book, flags, out);
  if (target === null) {
    if (out.targetSource === null) flags.push(flag('no_ventilation_target', 'info', {}));
    return { ventilation: out, deadSpace: vd };
  }
  if (c.sample !== 'arterial')
    flags.push(flag('suggestion_from_venous_pco2', 'warning', { sample: c.sample }));
  routesPart(c, v, { target, vd, ...fit }, book, flags, out);
  return { ventilation: out, deadSpace: vd };
}

/** Obstructive disease (clinical-scope section 10): known asthma or COPD, or a high PaCO2 with a high plateau. */
function obstructionOf(c: CanonicalCase, v: Vent): Ventilation['obstruction'] {
  const known = c.context.conditions;
  if (known.includes('asthma')) return 'asthma';
  if (known.includes('copd')) return 'copd';
  if (has(v.pplat) && v.pplat > VENTILATION.plateauMax && c.gas.pco2 > NORMAL.pco2.high)
    return 'pressures';
  return null;
}
