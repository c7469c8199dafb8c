// The acid-base part of the note's view model: compensation, reference point, anion gap, delta ratio, osmolar
// gap, the physicochemical view, urine and chemistry.
import { fieldsOf, keyOf, reference as R, units as U } from '../calc/index.ts';
import type { FieldPath, Findings } from '../calc/index.ts';
import type { Formatter, Text } from './format.ts';
import { type Ctx, has } from './viewShared.ts';

export function compensationView({ f, fmt, withheld }: Ctx) {
  const g = f.case.gas;
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
          // a metabolic acidosis that explains the low HCO3 is no reason to doubt the stated timing
          otherTimingFits:
            comp.verdict === 'within' || comp.hco3LoweredBy !== null
              ? null
              : comp.timing === 'acute' && (comp.fit === 'chronic' || comp.fit === 'either')
                ? ('chronic' as const)
                : comp.timing === 'chronic' && (comp.fit === 'acute' || comp.fit === 'either')
                  ? ('acute' as const)
                  : null,
          loweredBy: comp.hco3LoweredBy,
          fromUsualPh: comp.fromUsualPh,
          nearCeiling: comp.nearCeiling
            ? fmt.pressureBand({ low: R.ALKALOSIS_CEILING.low, high: R.ALKALOSIS_CEILING.high })
            : null,
        }
      : null;

  return compensation;
}

export function referenceView({ f, fmt }: Ctx) {
  const ref = f.reference;
  const usual = ref.usual;
  return {
    kind: ref.kind,
    pco2: fmt.pressure(ref.pco2),
    hco3: fmt.mmol(ref.hco3),
    usualPhIgnored: ref.usualPhIgnored,
    pco2Band: fmt.pressureBand(ref.pco2Band),
    // a reference range is a limit, written short
    hco3Band: fmt.range(ref.hco3Band.low, ref.hco3Band.high, 1, 'mmol/L'),
    pco2Estimated: ref.estimated.pco2,
    hco3Estimated: ref.estimated.hco3,
    fromUsualPh: usual?.source === 'usual_ph',
    /** a usual point estimated on the chronic line from today's gas (the reference itself stays textbook), worded
     *  where it makes the reading acute-on-chronic; at the usual point itself it adds nothing */
    chronicLine:
      usual?.source === 'chronic_line' && f.disorders[0]?.detail === 'acute_on_chronic'
        ? { pco2: fmt.pressure(usual.pco2), hco3: fmt.mmol(usual.hco3) }
        : null,
  };
}

export function anionGapView({ f, fmt }: Ctx) {
  const d = f.derived;
  const m = f.metabolic;
  const ch = f.case.chemistry;
  const anionGap = has(d.anionGap)
    ? {
        value: fmt.mmol(d.anionGap),
        corrected: fmt.mmol(d.anionGapCorrected),
        usedCorrected: m.anionGapUsed === 'corrected',
        albumin: fmt.field('chemistry.albumin', ch.albumin),
        // albumin near 4 g/dL changes nothing: the corrected figure is not said again
        correctionChanges:
          m.anionGapUsed === 'corrected' && fmt.mmol(d.anionGapCorrected) !== fmt.mmol(d.anionGap),
        includesK: m.anionGapIncludesK,
        upper: fmt.withUnit(m.anionGapUpperLimit, 1, 'mmol/L'),
        raised: m.anionGapRaised === true,
        used: fmt.mmol(m.anionGapUsed === 'corrected' ? d.anionGapCorrected : d.anionGap),
      }
    : null;
  return anionGap;
}

const DELTA_REFERENCE = {
  textbook: 'textbook',
  pregnancy: 'pregnancy',
  usual: 'usual',
  respiratory_acute: 'acute',
  respiratory_chronic: 'chronic',
} as const;

/** The delta ratio against the HCO3 that applies (clinical-scope section 10), only where the gap is raised. */
export function deltaRatioView({ f, fmt }: Ctx) {
  const delta = f.metabolic.delta;
  if (!delta) return null;
  const points = delta.points.map((p) => ({
    reference: DELTA_REFERENCE[p.basis],
    referenceHco3: fmt.mmol(p.referenceHco3),
    value: p.ratio === null ? null : fmt.fixed(p.ratio, 2),
    verdict: p.verdict,
    implies:
      p.verdict === 'normal_gap' || p.verdict === 'mixed_high_and_normal_gap'
        ? 'normal_gap_acidosis'
        : p.verdict === 'high_gap'
          ? 'nothing_more'
          : 'alkalosis',
  }));
  const single = points.length === 1 ? points[0] : undefined;
  return {
    single: single ?? null,
    acute: points.find((p) => p.reference === 'acute') ?? null,
    chronic: points.find((p) => p.reference === 'chronic') ?? null,
    /** the figure the one-line summary may quote: one reference, and a fall in HCO3 to measure against */
    value: single?.value ?? null,
    implies: delta.implies,
    usesCorrected: f.metabolic.anionGapUsed === 'corrected',
    limits: {
      normal: fmt.plain(R.DELTA_RATIO.normalGapBelow, 1),
      mixed: fmt.plain(R.DELTA_RATIO.mixedBelow, 1),
      high: fmt.plain(R.DELTA_RATIO.highGapUpTo, 1),
      fall: fmt.withUnit(R.DELTA_RATIO.minHco3Fall, 1, 'mmol/L'),
    },
  };
}

export function metabolicDetailView({ f, fmt }: Ctx) {
  const d = f.derived;
  const m = f.metabolic;
  const c = f.case;
  const ch = c.chemistry;
  return {
    osmolarGap: has(d.osmolarGap)
      ? {
          value: fmt.mosm(d.osmolarGap),
          measured: fmt.field('chemistry.osmolality', ch.osmolality),
          calculated: fmt.mosm(d.calculatedOsmolality),
          raised: m.osmolarGapRaised === true,
          limit: fmt.withUnit(R.OSMOLAR_GAP_RAISED, 0, 'mOsm/kg'),
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
      chloride: m.urineChlorideResponsive === null ? null : fmt.mmol(c.urine.cl, 0),
      chlorideResponsive: m.urineChlorideResponsive,
      chlorideLimit: fmt.withUnit(R.URINE_CHLORIDE_RESPONSIVE, 0, 'mmol/L'),
      notRead: m.urineNotRead.anionGap || m.urineNotRead.chloride ? m.urineNotRead : null,
    },
    ethanolMeasured: has(ch.ethanol),
    glucose: glucoseView(f, fmt),
    lactateLimits: {
      raised: fmt.withUnit(R.LACTATE.raised, 1, 'mmol/L'),
      high: fmt.withUnit(R.LACTATE.high, 1, 'mmol/L'),
    },
  };
}

/** Corrected sodium, effective osmolality and the patterns that follow from glucose (clinical-scope section 10). */
function glucoseView(f: Findings, fmt: Formatter) {
  const gl = f.metabolic.glucose;
  if (!gl) return null;
  const d = f.derived;
  return {
    correctedSodium: fmt.field('chemistry.na', d.correctedSodium),
    effectiveOsmolality: fmt.mosm(d.effectiveOsmolality),
    hyperosmolar: gl.hyperosmolar === true,
    osmolalityLimit: fmt.withUnit(R.GLUCOSE.hyperosmolarOsmolality, 0, 'mOsm/kg'),
    glucoseLimit: fmt.field('chemistry.glucose', R.GLUCOSE.hyperosmolarGlucose),
    ketoacidosisPattern: gl.ketoacidosisPattern,
    hyperglycaemia: gl.hyperglycaemia === true,
    glucoseGiven: gl.hyperglycaemia !== null,
    knownDiabetes: gl.knownDiabetes,
    potassium: gl.potassium,
    ketones: fmt.withUnit(R.GLUCOSE.ketones, 1, 'mmol/L'),
  };
}

/**
 * The chemistry as the note lists it: every value of the chemistry group of the table of fields that was given,
 * in table order, with its label as it reads mid-sentence ("albumin", but "Na" and "BUN") and its value in the
 * clinician's unit. `values` gives each one by key for the templates that pick a few.
 */
export function chemistryView(
  f: Findings,
  fmt: Formatter,
): { values: Record<string, Text>; list: { label: string; text: string }[] } {
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
