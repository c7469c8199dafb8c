// The ways to a target PaCO2 on the ventilator and whether each keeps within lung-protective limits: RR at unchanged
// VT (up to 35/min, with the expiratory time it leaves), VT at unchanged RR (VT per kg PBW, and the plateau and driving
// pressure the compliance predicts), and, when neither does, the best setting within the limits with the PaCO2 and pH
// it should give, the ARDS Network pH steps and the levers beyond the ventilator (clinical-scope sections 8 and 10).
import type { CanonicalCase } from './canonical.ts';
import { ARDSNET_PH, BICARBONATE_PH_AT_OR_BELOW, PHYSIOLOGY, VENTILATION } from './reference.ts';
import { rrForTarget, vtForTarget } from './ventilation.ts';
import {
  expiratoryTime,
  largestSafeVt,
  phAfterAcuteChange,
  predictedPlateau,
} from './mechanics.ts';
import { flag, type Flag } from './flags.ts';
import { input, record, round } from './explain.ts';
import {
  type BestSetting,
  type Book,
  type N,
  type Route,
  type Ventilation,
  has,
} from './findings.ts';

const P = 'mmHg';
type Vent = NonNullable<CanonicalCase['ventilator']>;

export interface RouteInputs {
  target: number;
  vd: N;
  pbw: N;
  vtPerKgPbw: N;
  crs: N;
}

/** RR at unchanged VT: at most 35/min, and with an inspiratory time, an expiratory time left. */
function rateRoute(
  c: CanonicalCase,
  v: Vent & { rr: number },
  x: RouteInputs,
  book: Book,
  flags: Flag[],
) {
  const pco2 = c.gas.pco2;
  const rr = record(book, 'suggestedRr', Math.round(rrForTarget(v.rr, pco2, x.target)), {
    label: 'RR at unchanged VT',
    unit: '/min',
    decimals: 0,
    formula: 'RR_new = RR x PaCO2 now / PaCO2 target',
    inputs: [
      input('RR', v.rr, '/min'),
      input('PaCO2 now', pco2, P),
      input('PaCO2 target', x.target, P),
    ],
    source: 'west',
  });
  const route: Route = { value: rr, offered: false, limits: [], unchecked: [] };
  if (rr > VENTILATION.rrMax) {
    route.limits.push('rr_above_35');
    flags.push(flag('rr_above_35', 'warning', { which: 'suggested', rr }));
  }
  let te: N = null;
  if (has(v.inspiratoryTime) && rr >= 1) {
    te = record(book, 'suggestedExpiratoryTime', expiratoryTime(rr, v.inspiratoryTime), {
      label: 'Expiratory time at the suggested RR',
      unit: 's',
      decimals: 1,
      formula: 'Te = 60 / RR_new - Ti',
      inputs: [input('RR_new', rr, '/min'), input('Ti', v.inspiratoryTime, 's')],
      source: 'expiratoryTime',
    });
    if (te <= 0) route.limits.push('no_expiratory_time');
  }
  route.offered = route.limits.length === 0 && rr >= 1;
  return { route, te };
}

/** VT at unchanged RR: within 4-8 mL/kg PBW, and the predicted plateau and driving pressure within 30 and 15. */
function volumeRoute(
  c: CanonicalCase,
  v: Vent & { vt: number },
  x: RouteInputs & { vd: number },
  book: Book,
  flags: Flag[],
): Route {
  const pco2 = c.gas.pco2;
  const V = VENTILATION;
  const vt = record(
    book,
    'suggestedVt',
    Math.round(vtForTarget(v.vt, x.vd, pco2, x.target) / 10) * 10,
    {
      label: 'VT at unchanged RR',
      unit: 'mL',
      decimals: 0,
      formula: 'VT_new = VD + (VT - VD) x PaCO2 now / PaCO2 target',
      inputs: [
        input('VT', v.vt, 'mL'),
        input('VD', round(x.vd, 0), 'mL'),
        input('PaCO2 now', pco2, P),
        input('PaCO2 target', x.target, P),
      ],
      source: 'west',
    },
  );
  const route: Route = { value: vt, offered: false, limits: [], unchecked: [] };
  if (x.pbw !== null) {
    const perKg = record(book, 'suggestedVtPerKgPbw', vt / x.pbw, {
      label: 'Suggested VT per kg PBW',
      unit: 'mL/kg',
      decimals: 1,
      formula: 'VT_new / PBW',
      inputs: [input('VT_new', vt, 'mL'), input('PBW', round(x.pbw, 1), 'kg')],
      source: 'ardsnet2000',
    });
    if (perKg > V.vtHighPerKg) {
      route.limits.push('vt_above_8_ml_per_kg');
      flags.push(
        flag('vt_above_8_ml_per_kg', 'warning', {
          which: 'suggested',
          vt,
          vtPerKg: round(perKg, 1),
        }),
      );
    }
    if (perKg < V.vtLowPerKg) route.limits.push('vt_below_4_ml_per_kg');
  } else route.unchecked.push('per_kg');
  const peep = c.oxygen.peep;
  if (x.crs !== null && has(peep)) {
    const plateau = record(book, 'predictedPlateau', predictedPlateau(vt, x.crs, peep), {
      label: 'Predicted plateau at the suggested VT',
      unit: 'cmH2O',
      decimals: 0,
      formula: 'Pplat = PEEP + VT_new / Crs',
      inputs: [
        input('PEEP', peep, 'cmH2O'),
        input('VT_new', vt, 'mL'),
        input('Crs', round(x.crs, 1), 'mL/cmH2O'),
      ],
      source: 'mechanics',
    });
    const driving = record(book, 'predictedDrivingPressure', plateau - peep, {
      label: 'Predicted driving pressure at the suggested VT',
      unit: 'cmH2O',
      decimals: 0,
      formula: 'VT_new / Crs',
      inputs: [input('VT_new', vt, 'mL'), input('Crs', round(x.crs, 1), 'mL/cmH2O')],
      source: 'mechanics',
    });
    if (plateau > V.plateauMax) route.limits.push('plateau_above_30');
    if (driving > V.drivingPressureMax) route.limits.push('driving_pressure_above_15');
    if (plateau > V.plateauMax || driving > V.drivingPressureMax)
      flags.push(
        flag('suggested_vt_pressure_limits', 'warning', {
          vt,
          predictedPlateau: round(plateau, 0),
          predictedDrivingPressure: round(driving, 0),
          plateauOver: plateau > V.plateauMax,
          drivingOver: driving > V.drivingPressureMax,
        }),
      );
  } else route.unchecked.push('plateau');
  route.offered = route.limits.length === 0;
  return route;
}

/**
 * The best setting within the limits: the largest safe VT (8 mL/kg PBW, plateau 30, driving pressure 15; the
 * current VT when PBW is unknown) and the rate that VT needs for the target, at most 35/min (and below 60/Ti).
 */
function bestSetting(
  c: CanonicalCase,
  v: Vent & { rr: number; vt: number },
  x: RouteInputs & { vd: number },
  book: Book,
): BestSetting | null {
  const g = c.gas;
  const safe = x.pbw !== null ? largestSafeVt(x.pbw, x.crs, c.oxygen.peep) : null;
  const vt = safe ? Math.floor(safe.vt / 10) * 10 : v.vt;
  if (vt - x.vd <= 0) return null;
  const vaNow = v.rr * (v.vt - x.vd);
  const needed = Math.ceil(((vaNow / (vt - x.vd)) * g.pco2) / x.target);
  let rrMax: number = VENTILATION.rrMax;
  if (has(v.inspiratoryTime)) rrMax = Math.min(rrMax, Math.ceil(60 / v.inspiratoryTime) - 1);
  const rr = Math.max(1, Math.min(needed, rrMax));
  const pco2 = (g.pco2 * vaNow) / (rr * (vt - x.vd));
  // no better than now: nothing to suggest
  if (pco2 >= g.pco2 - 0.5) return null;
  const ph = phAfterAcuteChange(g.hco3, g.pco2, pco2, PHYSIOLOGY.acuteBufferPerMmHg);
  const how = { source: 'west' as const, decimals: 0 };
  record(book, 'bestVt', vt, {
    ...how,
    label: 'Best VT within limits',
    unit: 'mL',
    formula: safe
      ? 'largest VT with VT <= 8 mL/kg PBW, Pplat <= 30, driving pressure <= 15'
      : 'VT unchanged (PBW unknown)',
    inputs: [input('VT now', v.vt, 'mL')],
    source: safe ? 'mechanics' : 'west',
  });
  record(book, 'bestRr', rr, {
    ...how,
    label: 'Best RR within limits',
    unit: '/min',
    formula: 'RR needed at the best VT, at most 35/min',
    inputs: [input('RR needed', needed, '/min')],
  });
  record(book, 'bestPco2', pco2, {
    ...how,
    decimals: 1,
    label: 'PaCO2 expected at the best setting',
    unit: P,
    formula: 'PaCO2 x VA now / VA best, VA = RR x (VT - VD)',
    inputs: [
      input('PaCO2 now', g.pco2, P),
      input('VD', round(x.vd, 0), 'mL'),
      input('RR', rr, '/min'),
      input('VT', vt, 'mL'),
    ],
  });
  if (ph !== null)
    record(book, 'bestPh', ph, {
      decimals: 2,
      label: 'pH expected at the best setting',
      unit: '',
      formula: 'pH = 9 - log10(24 x PaCO2 / (HCO3 + 0.1 x change in PaCO2))',
      inputs: [input('HCO3', g.hco3, 'mmol/L'), input('PaCO2 expected', pco2, P)],
      source: 'targetPco2',
    });
  return { rr, vt, pco2, ph, reachesTarget: needed <= rrMax, vtLimitedBy: safe?.limitedBy ?? null };
}

export function routesPart(
  c: CanonicalCase,
  v: Vent,
  x: RouteInputs,
  book: Book,
  flags: Flag[],
  out: Ventilation,
) {
  if (!has(v.rr) || !has(v.vt)) return;
  const vent = v as Vent & { rr: number; vt: number };
  const g = c.gas;
  const rate = rateRoute(c, vent, x, book, flags);
  out.rrRoute = rate.route;
  if (out.obstruction && rate.route.value > vent.rr)
    flags.push(
      flag('air_trapping_risk', 'warning', {
        obstruction: out.obstruction,
        rr: vent.rr,
        suggestedRr: rate.route.value,
        expiratoryTime: book.derived.expiratoryTime,
        suggestedExpiratoryTime: rate.te === null ? null : round(rate.te, 1),
      }),
    );
  const vd = x.vd;
  if (vd !== null && vent.vt - vd > 0)
    out.vtRoute = volumeRoute(c, vent, { ...x, vd }, book, flags);
  const reached = rate.route.offered || out.vtRoute?.offered === true;
  if (reached || x.target >= g.pco2 || vd === null || vent.vt - vd <= 0) return;
  out.best = bestSetting(c, vent, { ...x, vd }, book);
  if (out.best?.reachesTarget) return;
  const metabolicAcidosis = out.compensationTarget !== null;
  const phThen = out.best?.ph ?? g.ph;
  if (metabolicAcidosis) {
    // the ventilator cannot give the compensation within limits: the other levers (BICAR-ICU 2018)
    out.beyondVentilator = { bicarbonate: g.ph <= BICARBONATE_PH_AT_OR_BELOW };
    flags.push(
      flag('compensation_beyond_ventilator', 'warning', {
        ph: g.ph,
        bestPco2: out.best ? round(out.best.pco2, 1) : null,
        bestPh: out.best?.ph == null ? null : round(out.best.ph, 2),
        bicarbonate: out.beyondVentilator.bicarbonate,
      }),
    );
    return;
  }
  const lungProtective = x.vtPerKgPbw !== null && x.vtPerKgPbw <= VENTILATION.vtHighPerKg;
  if (!lungProtective) return;
  // ARDS Network protocol: pH goal 7.30-7.45; below 7.30 raise RR up to 35; below 7.15 bicarbonate may be considered
  out.ardsnetStep =
    g.ph >= ARDSNET_PH.goalLow
      ? 'goal'
      : phThen < ARDSNET_PH.bicarbonateBelow
        ? 'bicarbonate'
        : 'raise_rr';
  if (out.ardsnetStep === 'goal')
    flags.push(
      flag('permissive_hypercapnia_possible', 'info', {
        pco2: round(g.pco2, 1),
        target: round(x.target, 1),
        ph: g.ph,
      }),
    );
  else
    flags.push(
      flag('ph_below_ardsnet_goal', 'warning', {
        ph: g.ph,
        bestRr: out.best?.rr ?? null,
        bestPh: out.best?.ph == null ? null : round(out.best.ph, 2),
        bicarbonate: out.ardsnetStep === 'bicarbonate',
      }),
    );
}
