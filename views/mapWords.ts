// The map in words: the gases in time order, times and numbers as people read them, and the text alternative that
// says all the drawing says.
import {
  acidBase,
  reference,
  gasTime,
  inTimeOrder,
  type Gas,
  type PressureUnit,
  type Findings,
} from '../calc/index.ts';
import { type BandCode, bandSpec } from './mapBands.ts';
import {
  type Clamped,
  ISOPLETHS_MMHG,
  MAP_WINDOW,
  type Point,
  hco3Of,
  mmHgToKpa,
} from './mapGeometry.ts';

const { NORMAL } = reference;
const { hendersonConsistency, hydrogenIon } = acidBase;

export interface PlottedGas {
  /** 1 = oldest; the current gas carries the highest number */
  number: number;
  current: boolean;
  takenAt: string | null;
  label: string | null;
  gas: Gas;
}

export interface Placed extends PlottedGas {
  clamped: Clamped;
  at: Point;
  bands: BandCode[];
  normal: boolean;
  when: string | null;
}

export const DATE_TIME = /^(\d{4})-(\d{2})-(\d{2})(?:[T ](\d{2}):(\d{2})(?::(\d{2}))?)?/;

/**
 * Earlier gases in time order (calc's inTimeOrder, the order the note reads them in) when every one has a date
 * and time, else in the order entered; then the current gas.
 */
export function gasesInTimeOrder(findings: Findings): { gases: PlottedGas[]; byTakenAt: boolean } {
  const earlier = inTimeOrder(findings.previous);
  const byTakenAt = earlier.length > 0 && earlier.every((p) => gasTime(p.takenAt) !== null);
  const gases: PlottedGas[] = earlier.map((p, i) => ({
    number: i + 1,
    current: false,
    takenAt: p.takenAt,
    label: p.label,
    gas: p.gas,
  }));
  gases.push({
    number: gases.length + 1,
    current: true,
    takenAt: null,
    label: null,
    gas: findings.case.gas,
  });
  return { gases, byTakenAt };
}

export const DAY_MS = 86_400_000;
export const MONTHS = [
  'Jan',
  'Feb',
  'Mar',
  'Apr',
  'May',
  'Jun',
  'Jul',
  'Aug',
  'Sep',
  'Oct',
  'Nov',
  'Dec',
];

/** takenAt for people: "04:10" when all dated gases share a day (short form), else "2 Mar 2026 04:10". */
export function whenText(takenAt: string | null, short: boolean): string | null {
  if (takenAt === null || takenAt.trim() === '') return null;
  const m = DATE_TIME.exec(takenAt.trim());
  if (!m) return takenAt.trim();
  const month = MONTHS[Number(m[2]) - 1];
  if (!month) return takenAt.trim();
  const time = m[4] !== undefined ? `${m[4]}:${m[5]}` : null;
  if (short && time) return time;
  return `${Number(m[3])} ${month} ${m[1]}${time ? ` ${time}` : ''}`;
}

// ---------- words and numbers ----------

/** Text and attribute values for XML: escape markup, drop characters XML 1.0 cannot carry. */
export function escapeXml(value: string): string {
  return value
    .replace(/[\u0000-\u0008\u000B\u000C\u000E-\u001F\uFFFE\uFFFF]/g, '')
    .replace(
      /[&<>"']/g,
      (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c] as string,
    );
}

export const trim = (value: number, decimals: number): string =>
  String(Number(value.toFixed(decimals)));
export const phText = (ph: number) => ph.toFixed(2);
export const hco3Text = (hco3: number) => trim(hco3, 1);
/** A pressure in the clinician's unit: a measured value (trailing zeros dropped) or a fixed label. */
export function pressureText(
  mmHg: number,
  unit: PressureUnit,
  style: 'value' | 'label' = 'value',
): string {
  if (unit === 'mmHg') return trim(mmHg, style === 'label' ? 0 : 1);
  const kpa = mmHgToKpa(mmHg);
  // kPa is read with at least one decimal (8.0, 6.45)
  return style === 'label' || Number(kpa.toFixed(2)) === Number(kpa.toFixed(1))
    ? kpa.toFixed(1)
    : kpa.toFixed(2);
}

export function whereText(bands: BandCode[], normal: boolean): string {
  if (normal) return 'inside the normal region';
  if (bands.length === 0) return 'outside every compensation band';
  const names = bands.map((c) => bandSpec(c).name);
  // "acute respiratory acidosis" + "chronic respiratory acidosis" -> "the acute and chronic respiratory acidosis bands"
  const merged: string[] = [];
  for (const n of names) {
    const m = /^(acute|chronic) (.+)$/.exec(n);
    const partner = m
      ? merged.findIndex((x) => x === `${m[1] === 'acute' ? 'chronic' : 'acute'} ${m[2]}`)
      : -1;
    if (m && partner >= 0) merged[partner] = `acute and chronic ${m[2]}`;
    else merged.push(n);
  }
  const list =
    merged.length === 1
      ? (merged[0] as string)
      : `${merged.slice(0, -1).join(', ')} and ${merged.at(-1)}`;
  return `inside the ${list} band${merged.length > 1 || bands.length > 1 ? 's' : ''}`;
}

export function offText(off: Clamped['off']): string | null {
  const parts: string[] = [];
  if (off.ph)
    parts.push(
      `pH ${off.ph === 'high' ? 'above' : 'below'} ${phText(off.ph === 'high' ? MAP_WINDOW.ph.max : MAP_WINDOW.ph.min)}`,
    );
  if (off.hco3)
    parts.push(
      `HCO3 ${off.hco3 === 'high' ? 'above' : 'below'} ${MAP_WINDOW.hco3[off.hco3 === 'high' ? 'max' : 'min']} mmol/L`,
    );
  return parts.length ? `outside the drawn window (${parts.join(', ')}), shown at its edge` : null;
}

// ---------- the text alternative ----------

export function gasSentence(g: Placed, unit: PressureUnit, total: number): string {
  const v = g.gas;
  const name = g.current
    ? `Current gas (${g.number} of ${total})`
    : `Gas ${g.number} of ${total}${g.label ? `, ${g.label.trim()}` : ''}${g.takenAt?.trim() ? `, taken ${whenText(g.takenAt, false)}` : ''}`;
  const computed = v.computed
    ? ` (${v.computed === 'ph' ? 'pH' : v.computed === 'pco2' ? 'PaCO2' : 'HCO3'} worked out from the other two)`
    : '';
  const values = `pH ${phText(v.ph)}, PaCO2 ${pressureText(v.pco2, unit)} ${unit}, HCO3 ${hco3Text(v.hco3)} mmol/L, [H+] ${trim(hydrogenIon(v.ph), 0)} nmol/L${computed}`;
  const parts = [whereText(g.bands, g.normal)];
  const off = offText(g.clamped.off);
  if (off) parts.push(off);
  if (v.complete && !hendersonConsistency(v.ph, v.pco2, v.hco3).consistent) {
    parts.push(
      `its HCO3 does not agree with pH and PaCO2 by the Henderson equation (expected about ${trim(hco3Of(v.ph, v.pco2), 0)} mmol/L), so it is placed by pH and HCO3 as reported`,
    );
  }
  return `${name}: ${values}; ${parts.join('; ')}.`;
}

export function textAlternative(
  findings: Findings,
  placed: Placed[],
  byTakenAt: boolean,
  unit: PressureUnit,
): string {
  const r = findings.reference;
  const lines: string[] = [];
  const isopleths = ISOPLETHS_MMHG.map((p) => pressureText(p, unit, 'label')).join(', ');
  const normal = `pH ${phText(NORMAL.ph.low)}-${phText(NORMAL.ph.high)} with PaCO2 ${pressureText(NORMAL.pco2.low, unit, 'label')}-${pressureText(NORMAL.pco2.high, unit, 'label')} ${unit}`;
  lines.push(
    `Acid-base map: HCO3 (${MAP_WINDOW.hco3.min}-${MAP_WINDOW.hco3.max} mmol/L, up) against pH (${phText(MAP_WINDOW.ph.min)}-${phText(MAP_WINDOW.ph.max)}, across; [H+] along the top), with lines of equal PaCO2 (${isopleths} ${unit}), the normal region (${normal}) and the expected-compensation bands for metabolic acidosis (Winters' formula), metabolic alkalosis, and acute and chronic respiratory acidosis and alkalosis.`,
  );
  if (r.kind !== 'textbook') {
    const how =
      r.kind === 'pregnancy'
        ? 'the pregnancy reference'
        : `the patient's usual values${r.estimated.pco2 || r.estimated.hco3 ? ' (partly estimated)' : ''}`;
    lines.push(
      `Respiratory bands start from ${how}: PaCO2 ${pressureText(r.pco2, unit)} ${unit}, HCO3 ${hco3Text(r.hco3)} mmol/L.`,
    );
  }
  if (findings.withheld) {
    lines.push(
      'No gas is placed on the map: the PaCO2 may be in the other pressure unit. Confirm whether it was entered in mmHg or kPa.',
    );
  } else {
    const total = placed.length;
    const current = placed.at(-1) as Placed;
    lines.push(gasSentence(current, unit, total));
    if (total > 1) {
      const order = byTakenAt
        ? 'oldest first, by time taken'
        : 'in the order entered (not every earlier gas has a date and time)';
      lines.push(`Earlier gases, ${order}:`);
      for (const g of placed.slice(0, -1)) lines.push(gasSentence(g, unit, total));
      lines.push(
        `A line with arrows joins the gases from 1 to ${total}, ending at the current gas.`,
      );
    }
  }
  if (findings.case.sample !== 'arterial')
    lines.push(`This is a ${findings.case.sample} sample; the bands describe arterial values.`);
  lines.push(
    'The bands show the compensation expected for a single disorder, by rules of thumb that assume a steady state. A gas inside a band fits that disorder but does not prove it; a gas outside every band suggests more than one process. Decision support for licensed clinicians: check the sample and the patient, and follow local protocols and senior advice.',
  );
  return lines.join('\n');
}
