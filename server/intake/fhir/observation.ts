// One Observation (or one component of a panel) read into an item: its LOINC code looked up in calc's table, its
// valueQuantity's UCUM unit checked against the units the code takes (loinc.ts) and read by calc's readUnit (mEq/L
// by the ion's charge, a fraction saturation to a percent). A value without a usable unit is an error, never a guess.
import { readUnit, type FieldPath } from '../../../calc/index.ts';
import type { UnitSetting } from '../case.ts';
import { LOINC_NOT_READ, UCUM_SYSTEM, loincEntry, ucumCodes, type LoincEntry } from '../loinc.ts';
import {
  anyCoding,
  effectiveOf,
  isObject,
  isVitalSign,
  loincCodings,
  str,
  text,
  type Json,
} from './payload.ts';
import type { FhirResult } from './types.ts';

const USABLE_STATUS = new Set(['final', 'amended', 'corrected', 'preliminary']);

/** A value read from the payload, before it is placed in a gas. */
export interface Item {
  entry: LoincEntry;
  path: FieldPath;
  value: number;
  /** the case's unit choice the value is in (pressure kPa, albumin g/L ...), or null */
  setting: UnitSetting | null;
  effective: string | null;
  source: string;
  display: string;
}

export interface ReadState {
  result: FhirResult;
  items: Item[];
  /** fullUrl and Type/id of every resource in the payload, to find a panel's members */
  known: Set<string>;
}

export function readObservation(obs: Json, source: string, state: ReadState): void {
  const { result } = state;
  const status = str(obs.status);
  const head = anyCoding(obs.code);
  if (!status || !USABLE_STATUS.has(status)) {
    result.unused.push({
      code: loincCodings(obs.code)[0]?.code ?? head.code,
      display: loincCodings(obs.code)[0]?.display || head.display,
      reason: `status "${status ?? 'missing'}": not a result to use`,
      source,
    });
    return;
  }
  if (status === 'preliminary')
    result.notes.push(`${source}: a preliminary result; check it against the final report`);
  const effective = effectiveOf(obs);
  const components = Array.isArray(obs.component) ? obs.component : [];
  const hasValue = Object.keys(obs).some((k) => k.startsWith('value'));
  if (components.length || (!hasValue && Array.isArray(obs.hasMember))) {
    if (!hasValue) {
      const codings = loincCodings(obs.code);
      result.unused.push({
        code: codings[0]?.code ?? head.code,
        display: codings[0]?.display || head.display,
        reason: 'a panel: its results are read one by one',
        source,
      });
      const members = Array.isArray(obs.hasMember) ? obs.hasMember : [];
      const missingMembers = members.filter(
        (m) => isObject(m) && typeof m.reference === 'string' && !state.known.has(m.reference),
      ).length;
      if (missingMembers)
        result.notes.push(
          `${source}: the panel lists ${missingMembers} result(s) that are not in this payload`,
        );
    } else readValue(obs, obs, source, effective, state);
    components.forEach((component, j) => {
      if (isObject(component))
        readValue(component, obs, `${source}.component[${j}]`, effective, state);
    });
    return;
  }
  readValue(obs, obs, source, effective, state);
}

/** One coded value: an Observation or one of its components. */
function readValue(
  node: Json,
  obs: Json,
  source: string,
  effective: string | null,
  state: ReadState,
): void {
  const { result } = state;
  const codings = loincCodings(node.code);
  const head = anyCoding(node.code);
  if (!codings.length) {
    result.unused.push({
      code: head.code,
      display: head.display,
      reason: 'no LOINC code: not read',
      source,
    });
    return;
  }
  // pulse oximetry: 59408-5 is sent with 2708-6 (the FHIR oxygen saturation profile); a vital sign coded 2708-6 alone is SpO2 too
  const spo2 =
    codings.some((c) => c.code === '59408-5') ||
    (isVitalSign(obs) && codings.some((c) => c.code === '2708-6'));
  const known = spo2
    ? [loincEntry('59408-5')!]
    : codings.map((c) => loincEntry(c.code)).filter((x): x is LoincEntry => !!x);
  const display =
    codings.find((c) => c.code === known[0]?.code)?.display ||
    known[0]?.name ||
    codings[0]!.display;
  if (!known.length) {
    const c = codings[0]!;
    const notRead = LOINC_NOT_READ[c.code];
    result.unused.push({
      code: c.code,
      display: c.display || notRead?.name || '',
      reason: notRead?.reason ?? 'a LOINC code Gasline does not read',
      source,
    });
    return;
  }
  if (new Set(known.map((k) => k.path)).size > 1) {
    result.errors.push({
      path: `${source}.code`,
      message: `The LOINC codes ${known.map((k) => k.code).join(', ')} name different values: send one`,
    });
    return;
  }
  const entry = known[0]!;
  if (spo2 && !codings.some((c) => c.code === '59408-5'))
    result.notes.push(
      `${source}: 2708-6 in a vital-signs Observation is read as SpO2 (pulse oximetry), not SaO2`,
    );
  if (node.dataAbsentReason !== undefined && node.valueQuantity === undefined) {
    result.unused.push({
      code: entry.code,
      display,
      reason: `no value (${anyCoding(node.dataAbsentReason).code ?? 'data absent'})`,
      source,
    });
    return;
  }
  const q = node.valueQuantity;
  if (!isObject(q)) {
    const other = Object.keys(node).find((k) => k.startsWith('value'));
    result.unused.push({
      code: entry.code,
      display,
      reason: other ? `${other} is not a quantity: not read` : 'no value',
      source,
    });
    return;
  }
  if (q.comparator !== undefined) {
    result.unused.push({
      code: entry.code,
      display,
      reason: `the value is a bound (${text(q.comparator)} ${text(q.value)}), not a number to work with`,
      source,
    });
    return;
  }
  if (typeof q.value !== 'number' || !Number.isFinite(q.value)) {
    result.errors.push({
      path: `${source}.valueQuantity.value`,
      message: `${entry.name}: the value must be a number`,
    });
    return;
  }
  const ucum = unitOf(q, q.value, entry, source, result);
  if (ucum === undefined) return;
  const reading = readUnit(entry.field, ucum ?? '', q.value);
  if (!reading.ok) {
    result.errors.push({
      path: `${source}.valueQuantity.code`,
      message: `${entry.name}: ${reading.reason}`,
    });
    return;
  }
  if (reading.value !== q.value)
    result.conversions.push({
      path: entry.path,
      source,
      from: { value: q.value, unit: ucum ?? '' },
      to: { value: reading.value, unit: entry.field.unit },
      reason: entry.field.percent
        ? 'a fraction given as UCUM "1"; the case takes a percent'
        : `mEq/L of an ion of charge ${entry.field.charge}: mmol/L = mEq/L / ${entry.field.charge}`,
    });
  state.items.push({
    entry,
    path: entry.path,
    value: reading.value,
    setting: reading.setting,
    effective,
    source,
    display,
  });
}

/** A value without a unit is read only for pH (a number without a dimension). */
const UNIT_OPTIONAL: ReadonlySet<string> = new Set(['gas.ph']);

/**
 * The UCUM code of a valueQuantity, null for a pH sent without one, or undefined after an error naming the field:
 * a unit is never assumed.
 */
function unitOf(
  q: Json,
  value: number,
  entry: LoincEntry,
  source: string,
  result: FhirResult,
): string | null | undefined {
  const accepted = ucumCodes(entry);
  const system = str(q.system),
    code = str(q.code),
    unitText = str(q.unit);
  const list = accepted.map((k) => `"${k}"`).join(', ');
  const error = (where: string, message: string) => {
    result.errors.push({
      path: `${source}.valueQuantity.${where}`,
      message: `${entry.name}: ${message}`,
    });
    return undefined;
  };
  if (!code && !unitText && !system) {
    if (UNIT_OPTIONAL.has(entry.path)) return null;
    return error('unit', `no unit. The value cannot be read without one (UCUM ${list})`);
  }
  if (system !== UCUM_SYSTEM)
    return error(
      'system',
      `the unit "${code ?? unitText ?? ''}" is not marked as UCUM (valueQuantity.system ${UCUM_SYSTEM}); Gasline does not guess units`,
    );
  if (!code)
    return error('code', `no UCUM code for the unit "${unitText ?? ''}" (expected ${list})`);
  if (!accepted.includes(code)) {
    // UCUM codes are case-sensitive and mm[Hg] has brackets; name the code that was probably meant, still without
    // using it; a unit the field never takes says why (phosphate in mEq/L)
    const meant = accepted.find(
      (k) =>
        k.toLowerCase() === code.toLowerCase() ||
        k.replace(/[[\]]/g, '').toLowerCase() === code.toLowerCase(),
    );
    const refused = readUnit(entry.field, code, value);
    const hint = meant
      ? ` UCUM writes "${meant}"; send the value with that code.`
      : !refused.ok && code.toLowerCase() === 'meq/l'
        ? ` ${refused.reason}.`
        : '';
    return error(
      'code',
      `"${code}" is not a UCUM unit Gasline reads for this code (expected ${list}).${hint}`,
    );
  }
  // FiO2: a fraction (UCUM "1") of at most 1, or a percent of more than 1 (clinical-scope section 1)
  if (entry.path === 'oxygen.fio2' && (code === '%' ? value <= 1 : value > 1))
    return error(
      'value',
      `${value} "${code}" is neither a fraction ("1", 0.21-1.00) nor a percent ("%", 21-100): check the unit`,
    );
  return code;
}
