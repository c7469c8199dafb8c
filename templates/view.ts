// The view model: Findings turned into display-ready strings and plain switches for the .njk files.
// All choosing of numbers and units happens here; all wording and order live in the templates.
import { fieldsOf, keyOf, reference as R, units as U } from '../calc/index.ts';
import type { Disorder, FieldPath, Findings, Flag } from '../calc/index.ts';
import { formatter, type Formatter, type Text } from './format.ts';
import { co2Label, flagView, limits, o2Label, type FlagView } from './flagView.ts';

export type NoteFormat = 'text' | 'markdown';

// Peripheral venous against arterial (Byrne AL et al., Respirology 2014;19:168-75; figures from memory, as in
// clinical-scope section 7): pH about 0.03 lower, HCO3 about 1 mmol/L higher, PCO2 about 4-6 mmHg higher with
// limits of agreement near +/- 20 mmHg; a venous PCO2 below 45 mmHg makes arterial hypercapnia unlikely.
// The figures are the core's own (calc/reference.ts VENOUS).
export const VENOUS_AGREEMENT = R.VENOUS;

type Sample = Findings['case']['sample'];
type N = number | null | undefined;
const has = (x: N): x is number => typeof x === 'number' && Number.isFinite(x);

export interface DisorderView {
  code: Disorder['code'];
  detail: Disorder['detail'];
  role: Disorder['role'];
  basis: Disorder['basis'];
}

export interface NoteView {
  md: boolean;
  withheld: boolean;
  sample: Sample;
  arterial: boolean;
  kpa: boolean;
  bun: boolean;
  label: { co2: string; o2: string };
  unit: { pressure: string; step10: Text; buffer: Text; deadSpacePerKg: Text };
  gas: {
    ph: Text;
    phStatus: Findings['phStatus'];
    hPlus: Text;
    pco2: Text;
    hco3: Text;
    po2: Text;
    computed: 'ph' | 'pco2' | 'hco3' | null;
    lactate: Text;
    lactateBand: 'normal' | 'raised' | 'high' | null;
    baseExcess: Text;
    sbe: Text;
    sao2: Text;
    hb: Text;
  };
  withheldInfo: { entered: Text; unit: string; other: string } | null;
  primary: DisorderView | null;
  added: DisorderView[];
  disorders: DisorderView[];
  compensation: {
    rule: string;
    timing: string;
    verdict: string;
    fit: string | null;
    metabolic: boolean;
    expected: Text;
    observed: Text;
    acute: Text;
    chronic: Text;
    otherTimingFits: 'acute' | 'chronic' | null;
    /** a venous PCO2 judged by its arterial estimate: the measured value and the estimated arterial span */
    venous: { measured: Text; arterial: Text; span: Text } | null;
  } | null;
  reference: {
    kind: string;
    pco2: Text;
    hco3: Text;
    pco2Band: Text;
    hco3Band: Text;
    pco2Estimated: boolean;
    hco3Estimated: boolean;
    usualPhIgnored: boolean;
  };
  consistency: { reported: Text; calculated: Text } | null;
  anionGap: {
    value: Text;
    corrected: Text;
    usedCorrected: boolean;
    albumin: Text;
    includesK: boolean;
    upper: Text;
    raised: boolean;
    used: Text;
  } | null;
  deltaRatio: {
    value: Text;
    band: string;
    usesCorrected: boolean;
    limits: { normal: Text; mixed: Text; high: Text };
  } | null;
  osmolarGap: {
    value: Text;
    measured: Text;
    calculated: Text;
    raised: boolean;
    limit: Text;
  } | null;
  calculatedOsmolality: Text;
  partition: { sodiumChloride: Text; albumin: Text; unmeasured: Text } | null;
  strongIonGap: Text;
  urine: {
    anionGap: Text;
    anionGapNegative: boolean | null;
    chloride: Text;
    chlorideResponsive: boolean | null;
    chlorideLimit: Text;
  };
  /** each chemistry value by key, and `list`: the given ones in table order with their labels */
  chemistry: { values: Record<string, Text>; list: { label: string; text: string }[] };
  lactateLimits: { raised: Text; high: Text };
  oxygenation: {
    assessable: boolean;
    po2: Text;
    fio2: Text;
    peep: Text;
    level: string | null;
    failureType: number | null;
    pb: Text;
    pbSource: string;
    altitude: Text;
    alveolar: Text;
    aa: Text;
    aaExpected: Text;
    roomAir: boolean;
    aaRaised: boolean | null;
    lowInspired: boolean;
    aaImpossible: boolean;
    pf: Text;
    pfBand: string | null;
    pfBandApplies: boolean;
    pfLimits: { mild: Text; moderate: Text; severe: Text; peep: Text };
    spo2: Text;
    sf: Text;
    sfMeets: boolean | null;
    sfLimit: Text;
    sfSpo2Max: Text;
    sao2: Text;
    hb: Text;
    content: Text;
    hypoxaemiaBelow: Text;
    failureBelow: Text;
  };
  venous: {
    venous: boolean;
    capillary: boolean;
    pco2: Text;
    hypercapniaUnlikely: boolean;
    estimate: { ph: Text; pco2: Text; hco3: Text } | null;
    agreement: { ph: Text; hco3: Text; pco2: Text; limits: Text; hypercapniaBelow: Text };
  } | null;
  ventilation: {
    vt: Text;
    rr: Text;
    pplat: Text;
    peep: Text;
    sex: string | null;
    height: Text;
    pbw: Text;
    vtPerKg: Text;
    drivingPressure: Text;
    deadSpace: Text;
    deadSpaceSource: string | null;
    deadSpaceFraction: Text;
    apparatus: Text;
    ve: Text;
    va: Text;
    vco2: Text;
    ventilatoryRatio: Text;
    target: {
      pco2: Text;
      simple: Text;
      form: string | null;
      source: string | null;
      ph: Text;
    } | null;
    targetRequested: boolean;
    suggestedRr: Text;
    suggestedVt: Text;
    suggestedVtPerKg: Text;
    direction: 'lower' | 'raise' | 'same' | null;
    compensationTarget: Text;
    usual: Text;
  } | null;
  limits: ReturnType<typeof limits>;
  recheck: Text;
  plan: {
    ventilator: boolean;
    needAnionGap: boolean;
    raisedGap: boolean;
    raisedGapTests: string[];
    toxicAlcohols: 'raised' | 'conditional' | null;
    normalGap: boolean;
    urineAnionGap: boolean;
    alkalosis: boolean;
    urineChloride: boolean;
    potassium: boolean;
    lactate: boolean;
    hypoventilation: boolean;
    oxygen: boolean;
    arterialGas: boolean;
    verify: boolean;
    /** which way of reaching the target stays inside lung-protective limits */
    route: {
      rr: boolean;
      vt: boolean;
      vtReason: 'per_kg' | 'pressure' | null;
      vtUnchecked: boolean;
    };
    /** the requested ventilation target is below what this patient needs */
    targetConcern: 'above_compensation' | 'below_baseline' | null;
  };
  critical: FlagView[];
  flags: FlagView[];
  checks: { interpretation: FlagView[]; oxygenation: FlagView[]; ventilation: FlagView[] };
  trend: { when: Text; items: { label: string; from: Text; to: Text }[] } | null;
  patient: { age: Text; pregnant: boolean; under16: boolean };
}

function disorderView(d: Disorder): DisorderView {
  return { code: d.code, detail: d.detail, role: d.role, basis: d.basis };
}

/** Free text from the request (labels, times): one line, and inert in Markdown. */
function freeText(value: string | null, md: boolean): Text {
  if (!value) return null;
  const line = value
    .replace(/[\u0000-\u001f\u007f]+/g, ' ')
    .replace(/\s+/g, ' ')
    .trim();
  if (!line) return null;
  return md ? line.replace(/([\\`*_[\]<>#|~])/g, '\\$1') : line;
}

function gasText(
  fmt: Formatter,
  field: 'ph' | 'pco2' | 'hco3' | 'po2' | 'lactate',
  value: N,
): Text {
  if (!has(value)) return null;
  if (field === 'ph') return fmt.ph(value);
  if (field === 'pco2' || field === 'po2') return fmt.pressure(value);
  return fmt.mmol(value);
}

/** The same value without its unit, for "61 to 48 mmHg". */
function gasNumber(
  fmt: Formatter,
  field: 'ph' | 'pco2' | 'hco3' | 'po2' | 'lactate',
  value: N,
): Text {
  if (!has(value)) return null;
  if (field === 'ph') return fmt.ph(value);
  if (field === 'pco2' || field === 'po2') return fmt.pressureNumber(value);
  return fmt.plain(value, 1);
}

export function buildView(f: Findings, format: NoteFormat): NoteView {
  const md = format === 'markdown';
  const fmt = formatter(f.units);
  const c = f.case,
    g = c.gas,
    d = f.derived,
    m = f.metabolic,
    o = f.oxygenation,
    ch = c.chemistry;
  const arterial = c.sample === 'arterial';
  const flags = f.flags.map((fl: Flag) => flagView(fl, f, fmt));
  const visible = (section: FlagView['section']) =>
    flags.filter((x) => x.section === section && !x.inText);
  const hasDisorder = (code: Disorder['code'], detail?: Disorder['detail']) =>
    f.disorders.some((x) => x.code === code && (detail === undefined || x.detail === detail));
  const metabolicAcidosis = hasDisorder('metabolic_acidosis');
  const withheld = f.withheld;
  // in a withheld case, a value worked out from the doubtful pressure is not shown
  const safe = (field: 'ph' | 'pco2' | 'hco3') =>
    !withheld || (g.computed !== field && field !== 'pco2');

  const comp = f.compensation;
  const compensation =
    comp && !withheld
      ? {
          rule: comp.rule,
          timing: comp.timing,
          verdict: comp.verdict,
          fit: comp.fit,
          metabolic: comp.rule === 'winters' || comp.rule === 'metabolic_alkalosis',
          expected:
            comp.rule === 'winters' || comp.rule === 'metabolic_alkalosis'
              ? fmt.pressureBand(comp.expected)
              : fmt.mmolBand(comp.expected),
          observed:
            comp.rule === 'winters' || comp.rule === 'metabolic_alkalosis'
              ? fmt.pressure(comp.observed)
              : fmt.mmol(comp.observed),
          acute: fmt.mmolBand(comp.acute),
          chronic: fmt.mmolBand(comp.chronic),
          venous:
            comp.pco2Basis === 'venous_estimate'
              ? {
                  measured: fmt.pressure(g.pco2),
                  arterial: fmt.pressureBand({
                    low: g.pco2 - R.VENOUS.pco2High,
                    high: g.pco2 - R.VENOUS.pco2Low,
                  }),
                  span: fmt.pressureBand({ low: g.pco2 - R.VENOUS.pco2High, high: g.pco2 }),
                }
              : null,
          otherTimingFits:
            comp.verdict === 'within'
              ? null
              : comp.timing === 'acute' && (comp.fit === 'chronic' || comp.fit === 'either')
                ? ('chronic' as const)
                : comp.timing === 'chronic' && (comp.fit === 'acute' || comp.fit === 'either')
                  ? ('acute' as const)
                  : null,
        }
      : null;

  const ref = f.reference;
  const anionGap = has(d.anionGap)
    ? {
        value: fmt.mmol(d.anionGap),
        corrected: fmt.mmol(d.anionGapCorrected),
        usedCorrected: m.anionGapUsed === 'corrected',
        albumin: fmt.field('chemistry.albumin', ch.albumin),
        includesK: m.anionGapIncludesK,
        upper: fmt.mmol(m.anionGapUpperLimit),
        raised: m.anionGapRaised === true,
        used: fmt.mmol(m.anionGapUsed === 'corrected' ? d.anionGapCorrected : d.anionGap),
      }
    : null;
  // the delta ratio means something only beside an acidosis or a raised gap (Wrenn 1990)
  const showDelta =
    has(d.deltaRatio) && m.deltaBand !== null && (metabolicAcidosis || m.anionGapRaised === true);
  const deltaRatio = showDelta
    ? {
        value: fmt.plain(d.deltaRatio, 2),
        band: m.deltaBand as string,
        usesCorrected: m.anionGapUsed === 'corrected',
        limits: {
          normal: fmt.plain(R.DELTA_RATIO.normalGapBelow, 1),
          mixed: fmt.plain(R.DELTA_RATIO.mixedBelow, 1),
          high: fmt.plain(R.DELTA_RATIO.highGapUpTo, 1),
        },
      }
    : null;

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
            hco3: fmt.mmol(VENOUS_AGREEMENT.hco3),
            pco2: fmt.pressureBand({
              low: VENOUS_AGREEMENT.pco2Low,
              high: VENOUS_AGREEMENT.pco2High,
            }),
            limits: fmt.pressure(VENOUS_AGREEMENT.pco2Limits),
            hypercapniaBelow: fmt.pressure(VENOUS_AGREEMENT.hypercapniaBelow),
          },
        }
      : null;

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
    hypoxaemiaBelow: fmt.pressure(R.OXYGENATION.hypoxaemia),
    failureBelow: fmt.pressure(R.OXYGENATION.respiratoryFailure),
  };

  const last = f.previous.at(-1);
  const trend =
    last && f.changes.length && !withheld
      ? {
          when: freeText(
            [last.label, last.takenAt?.replace('T', ' ') ?? null].filter(Boolean).join(', ') ||
              null,
            md,
          ),
          items: f.changes.map((x) => ({
            label:
              x.field === 'ph'
                ? 'pH'
                : x.field === 'pco2'
                  ? co2Label(c.sample)
                  : x.field === 'hco3'
                    ? 'HCO3'
                    : x.field === 'po2'
                      ? o2Label(c.sample)
                      : 'lactate',
            from: gasNumber(fmt, x.field, x.from),
            to: gasText(fmt, x.field, x.to),
            change:
              x.change === 0
                ? null
                : `${x.change > 0 ? '+' : '-'}${gasText(fmt, x.field, Math.abs(x.change))}`,
          })),
          ventilator: serialView(f, fmt),
        }
      : null;

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

  const minutes = f.ventilation?.recheckMinutes ?? R.VENTILATION.recheckMinutes;
  const recheck = `${fmt.plain(minutes.low, 0)}-${fmt.plain(minutes.high, 0)} min`;

  return {
    md,
    withheld,
    sample: c.sample,
    arterial,
    kpa: fmt.kpa,
    bun: f.units.urea === 'bun-mg/dL',
    label: { co2: co2Label(c.sample), o2: o2Label(c.sample) },
    unit: {
      pressure: fmt.pressureUnit,
      step10: fmt.pressure(10),
      // acute buffering, HCO3 mmol/L per unit of PaCO2 (Berend 2014 acute rule), in the clinician's unit
      buffer: `${fmt.plain(R.PHYSIOLOGY.acuteBufferPerMmHg * (fmt.kpa ? U.MMHG_PER_KPA : 1), 2)} mmol/L per ${fmt.pressureUnit}`,
      deadSpacePerKg: fmt.withUnit(R.PHYSIOLOGY.anatomicDeadSpaceMlPerKg, 1, 'mL/kg PBW'),
    },
    gas: {
      ph: safe('ph') ? fmt.ph(g.ph) : null,
      phStatus: f.phStatus,
      hPlus: safe('ph') ? fmt.withUnit(d.hPlus, 1, 'nmol/L') : null,
      pco2: withheld ? null : fmt.pressure(g.pco2),
      hco3: safe('hco3') ? fmt.mmol(g.hco3) : null,
      po2: withheld ? null : fmt.pressure(g.po2),
      computed: withheld ? null : g.computed,
      lactate: fmt.mmol(g.lactate),
      lactateBand: m.lactateBand,
      baseExcess: fmt.mmol(g.baseExcess),
      sbe: fmt.mmol(d.standardBaseExcess),
      sao2: fmt.withUnit(g.sao2, 0, '%'),
      hb: fmt.field('gas.hb', g.hb),
    },
    withheldInfo: withheld
      ? {
          entered: fmt.pressureAsEntered(g.pco2),
          unit: fmt.pressureUnit,
          other: fmt.kpa ? 'mmHg' : 'kPa',
        }
      : null,
    primary: withheld ? null : f.disorders[0] ? disorderView(f.disorders[0]) : null,
    added: withheld ? [] : f.disorders.slice(1).map(disorderView),
    disorders: withheld ? [] : f.disorders.map(disorderView),
    compensation,
    reference: {
      kind: ref.kind,
      pco2: fmt.pressure(ref.pco2),
      hco3: fmt.mmol(ref.hco3),
      usualPhIgnored: ref.usualPhIgnored,
      pco2Band: fmt.pressureBand(ref.pco2Band),
      hco3Band: fmt.mmolBand(ref.hco3Band),
      pco2Estimated: ref.estimated.pco2,
      hco3Estimated: ref.estimated.hco3,
    },
    consistency:
      inconsistent && f.consistency
        ? {
            reported: fmt.mmol(f.consistency.reported),
            calculated: fmt.mmol(f.consistency.calculated),
          }
        : null,
    anionGap,
    deltaRatio,
    osmolarGap: has(d.osmolarGap)
      ? {
          value: fmt.mosm(d.osmolarGap),
          measured: fmt.mosm(ch.osmolality),
          calculated: fmt.mosm(d.calculatedOsmolality),
          raised: m.osmolarGapRaised === true,
          limit: fmt.mosm(R.OSMOLAR_GAP_RAISED),
        }
      : null,
    calculatedOsmolality: fmt.mosm(d.calculatedOsmolality),
    partition: has(d.unmeasuredIonEffect)
      ? {
          sodiumChloride: fmt.mmol(d.sodiumChlorideEffect),
          albumin: fmt.mmol(d.albuminEffect),
          unmeasured: fmt.mmol(d.unmeasuredIonEffect),
        }
      : null,
    strongIonGap: fmt.mmol(d.strongIonGap),
    urine: {
      anionGap: fmt.mmol(d.urineAnionGap, 0),
      anionGapNegative: m.urineAnionGapNegative,
      chloride: fmt.mmol(c.urine.cl, 0),
      chlorideResponsive: m.urineChlorideResponsive,
      chlorideLimit: fmt.mmol(R.URINE_CHLORIDE_RESPONSIVE, 0),
    },
    chemistry: chemistryView(f, fmt),
    lactateLimits: { raised: fmt.mmol(R.LACTATE.raised), high: fmt.mmol(R.LACTATE.high) },
    oxygenation,
    venous,
    ventilation,
    limits: limits(f, fmt),
    recheck,
    plan,
    critical: flags.filter((x) => x.code === 'critical_value'),
    flags,
    // a ventilation check with no ventilation section to sit in goes under the interpretation
    checks: ventilation
      ? {
          interpretation: visible('interpretation'),
          oxygenation: visible('oxygenation'),
          ventilation: visible('ventilation'),
        }
      : {
          interpretation: [...visible('interpretation'), ...visible('ventilation')],
          oxygenation: visible('oxygenation'),
          ventilation: [],
        },
    trend,
    patient: {
      age: fmt.withUnit(c.patient.ageYears, 0, 'years'),
      pregnant: c.patient.pregnant,
      under16: has(c.patient.ageYears) && c.patient.ageYears < 16,
    },
  };
}

/** The ventilator change between the two gases and what the alveolar ventilation equation predicted. */
function serialView(f: Findings, fmt: Formatter) {
  const serial = f.serial;
  const v = f.case.ventilator;
  if (!serial?.ventilatorChanged || !v) return null;
  const last = serial.last;
  const p = serial.prediction;
  return {
    before: `RR ${fmt.plain(last.rr, 0)}/min, VT ${fmt.plain(last.vt, 0)} mL`,
    now: `RR ${fmt.plain(v.rr, 0)}/min, VT ${fmt.plain(v.vt, 0)} mL`,
    predicted: p ? fmt.pressure(p.predicted) : null,
    observed: p ? fmt.pressure(p.observed) : null,
    verdict: p ? p.verdict : null,
    unavailable: serial.predictionUnavailable,
  };
}

/**
 * The chemistry as the note lists it: every value of the chemistry group of the table of fields that was given,
 * in table order, with its label as it reads mid-sentence ("albumin", but "Na" and "BUN") and its value in the
 * clinician's unit. `values` gives each one by key for the templates that pick a few.
 */
function chemistryView(f: Findings, fmt: Formatter): NoteView['chemistry'] {
  const list: { label: string; text: string }[] = [];
  const values: Record<string, Text> = {};
  for (const field of fieldsOf('chemistry')) {
    const key = keyOf(field);
    const text = fmt.field(
      field.path as FieldPath,
      f.case.chemistry[key as keyof typeof f.case.chemistry],
    );
    values[key] = text;
    if (text === null) continue;
    const named = field.quantity ? U.unitDef(field.quantity, f.units).name : undefined;
    list.push({ label: named ?? midSentence(field.label), text });
  }
  return { values, list };
}

/** A label as it reads inside a sentence: a plain word goes lower-case, symbols and abbreviations stay. */
const midSentence = (label: string): string => {
  const first = label.split(' ')[0]!;
  return first.length > 2 && /^[A-Z][a-z]+$/.test(first)
    ? label[0]!.toLowerCase() + label.slice(1)
    : label;
};
