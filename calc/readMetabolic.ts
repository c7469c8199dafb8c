// The metabolic part of a reading: anion gap, delta ratio, osmolar gap, lactate, the physicochemical view, urine.
import type { CanonicalCase } from './canonical.ts';
import type { Settings } from './reference.ts';
import {
  albuminCorrectedAnionGap,
  anionGap,
  chlorideResponsive,
  urineAnionGap,
} from './anionGap.ts';
import type { Classification, Disorder } from './classify.ts';
import { glucosePart } from './readGlucose.ts';
import type { DeltaBasis, DeltaPoint } from './deltaReference.ts';
import { calculatedOsmolality, lactateBand, osmolarGap, osmolarGapRaised } from './osmolality.ts';
import {
  apparentStrongIonDifference,
  effectiveStrongIonDifference,
  physicochemicalPartition,
  strongIonGap,
} from './physicochemical.ts';
import { flag, type Flag } from './flags.ts';
import { input, record, round } from './explain.ts';
import { type Book, type Metabolic, has } from './findings.ts';

const M = 'mmol/L';

export function emptyMetabolic(s: Settings): Metabolic {
  return {
    anionGapIncludesK: s.anionGapIncludesK,
    anionGapUpperLimit: s.anionGapNormal + s.anionGapHalfWidth,
    anionGapRaised: null,
    anionGapUsed: null,
    deltaBand: null,
    delta: null,
    lactateBand: null,
    osmolarGapRaised: null,
    urineAnionGapNegative: null,
    urineChlorideResponsive: null,
    urineNotRead: { anionGap: false, chloride: false },
    glucose: null,
  };
}

export function anionGapPart(c: CanonicalCase, book: Book, m: Metabolic) {
  const { na, cl, k, albumin } = c.chemistry;
  const g = c.gas;
  const s = c.settings;
  if (!has(na) || !has(cl)) return null;
  const withK = s.anionGapIncludesK && has(k);
  m.anionGapIncludesK = withK;
  const inputs = [input('Na', na, M), input('Cl', cl, M), input('HCO3', g.hco3, M)];
  if (withK) inputs.splice(1, 0, input('K', k, M));
  const gap = record(book, 'anionGap', anionGap(na, cl, g.hco3, withK ? k : null), {
    label: 'Anion gap',
    unit: M,
    decimals: 1,
    formula: withK ? 'AG = Na + K - (Cl + HCO3)' : 'AG = Na - (Cl + HCO3)',
    inputs,
    source: 'kraut2007',
  });
  let used = gap;
  m.anionGapUsed = 'uncorrected';
  if (has(albumin)) {
    used = record(book, 'anionGapCorrected', albuminCorrectedAnionGap(gap, albumin), {
      label: 'Albumin-corrected anion gap',
      unit: M,
      decimals: 1,
      formula: 'AGc = AG + 2.5 x (4.0 - albumin g/dL)',
      inputs: [input('AG', round(gap, 1), M), input('Albumin', albumin, 'g/dL')],
      source: 'figge1998',
    });
    m.anionGapUsed = 'corrected';
  }
  const upper = s.anionGapNormal + s.anionGapHalfWidth;
  m.anionGapUpperLimit = upper;
  m.anionGapRaised = used > upper;
  return { value: used, upperLimit: upper, normal: s.anionGapNormal };
}

const REFERENCE_NAME: Record<DeltaBasis, string> = {
  textbook: 'Reference HCO3 (textbook)',
  pregnancy: 'Reference HCO3 (pregnancy)',
  usual: 'Reference HCO3 (usual, with the acute change since)',
  respiratory_acute: 'Reference HCO3 (acute respiratory rule)',
  respiratory_chronic: 'Reference HCO3 (chronic respiratory rule)',
};

/** The delta ratio against the HCO3 that applies, recorded once per reference it was measured against. */
export function deltaPart(c: CanonicalCase, book: Book, m: Metabolic, cl: Classification) {
  const d = cl.delta;
  if (!d) return;
  m.delta = d;
  const single = d.points.length === 1 ? d.points[0] : undefined;
  m.deltaBand = single && single.verdict !== 'hco3_not_lowered' ? single.verdict : null;
  const name = m.anionGapUsed === 'corrected' ? 'AGc' : 'AG';
  const used =
    m.anionGapUsed === 'corrected' ? book.derived.anionGapCorrected : book.derived.anionGap;
  const normal = c.settings.anionGapNormal;
  const both = d.points.length > 1;
  for (const p of d.points.filter((x): x is DeltaPoint & { ratio: number } => x.ratio !== null)) {
    const chronic = p.basis === 'respiratory_chronic';
    record(
      book,
      both ? (chronic ? 'deltaRatioChronic' : 'deltaRatioAcute') : 'deltaRatio',
      p.ratio,
      {
        label: both ? `Delta ratio (if ${chronic ? 'chronic' : 'acute'})` : 'Delta ratio',
        unit: '',
        decimals: 2,
        formula: `delta ratio = (${name} - ${normal}) / (reference HCO3 - HCO3)`,
        inputs: [
          input(name, used ?? 0, M),
          input(REFERENCE_NAME[p.basis], round(p.referenceHco3, 1), M),
          input('HCO3', c.gas.hco3, M),
        ],
        source: 'wrenn1990',
      },
    );
  }
}

function osmolality(c: CanonicalCase, book: Book, m: Metabolic, flags: Flag[]) {
  const { na, glucose, urea, ethanol, osmolality: measured } = c.chemistry;
  if (!has(na) || !has(glucose) || !has(urea)) return;
  const inputs = [
    input('Na', na, M),
    input('Glucose', round(glucose, 1), M),
    input('Urea', round(urea, 1), M),
  ];
  if (has(ethanol)) inputs.push(input('Ethanol', round(ethanol, 1), M));
  const calculated = record(
    book,
    'calculatedOsmolality',
    calculatedOsmolality(na, glucose, urea, ethanol),
    {
      label: 'Calculated osmolality',
      unit: 'mOsm/kg',
      decimals: 1,
      formula: has(ethanol)
        ? '2 Na + glucose + urea + ethanol mg/dL / 3.7 (mmol/L)'
        : '2 Na + glucose + urea (mmol/L)',
      inputs,
      source: 'purssell2001',
    },
  );
  if (!has(measured)) return;
  const gap = record(book, 'osmolarGap', osmolarGap(measured, calculated), {
    label: 'Osmolar gap',
    unit: 'mOsm/kg',
    decimals: 1,
    formula: 'measured - calculated osmolality',
    inputs: [
      input('Measured', measured, 'mOsm/kg'),
      input('Calculated', round(calculated, 1), 'mOsm/kg'),
    ],
    source: 'purssell2001',
  });
  m.osmolarGapRaised = osmolarGapRaised(gap);
  // a measured ethanol is already in the calculated osmolality (Purssell 2001): it does not explain what is left
  if (m.osmolarGapRaised)
    flags.push(
      flag('osmolar_gap_raised', 'warning', {
        osmolarGap: round(gap, 1),
        ethanolMeasured: has(ethanol),
        anionGapRaised: m.anionGapRaised === true,
      }),
    );
}

function physicochemical(c: CanonicalCase, sbe: number, book: Book) {
  const { na, k, cl, albumin, ionisedCalcium, magnesium, phosphate } = c.chemistry;
  const g = c.gas;
  if (!has(na) || !has(cl) || !has(albumin)) return;
  const p = physicochemicalPartition(sbe, na, cl, albumin);
  const story = { unit: M, decimals: 1, source: 'story2004' } as const;
  record(book, 'sodiumChlorideEffect', p.sodiumChloride, {
    ...story,
    label: 'Na-Cl effect',
    formula: 'Na - Cl - 38',
    inputs: [input('Na', na, M), input('Cl', cl, M)],
  });
  record(book, 'albuminEffect', p.albumin, {
    ...story,
    label: 'Albumin effect',
    formula: '0.25 x (42 - albumin g/L)',
    inputs: [input('Albumin', round(albumin * 10, 0), 'g/L')],
  });
  record(book, 'unmeasuredIonEffect', p.unmeasured, {
    ...story,
    label: 'Unmeasured-ion effect',
    formula: 'SBE - (Na-Cl effect) - (albumin effect)',
    inputs: [
      input('SBE', round(sbe, 1), M),
      input('Na-Cl effect', round(p.sodiumChloride, 1), M),
      input('Albumin effect', round(p.albumin, 1), M),
    ],
  });
  if (!has(k) || !has(ionisedCalcium) || !has(magnesium) || !has(g.lactate) || !has(phosphate))
    return;
  const kellum = { unit: M, decimals: 1, source: 'kellum2005' } as const;
  const sida = record(
    book,
    'apparentSid',
    apparentStrongIonDifference({ na, k, ionisedCalcium, magnesium, cl, lactate: g.lactate }),
    {
      ...kellum,
      label: 'Apparent SID',
      formula: 'Na + K + 2 iCa + 2 Mg - Cl - lactate',
      inputs: [
        input('Na', na, M),
        input('K', k, M),
        input('iCa', ionisedCalcium, M),
        input('Mg', magnesium, M),
        input('Cl', cl, M),
        input('Lactate', g.lactate, M),
      ],
    },
  );
  const side = record(
    book,
    'effectiveSid',
    effectiveStrongIonDifference(g.hco3, albumin, phosphate, g.ph),
    {
      ...kellum,
      label: 'Effective SID',
      formula: 'HCO3 + albumin g/L x (0.123 pH - 0.631) + phosphate x (0.309 pH - 0.469)',
      inputs: [
        input('HCO3', g.hco3, M),
        input('Albumin', round(albumin * 10, 0), 'g/L'),
        input('Phosphate', phosphate, M),
        input('pH', g.ph, ''),
      ],
    },
  );
  record(book, 'strongIonGap', strongIonGap(sida, side), {
    ...kellum,
    label: 'Strong ion gap',
    formula: 'SIG = SIDa - SIDe',
    inputs: [input('SIDa', round(sida, 1), M), input('SIDe', round(side, 1), M)],
  });
}

// The urine anion gap speaks to a normal-AG metabolic acidosis only (in a raised-AG state the unmeasured urinary
// anions, ketones among them, make it misleading); urine chloride to a metabolic alkalosis only (common practice).
function urine(c: CanonicalCase, book: Book, m: Metabolic, disorders: Disorder[]) {
  const u = c.urine;
  const named = (code: Disorder['code'], detail?: Disorder['detail']) =>
    disorders.some((d) => d.code === code && (detail === undefined || d.detail === detail));
  const normalGapOnly =
    named('metabolic_acidosis', 'normal_anion_gap') &&
    !named('metabolic_acidosis', 'high_anion_gap');
  if (has(u.na) && has(u.k) && has(u.cl)) {
    if (normalGapOnly) {
      const uag = record(book, 'urineAnionGap', urineAnionGap(u.na, u.k, u.cl), {
        label: 'Urine anion gap',
        unit: M,
        decimals: 0,
        formula: 'uNa + uK - uCl',
        inputs: [input('Urine Na', u.na, M), input('Urine K', u.k, M), input('Urine Cl', u.cl, M)],
        source: 'commonPractice',
      });
      m.urineAnionGapNegative = uag < 0;
    } else m.urineNotRead.anionGap = true;
  }
  if (has(u.cl)) {
    if (named('metabolic_alkalosis')) m.urineChlorideResponsive = chlorideResponsive(u.cl);
    else m.urineNotRead.chloride = true;
  }
}

export function otherMetabolic(
  c: CanonicalCase,
  sbe: number,
  book: Book,
  m: Metabolic,
  flags: Flag[],
  disorders: Disorder[],
) {
  const lactate = c.gas.lactate;
  if (has(lactate)) {
    m.lactateBand = lactateBand(lactate);
    if (m.lactateBand !== 'normal')
      flags.push(
        flag('lactate_raised', m.lactateBand === 'high' ? 'warning' : 'info', {
          lactate,
          band: m.lactateBand,
        }),
      );
  }
  osmolality(c, book, m, flags);
  physicochemical(c, sbe, book);
  urine(c, book, m, disorders);
  m.glucose = glucosePart(c, book, flags, disorders);
}
