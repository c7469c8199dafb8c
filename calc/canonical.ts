// The edge: a validated case in the clinician's units becomes a case in canonical units, once.
import { fio2Fraction, toCanonical, type Units } from './units.ts';
import { resolveUnits, type ParsedCase } from './schema.ts';
import { mergeSettings, type Settings } from './reference.ts';
import {
  hendersonBicarbonate,
  hendersonPco2,
  hydrogenIon,
  phFromHydrogenIon,
  hendersonHydrogenIon,
} from './acidBase.ts';
import type { Timing } from './compensation.ts';
import type { Sex } from './ventilation.ts';

type N = number | null;
const v = (x: number | null | undefined): N => (x === undefined || x === null ? null : x);

export interface Gas {
  ph: number;
  pco2: number;
  hco3: number;
  po2: N;
  baseExcess: N;
  sao2: N;
  lactate: N;
  hb: N;
  /** the one of pH, PaCO2, HCO3 that was worked out with the Henderson equation, if any */
  computed: 'ph' | 'pco2' | 'hco3' | null;
  /** all three of pH, PaCO2 and HCO3 were entered */
  complete: boolean;
}

export interface CanonicalCase {
  sample: 'arterial' | 'venous' | 'capillary';
  units: Units;
  gas: Gas;
  chemistry: {
    na: N;
    k: N;
    cl: N;
    albumin: N;
    glucose: N;
    urea: N;
    creatinine: N;
    osmolality: N;
    ethanol: N;
    ionisedCalcium: N;
    magnesium: N;
    phosphate: N;
  };
  urine: { na: N; k: N; cl: N };
  patient: { ageYears: N; sex: Sex | null; heightCm: N; pregnant: boolean };
  context: {
    timing: Timing;
    baseline: { pco2: N; hco3: N; ph: N } | null;
    barometricPressure: N;
    altitudeM: N;
    temperatureC: N;
  };
  oxygen: { fio2: N; peep: N; spo2: N };
  ventilator: {
    vt: N;
    rr: N;
    pplat: N;
    deadSpaceMl: N;
    deadSpaceFraction: N;
    targetPh: N;
    targetPco2: N;
  } | null;
  settings: Settings;
  previous: {
    takenAt: string | null;
    label: string | null;
    gas: Gas;
    fio2: N;
    peep: N;
    vt: N;
    rr: N;
  }[];
}

/** Fill the third of pH, PaCO2, HCO3 from the other two (the schema guarantees at least two). */
export function completeGas(g: ParsedCase['gas'], units: Units): Gas {
  const pco2In =
    g.pco2 === null || g.pco2 === undefined ? null : toCanonical('pressure', g.pco2, units);
  const phIn = v(g.ph),
    hco3In = v(g.hco3);
  let ph = phIn,
    pco2 = pco2In,
    hco3 = hco3In;
  let computed: Gas['computed'] = null;
  if (hco3 === null && ph !== null && pco2 !== null) {
    hco3 = hendersonBicarbonate(hydrogenIon(ph), pco2);
    computed = 'hco3';
  } else if (pco2 === null && ph !== null && hco3 !== null) {
    pco2 = hendersonPco2(hydrogenIon(ph), hco3);
    computed = 'pco2';
  } else if (ph === null && pco2 !== null && hco3 !== null) {
    ph = phFromHydrogenIon(hendersonHydrogenIon(pco2, hco3));
    computed = 'ph';
  }
  return {
    ph: ph as number,
    pco2: pco2 as number,
    hco3: hco3 as number,
    po2: g.po2 === null || g.po2 === undefined ? null : toCanonical('pressure', g.po2, units),
    baseExcess: v(g.baseExcess),
    sao2: v(g.sao2),
    lactate: v(g.lactate),
    hb: g.hb === null || g.hb === undefined ? null : toCanonical('hb', g.hb, units),
    computed,
    complete: computed === null,
  };
}

export function canonicalize(c: ParsedCase): CanonicalCase {
  const units = resolveUnits(c.units);
  const conv = (kind: Parameters<typeof toCanonical>[0], x: number | null | undefined): N =>
    x === null || x === undefined ? null : toCanonical(kind, x, units);
  const ch = c.chemistry ?? {};
  const ctx = c.context ?? {};
  const b = ctx.baseline;
  const hasBaseline = !!b && [b.pco2, b.hco3, b.ph].some((x) => x !== null && x !== undefined);
  const vent = c.ventilator;
  return {
    sample: c.sample ?? 'arterial',
    units,
    gas: completeGas(c.gas, units),
    chemistry: {
      na: v(ch.na),
      k: v(ch.k),
      cl: v(ch.cl),
      albumin: conv('albumin', ch.albumin),
      glucose: conv('glucose', ch.glucose),
      urea: conv('urea', ch.urea),
      creatinine: conv('creatinine', ch.creatinine),
      osmolality: v(ch.osmolality),
      ethanol: conv('ethanol', ch.ethanol),
      ionisedCalcium: v(ch.ionisedCalcium),
      magnesium: v(ch.magnesium),
      phosphate: v(ch.phosphate),
    },
    urine: { na: v(c.urine?.na), k: v(c.urine?.k), cl: v(c.urine?.cl) },
    patient: {
      ageYears: v(c.patient?.ageYears),
      sex: c.patient?.sex ?? null,
      heightCm: v(c.patient?.heightCm),
      pregnant: c.patient?.pregnant === true,
    },
    context: {
      timing: ctx.timing ?? 'unknown',
      baseline:
        hasBaseline && b ? { pco2: conv('pressure', b.pco2), hco3: v(b.hco3), ph: v(b.ph) } : null,
      barometricPressure: conv('pressure', ctx.barometricPressure),
      altitudeM: v(ctx.altitudeM),
      temperatureC: v(ctx.temperatureC),
    },
    oxygen: {
      fio2:
        c.oxygen?.fio2 === null || c.oxygen?.fio2 === undefined
          ? null
          : fio2Fraction(c.oxygen.fio2),
      peep: v(c.oxygen?.peep),
      spo2: v(c.oxygen?.spo2),
    },
    ventilator: vent
      ? {
          vt: v(vent.vt),
          rr: v(vent.rr),
          pplat: v(vent.pplat),
          deadSpaceMl: v(vent.deadSpaceMl),
          deadSpaceFraction: v(vent.deadSpaceFraction),
          targetPh: v(vent.targetPh),
          targetPco2: conv('pressure', vent.targetPco2),
        }
      : null,
    settings: mergeSettings(
      c.settings
        ? {
            anionGapNormal: c.settings.anionGapNormal ?? undefined,
            anionGapHalfWidth: c.settings.anionGapHalfWidth ?? undefined,
            anionGapIncludesK: c.settings.anionGapIncludesK ?? undefined,
          }
        : null,
    ),
    previous: (c.previous ?? []).map((p) => ({
      takenAt: p.takenAt ?? null,
      label: p.label ?? null,
      gas: completeGas(p.gas, units),
      fio2:
        p.oxygen?.fio2 === null || p.oxygen?.fio2 === undefined
          ? null
          : fio2Fraction(p.oxygen.fio2),
      peep: v(p.oxygen?.peep),
      vt: v(p.ventilator?.vt),
      rr: v(p.ventilator?.rr),
    })),
  };
}
