// interpret(case): validate, convert once, compute every finding, and say how each number was reached.
import {
  parseCase,
  rangeText,
  type CaseInput,
  type FieldError,
  type ParsedCase,
} from './schema.ts';
import { FIELD } from './fields.ts';
import { canonicalize, type CanonicalCase, type Gas } from './canonical.ts';
import { mergeSettings, UNIT_SCREEN, VENOUS } from './reference.ts';
import {
  hendersonBicarbonate,
  hendersonConsistency,
  hendersonHasselbalchPh,
  hydrogenIon,
  type Consistency,
} from './acidBase.ts';
import { classify, phStatus } from './classify.ts';
import { referencePoint, type ReferencePoint } from './referencePoint.ts';
import { standardBaseExcess } from './physicochemical.ts';
import { bySeverity, flag, type Flag } from './flags.ts';
import { input, record, round } from './explain.ts';
import { MMHG_PER_KPA } from './units.ts';
import {
  type Book,
  type Findings,
  type InterpretOptions,
  type Rejected,
  emptyDerived,
  has,
} from './findings.ts';
import { anionGapPart, deltaPart, emptyMetabolic, otherMetabolic } from './readMetabolic.ts';
import { explainCompensation, explainUsual, hypoventilationFlags } from './readAcidBase.ts';
import { notAssessed, oxygenationPart, venousPart } from './readOxygenation.ts';
import { ventilationPart } from './readVentilation.ts';
import { saturationPart } from './readSaturation.ts';
import { changesSince, inTimeOrder, serialPart } from './readSerial.ts';

const P = 'mmHg';
const M = 'mmol/L';

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
    // a case's own settings override the department's
    const own = value.settings ?? {};
    const department = mergeSettings(options.settings);
    c.settings = {
      anionGapNormal: own.anionGapNormal ?? department.anionGapNormal,
      anionGapHalfWidth: own.anionGapHalfWidth ?? department.anionGapHalfWidth,
      anionGapIncludesK: own.anionGapIncludesK ?? department.anionGapIncludesK,
      critical: department.critical,
    };
  }
  const errors = computedGasErrors(c);
  if (errors.length) return { ok: false, errors };
  return readCase(c);
}

/** A worked-out third value must itself be plausible, or the inputs are wrong. */
function computedGasErrors(c: CanonicalCase): FieldError[] {
  const errors: FieldError[] = [];
  const check = (g: Gas, prefix: string) => {
    if (!g.computed) return;
    const field = FIELD[`gas.${g.computed}`];
    const value = g[g.computed];
    if (Number.isFinite(value) && value >= field.range[0] && value <= field.range[1]) return;
    const shown = Number.isFinite(value) ? round(value, 2) : 'undefined';
    errors.push({
      path: `${prefix}.${g.computed}`,
      message: `${field.label} worked out from the other two values would be ${shown}, outside ${rangeText(field, c.units)}: check the entered values`,
    });
  };
  check(c.gas, 'gas');
  for (const [i, p] of c.previous.entries()) check(p.gas, `previous.${i}.gas`);
  return errors;
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
      : g.pco2 > UNIT_SCREEN.pco2MmHgBelow * MMHG_PER_KPA;
  if (!suspicious) return false;
  // an entered HCO3 that agrees with the reading as entered settles it: a real, extreme value
  return !(g.complete && hendersonConsistency(g.ph, g.pco2, g.hco3).consistent);
}

/** [H+], the Henderson figures and the standard base excess: the numbers every reading starts from. */
function acidBaseNumbers(c: CanonicalCase, book: Book) {
  const g = c.gas;
  const hPlus = book.derived.hPlus;
  record(book, 'hco3Henderson', hendersonBicarbonate(hPlus, g.pco2), {
    label: 'HCO3 from the Henderson equation',
    unit: M,
    decimals: 1,
    formula: 'HCO3 = 24 x PaCO2 / [H+]',
    inputs: [input('PaCO2', g.pco2, P), input('[H+]', round(hPlus, 1), 'nmol/L')],
    source: 'henderson',
  });
  record(book, 'phHendersonHasselbalch', hendersonHasselbalchPh(g.pco2, g.hco3), {
    label: 'pH from Henderson-Hasselbalch',
    unit: '',
    decimals: 2,
    formula: 'pH = 6.1 + log10(HCO3 / (0.0307 x PaCO2))',
    inputs: [input('HCO3', g.hco3, M), input('PaCO2', g.pco2, P)],
    source: 'hendersonHasselbalch',
  });
  return record(book, 'standardBaseExcess', standardBaseExcess(g.ph, g.hco3), {
    label: 'Standard base excess',
    unit: M,
    decimals: 1,
    formula: 'SBE = 0.93 x (HCO3 - 24.4 + 14.8 x (pH - 7.40))',
    inputs: [input('HCO3', g.hco3, M), input('pH', g.ph, '')],
    source: 'clsiC46',
  });
}

function readCase(c: CanonicalCase): Findings {
  const g = c.gas;
  const book: Book = { derived: emptyDerived(0), explain: {} };
  record(book, 'hPlus', hydrogenIon(g.ph), {
    label: '[H+]',
    unit: 'nmol/L',
    decimals: 1,
    formula: '[H+] = 10^(9 - pH)',
    inputs: [input('pH', g.ph, '')],
    source: 'hydrogenIon',
  });
  const flags: Flag[] = [];
  const previous = inTimeOrder(c.previous).map((p) => ({ ...p, hPlus: hydrogenIon(p.gas.ph) }));
  const common = {
    ok: true as const,
    units: c.units,
    case: c,
    previous,
    derived: book.derived,
    explain: book.explain,
  };

  // A likely unit slip: ask, compute nothing from the pressure (clinical-scope section 3); a value worked out
  // from the doubtful PaCO2 is not reported either, and the usual PaCO2 is in doubt too (the textbook reference)
  if (unitLooksMixed(c)) {
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
    return {
      ...common,
      withheld: true,
      phStatus: phStatus(g.ph),
      consistency: null,
      reference: referencePoint(null, c.patient.pregnant, g.hco3),
      compensation: null,
      disorders: [],
      metabolic: emptyMetabolic(c.settings),
      oxygenation: notAssessed(c),
      ventilation: null,
      venous: null,
      changes: [],
      serial: null,
      flags: flags.sort(bySeverity),
    };
  }

  if (g.computed)
    flags.push(
      flag('gas_value_computed', 'info', {
        field: g.computed,
        value: round(g[g.computed], g.computed === 'ph' ? 2 : 1),
      }),
    );
  const sbe = acidBaseNumbers(c, book);

  // Henderson check of the report (clinical-scope section 2)
  let consistency: Consistency | null = null;
  if (g.complete) {
    consistency = hendersonConsistency(g.ph, g.pco2, g.hco3);
    if (!consistency.consistent)
      flags.push(
        flag('values_inconsistent', 'warning', {
          reported: g.hco3,
          calculated: round(consistency.calculated, 1),
          difference: round(consistency.difference, 1),
        }),
      );
  }

  const metabolic = emptyMetabolic(c.settings);
  const anionGap = anionGapPart(c, book, metabolic);
  // a usual pH alone cannot stand on an HCO3 that a raised-AG acidosis has lowered (clinical-scope section 10)
  const judged = referencePoint(
    c.context.baseline,
    c.patient.pregnant,
    g.hco3,
    metabolic.anionGapRaised === true,
  );
  // a venous PCO2 is judged against the rules by its arterial estimate (Byrne et al. 2014, from memory)
  const venousEstimate = c.sample === 'venous' && g.pco2 >= VENOUS.minPco2;
  const classification = classify({
    ph: g.ph,
    pco2: venousEstimate ? g.pco2 - VENOUS.pco2Mid : g.pco2,
    hco3: g.hco3,
    timing: c.context.timing,
    reference: judged,
    anionGap,
    pco2Basis: venousEstimate ? 'venous_estimate' : 'measured',
    // the arterial PCO2 lies at or below the venous one, on average 4-6 mmHg lower: an added respiratory process
    // is named only when the whole span from venous - 6 to the venous value itself is outside the band
    pco2Range: venousEstimate ? { low: g.pco2 - VENOUS.pco2High, high: g.pco2 } : undefined,
  });
  // the usual point, however it was obtained, is the one every later check uses
  const reference: ReferencePoint = { ...judged, usual: classification.usual };
  deltaPart(c, book, metabolic, classification);
  explainCompensation(classification.compensation, reference, g, book);
  explainUsual(reference, g, book, flags);
  contextFlags(c, reference, flags);
  hypoventilationFlags(c, classification, flags);

  otherMetabolic(c, sbe, book, metabolic, flags, classification.disorders);
  const oxygenation = oxygenationPart(c, book, flags);
  saturationPart(c, reference, book, flags, oxygenation);
  const venous = venousPart(c, flags);
  const { ventilation, deadSpace } = ventilationPart(c, book, flags, classification, reference);
  criticalFlags(c, flags, false);
  const last = previous.at(-1);
  return {
    ...common,
    withheld: false,
    phStatus: classification.phStatus,
    consistency,
    reference,
    compensation: classification.compensation,
    disorders: classification.disorders,
    metabolic,
    oxygenation,
    ventilation,
    venous,
    changes: changesSince(c, last),
    serial: serialPart(c, last ?? null, deadSpace, book),
    flags: flags.sort(bySeverity),
  };
}

function contextFlags(c: CanonicalCase, reference: ReferencePoint, flags: Flag[]) {
  if (reference.kind === 'pregnancy')
    flags.push(flag('pregnancy_reference', 'info', { pco2: reference.pco2, hco3: reference.hco3 }));
  const { ageYears } = c.patient;
  if (has(ageYears) && ageYears < 16) flags.push(flag('adult_rules_only', 'warning', { ageYears }));
  const { temperatureC } = c.context;
  if (has(temperatureC) && Math.abs(temperatureC - 37) > 1)
    flags.push(flag('temperature_not_37', 'warning', { temperatureC }));
}

function criticalFlags(c: CanonicalCase, flags: Flag[], withheld: boolean) {
  const k = c.settings.critical;
  const g = c.gas;
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
