// The oxygenation part of the note's view model, and what a venous or capillary sample can show.
import { reference as R } from '../calc/index.ts';
import { type Ctx, has } from './viewShared.ts';

// Peripheral venous against arterial (Byrne AL et al., Respirology 2014;19:168-75; figures from memory, as in
// clinical-scope section 7): pH about 0.03 lower, HCO3 about 1 mmol/L higher, PCO2 about 4-6 mmHg higher with
// limits of agreement near +/- 20 mmHg; a venous PCO2 below 45 mmHg makes arterial hypercapnia unlikely.
// The figures are the core's own (calc/reference.ts VENOUS).
export const VENOUS_AGREEMENT = R.VENOUS;

export function venousView({ f, fmt, withheld }: Ctx) {
  const g = f.case.gas;
  const vn = f.venous;
  const venous =
    vn && !withheld
      ? {
          venous: vn.sample === 'venous',
          capillary: vn.sample === 'capillary',
          pco2: fmt.pressure(g.pco2),
          hypercapniaUnlikely: vn.hypercapniaUnlikely,
          estimate: vn.arterialEstimate
            ? {
                ph: fmt.ph(vn.arterialEstimate.ph),
                pco2: fmt.pressureBand({
                  low: vn.arterialEstimate.pco2Low,
                  high: vn.arterialEstimate.pco2High,
                }),
                hco3: fmt.mmol(vn.arterialEstimate.hco3),
              }
            : null,
          agreement: {
            ph: fmt.fixed(VENOUS_AGREEMENT.ph, 2),
            hco3: fmt.withUnit(VENOUS_AGREEMENT.hco3, 1, 'mmol/L'),
            pco2: fmt.pressureBand({
              low: VENOUS_AGREEMENT.pco2Low,
              high: VENOUS_AGREEMENT.pco2High,
            }),
            limits: fmt.pressure(VENOUS_AGREEMENT.pco2Limits),
            hypercapniaBelow: fmt.pressure(VENOUS_AGREEMENT.hypercapniaBelow),
          },
        }
      : null;

  return venous;
}

export function oxygenationView({ f, fmt, withheld }: Ctx) {
  const c = f.case;
  const g = c.gas;
  const d = f.derived;
  const o = f.oxygenation;
  const arterial = c.sample === 'arterial';
  const ox = c.oxygen;
  const oxygenation = {
    assessable: o.assessable && !withheld,
    po2: arterial && !withheld ? fmt.pressure(g.po2) : null,
    fio2: fmt.fio2(ox.fio2),
    peep: fmt.withUnit(ox.peep, 0, 'cmH2O'),
    level: o.level,
    failureType: o.failureType,
    pb: fmt.pressure(d.barometricPressure),
    pbSource: o.barometricSource,
    altitude: fmt.withUnit(c.context.altitudeM, 0, 'm'),
    alveolar: fmt.pressure(d.alveolarPo2),
    aa: fmt.pressure(d.aaGradient),
    aaExpected: fmt.pressure(d.aaGradientExpected),
    roomAir: has(ox.fio2) && Math.abs(ox.fio2 - R.OXYGENATION.roomAirFio2) < 0.005,
    aaRaised: o.aaRaised,
    lowInspired: o.lowInspiredOrHypoventilation,
    aaImpossible: f.flags.some((x) => x.code === 'po2_above_alveolar'),
    pf: fmt.pfRatio(d.pfRatio),
    // below sea-level pressure: the ratio the Berlin bands are judged on (clinical-scope section 10)
    pfAdjusted: fmt.pfRatio(d.pfRatioAdjusted),
    pfBand: o.pfBand,
    pfBandApplies: o.pfBandApplies,
    pfLimits: {
      mild: fmt.pfRatio(R.OXYGENATION.pfMild),
      moderate: fmt.pfRatio(R.OXYGENATION.pfModerate),
      severe: fmt.pfRatio(R.OXYGENATION.pfSevere),
      peep: fmt.withUnit(R.OXYGENATION.pfMinimumPeep, 0, 'cmH2O'),
    },
    spo2: fmt.withUnit(ox.spo2, 0, '%'),
    sf: fmt.plain(d.sfRatio, 0),
    sfMeets: o.sfMeetsCriterion,
    sfLimit: fmt.plain(R.OXYGENATION.sfThreshold, 0),
    sfSpo2Max: fmt.withUnit(R.OXYGENATION.sfMaxSpo2, 0, '%'),
    sao2: fmt.withUnit(g.sao2, 0, '%'),
    hb: fmt.field('gas.hb', g.hb),
    content: fmt.withUnit(d.oxygenContent, 1, 'mL/dL'),
    // the SpO2 target band (BTS 2017) and the saturation judged against it
    target: o.target ? fmt.range(o.target.low, o.target.high, 0, '%') : null,
    targetBasis: o.target?.basis ?? null,
    saturation: o.saturation ? fmt.withUnit(o.saturation.value, 0, '%') : null,
    saturationFromSao2: o.saturation?.source === 'sao2',
    aboveTarget: o.aboveTarget,
    saturationPlace:
      o.saturation && o.target
        ? o.saturation.value > o.target.high
          ? ('above' as const)
          : o.saturation.value < o.target.low
            ? ('below' as const)
            : ('within' as const)
        : null,
    belowTarget: o.belowTarget,
    onOxygen: has(ox.fio2) && ox.fio2 > R.OXYGENATION.roomAirFio2 + 0.005,
    severeHypoxaemia: o.severeHypoxaemia,
    ardsCriterionMet: o.ardsCriterionMet,
    gasExchangeImpaired: o.gasExchangeImpaired,
    pfMild: fmt.pfRatio(R.OXYGENATION.pfMild),
    cohb: fmt.withUnit(g.cohb, 1, '%'),
    methb: fmt.withUnit(g.methb, 1, '%'),
    cohbRaised: f.flags.some((x) => x.code === 'cohb_raised'),
    methbRaised: f.flags.some((x) => x.code === 'methb_raised'),
    hypoxaemiaBelow: fmt.pressure(R.OXYGENATION.hypoxaemia),
    failureBelow: fmt.pressure(R.OXYGENATION.respiratoryFailure),
  };

  return oxygenation;
}
