// interpret(case): validate, convert once, compute every finding, and say how each number was reached.
import {
  parseCase,
  type FieldError,
  type CaseInput,
  type ParsedCase,
  GAS_RANGES,
  rangeText,
} from './schema.ts';
import { canonicalize, type CanonicalCase, type Gas } from './canonical.ts';
import { mergeSettings, NORMAL, UNIT_SCREEN, VENOUS } from './reference.ts';
import {
  hendersonBicarbonate,
  hendersonConsistency,
  hendersonHasselbalchPh,
  hydrogenIon,
  type Consistency,
} from './acidBase.ts';
import {
  classify,
  referencePoint,
  type Band,
  type Classification,
  type Compensation,
  type Disorder,
  type PhStatus,
  type ReferencePoint,
} from './compensation.ts';
import { standardBaseExcess } from './physicochemical.ts';
import { bySeverity, flag, type Flag } from './flags.ts';
import { explanation, input, round, type Explanation } from './explain.ts';
import type { Units } from './units.ts';
import {
  type Derived,
  type Metabolic,
  type Oxygenation,
  type Ventilation,
  type Venous,
  type PreviousGas,
  type Change,
  type Serial,
  type Findings,
  type Rejected,
  type InterpretOptions,
  has,
  type Explainers,
} from './findings.ts';
import { emptyMetabolic, anionGapPart, otherMetabolic } from './readMetabolic.ts';
import { notAssessed, oxygenationPart, venousPart } from './readOxygenation.ts';
import { ventilationPart } from './readVentilation.ts';
import { inTimeOrder, changesSince, serialPart } from './readSerial.ts';

/** The whole reading of one case. Pure: the same case always gives the same findings. */
export function interpret(
  raw: CaseInput | unknown,
  options: InterpretOptions = {},
): Findings | Rejected {
  const parsed = parseCase(raw);
  if (!parsed.ok) return { ok: false, errors: parsed.errors };
  return interpretParsed(parsed.value, options);
}

/** The reading of a case that has already passed caseSchema (the server's validator, say). */
export function interpretParsed(
  value: ParsedCase,
  options: InterpretOptions = {},
): Findings | Rejected {
  const c = canonicalize(value);
  if (options.settings) {
    const rawSettings = value.settings ?? {};
    const department = mergeSettings({
      ...options.settings,
      critical: { ...options.settings.critical },
    });
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
      errors.push({
        path: `${prefix}.${g.computed}`,
        message: `${range.label} worked out from the other two values would be ${Number.isFinite(value) ? round(value, 2) : 'undefined'}, outside ${rangeText(range, c.units)}: check the entered values`,
      });
    }
  };
  check(c.gas, 'gas');
  for (const [i, p] of c.previous.entries()) check(p.gas, `previous.${i}.gas`);
  return errors;
}

function emptyDerived(hPlus: number, sbe: number, gas: Gas): Derived {
  return {
    hPlus,
    hco3Henderson: hendersonBicarbonate(hPlus, gas.pco2),
    phHendersonHasselbalch: hendersonHasselbalchPh(gas.pco2, gas.hco3),
    anionGap: null,
    anionGapCorrected: null,
    deltaRatio: null,
    expectedPco2: null,
    expectedHco3: null,
    standardBaseExcess: sbe,
    sodiumChlorideEffect: null,
    albuminEffect: null,
    unmeasuredIonEffect: null,
    apparentSid: null,
    effectiveSid: null,
    strongIonGap: null,
    calculatedOsmolality: null,
    osmolarGap: null,
    urineAnionGap: null,
    barometricPressure: null,
    alveolarPo2: null,
    aaGradient: null,
    aaGradientExpected: null,
    pfRatio: null,
    sfRatio: null,
    oxygenContent: null,
    predictedBodyWeightKg: null,
    vtPerKgPbw: null,
    drivingPressure: null,
    deadSpaceMl: null,
    minuteVentilation: null,
    alveolarVentilation: null,
    co2Production: null,
    ventilatoryRatio: null,
    targetPco2: null,
    targetPco2Simple: null,
    suggestedRr: null,
    suggestedVt: null,
    suggestedVtPerKgPbw: null,
    predictedPco2: null,
  };
}

/** PaCO2 that looks like the other pressure unit, with a near-normal pH, and no HCO3 that settles it. */
export function unitLooksMixed(c: CanonicalCase): boolean {
  const g = c.gas;
  // a PaCO2 worked out from pH and HCO3 was not entered in any unit
  if (g.computed === 'pco2') return false;
  if (g.ph < UNIT_SCREEN.phLow || g.ph > UNIT_SCREEN.phHigh) return false;
  const suspicious =
    c.units.pressure === 'mmHg'
      ? g.pco2 < UNIT_SCREEN.pco2MmHgBelow
      : g.pco2 > UNIT_SCREEN.pco2MmHgBelow * 7.50062;
  if (!suspicious) return false;
  // an entered HCO3 that agrees with the reading as entered settles it: a real, extreme value
  if (g.complete && hendersonConsistency(g.ph, g.pco2, g.hco3).consistent) return false;
  return true;
}

function readCase(c: CanonicalCase): Findings {
  const g = c.gas;
  const s = c.settings;
  const hPlus = hydrogenIon(g.ph);
  const sbe = standardBaseExcess(g.ph, g.hco3);
  const derived = emptyDerived(hPlus, sbe, g);
  const flags: Flag[] = [];
  const explain: Explainers = {};
  const P = 'mmHg',
    M = 'mmol/L';
  const gasInputs = () => [
    input('pH', g.ph, ''),
    input('PaCO2', g.pco2, P),
    input('HCO3', g.hco3, M),
  ];

  explain.hPlus = () =>
    explanation(
      'hPlus',
      '[H+]',
      round(hPlus, 1),
      'nmol/L',
      '[H+] = 10^(9 - pH)',
      [input('pH', g.ph, '')],
      'hydrogenIon',
    );
  explain.hco3Henderson = () =>
    explanation(
      'hco3Henderson',
      'HCO3 from the Henderson equation',
      round(derived.hco3Henderson!, 1),
      M,
      'HCO3 = 24 x PaCO2 / [H+]',
      [input('PaCO2', g.pco2, P), input('[H+]', round(hPlus, 1), 'nmol/L')],
      'henderson',
    );
  explain.phHendersonHasselbalch = () =>
    explanation(
      'phHendersonHasselbalch',
      'pH from Henderson-Hasselbalch',
      round(derived.phHendersonHasselbalch!, 2),
      '',
      'pH = 6.1 + log10(HCO3 / (0.0307 x PaCO2))',
      [input('HCO3', g.hco3, M), input('PaCO2', g.pco2, P)],
      'hendersonHasselbalch',
    );
  explain.standardBaseExcess = () =>
    explanation(
      'standardBaseExcess',
      'Standard base excess',
      round(sbe, 1),
      M,
      'SBE = 0.93 x (HCO3 - 24.4 + 14.8 x (pH - 7.40))',
      [input('HCO3', g.hco3, M), input('pH', g.ph, '')],
      'clsiC46',
    );

  if (g.computed)
    flags.push(
      flag('gas_value_computed', 'info', {
        field: g.computed,
        value: round(g[g.computed], g.computed === 'ph' ? 2 : 1),
      }),
    );

  // a pressure in doubt (unit_ambiguous, below) puts the usual PaCO2 in doubt too: the textbook reference then
  const withheld = unitLooksMixed(c);
  const reference = withheld
    ? referencePoint(null, c.patient.pregnant, g.hco3)
    : referencePoint(c.context.baseline, c.patient.pregnant, g.hco3, g.pco2);
  const previous = inTimeOrder(c.previous).map((p) => ({ ...p, hPlus: hydrogenIon(p.gas.ph) }));

  // A likely unit slip: ask, compute nothing from the pressure (clinical-scope section 3).
  if (withheld) {
    // a value worked out from the doubtful PaCO2 is not reported either
    const computedFlag = flags.findIndex((x) => x.code === 'gas_value_computed');
    if (computedFlag >= 0) flags.splice(computedFlag, 1);
    flags.push(
      flag('unit_ambiguous', 'critical', {
        field: 'gas.pco2',
        entered: c.units.pressure,
        pco2: round(g.pco2, 1),
        ph: g.ph,
      }),
    );
    if (c.sample !== 'arterial')
      flags.push(flag('oxygenation_not_assessable', 'info', { sample: c.sample }));
    criticalFlags(c, flags, true);
    return finish(
      {
        withheld: true,
        case: c,
        phStatus: classifyPhOnly(g.ph),
        consistency: null,
        reference,
        compensation: null,
        disorders: [],
        derived,
        metabolic: emptyMetabolic(s),
        oxygenation: notAssessed(c),
        ventilation: null,
        venous: null,
        previous,
        changes: [],
        serial: null,
        flags,
      },
      explain,
    );
  }

  // Henderson check of the report (clinical-scope section 2)
  let consistency: Consistency | null = null;
  if (g.complete) {
    consistency = hendersonConsistency(g.ph, g.pco2, g.hco3);
    if (!consistency.consistent) {
      flags.push(
        flag('values_inconsistent', 'warning', {
          reported: g.hco3,
          calculated: round(consistency.calculated, 1),
          difference: round(consistency.difference, 1),
        }),
      );
    }
  }

  const metabolic = emptyMetabolic(s);
  const ag = anionGapPart(c, derived, metabolic, explain);

  // a venous PCO2 is judged against the rules by its arterial estimate (Byrne et al. 2014, from memory)
  const venousEstimate = c.sample === 'venous' && g.pco2 >= VENOUS.minPco2;
  const classification: Classification = classify({
    ph: g.ph,
    pco2: venousEstimate ? g.pco2 - VENOUS.pco2Mid : g.pco2,
    hco3: g.hco3,
    timing: c.context.timing,
    reference,
    anionGap: ag,
    pco2Basis: venousEstimate ? 'venous_estimate' : 'measured',
    // the arterial PCO2 lies at or below the venous one, on average 4-6 mmHg lower: an added respiratory process
    // is named only when the whole span from venous - 6 to the venous value itself is outside the band
    pco2Range: venousEstimate ? { low: g.pco2 - VENOUS.pco2High, high: g.pco2 } : undefined,
  });
  derived.expectedPco2 = classification.expectedPco2;
  derived.expectedHco3 = classification.expectedHco3;
  explainCompensation(classification.compensation, reference, explain, gasInputs);

  if (reference.kind === 'pregnancy')
    flags.push(flag('pregnancy_reference', 'info', { pco2: reference.pco2, hco3: reference.hco3 }));
  if (reference.kind === 'baseline' && (reference.estimated.pco2 || reference.estimated.hco3)) {
    flags.push(
      flag('baseline_estimated', 'info', {
        pco2: round(reference.pco2, 1),
        hco3: round(reference.hco3, 1),
        pco2Estimated: reference.estimated.pco2,
        hco3Estimated: reference.estimated.hco3,
      }),
    );
  }
  if (has(c.patient.ageYears) && c.patient.ageYears < 16)
    flags.push(flag('adult_rules_only', 'warning', { ageYears: c.patient.ageYears }));
  if (has(c.context.temperatureC) && Math.abs(c.context.temperatureC - 37) > 1)
    flags.push(flag('temperature_not_37', 'warning', { temperatureC: c.context.temperatureC }));

  otherMetabolic(c, sbe, derived, metabolic, explain, flags);
  const oxygenation = oxygenationPart(c, derived, explain, flags);
  const venous = venousPart(c, flags);
  const ventilation = ventilationPart(c, derived, explain, flags, classification, reference);
  criticalFlags(c, flags, false);

  const serial = serialPart(c, previous.at(-1) ?? null, derived, explain);
  return finish(
    {
      withheld: false,
      case: c,
      phStatus: classification.phStatus,
      consistency,
      reference,
      compensation: classification.compensation,
      disorders: classification.disorders,
      derived,
      metabolic,
      oxygenation,
      ventilation,
      venous,
      previous,
      changes: changesSince(c),
      serial,
      flags,
    },
    explain,
  );
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
  #thunks: Explainers;
  #built: Record<string, Explanation> | null = null;
  constructor(p: Parts, thunks: Explainers) {
    this.withheld = p.withheld;
    this.units = p.case.units;
    this.case = p.case;
    this.phStatus = p.phStatus;
    this.consistency = p.consistency;
    this.reference = p.reference;
    this.compensation = p.compensation;
    this.disorders = p.disorders;
    this.derived = p.derived;
    this.metabolic = p.metabolic;
    this.oxygenation = p.oxygenation;
    this.ventilation = p.ventilation;
    this.venous = p.venous;
    this.previous = p.previous;
    this.changes = p.changes;
    this.serial = p.serial;
    this.flags = p.flags;
    this.#thunks = thunks;
  }
  get explain(): Record<string, Explanation> {
    this.#built ??= Object.fromEntries(
      Object.entries(this.#thunks).map(([key, thunk]) => [key, thunk()]),
    );
    return this.#built;
  }
  toJSON() {
    return { ...this, explain: this.explain };
  }
}

const classifyPhOnly = (ph: number): PhStatus =>
  ph < NORMAL.ph.low ? 'acidaemia' : ph > NORMAL.ph.high ? 'alkalaemia' : 'normal';

function explainCompensation(
  comp: Compensation | null,
  ref: ReferencePoint,
  explain: Explainers,
  gasInputs: () => ReturnType<typeof input>[],
) {
  if (!comp) return;
  const mid = (b: Band) => round((b.low + b.high) / 2, 1);
  const refInputs = () => [
    input('Reference PaCO2', round(ref.pco2, 1), 'mmHg'),
    input('Reference HCO3', round(ref.hco3, 1), 'mmol/L'),
  ];
  switch (comp.rule) {
    case 'winters':
      explain.expectedPco2 = () =>
        explanation(
          'expectedPco2',
          'Expected PaCO2 (Winters)',
          mid(comp.expected),
          'mmHg',
          'PaCO2 = 1.5 x HCO3 + 8 (+/- 2)',
          gasInputs().slice(2),
          'winters',
        );
      break;
    case 'metabolic_alkalosis':
      explain.expectedPco2 = () =>
        explanation(
          'expectedPco2',
          'Expected PaCO2 (metabolic alkalosis)',
          mid(comp.expected),
          'mmHg',
          'PaCO2 = 0.7 x HCO3 + 21 (+/- 2)',
          gasInputs().slice(2),
          'berend2014',
        );
      break;
    case 'respiratory_acidosis':
      explain.expectedHco3 = () =>
        explanation(
          'expectedHco3',
          'Expected HCO3 (respiratory acidosis)',
          mid(comp.expected),
          'mmol/L',
          comp.timing === 'acute'
            ? 'HCO3 = ref HCO3 + 1 x (PaCO2 - ref PaCO2) / 10 (+/- 2)'
            : comp.timing === 'chronic'
              ? 'HCO3 = ref HCO3 + 3.5 x (PaCO2 - ref PaCO2) / 10 (+/- 2)'
              : 'from acute (1 per 10 mmHg) to chronic (3.5 per 10 mmHg), +/- 2',
          [gasInputs()[1]!, ...refInputs()],
          'berend2014',
        );
      break;
    case 'respiratory_alkalosis':
      explain.expectedHco3 = () =>
        explanation(
          'expectedHco3',
          'Expected HCO3 (respiratory alkalosis)',
          mid(comp.expected),
          'mmol/L',
          comp.timing === 'acute'
            ? 'HCO3 = ref HCO3 - 2 x (ref PaCO2 - PaCO2) / 10 (+/- 2)'
            : comp.timing === 'chronic'
              ? 'HCO3 = ref HCO3 - 4 to 5 x (ref PaCO2 - PaCO2) / 10 (+/- 2)'
              : 'from acute (2 per 10 mmHg) to chronic (4-5 per 10 mmHg), +/- 2',
          [gasInputs()[1]!, ...refInputs()],
          'berend2014',
        );
      break;
  }
}

function criticalFlags(c: CanonicalCase, flags: Flag[], withheld: boolean) {
  const k = c.settings.critical,
    g = c.gas;
  const crit = (field: string, value: number, limit: number, direction: 'below' | 'above') =>
    flags.push(
      flag('critical_value', 'critical', {
        field,
        value: round(value, field === 'ph' ? 2 : 1),
        limit,
        direction,
      }),
    );
  if (g.ph < k.phLow) crit('ph', g.ph, k.phLow, 'below');
  if (g.ph > k.phHigh) crit('ph', g.ph, k.phHigh, 'above');
  if (!withheld) {
    if (g.pco2 > k.pco2High) crit('pco2', g.pco2, k.pco2High, 'above');
    if (c.sample === 'arterial' && has(g.po2) && g.po2 < k.po2Low)
      crit('po2', g.po2, k.po2Low, 'below');
  }
  const potassium = c.chemistry.k;
  if (has(potassium) && potassium < k.kLow) crit('k', potassium, k.kLow, 'below');
  if (has(potassium) && potassium > k.kHigh) crit('k', potassium, k.kHigh, 'above');
  if (has(g.lactate) && g.lactate >= k.lactateHigh)
    crit('lactate', g.lactate, k.lactateHigh, 'above');
}

const r = (value: number | null, decimals: number): number | null =>
  value === null ? null : round(value, decimals);

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
