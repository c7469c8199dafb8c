// The metabolic part of a reading: anion gap, delta ratio, osmolar gap, lactate, the physicochemical view, urine.
import type { CanonicalCase } from './canonical.ts';
import type { Settings } from './reference.ts';
import {
  albuminCorrectedAnionGap,
  anionGap,
  chlorideResponsive,
  deltaRatio,
  deltaRatioBand,
  urineAnionGap,
} from './anionGap.ts';
import { calculatedOsmolality, lactateBand, osmolarGap, osmolarGapRaised } from './osmolality.ts';
import {
  apparentStrongIonDifference,
  effectiveStrongIonDifference,
  physicochemicalPartition,
  strongIonGap,
} from './physicochemical.ts';
import { flag, type Flag } from './flags.ts';
import { explanation, input, round } from './explain.ts';
import { type Derived, type Metabolic, has, type Explainers } from './findings.ts';

export function emptyMetabolic(s: Settings): Metabolic {
  return {
    anionGapIncludesK: s.anionGapIncludesK,
    anionGapUpperLimit: s.anionGapNormal + s.anionGapHalfWidth,
    anionGapRaised: null,
    anionGapUsed: null,
    deltaBand: null,
    lactateBand: null,
    osmolarGapRaised: null,
    urineAnionGapNegative: null,
    urineChlorideResponsive: null,
  };
}

export function anionGapPart(c: CanonicalCase, d: Derived, m: Metabolic, explain: Explainers) {
  const ch = c.chemistry,
    g = c.gas,
    s = c.settings;
  if (!has(ch.na) || !has(ch.cl)) return null;
  const withK = s.anionGapIncludesK && has(ch.k);
  m.anionGapIncludesK = withK;
  const gap = anionGap(ch.na, ch.cl, g.hco3, withK ? ch.k : null);
  d.anionGap = gap;
  const na = ch.na,
    cl = ch.cl,
    k = ch.k;
  explain.anionGap = () => {
    const inputs = [
      input('Na', na, 'mmol/L'),
      input('Cl', cl, 'mmol/L'),
      input('HCO3', g.hco3, 'mmol/L'),
    ];
    if (withK && has(k)) inputs.splice(1, 0, input('K', k, 'mmol/L'));
    return explanation(
      'anionGap',
      'Anion gap',
      round(gap, 1),
      'mmol/L',
      withK ? 'AG = Na + K - (Cl + HCO3)' : 'AG = Na - (Cl + HCO3)',
      inputs,
      'kraut2007',
    );
  };
  let used = gap;
  m.anionGapUsed = 'uncorrected';
  if (has(ch.albumin)) {
    const corrected = albuminCorrectedAnionGap(gap, ch.albumin);
    d.anionGapCorrected = corrected;
    used = corrected;
    m.anionGapUsed = 'corrected';
    explain.anionGapCorrected = () =>
      explanation(
        'anionGapCorrected',
        'Albumin-corrected anion gap',
        round(corrected, 1),
        'mmol/L',
        'AGc = AG + 2.5 x (4.0 - albumin g/dL)',
        [input('AG', round(gap, 1), 'mmol/L'), input('Albumin', ch.albumin!, 'g/dL')],
        'figge1998',
      );
  }
  const upper = s.anionGapNormal + s.anionGapHalfWidth;
  m.anionGapUpperLimit = upper;
  m.anionGapRaised = used > upper;
  const ratio = deltaRatio(used, g.hco3, s.anionGapNormal);
  d.deltaRatio = ratio;
  if (ratio !== null) {
    m.deltaBand = deltaRatioBand(ratio);
    explain.deltaRatio = () =>
      explanation(
        'deltaRatio',
        'Delta ratio',
        round(ratio, 2),
        '',
        `delta ratio = (${m.anionGapUsed === 'corrected' ? 'AGc' : 'AG'} - ${s.anionGapNormal}) / (24 - HCO3)`,
        [
          input(m.anionGapUsed === 'corrected' ? 'AGc' : 'AG', round(used, 1), 'mmol/L'),
          input('HCO3', g.hco3, 'mmol/L'),
        ],
        'wrenn1990',
      );
  }
  return { value: used, upperLimit: upper, normal: s.anionGapNormal, deltaRatio: ratio };
}

export function otherMetabolic(
  c: CanonicalCase,
  sbe: number,
  d: Derived,
  m: Metabolic,
  explain: Explainers,
  flags: Flag[],
) {
  const ch = c.chemistry,
    g = c.gas,
    u = c.urine;
  if (has(g.lactate)) {
    m.lactateBand = lactateBand(g.lactate);
    if (m.lactateBand !== 'normal')
      flags.push(
        flag('lactate_raised', m.lactateBand === 'high' ? 'warning' : 'info', {
          lactate: g.lactate,
          band: m.lactateBand,
        }),
      );
  }
  if (has(ch.na) && has(ch.glucose) && has(ch.urea)) {
    const calc = calculatedOsmolality(ch.na, ch.glucose, ch.urea, ch.ethanol);
    d.calculatedOsmolality = calc;
    const na = ch.na,
      glucose = ch.glucose,
      urea = ch.urea,
      ethanol = ch.ethanol;
    explain.calculatedOsmolality = () => {
      const inputs = [
        input('Na', na, 'mmol/L'),
        input('Glucose', round(glucose, 1), 'mmol/L'),
        input('Urea', round(urea, 1), 'mmol/L'),
      ];
      if (has(ethanol)) inputs.push(input('Ethanol', round(ethanol, 1), 'mmol/L'));
      return explanation(
        'calculatedOsmolality',
        'Calculated osmolality',
        round(calc, 1),
        'mOsm/kg',
        has(ethanol)
          ? '2 Na + glucose + urea + ethanol mg/dL / 3.7 (mmol/L)'
          : '2 Na + glucose + urea (mmol/L)',
        inputs,
        'purssell2001',
      );
    };
    if (has(ch.osmolality)) {
      const gap = osmolarGap(ch.osmolality, calc);
      d.osmolarGap = gap;
      m.osmolarGapRaised = osmolarGapRaised(gap);
      explain.osmolarGap = () =>
        explanation(
          'osmolarGap',
          'Osmolar gap',
          round(gap, 1),
          'mOsm/kg',
          'measured - calculated osmolality',
          [
            input('Measured', ch.osmolality!, 'mOsm/kg'),
            input('Calculated', round(calc, 1), 'mOsm/kg'),
          ],
          'purssell2001',
        );
      if (m.osmolarGapRaised)
        flags.push(flag('osmolar_gap_raised', 'warning', { osmolarGap: round(gap, 1) }));
    }
  }
  if (has(ch.na) && has(ch.cl) && has(ch.albumin)) {
    const p = physicochemicalPartition(sbe, ch.na, ch.cl, ch.albumin);
    d.sodiumChlorideEffect = p.sodiumChloride;
    d.albuminEffect = p.albumin;
    d.unmeasuredIonEffect = p.unmeasured;
    explain.sodiumChlorideEffect = () =>
      explanation(
        'sodiumChlorideEffect',
        'Na-Cl effect',
        round(p.sodiumChloride, 1),
        'mmol/L',
        'Na - Cl - 38',
        [input('Na', ch.na!, 'mmol/L'), input('Cl', ch.cl!, 'mmol/L')],
        'story2004',
      );
    explain.albuminEffect = () =>
      explanation(
        'albuminEffect',
        'Albumin effect',
        round(p.albumin, 1),
        'mmol/L',
        '0.25 x (42 - albumin g/L)',
        [input('Albumin', round(ch.albumin! * 10, 0), 'g/L')],
        'story2004',
      );
    explain.unmeasuredIonEffect = () =>
      explanation(
        'unmeasuredIonEffect',
        'Unmeasured-ion effect',
        round(p.unmeasured, 1),
        'mmol/L',
        'SBE - (Na-Cl effect) - (albumin effect)',
        [
          input('SBE', round(sbe, 1), 'mmol/L'),
          input('Na-Cl effect', round(p.sodiumChloride, 1), 'mmol/L'),
          input('Albumin effect', round(p.albumin, 1), 'mmol/L'),
        ],
        'story2004',
      );
  }
  if (
    has(ch.na) &&
    has(ch.k) &&
    has(ch.ionisedCalcium) &&
    has(ch.magnesium) &&
    has(ch.cl) &&
    has(g.lactate) &&
    has(ch.albumin) &&
    has(ch.phosphate)
  ) {
    const sida = apparentStrongIonDifference({
      na: ch.na,
      k: ch.k,
      ionisedCalcium: ch.ionisedCalcium,
      magnesium: ch.magnesium,
      cl: ch.cl,
      lactate: g.lactate,
    });
    const side = effectiveStrongIonDifference(g.hco3, ch.albumin, ch.phosphate, g.ph);
    d.apparentSid = sida;
    d.effectiveSid = side;
    d.strongIonGap = strongIonGap(sida, side);
    explain.apparentSid = () =>
      explanation(
        'apparentSid',
        'Apparent SID',
        round(sida, 1),
        'mmol/L',
        'Na + K + 2 iCa + 2 Mg - Cl - lactate',
        [
          input('Na', ch.na!, 'mmol/L'),
          input('K', ch.k!, 'mmol/L'),
          input('iCa', ch.ionisedCalcium!, 'mmol/L'),
          input('Mg', ch.magnesium!, 'mmol/L'),
          input('Cl', ch.cl!, 'mmol/L'),
          input('Lactate', g.lactate!, 'mmol/L'),
        ],
        'kellum2005',
      );
    explain.effectiveSid = () =>
      explanation(
        'effectiveSid',
        'Effective SID',
        round(side, 1),
        'mmol/L',
        'HCO3 + albumin g/L x (0.123 pH - 0.631) + phosphate x (0.309 pH - 0.469)',
        [
          input('HCO3', g.hco3, 'mmol/L'),
          input('Albumin', round(ch.albumin! * 10, 0), 'g/L'),
          input('Phosphate', ch.phosphate!, 'mmol/L'),
          input('pH', g.ph, ''),
        ],
        'kellum2005',
      );
    explain.strongIonGap = () =>
      explanation(
        'strongIonGap',
        'Strong ion gap',
        round(d.strongIonGap!, 1),
        'mmol/L',
        'SIG = SIDa - SIDe',
        [input('SIDa', round(sida, 1), 'mmol/L'), input('SIDe', round(side, 1), 'mmol/L')],
        'kellum2005',
      );
  }
  if (has(u.na) && has(u.k) && has(u.cl)) {
    const uag = urineAnionGap(u.na, u.k, u.cl);
    d.urineAnionGap = uag;
    m.urineAnionGapNegative = uag < 0;
    explain.urineAnionGap = () =>
      explanation(
        'urineAnionGap',
        'Urine anion gap',
        round(uag, 0),
        'mmol/L',
        'uNa + uK - uCl',
        [
          input('Urine Na', u.na!, 'mmol/L'),
          input('Urine K', u.k!, 'mmol/L'),
          input('Urine Cl', u.cl!, 'mmol/L'),
        ],
        'commonPractice',
      );
  }
  if (has(u.cl)) m.urineChlorideResponsive = chlorideResponsive(u.cl);
}
