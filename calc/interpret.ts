// interpret(case): validate, convert once, compute every finding, and say how each number was reached.
import { parseCase, type FieldError, type CaseInput, type ParsedCase, GAS_RANGES, VENTILATOR_RANGES, rangeText } from './schema.ts';
import { canonicalize, type CanonicalCase, type Gas } from './canonical.ts';
import { mergeSettings, NORMAL, SERIAL, UNIT_SCREEN, OXYGENATION, PHYSIOLOGY, VENOUS, VENTILATION, type Settings } from './reference.ts';
import { hendersonBicarbonate, hendersonConsistency, hendersonHasselbalchPh, hydrogenIon, type Consistency } from './acidBase.ts';
import { classify, referencePoint, wintersPco2, type Band, type Classification, type Compensation, type Disorder, type PhStatus, type ReferencePoint } from './compensation.ts';
import { albuminCorrectedAnionGap, anionGap, chlorideResponsive, deltaRatio, deltaRatioBand, urineAnionGap, type DeltaBand } from './anionGap.ts';
import { calculatedOsmolality, lactateBand, osmolarGap, osmolarGapRaised, type LactateBand } from './osmolality.ts';
import { apparentStrongIonDifference, effectiveStrongIonDifference, physicochemicalPartition, standardBaseExcess, strongIonGap } from './physicochemical.ts';
import { aaGradient, alveolarPo2, barometricPressureAtAltitude, expectedAaGradient, oxygenContent, oxygenationLevel, pfBand, pfRatio, sfMeetsCriterion, sfRatio, type OxygenationLevel, type PfBand } from './oxygenation.ts';
import { alveolarVentilation, co2ProductionEstimate, predictedPco2AfterChange, drivingPressure, estimatedDeadSpace, minuteVentilation, predictedBodyWeight, rrForTarget, targetPco2Buffered, targetPco2Simple, ventilatoryRatio, vtForTarget, vtPerKg } from './ventilation.ts';
import { bySeverity, flag, type Flag } from './flags.ts';
import { explanation, input, round, type Explanation } from './explain.ts';
import { type Units } from './units.ts';

type N = number | null;

export interface Derived {
  hPlus: number;
  hco3Henderson: N;
  phHendersonHasselbalch: N;
  anionGap: N; anionGapCorrected: N; deltaRatio: N;
  expectedPco2: Band | null; expectedHco3: Band | null;
  standardBaseExcess: N;
  sodiumChlorideEffect: N; albuminEffect: N; unmeasuredIonEffect: N;
  apparentSid: N; effectiveSid: N; strongIonGap: N;
  calculatedOsmolality: N; osmolarGap: N;
  urineAnionGap: N;
  barometricPressure: N; alveolarPo2: N; aaGradient: N; aaGradientExpected: N;
  pfRatio: N; sfRatio: N; oxygenContent: N;
  predictedBodyWeightKg: N; vtPerKgPbw: N; drivingPressure: N;
  deadSpaceMl: N; minuteVentilation: N; alveolarVentilation: N; co2Production: N; ventilatoryRatio: N;
  targetPco2: N; targetPco2Simple: N; suggestedRr: N; suggestedVt: N; suggestedVtPerKgPbw: N;
  predictedPco2: N;
}

export interface Metabolic {
  anionGapIncludesK: boolean;
  anionGapUpperLimit: number;
  anionGapRaised: boolean | null;
  anionGapUsed: 'corrected' | 'uncorrected' | null;
  deltaBand: DeltaBand | null;
  lactateBand: LactateBand | null;
  osmolarGapRaised: boolean | null;
  urineAnionGapNegative: boolean | null;
  urineChlorideResponsive: boolean | null;
}

export interface Oxygenation {
  assessable: boolean;
  reason: 'venous' | 'capillary' | null;
  barometricSource: 'entered' | 'altitude' | 'sea_level';
  level: OxygenationLevel | null;
  failureType: 1 | 2 | null;
  pfBand: PfBand | null;
  pfBandApplies: boolean;
  sfMeetsCriterion: boolean | null;
  aaRaised: boolean | null;
  lowInspiredOrHypoventilation: boolean;
}

export interface Ventilation {
  ventilated: boolean;
  deadSpaceSource: 'measured_fraction' | 'estimated' | null;
  targetSource: 'target_pco2' | 'target_ph' | null;
  targetForm: 'acute_buffering' | 'as_given' | null;
  recheckMinutes: { low: number; high: number };
  compensationTarget: Band | null;
  usualPco2: N;
}

export interface Venous {
  sample: 'venous' | 'capillary';
  hypercapniaUnlikely: boolean;
  arterialEstimate: { ph: number; pco2Low: number; pco2High: number; hco3: number } | null;
}

export interface PreviousGas {
  takenAt: string | null;
  label: string | null;
  gas: Gas;
  hPlus: number;
  fio2: N; peep: N; vt: N; rr: N;
}

export interface Change { field: 'ph' | 'pco2' | 'hco3' | 'po2' | 'lactate'; from: number; to: number; change: number }

export interface Serial {
  /** the latest earlier gas */
  last: PreviousGas;
  ventilatorChanged: boolean;
  /** the alveolar ventilation equation applied to the change, when the settings allow */
  prediction: {
    vaBefore: number; vaNow: number; predicted: number; observed: number; difference: number;
    verdict: 'as_predicted' | 'higher' | 'lower';
  } | null;
  predictionUnavailable: 'settings_unchanged' | 'settings_missing' | 'dead_space_unknown' | null;
}

export interface Findings {
  ok: true;
  withheld: boolean;
  units: Units;
  case: CanonicalCase;
  phStatus: PhStatus;
  consistency: Consistency | null;
  reference: ReferencePoint;
  compensation: Compensation | null;
  disorders: Disorder[];
  derived: Derived;
  metabolic: Metabolic;
  oxygenation: Oxygenation;
  ventilation: Ventilation | null;
  venous: Venous | null;
  previous: PreviousGas[];
  changes: Change[];
  serial: Serial | null;
  flags: Flag[];
  explain: Record<string, Explanation>;
}

export interface Rejected { ok: false; errors: FieldError[] }

export interface InterpretOptions {
  /** a department's defaults; a case's own settings override them */
  settings?: Partial<Settings> | null;
}

const has = (x: N | undefined): x is number => x !== null && x !== undefined;

/** Explanations are built only when read: each is a thunk over the values of one reading. */
type Explainers = Record<string, () => Explanation>;

/** The whole reading of one case. Pure: the same case always gives the same findings. */
export function interpret(raw: CaseInput | unknown, options: InterpretOptions = {}): Findings | Rejected {
  const parsed = parseCase(raw);
  if (!parsed.ok) return { ok: false, errors: parsed.errors };
  return interpretParsed(parsed.value, options);
}

/** The reading of a case that has already passed caseSchema (the server's validator, say). */
export function interpretParsed(value: ParsedCase, options: InterpretOptions = {}): Findings | Rejected {
  const c = canonicalize(value);
  if (options.settings) {
    const rawSettings = value.settings ?? {};
    const department = mergeSettings({ ...options.settings, critical: { ...options.settings.critical } });
    c.settings = mergeSettings({
      anionGapNormal: rawSettings.anionGapNormal ?? department.anionGapNormal,
      anionGapHalfWidth: rawSettings.anionGapHalfWidth ?? department.anionGapHalfWidth,
      anionGapIncludesK: rawSettings.anionGapIncludesK ?? department.anionGapIncludesK,
      critical: department.critical,
    });
  }
  const computedErrors = computedGasErrors(c);
  if (computedErrors.length) return { ok: false, errors: computedErrors };
  return readCase(c);
}

/** A worked-out third value must itself be plausible, or the inputs are wrong. */
function computedGasErrors(c: CanonicalCase): FieldError[] {
  const errors: FieldError[] = [];
  const check = (g: Gas, prefix: string) => {
    if (!g.computed) return;
    const range = GAS_RANGES[g.computed];
    const value = g[g.computed];
    if (!Number.isFinite(value) || value < range.min || value > range.max) {
      errors.push({ path: `${prefix}.${g.computed}`, message: `${range.label} worked out from the other two values would be ${Number.isFinite(value) ? round(value, 2) : 'undefined'}, outside ${rangeText(range, c.units)}: check the entered values` });
    }
  };
  check(c.gas, 'gas');
  c.previous.forEach((p, i) => check(p.gas, `previous.${i}.gas`));
  return errors;
}

function emptyDerived(hPlus: number, gas: Gas): Derived {
  return {
    hPlus, hco3Henderson: hendersonBicarbonate(hPlus, gas.pco2), phHendersonHasselbalch: hendersonHasselbalchPh(gas.pco2, gas.hco3),
    anionGap: null, anionGapCorrected: null, deltaRatio: null, expectedPco2: null, expectedHco3: null,
    standardBaseExcess: standardBaseExcess(gas.ph, gas.hco3),
    sodiumChlorideEffect: null, albuminEffect: null, unmeasuredIonEffect: null,
    apparentSid: null, effectiveSid: null, strongIonGap: null,
    calculatedOsmolality: null, osmolarGap: null, urineAnionGap: null,
    barometricPressure: null, alveolarPo2: null, aaGradient: null, aaGradientExpected: null,
    pfRatio: null, sfRatio: null, oxygenContent: null,
    predictedBodyWeightKg: null, vtPerKgPbw: null, drivingPressure: null,
    deadSpaceMl: null, minuteVentilation: null, alveolarVentilation: null, co2Production: null, ventilatoryRatio: null,
    targetPco2: null, targetPco2Simple: null, suggestedRr: null, suggestedVt: null, suggestedVtPerKgPbw: null,
    predictedPco2: null,
  };
}

/** PaCO2 that looks like the other pressure unit, with a near-normal pH, and no HCO3 that settles it. */
export function unitLooksMixed(c: CanonicalCase): boolean {
  const g = c.gas;
  // a PaCO2 worked out from pH and HCO3 was not entered in any unit
  if (g.computed === 'pco2') return false;
  if (g.ph < UNIT_SCREEN.phLow || g.ph > UNIT_SCREEN.phHigh) return false;
  const suspicious = c.units.pressure === 'mmHg' ? g.pco2 < UNIT_SCREEN.pco2MmHgBelow : g.pco2 > UNIT_SCREEN.pco2MmHgBelow * 7.50062;
  if (!suspicious) return false;
  // an entered HCO3 that agrees with the reading as entered settles it: a real, extreme value
  if (g.complete && hendersonConsistency(g.ph, g.pco2, g.hco3).consistent) return false;
  return true;
}

function readCase(c: CanonicalCase): Findings {
  const g = c.gas;
  const s = c.settings;
  const hPlus = hydrogenIon(g.ph);
  const derived = emptyDerived(hPlus, g);
  const sbe = standardBaseExcess(g.ph, g.hco3);
  const flags: Flag[] = [];
  const explain: Explainers = {};
  const P = 'mmHg', M = 'mmol/L';
  const gasInputs = () => [input('pH', g.ph, ''), input('PaCO2', g.pco2, P), input('HCO3', g.hco3, M)];

  explain.hPlus = () => explanation('hPlus', '[H+]', round(hPlus, 1), 'nmol/L', '[H+] = 10^(9 - pH)', [input('pH', g.ph, '')], 'hydrogenIon');
  explain.hco3Henderson = () => explanation('hco3Henderson', 'HCO3 from the Henderson equation', round(hendersonBicarbonate(hPlus, g.pco2), 1), M, 'HCO3 = 24 x PaCO2 / [H+]', [input('PaCO2', g.pco2, P), input('[H+]', round(hPlus, 1), 'nmol/L')], 'henderson');
  explain.phHendersonHasselbalch = () => explanation('phHendersonHasselbalch', 'pH from Henderson-Hasselbalch', round(hendersonHasselbalchPh(g.pco2, g.hco3), 2), '', 'pH = 6.1 + log10(HCO3 / (0.0307 x PaCO2))', [input('HCO3', g.hco3, M), input('PaCO2', g.pco2, P)], 'hendersonHasselbalch');
  explain.standardBaseExcess = () => explanation('standardBaseExcess', 'Standard base excess', round(sbe, 1), M, 'SBE = 0.93 x (HCO3 - 24.4 + 14.8 x (pH - 7.40))', [input('HCO3', g.hco3, M), input('pH', g.ph, '')], 'clsiC46');

  if (g.computed) flags.push(flag('gas_value_computed', 'info', { field: g.computed, value: round(g[g.computed], g.computed === 'ph' ? 2 : 1) }));

  // a pressure in doubt (unit_ambiguous, below) puts the usual PaCO2 in doubt too: the textbook reference then
  const withheld = unitLooksMixed(c);
  const reference = withheld ? referencePoint(null, c.patient.pregnant, g.hco3) : referencePoint(c.context.baseline, c.patient.pregnant, g.hco3, g.pco2);
  const previous = inTimeOrder(c.previous).map((p) => ({ ...p, hPlus: hydrogenIon(p.gas.ph) }));

  // A likely unit slip: ask, compute nothing from the pressure (clinical-scope section 3).
  if (withheld) {
    // a value worked out from the doubtful PaCO2 is not reported either
    const computedFlag = flags.findIndex((x) => x.code === 'gas_value_computed');
    if (computedFlag >= 0) flags.splice(computedFlag, 1);
    flags.push(flag('unit_ambiguous', 'critical', { field: 'gas.pco2', entered: c.units.pressure, pco2: round(g.pco2, 1), ph: g.ph }));
    if (c.sample !== 'arterial') flags.push(flag('oxygenation_not_assessable', 'info', { sample: c.sample }));
    criticalFlags(c, flags, true);
    return finish({
      withheld: true, case: c, phStatus: classifyPhOnly(g.ph), consistency: null, reference, compensation: null, disorders: [],
      derived, metabolic: emptyMetabolic(s), oxygenation: notAssessed(c), ventilation: null, venous: null,
      previous, changes: [], serial: null, flags,
    }, explain);
  }

  // Henderson check of the report (clinical-scope section 2)
  let consistency: Consistency | null = null;
  if (g.complete) {
    consistency = hendersonConsistency(g.ph, g.pco2, g.hco3);
    if (!consistency.consistent) {
      flags.push(flag('values_inconsistent', 'warning', { reported: g.hco3, calculated: round(consistency.calculated, 1), difference: round(consistency.difference, 1) }));
    }
  }

  const metabolic = emptyMetabolic(s);
  const ag = anionGapPart(c, derived, metabolic, explain);

  // a venous PCO2 is judged against the rules by its arterial estimate (Byrne et al. 2014, from memory)
  const venousEstimate = c.sample === 'venous' && g.pco2 >= VENOUS.minPco2;
  const classification: Classification = classify({
    ph: g.ph, pco2: venousEstimate ? g.pco2 - VENOUS.pco2Mid : g.pco2, hco3: g.hco3, timing: c.context.timing, reference, anionGap: ag,
    pco2Basis: venousEstimate ? 'venous_estimate' : 'measured',
    // the arterial PCO2 lies at or below the venous one, on average 4-6 mmHg lower: an added respiratory process
    // is named only when the whole span from venous - 6 to the venous value itself is outside the band
    pco2Range: venousEstimate ? { low: g.pco2 - VENOUS.pco2High, high: g.pco2 } : undefined,
  });
  derived.expectedPco2 = classification.expectedPco2;
  derived.expectedHco3 = classification.expectedHco3;
  explainCompensation(classification.compensation, reference, explain, gasInputs);

  if (reference.kind === 'pregnancy') flags.push(flag('pregnancy_reference', 'info', { pco2: reference.pco2, hco3: reference.hco3 }));
  if (reference.kind === 'baseline' && (reference.estimated.pco2 || reference.estimated.hco3)) {
    flags.push(flag('baseline_estimated', 'info', { pco2: round(reference.pco2, 1), hco3: round(reference.hco3, 1), pco2Estimated: reference.estimated.pco2, hco3Estimated: reference.estimated.hco3 }));
  }
  if (has(c.patient.ageYears) && c.patient.ageYears < 16) flags.push(flag('adult_rules_only', 'warning', { ageYears: c.patient.ageYears }));
  if (has(c.context.temperatureC) && Math.abs(c.context.temperatureC - 37) > 1) flags.push(flag('temperature_not_37', 'warning', { temperatureC: c.context.temperatureC }));

  otherMetabolic(c, sbe, derived, metabolic, explain, flags);
  const oxygenation = oxygenationPart(c, derived, explain, flags);
  const venous = venousPart(c, flags);
  const ventilation = ventilationPart(c, derived, explain, flags, classification, reference);
  criticalFlags(c, flags, false);

  const serial = serialPart(c, previous.at(-1) ?? null, derived, explain);
  return finish({
    withheld: false, case: c, phStatus: classification.phStatus, consistency, reference, compensation: classification.compensation,
    disorders: classification.disorders, derived, metabolic, oxygenation, ventilation, venous,
    previous, changes: changesSince(c), serial, flags,
  }, explain);
}

type Parts = Omit<Findings, 'ok' | 'units' | 'explain'>;

/** The findings as one object; the explanations are built the first time they are read. */
function finish(parts: Parts, thunks: Explainers): Findings {
  parts.flags.sort(bySeverity);
  roundDerived(parts.derived);
  if (parts.withheld) {
    // nothing is computed from a pressure that may be in the wrong unit
    const rec = parts.derived as unknown as Record<string, unknown>;
    for (const key of Object.keys(rec)) if (key !== 'hPlus') rec[key] = null;
    for (const key of Object.keys(thunks)) if (key !== 'hPlus') delete thunks[key];
  }
  return new Reading(parts, thunks);
}

/** One reading. `explain` is worked out on first use and kept (it is enumerable, so JSON carries it). */
class Reading implements Findings {
  readonly ok = true;
  withheld: boolean; units: Units; case: CanonicalCase; phStatus: PhStatus; consistency: Consistency | null;
  reference: ReferencePoint; compensation: Compensation | null; disorders: Disorder[]; derived: Derived; metabolic: Metabolic;
  oxygenation: Oxygenation; ventilation: Ventilation | null; venous: Venous | null; previous: PreviousGas[]; changes: Change[];
  serial: Serial | null; flags: Flag[];
  #thunks: Explainers;
  #built: Record<string, Explanation> | null = null;
  constructor(p: Parts, thunks: Explainers) {
    this.withheld = p.withheld; this.units = p.case.units; this.case = p.case; this.phStatus = p.phStatus;
    this.consistency = p.consistency; this.reference = p.reference; this.compensation = p.compensation;
    this.disorders = p.disorders; this.derived = p.derived; this.metabolic = p.metabolic; this.oxygenation = p.oxygenation;
    this.ventilation = p.ventilation; this.venous = p.venous; this.previous = p.previous; this.changes = p.changes;
    this.serial = p.serial; this.flags = p.flags;
    this.#thunks = thunks;
  }
  get explain(): Record<string, Explanation> {
    return (this.#built ??= Object.fromEntries(Object.entries(this.#thunks).map(([key, thunk]) => [key, thunk()])));
  }
  toJSON() {
    return { ...this, explain: this.explain };
  }
}

const classifyPhOnly = (ph: number): PhStatus => (ph < NORMAL.ph.low ? 'acidaemia' : ph > NORMAL.ph.high ? 'alkalaemia' : 'normal');

function emptyMetabolic(s: Settings): Metabolic {
  return {
    anionGapIncludesK: s.anionGapIncludesK, anionGapUpperLimit: s.anionGapNormal + s.anionGapHalfWidth,
    anionGapRaised: null, anionGapUsed: null, deltaBand: null, lactateBand: null, osmolarGapRaised: null,
    urineAnionGapNegative: null, urineChlorideResponsive: null,
  };
}

function notAssessed(c: CanonicalCase): Oxygenation {
  return {
    assessable: false, reason: c.sample === 'arterial' ? null : c.sample, barometricSource: 'sea_level', level: null, failureType: null,
    pfBand: null, pfBandApplies: false, sfMeetsCriterion: null, aaRaised: null, lowInspiredOrHypoventilation: false,
  };
}

function anionGapPart(c: CanonicalCase, d: Derived, m: Metabolic, explain: Explainers) {
  const ch = c.chemistry, g = c.gas, s = c.settings;
  if (!has(ch.na) || !has(ch.cl)) return null;
  const withK = s.anionGapIncludesK && has(ch.k);
  m.anionGapIncludesK = withK;
  const gap = anionGap(ch.na, ch.cl, g.hco3, withK ? ch.k : null);
  d.anionGap = gap;
  const inputs = [input('Na', ch.na, 'mmol/L'), input('Cl', ch.cl, 'mmol/L'), input('HCO3', g.hco3, 'mmol/L')];
  if (withK && has(ch.k)) inputs.splice(1, 0, input('K', ch.k, 'mmol/L'));
  explain.anionGap = () => explanation('anionGap', 'Anion gap', round(gap, 1), 'mmol/L', withK ? 'AG = Na + K - (Cl + HCO3)' : 'AG = Na - (Cl + HCO3)', inputs, 'kraut2007');
  let used = gap;
  m.anionGapUsed = 'uncorrected';
  if (has(ch.albumin)) {
    const corrected = albuminCorrectedAnionGap(gap, ch.albumin);
    d.anionGapCorrected = corrected;
    used = corrected;
    m.anionGapUsed = 'corrected';
    explain.anionGapCorrected = () => explanation('anionGapCorrected', 'Albumin-corrected anion gap', round(corrected, 1), 'mmol/L', 'AGc = AG + 2.5 x (4.0 - albumin g/dL)', [input('AG', round(gap, 1), 'mmol/L'), input('Albumin', ch.albumin!, 'g/dL')], 'figge1998');
  }
  const upper = s.anionGapNormal + s.anionGapHalfWidth;
  m.anionGapUpperLimit = upper;
  m.anionGapRaised = used > upper;
  const ratio = deltaRatio(used, g.hco3, s.anionGapNormal);
  d.deltaRatio = ratio;
  if (ratio !== null) {
    m.deltaBand = deltaRatioBand(ratio);
    explain.deltaRatio = () => explanation('deltaRatio', 'Delta ratio', round(ratio, 2), '', `delta ratio = (${m.anionGapUsed === 'corrected' ? 'AGc' : 'AG'} - ${s.anionGapNormal}) / (24 - HCO3)`, [input(m.anionGapUsed === 'corrected' ? 'AGc' : 'AG', round(used, 1), 'mmol/L'), input('HCO3', g.hco3, 'mmol/L')], 'wrenn1990');
  }
  return { value: used, upperLimit: upper, normal: s.anionGapNormal, deltaRatio: ratio };
}

function otherMetabolic(c: CanonicalCase, sbe: number, d: Derived, m: Metabolic, explain: Explainers, flags: Flag[]) {
  const ch = c.chemistry, g = c.gas, u = c.urine;
  if (has(g.lactate)) {
    m.lactateBand = lactateBand(g.lactate);
    if (m.lactateBand !== 'normal') flags.push(flag('lactate_raised', m.lactateBand === 'high' ? 'warning' : 'info', { lactate: g.lactate, band: m.lactateBand }));
  }
  if (has(ch.na) && has(ch.glucose) && has(ch.urea)) {
    const calc = calculatedOsmolality(ch.na, ch.glucose, ch.urea, ch.ethanol);
    d.calculatedOsmolality = calc;
    const inputs = [input('Na', ch.na, 'mmol/L'), input('Glucose', round(ch.glucose, 1), 'mmol/L'), input('Urea', round(ch.urea, 1), 'mmol/L')];
    if (has(ch.ethanol)) inputs.push(input('Ethanol', round(ch.ethanol, 1), 'mmol/L'));
    explain.calculatedOsmolality = () => explanation('calculatedOsmolality', 'Calculated osmolality', round(calc, 1), 'mOsm/kg',
      has(ch.ethanol) ? '2 Na + glucose + urea + ethanol mg/dL / 3.7 (mmol/L)' : '2 Na + glucose + urea (mmol/L)', inputs, 'purssell2001');
    if (has(ch.osmolality)) {
      const gap = osmolarGap(ch.osmolality, calc);
      d.osmolarGap = gap;
      m.osmolarGapRaised = osmolarGapRaised(gap);
      explain.osmolarGap = () => explanation('osmolarGap', 'Osmolar gap', round(gap, 1), 'mOsm/kg', 'measured - calculated osmolality', [input('Measured', ch.osmolality!, 'mOsm/kg'), input('Calculated', round(calc, 1), 'mOsm/kg')], 'purssell2001');
      if (m.osmolarGapRaised) flags.push(flag('osmolar_gap_raised', 'warning', { osmolarGap: round(gap, 1) }));
    }
  }
  if (has(ch.na) && has(ch.cl) && has(ch.albumin)) {
    const p = physicochemicalPartition(sbe, ch.na, ch.cl, ch.albumin);
    d.sodiumChlorideEffect = p.sodiumChloride; d.albuminEffect = p.albumin; d.unmeasuredIonEffect = p.unmeasured;
    explain.sodiumChlorideEffect = () => explanation('sodiumChlorideEffect', 'Na-Cl effect', round(p.sodiumChloride, 1), 'mmol/L', 'Na - Cl - 38', [input('Na', ch.na!, 'mmol/L'), input('Cl', ch.cl!, 'mmol/L')], 'story2004');
    explain.albuminEffect = () => explanation('albuminEffect', 'Albumin effect', round(p.albumin, 1), 'mmol/L', '0.25 x (42 - albumin g/L)', [input('Albumin', round(ch.albumin! * 10, 0), 'g/L')], 'story2004');
    explain.unmeasuredIonEffect = () => explanation('unmeasuredIonEffect', 'Unmeasured-ion effect', round(p.unmeasured, 1), 'mmol/L', 'SBE - (Na-Cl effect) - (albumin effect)', [input('SBE', round(sbe, 1), 'mmol/L'), input('Na-Cl effect', round(p.sodiumChloride, 1), 'mmol/L'), input('Albumin effect', round(p.albumin, 1), 'mmol/L')], 'story2004');
  }
  if (has(ch.na) && has(ch.k) && has(ch.ionisedCalcium) && has(ch.magnesium) && has(ch.cl) && has(g.lactate) && has(ch.albumin) && has(ch.phosphate)) {
    const sida = apparentStrongIonDifference({ na: ch.na, k: ch.k, ionisedCalcium: ch.ionisedCalcium, magnesium: ch.magnesium, cl: ch.cl, lactate: g.lactate });
    const side = effectiveStrongIonDifference(g.hco3, ch.albumin, ch.phosphate, g.ph);
    d.apparentSid = sida; d.effectiveSid = side; d.strongIonGap = strongIonGap(sida, side);
    explain.apparentSid = () => explanation('apparentSid', 'Apparent SID', round(sida, 1), 'mmol/L', 'Na + K + 2 iCa + 2 Mg - Cl - lactate', [input('Na', ch.na!, 'mmol/L'), input('K', ch.k!, 'mmol/L'), input('iCa', ch.ionisedCalcium!, 'mmol/L'), input('Mg', ch.magnesium!, 'mmol/L'), input('Cl', ch.cl!, 'mmol/L'), input('Lactate', g.lactate!, 'mmol/L')], 'kellum2005');
    explain.effectiveSid = () => explanation('effectiveSid', 'Effective SID', round(side, 1), 'mmol/L', 'HCO3 + albumin g/L x (0.123 pH - 0.631) + phosphate x (0.309 pH - 0.469)', [input('HCO3', g.hco3, 'mmol/L'), input('Albumin', round(ch.albumin! * 10, 0), 'g/L'), input('Phosphate', ch.phosphate!, 'mmol/L'), input('pH', g.ph, '')], 'kellum2005');
    explain.strongIonGap = () => explanation('strongIonGap', 'Strong ion gap', round(d.strongIonGap!, 1), 'mmol/L', 'SIG = SIDa - SIDe', [input('SIDa', round(sida, 1), 'mmol/L'), input('SIDe', round(side, 1), 'mmol/L')], 'kellum2005');
  }
  if (has(u.na) && has(u.k) && has(u.cl)) {
    const uag = urineAnionGap(u.na, u.k, u.cl);
    d.urineAnionGap = uag;
    m.urineAnionGapNegative = uag < 0;
    explain.urineAnionGap = () => explanation('urineAnionGap', 'Urine anion gap', round(uag, 0), 'mmol/L', 'uNa + uK - uCl', [input('Urine Na', u.na!, 'mmol/L'), input('Urine K', u.k!, 'mmol/L'), input('Urine Cl', u.cl!, 'mmol/L')], 'commonPractice');
  }
  if (has(u.cl)) m.urineChlorideResponsive = chlorideResponsive(u.cl);
}

function explainCompensation(comp: Compensation | null, ref: ReferencePoint, explain: Explainers, gasInputs: () => ReturnType<typeof input>[]) {
  if (!comp) return;
  const mid = (b: Band) => round((b.low + b.high) / 2, 1);
  const refInputs = [input('Reference PaCO2', round(ref.pco2, 1), 'mmHg'), input('Reference HCO3', round(ref.hco3, 1), 'mmol/L')];
  switch (comp.rule) {
    case 'winters':
      explain.expectedPco2 = () => explanation('expectedPco2', 'Expected PaCO2 (Winters)', mid(comp.expected), 'mmHg', 'PaCO2 = 1.5 x HCO3 + 8 (+/- 2)', gasInputs().slice(2), 'winters');
      break;
    case 'metabolic_alkalosis':
      explain.expectedPco2 = () => explanation('expectedPco2', 'Expected PaCO2 (metabolic alkalosis)', mid(comp.expected), 'mmHg', 'PaCO2 = 0.7 x HCO3 + 21 (+/- 2)', gasInputs().slice(2), 'berend2014');
      break;
    case 'respiratory_acidosis':
      explain.expectedHco3 = () => explanation('expectedHco3', 'Expected HCO3 (respiratory acidosis)', mid(comp.expected), 'mmol/L',
        comp.timing === 'acute' ? 'HCO3 = ref HCO3 + 1 x (PaCO2 - ref PaCO2) / 10 (+/- 2)' : comp.timing === 'chronic' ? 'HCO3 = ref HCO3 + 3.5 x (PaCO2 - ref PaCO2) / 10 (+/- 2)' : 'from acute (1 per 10 mmHg) to chronic (3.5 per 10 mmHg), +/- 2',
        [gasInputs()[1]!, ...refInputs], 'berend2014');
      break;
    case 'respiratory_alkalosis':
      explain.expectedHco3 = () => explanation('expectedHco3', 'Expected HCO3 (respiratory alkalosis)', mid(comp.expected), 'mmol/L',
        comp.timing === 'acute' ? 'HCO3 = ref HCO3 - 2 x (ref PaCO2 - PaCO2) / 10 (+/- 2)' : comp.timing === 'chronic' ? 'HCO3 = ref HCO3 - 4 to 5 x (ref PaCO2 - PaCO2) / 10 (+/- 2)' : 'from acute (2 per 10 mmHg) to chronic (4-5 per 10 mmHg), +/- 2',
        [gasInputs()[1]!, ...refInputs], 'berend2014');
      break;
  }
}

function oxygenationPart(c: CanonicalCase, d: Derived, explain: Explainers, flags: Flag[]): Oxygenation {
  const o = notAssessed(c);
  const g = c.gas, ox = c.oxygen;
  // SpO2/FiO2 needs no arterial PO2: it is the 2024 global definition's measure when no arterial gas is at hand
  if (has(ox.spo2) && has(ox.fio2)) {
    const sf = sfRatio(ox.spo2, ox.fio2);
    d.sfRatio = sf;
    o.sfMeetsCriterion = sfMeetsCriterion(ox.spo2, sf);
    explain.sfRatio = () => explanation('sfRatio', 'SpO2/FiO2', round(sf, 0), '', 'S/F = SpO2 % / FiO2', [input('SpO2', ox.spo2!, '%'), input('FiO2', ox.fio2!, '')], 'ardsGlobal2024');
  }
  if (c.sample !== 'arterial') {
    flags.push(flag('oxygenation_not_assessable', 'info', { sample: c.sample }));
    return o;
  }
  o.assessable = has(g.po2);
  let pb: number = PHYSIOLOGY.seaLevelMmHg;
  if (has(c.context.barometricPressure)) { pb = c.context.barometricPressure; o.barometricSource = 'entered'; }
  else if (has(c.context.altitudeM)) {
    pb = barometricPressureAtAltitude(c.context.altitudeM); o.barometricSource = 'altitude';
    explain.barometricPressure = () => explanation('barometricPressure', 'Barometric pressure', round(pb, 0), 'mmHg', 'PB = 760 x (1 - 2.25577e-5 x altitude m)^5.25588', [input('Altitude', c.context.altitudeM!, 'm')], 'isa');
  }
  d.barometricPressure = pb;
  if (has(g.hb) && has(g.sao2)) {
    d.oxygenContent = oxygenContent(g.hb, g.sao2, g.po2 ?? 0);
    if (has(g.po2)) {
      explain.oxygenContent = () => explanation('oxygenContent', 'O2 content', round(d.oxygenContent!, 1), 'mL/dL', 'CaO2 = 1.34 x Hb x SaO2 + 0.003 x PaO2', [input('Hb', round(g.hb!, 1), 'g/dL'), input('SaO2', g.sao2!, '%'), input('PaO2', round(g.po2!, 1), 'mmHg')], 'oxygenContent');
    } else d.oxygenContent = null;
  }
  if (!has(g.po2)) return o;
  o.level = oxygenationLevel(g.po2);
  if (g.po2 < OXYGENATION.respiratoryFailure) o.failureType = g.pco2 > OXYGENATION.hypercapnia ? 2 : 1;
  if (!has(ox.fio2)) {
    flags.push(flag('fio2_missing', 'info', {}));
    return o;
  }
  const pao2 = alveolarPo2(ox.fio2, g.pco2, pb);
  d.alveolarPo2 = pao2;
  explain.alveolarPo2 = () => explanation('alveolarPo2', 'Alveolar PO2', round(pao2, 1), 'mmHg', 'PAO2 = FiO2 x (PB - 47) - PaCO2 / 0.8', [input('FiO2', ox.fio2!, ''), input('PB', round(pb, 0), 'mmHg'), input('PaCO2', round(g.pco2, 1), 'mmHg')], 'alveolarGas');
  const gradient = aaGradient(pao2, g.po2);
  d.aaGradient = gradient;
  explain.aaGradient = () => explanation('aaGradient', 'A-a gradient', round(gradient, 1), 'mmHg', 'A-a = PAO2 - PaO2', [input('PAO2', round(pao2, 1), 'mmHg'), input('PaO2', round(g.po2!, 1), 'mmHg')], 'alveolarGas');
  if (g.po2 > pao2) flags.push(flag('po2_above_alveolar', 'warning', { po2: round(g.po2, 1), alveolarPo2: round(pao2, 1), fio2: ox.fio2 }));
  const roomAir = Math.abs(ox.fio2 - OXYGENATION.roomAirFio2) < 0.005;
  if (has(c.patient.ageYears)) {
    const expected = expectedAaGradient(c.patient.ageYears);
    d.aaGradientExpected = expected;
    explain.aaGradientExpected = () => explanation('aaGradientExpected', 'Expected A-a gradient (room air)', round(expected, 0), 'mmHg', 'age / 4 + 4', [input('Age', c.patient.ageYears!, 'years')], 'aaAge');
    if (roomAir) {
      o.aaRaised = gradient > expected;
      o.lowInspiredOrHypoventilation = o.level !== 'normal' && !o.aaRaised;
    } else flags.push(flag('aa_reference_room_air_only', 'info', { fio2: ox.fio2 }));
  }
  const pf = pfRatio(g.po2, ox.fio2);
  d.pfRatio = pf;
  explain.pfRatio = () => explanation('pfRatio', 'P/F ratio', round(pf, 0), 'mmHg', 'P/F = PaO2 / FiO2', [input('PaO2', round(g.po2!, 1), 'mmHg'), input('FiO2', ox.fio2!, '')], 'ardsBerlin');
  o.pfBandApplies = has(ox.peep) && ox.peep >= OXYGENATION.pfMinimumPeep;
  o.pfBand = pfBand(pf);
  return o;
}

function venousPart(c: CanonicalCase, flags: Flag[]): Venous | null {
  if (c.sample === 'arterial') return null;
  const g = c.gas;
  const venous = c.sample === 'venous';
  flags.push(flag(venous ? 'venous_sample' : 'capillary_sample', 'warning', { pco2: round(g.pco2, 1) }));
  return {
    sample: venous ? 'venous' : 'capillary',
    hypercapniaUnlikely: venous && g.pco2 < VENOUS.hypercapniaBelow,
    arterialEstimate: venous && g.pco2 >= VENOUS.minPco2
      ? { ph: round(g.ph + VENOUS.ph, 2), pco2Low: round(g.pco2 - VENOUS.pco2High, 0), pco2High: round(g.pco2 - VENOUS.pco2Low, 0), hco3: round(g.hco3 - VENOUS.hco3, 1) }
      : null,
  };
}

function ventilationPart(c: CanonicalCase, d: Derived, explain: Explainers, flags: Flag[], cl: Classification, ref: ReferencePoint): Ventilation | null {
  const v = c.ventilator;
  if (!v) return null;
  const g = c.gas, p = c.patient, peep = c.oxygen.peep;
  const out: Ventilation = {
    ventilated: true, deadSpaceSource: null, targetSource: null, targetForm: null,
    recheckMinutes: { ...VENTILATION.recheckMinutes }, compensationTarget: null, usualPco2: null,
  };
  let pbw: N = null;
  if (p.sex && has(p.heightCm)) {
    if (p.heightCm < 130) flags.push(flag('pbw_not_applicable', 'warning', { heightCm: p.heightCm }));
    else {
      pbw = predictedBodyWeight(p.sex, p.heightCm);
      d.predictedBodyWeightKg = pbw;
      explain.predictedBodyWeightKg = () => explanation('predictedBodyWeightKg', 'Predicted body weight', round(pbw!, 1), 'kg', `${p.sex === 'male' ? '50' : '45.5'} + 0.91 x (height cm - 152.4)`, [input('Height', p.heightCm!, 'cm')], 'ardsnet2000');
    }
  }
  if (has(v.vt) && pbw !== null) {
    d.vtPerKgPbw = vtPerKg(v.vt, pbw);
    explain.vtPerKgPbw = () => explanation('vtPerKgPbw', 'VT per kg PBW', round(d.vtPerKgPbw!, 1), 'mL/kg', 'VT / PBW', [input('VT', v.vt!, 'mL'), input('PBW', round(pbw, 1), 'kg')], 'ardsnet2000');
    if (d.vtPerKgPbw > VENTILATION.vtHighPerKg) flags.push(flag('vt_above_8_ml_per_kg', 'warning', { which: 'current', vt: v.vt, vtPerKg: round(d.vtPerKgPbw, 1) }));
  }
  if (has(v.rr) && v.rr > VENTILATION.rrMax) flags.push(flag('rr_above_35', 'warning', { which: 'current', rr: v.rr }));
  if (has(v.pplat)) {
    if (v.pplat > VENTILATION.plateauMax) flags.push(flag('plateau_above_30', 'warning', { pplat: v.pplat }));
    if (has(peep)) {
      d.drivingPressure = drivingPressure(v.pplat, peep);
      explain.drivingPressure = () => explanation('drivingPressure', 'Driving pressure', round(d.drivingPressure!, 0), 'cmH2O', 'Pplat - PEEP', [input('Pplat', v.pplat!, 'cmH2O'), input('PEEP', peep, 'cmH2O')], 'amato2015');
      if (d.drivingPressure > VENTILATION.drivingPressureMax) flags.push(flag('driving_pressure_above_15', 'warning', { drivingPressure: round(d.drivingPressure, 0) }));
    }
  }
  // dead space: a measured VD/VT first, else the anatomic estimate plus apparatus
  let vd: N = null;
  if (has(v.deadSpaceFraction) && has(v.vt)) {
    vd = v.deadSpaceFraction * v.vt; out.deadSpaceSource = 'measured_fraction';
    explain.deadSpaceMl = () => explanation('deadSpaceMl', 'Dead space', round(vd!, 0), 'mL', 'VD = VD/VT x VT', [input('VD/VT', v.deadSpaceFraction!, ''), input('VT', v.vt!, 'mL')], 'west');
  } else if (pbw !== null) {
    vd = estimatedDeadSpace(pbw, v.deadSpaceMl ?? 0); out.deadSpaceSource = 'estimated';
    explain.deadSpaceMl = () => explanation('deadSpaceMl', 'Dead space (estimate)', round(vd!, 0), 'mL', '2.2 mL/kg x PBW + apparatus dead space', [input('PBW', round(pbw, 1), 'kg'), input('Apparatus', v.deadSpaceMl ?? 0, 'mL')], 'radford1955');
  }
  d.deadSpaceMl = vd;
  if (has(v.rr) && has(v.vt)) {
    d.minuteVentilation = minuteVentilation(v.rr, v.vt);
    explain.minuteVentilation = () => explanation('minuteVentilation', 'Minute ventilation', round(d.minuteVentilation!, 1), 'L/min', 'VE = RR x VT', [input('RR', v.rr!, '/min'), input('VT', v.vt!, 'mL')], 'west');
    if (vd !== null) {
      if (v.vt - vd <= 0) flags.push(flag('dead_space_exceeds_vt', 'warning', { vt: v.vt, deadSpace: round(vd, 0) }));
      else {
        const va = alveolarVentilation(v.rr, v.vt, vd);
        d.alveolarVentilation = va;
        d.co2Production = co2ProductionEstimate(g.pco2, va);
        explain.alveolarVentilation = () => explanation('alveolarVentilation', 'Alveolar ventilation', round(va, 1), 'L/min', 'VA = RR x (VT - VD)', [input('RR', v.rr!, '/min'), input('VT', v.vt!, 'mL'), input('VD', round(vd, 0), 'mL')], 'west');
        explain.co2Production = () => explanation('co2Production', 'CO2 production (estimate)', round(d.co2Production!, 0), 'mL/min', 'VCO2 = PaCO2 x VA / 0.863', [input('PaCO2', round(g.pco2, 1), 'mmHg'), input('VA', round(va, 2), 'L/min')], 'west');
      }
    }
    if (pbw !== null) {
      d.ventilatoryRatio = ventilatoryRatio(v.rr * v.vt, g.pco2, pbw);
      explain.ventilatoryRatio = () => explanation('ventilatoryRatio', 'Ventilatory ratio', round(d.ventilatoryRatio!, 2), '', '(VE mL/min x PaCO2) / (PBW x 100 x 37.5)', [input('VE', v.rr! * v.vt!, 'mL/min'), input('PaCO2', round(g.pco2, 1), 'mmHg'), input('PBW', round(pbw, 1), 'kg')], 'sinha2009');
    }
  }

  // the target PaCO2 (clinical-scope section 8)
  let target: N = null;
  if (has(v.targetPco2)) { target = v.targetPco2; out.targetSource = 'target_pco2'; out.targetForm = 'as_given'; }
  else if (has(v.targetPh)) {
    const hTarget = hydrogenIon(v.targetPh);
    d.targetPco2Simple = targetPco2Simple(hTarget, g.hco3);
    explain.targetPco2Simple = () => explanation('targetPco2Simple', 'Target PaCO2 (HCO3 held constant)', round(d.targetPco2Simple!, 1), 'mmHg', 'PaCO2_t = [H+]_t x HCO3 / 24', [input('[H+] at target pH', round(hTarget, 1), 'nmol/L'), input('HCO3', g.hco3, 'mmol/L')], 'henderson');
    target = targetPco2Buffered(hTarget, g.hco3, g.pco2);
    out.targetSource = 'target_ph'; out.targetForm = 'acute_buffering';
    if (target === null) flags.push(flag('target_not_reachable', 'warning', { targetPh: v.targetPh }));
    else explain.targetPco2 = () => explanation('targetPco2', 'Target PaCO2 (acute buffering)', round(target!, 1), 'mmHg', 'PaCO2_t = [H+]_t x (HCO3 - 0.1 x PaCO2) / (24 - 0.1 x [H+]_t)', [input('Target pH', v.targetPh!, ''), input('[H+] at target pH', round(hTarget, 1), 'nmol/L'), input('HCO3', g.hco3, 'mmol/L'), input('PaCO2 now', round(g.pco2, 1), 'mmHg')], 'targetPco2');
  } else flags.push(flag('no_ventilation_target', 'info', {}));
  d.targetPco2 = target;
  if (target === null) return out;
  if (target < VENTILATOR_RANGES.targetPco2.min) {
    // a target below the lowest plausible PaCO2 is not a ventilator setting to suggest
    flags.push(flag('target_not_reachable', 'warning', { targetPh: v.targetPh, targetPco2: round(target, 1) }));
    d.targetPco2 = null;
    delete explain.targetPco2;
    return out;
  }
  if (c.sample !== 'arterial') flags.push(flag('suggestion_from_venous_pco2', 'warning', { sample: c.sample }));

  if (has(v.rr) && has(v.vt)) {
    const rr = Math.round(rrForTarget(v.rr, g.pco2, target));
    d.suggestedRr = rr;
    explain.suggestedRr = () => explanation('suggestedRr', 'RR at unchanged VT', rr, '/min', 'RR_new = RR x PaCO2 now / PaCO2 target', [input('RR', v.rr!, '/min'), input('PaCO2 now', round(g.pco2, 1), 'mmHg'), input('PaCO2 target', round(target, 1), 'mmHg')], 'west');
    if (rr > VENTILATION.rrMax) flags.push(flag('rr_above_35', 'warning', { which: 'suggested', rr }));
    if (vd !== null && v.vt - vd > 0) {
      const vt = Math.round(vtForTarget(v.vt, vd, g.pco2, target) / 10) * 10;
      d.suggestedVt = vt;
      explain.suggestedVt = () => explanation('suggestedVt', 'VT at unchanged RR', vt, 'mL', 'VT_new = VD + (VT - VD) x PaCO2 now / PaCO2 target', [input('VT', v.vt!, 'mL'), input('VD', round(vd, 0), 'mL'), input('PaCO2 now', round(g.pco2, 1), 'mmHg'), input('PaCO2 target', round(target, 1), 'mmHg')], 'west');
      if (pbw !== null) {
        d.suggestedVtPerKgPbw = vt / pbw;
        if (d.suggestedVtPerKgPbw > VENTILATION.vtHighPerKg) flags.push(flag('vt_above_8_ml_per_kg', 'warning', { which: 'suggested', vt, vtPerKg: round(d.suggestedVtPerKgPbw, 1) }));
      }
    }
    const lungProtective = d.vtPerKgPbw !== null && d.vtPerKgPbw <= VENTILATION.vtHighPerKg;
    // permissive hypercapnia is worth weighing only when neither route reaches the target within limits
    const hardToReach = rr > VENTILATION.rrMax && (d.suggestedVtPerKgPbw === null || d.suggestedVtPerKgPbw > VENTILATION.vtHighPerKg);
    if (lungProtective && hardToReach && target < g.pco2) flags.push(flag('permissive_hypercapnia_possible', 'info', { pco2: round(g.pco2, 1), target: round(target, 1) }));
  }

  // a target below what the patient needs (clinical-scope section 8)
  const metabolicAcidosis = cl.disorders.some((x) => x.code === 'metabolic_acidosis');
  if (metabolicAcidosis && g.hco3 < NORMAL.hco3.low) {
    out.compensationTarget = wintersPco2(g.hco3);
    if (target > out.compensationTarget.high) flags.push(flag('target_pco2_above_compensation', 'warning', { target: round(target, 1), expectedLow: round(out.compensationTarget.low, 1), expectedHigh: round(out.compensationTarget.high, 1) }));
  }
  const usual = usualPco2(c, cl, ref);
  out.usualPco2 = usual;
  if (usual !== null && target < usual) flags.push(flag('target_pco2_below_baseline', 'warning', { target: round(target, 1), usual: round(usual, 1), estimated: ref.kind !== 'baseline' || ref.estimated.pco2 }));
  return out;
}

/** The patient's usual PaCO2 in chronic hypercapnia: stated, estimated from the baseline, or from the chronic HCO3. */
function usualPco2(c: CanonicalCase, cl: Classification, ref: ReferencePoint): N {
  if (ref.kind === 'baseline') return ref.pco2 > NORMAL.pco2.high ? ref.pco2 : null;
  const chronicHypercapnia = cl.disorders.some((x) => x.code === 'respiratory_acidosis' && (x.detail === 'chronic' || x.detail === 'acute_on_chronic'));
  if (!chronicHypercapnia) return null;
  // invert the chronic rule (Berend 2014): usual PaCO2 = 40 + (HCO3 - 24) x 10 / 3.5, an estimate
  const estimate = 40 + ((c.gas.hco3 - 24) * 10) / 3.5;
  return estimate > NORMAL.pco2.high ? Math.min(estimate, c.gas.pco2) : null;
}

function criticalFlags(c: CanonicalCase, flags: Flag[], withheld: boolean) {
  const k = c.settings.critical, g = c.gas;
  const crit = (field: string, value: number, limit: number, direction: 'below' | 'above') =>
    flags.push(flag('critical_value', 'critical', { field, value: round(value, field === 'ph' ? 2 : 1), limit, direction }));
  if (g.ph < k.phLow) crit('ph', g.ph, k.phLow, 'below');
  if (g.ph > k.phHigh) crit('ph', g.ph, k.phHigh, 'above');
  if (!withheld) {
    if (g.pco2 > k.pco2High) crit('pco2', g.pco2, k.pco2High, 'above');
    if (c.sample === 'arterial' && has(g.po2) && g.po2 < k.po2Low) crit('po2', g.po2, k.po2Low, 'below');
  }
  const potassium = c.chemistry.k;
  if (has(potassium) && potassium < k.kLow) crit('k', potassium, k.kLow, 'below');
  if (has(potassium) && potassium > k.kHigh) crit('k', potassium, k.kHigh, 'above');
  if (has(g.lactate) && g.lactate >= k.lactateHigh) crit('lactate', g.lactate, k.lactateHigh, 'above');
}

/** Earlier gases in time order: by takenAt when every one has an ISO date and time, else as entered. */
export function inTimeOrder<T extends { takenAt: string | null }>(gases: T[]): T[] {
  const iso = /^\d{4}-\d{2}-\d{2}([T ]\d{2}:\d{2}(:\d{2})?)?/;
  if (!gases.every((g) => g.takenAt !== null && iso.test(g.takenAt))) return gases;
  return gases.map((g, i) => ({ g, i })).sort((a, b) => (a.g.takenAt! < b.g.takenAt! ? -1 : a.g.takenAt! > b.g.takenAt! ? 1 : a.i - b.i)).map((x) => x.g);
}

function changesSince(c: CanonicalCase): Change[] {
  const last = inTimeOrder(c.previous).at(-1);
  if (!last) return [];
  const out: Change[] = [];
  const fields = ['ph', 'pco2', 'hco3', 'po2', 'lactate'] as const;
  for (const field of fields) {
    const from = last.gas[field], to = c.gas[field];
    if (has(from) && has(to)) out.push({ field, from, to, change: to - from });
  }
  return out;
}

/** Did the new PaCO2 follow the ventilator change as the alveolar ventilation equation predicts (West)? */
function serialPart(c: CanonicalCase, last: PreviousGas | null, d: Derived, explain: Explainers): Serial | null {
  if (!last) return null;
  const v = c.ventilator;
  const out: Serial = { last, ventilatorChanged: false, prediction: null, predictionUnavailable: null };
  if (!v || !has(v.vt) || !has(v.rr) || !has(last.vt) || !has(last.rr)) {
    out.predictionUnavailable = 'settings_missing';
    return out;
  }
  out.ventilatorChanged = v.vt !== last.vt || v.rr !== last.rr;
  if (!out.ventilatorChanged) { out.predictionUnavailable = 'settings_unchanged'; return out; }
  // with VT unchanged, VA scales with RR whatever the dead space; otherwise the dead space per breath is needed
  const vd = d.deadSpaceMl ?? (v.vt === last.vt ? 0 : null);
  if (vd === null || last.vt - vd <= 0 || v.vt - vd <= 0) { out.predictionUnavailable = 'dead_space_unknown'; return out; }
  const vaBefore = alveolarVentilation(last.rr, last.vt, vd), vaNow = alveolarVentilation(v.rr, v.vt, vd);
  const predicted = predictedPco2AfterChange(last.gas.pco2, vaBefore, vaNow);
  const observed = c.gas.pco2, difference = observed - predicted;
  const tolerance = Math.max(SERIAL.pco2Absolute, SERIAL.pco2Relative * predicted);
  out.prediction = { vaBefore, vaNow, predicted, observed, difference, verdict: Math.abs(difference) <= tolerance ? 'as_predicted' : difference > 0 ? 'higher' : 'lower' };
  d.predictedPco2 = predicted;
  explain.predictedPco2 = () => explanation('predictedPco2', 'PaCO2 predicted after the ventilator change', round(predicted, 1), 'mmHg', 'PaCO2_new = PaCO2_before x VA_before / VA_now, VA = RR x (VT - VD)',
    [input('PaCO2 before', round(last.gas.pco2, 1), 'mmHg'), input('RR before', last.rr!, '/min'), input('VT before', last.vt!, 'mL'), input('RR now', v.rr!, '/min'), input('VT now', v.vt!, 'mL'), input(d.deadSpaceMl === null ? 'VD (cancels out: VT unchanged)' : 'VD', round(vd, 0), 'mL')], 'west');
  return out;
}


const r = (value: number | null, decimals: number): number | null => (value === null ? null : round(value, decimals));

/** Derived values rounded for reporting (the decisions above used the unrounded values). */
function roundDerived(d: Derived) {
  d.hPlus = round(d.hPlus, 1);
  d.hco3Henderson = r(d.hco3Henderson, 1);
  d.phHendersonHasselbalch = r(d.phHendersonHasselbalch, 2);
  d.anionGap = r(d.anionGap, 1);
  d.anionGapCorrected = r(d.anionGapCorrected, 1);
  d.deltaRatio = r(d.deltaRatio, 2);
  d.standardBaseExcess = r(d.standardBaseExcess, 1);
  d.sodiumChlorideEffect = r(d.sodiumChlorideEffect, 1);
  d.albuminEffect = r(d.albuminEffect, 1);
  d.unmeasuredIonEffect = r(d.unmeasuredIonEffect, 1);
  d.apparentSid = r(d.apparentSid, 1);
  d.effectiveSid = r(d.effectiveSid, 1);
  d.strongIonGap = r(d.strongIonGap, 1);
  d.calculatedOsmolality = r(d.calculatedOsmolality, 1);
  d.osmolarGap = r(d.osmolarGap, 1);
  d.urineAnionGap = r(d.urineAnionGap, 0);
  d.barometricPressure = r(d.barometricPressure, 0);
  d.alveolarPo2 = r(d.alveolarPo2, 1);
  d.aaGradient = r(d.aaGradient, 1);
  d.aaGradientExpected = r(d.aaGradientExpected, 0);
  d.pfRatio = r(d.pfRatio, 0);
  d.sfRatio = r(d.sfRatio, 0);
  d.oxygenContent = r(d.oxygenContent, 1);
  d.predictedBodyWeightKg = r(d.predictedBodyWeightKg, 1);
  d.vtPerKgPbw = r(d.vtPerKgPbw, 1);
  d.drivingPressure = r(d.drivingPressure, 0);
  d.deadSpaceMl = r(d.deadSpaceMl, 0);
  d.minuteVentilation = r(d.minuteVentilation, 1);
  d.alveolarVentilation = r(d.alveolarVentilation, 1);
  d.co2Production = r(d.co2Production, 0);
  d.ventilatoryRatio = r(d.ventilatoryRatio, 2);
  d.targetPco2 = r(d.targetPco2, 1);
  d.targetPco2Simple = r(d.targetPco2Simple, 1);
  d.suggestedRr = r(d.suggestedRr, 0);
  d.suggestedVt = r(d.suggestedVt, 0);
  d.suggestedVtPerKgPbw = r(d.suggestedVtPerKgPbw, 1);
  d.predictedPco2 = r(d.predictedPco2, 1);
  for (const key of ['expectedPco2', 'expectedHco3'] as const) {
    const b = d[key];
    if (b) d[key] = { low: round(b.low, 1), high: round(b.high, 1) };
  }
}
