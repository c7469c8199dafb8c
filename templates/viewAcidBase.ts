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

  return compensation;
}

export function referenceView({ f, fmt }: Ctx) {
  const ref = f.reference;
  return {
    kind: ref.kind,
    pco2: fmt.pressure(ref.pco2),
    hco3: fmt.mmol(ref.hco3),
    usualPhIgnored: ref.usualPhIgnored,
    pco2Band: fmt.pressureBand(ref.pco2Band),
    hco3Band: fmt.mmolBand(ref.hco3Band),
    pco2Estimated: ref.estimated.pco2,
    hco3Estimated: ref.estimated.hco3,
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
        includesK: m.anionGapIncludesK,
        upper: fmt.mmol(m.anionGapUpperLimit),
        raised: m.anionGapRaised === true,
        used: fmt.mmol(m.anionGapUsed === 'corrected' ? d.anionGapCorrected : d.anionGap),
      }
    : null;
  return anionGap;
}

export function deltaRatioView({ f, fmt, hasDisorder }: Ctx) {
  const d = f.derived;
  const m = f.metabolic;
  const metabolicAcidosis = hasDisorder('metabolic_acidosis');
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

  return deltaRatio;
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
    lactateLimits: { raised: fmt.mmol(R.LACTATE.raised), high: fmt.mmol(R.LACTATE.high) },
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
