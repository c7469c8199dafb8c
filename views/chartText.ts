// The chart's numbers and times as people read them, and the gases in calc's one time order.
import { gasTime, inTimeOrder, type Findings, type Gas, type PressureUnit } from '../calc/index.ts';
import { mmHgToKpa } from './chartGeometry.ts';

export interface PlottedGas {
  /** 1 = oldest; the current gas carries the highest number */
  number: number;
  current: boolean;
  takenAt: string | null;
  label: string | null;
  gas: Gas;
}

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

const DATE_TIME = /^(\d{4})-(\d{2})-(\d{2})(?:[T ](\d{2}):(\d{2})(?::(\d{2}))?)?/;
const MONTHS = 'Jan Feb Mar Apr May Jun Jul Aug Sep Oct Nov Dec'.split(' ');

/** takenAt for people: "2 Mar 2026 04:10"; what cannot be read as a date is shown as written. */
export function whenText(takenAt: string | null): string | null {
  if (takenAt === null || takenAt.trim() === '') return null;
  const m = DATE_TIME.exec(takenAt.trim());
  const month = m ? MONTHS[Number(m[2]) - 1] : undefined;
  if (!m || !month) return takenAt.trim();
  return `${Number(m[3])} ${month} ${m[1]}${m[4] !== undefined ? ` ${m[4]}:${m[5]}` : ''}`;
}

/** Text and attribute values for XML: escape markup, drop characters XML 1.0 cannot carry. */
export function escapeXml(value: string): string {
  return value
    .replace(/[\u0000-\u0008\u000B\u000C\u000E-\u001F\uFFFE\uFFFF]/g, '')
    .replace(
      /[&<>"']/g,
      (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c] as string,
    );
}

// rounded as the note rounds them (templates/format.ts): pH 2 decimals, HCO3 1, a pressure 0 in mmHg and 1 in kPa
export const trim = (value: number, decimals: number): string =>
  String(Number(value.toFixed(decimals)));
export const phText = (ph: number) => ph.toFixed(2);
export const hco3Text = (hco3: number) => hco3.toFixed(1);
export const hPlusText = (hPlus: number) => hPlus.toFixed(0);

/** A pressure in the clinician's unit: a value as the note writes it, or a whole-number axis label. */
export function pressureText(
  mmHg: number,
  unit: PressureUnit,
  style: 'value' | 'label' = 'value',
): string {
  if (unit === 'mmHg') return mmHg.toFixed(0);
  const kpa = mmHgToKpa(mmHg);
  return style === 'label' ? trim(kpa, 0) : kpa.toFixed(1);
}
