// Serial gases: earlier gases in time order, what changed, and the PaCO2 predicted after a ventilator change.
import type { CanonicalCase } from './canonical.ts';
import { SERIAL } from './reference.ts';
import { alveolarVentilation, predictedPco2AfterChange } from './ventilation.ts';
import { input, record } from './explain.ts';
import {
  type Book,
  type Change,
  type N,
  type PreviousGas,
  type Serial,
  type SettingChange,
  has,
} from './findings.ts';

const TIME = /^(\d{4})-(\d{2})-(\d{2})(?:[T ](\d{2}):(\d{2})(?::(\d{2}))?)?/;

/**
 * When a gas was taken, as a number that sorts in time order: "2026-03-02 04:10" and "2026-03-02T04:10" are the
 * same moment, and a date alone is its midnight. Null for text that is not such a date. Times are read as written
 * (local to the ward that wrote them); a zone suffix is ignored.
 */
export function gasTime(takenAt: string | null | undefined): number | null {
  const m = TIME.exec(takenAt?.trim() ?? '');
  if (!m) return null;
  const [, y, mo, d, h, mi, s] = m.map((x) => (x === undefined ? 0 : Number(x)));
  const time = Date.UTC(y!, mo! - 1, d!, h!, mi!, s!);
  return Number.isNaN(time) ? null : time;
}

/**
 * Gases in time order, oldest first: by their time taken when every one has a date, else as entered (a gas
 * without a time cannot be placed). The one ordering the note, the chart and the page all use.
 */
export function inTimeOrder<T extends { takenAt?: string | null }>(gases: readonly T[]): T[] {
  const times = gases.map((g) => gasTime(g.takenAt));
  if (times.some((t) => t === null)) return [...gases];
  return gases
    .map((g, i) => ({ g, i, t: times[i]! }))
    .sort((a, b) => a.t - b.t || a.i - b.i)
    .map((x) => x.g);
}

export function changesSince(c: CanonicalCase, last: PreviousGas | undefined): Change[] {
  if (!last) return [];
  const out: Change[] = [];
  for (const field of ['ph', 'pco2', 'hco3', 'po2', 'lactate'] as const) {
    const from = last.gas[field];
    const to = c.gas[field];
    if (has(from) && has(to)) out.push({ field, from, to, change: to - from });
  }
  return out;
}

const SETTINGS = [
  ['rr', (c: CanonicalCase) => c.ventilator?.rr],
  ['vt', (c: CanonicalCase) => c.ventilator?.vt],
  ['peep', (c: CanonicalCase) => c.oxygen.peep],
  ['fio2', (c: CanonicalCase) => c.oxygen.fio2],
] as const;

/** The settings known at both gases that differ: "RR 22 to 28". */
export function settingChanges(c: CanonicalCase, last: PreviousGas): SettingChange[] {
  const out: SettingChange[] = [];
  for (const [field, now] of SETTINGS) {
    const from = last[field];
    const to = now(c);
    if (has(from) && has(to) && from !== to) out.push({ field, from, to });
  }
  return out;
}

/** Is this gas at the target the clinician set? A target pH is judged first, as the ventilator part uses it. */
export function targetReached(c: CanonicalCase): Serial['target'] {
  const v = c.ventilator;
  if (has(v?.targetPh) && has(c.gas.ph))
    return {
      kind: 'ph',
      value: v.targetPh,
      reached: Math.abs(c.gas.ph - v.targetPh) <= SERIAL.targetPh + 1e-9,
    };
  if (has(v?.targetPco2) && has(c.gas.pco2))
    return {
      kind: 'pco2',
      value: v.targetPco2,
      reached: Math.abs(c.gas.pco2 - v.targetPco2) <= SERIAL.targetPco2 + 1e-9,
    };
  return null;
}

/** Did the new PaCO2 follow the ventilator change as the alveolar ventilation equation predicts (West)? */
export function serialPart(
  c: CanonicalCase,
  last: PreviousGas | null,
  deadSpace: N,
  book: Book,
): Serial | null {
  if (!last) return null;
  const v = c.ventilator;
  const out: Serial = {
    last,
    ventilatorChanged: false,
    settingChanges: settingChanges(c, last),
    target: targetReached(c),
    prediction: null,
    predictionUnavailable: null,
  };
  if (!v || !has(v.vt) || !has(v.rr) || !has(last.vt) || !has(last.rr)) {
    out.predictionUnavailable = 'settings_missing';
    return out;
  }
  out.ventilatorChanged = v.vt !== last.vt || v.rr !== last.rr;
  if (!out.ventilatorChanged) {
    out.predictionUnavailable = 'settings_unchanged';
    return out;
  }
  // with VT unchanged, VA scales with RR whatever the dead space; otherwise the dead space per breath is needed
  const vd = deadSpace ?? (v.vt === last.vt ? 0 : null);
  if (vd === null || last.vt - vd <= 0 || v.vt - vd <= 0) {
    out.predictionUnavailable = 'dead_space_unknown';
    return out;
  }
  const vaBefore = alveolarVentilation(last.rr, last.vt, vd);
  const vaNow = alveolarVentilation(v.rr, v.vt, vd);
  const predicted = record(
    book,
    'predictedPco2',
    predictedPco2AfterChange(last.gas.pco2, vaBefore, vaNow),
    {
      label: 'PaCO2 predicted after the ventilator change',
      unit: 'mmHg',
      decimals: 1,
      formula: 'PaCO2_new = PaCO2_before x VA_before / VA_now, VA = RR x (VT - VD)',
      inputs: [
        input('PaCO2 before', last.gas.pco2, 'mmHg'),
        input('RR before', last.rr, '/min'),
        input('VT before', last.vt, 'mL'),
        input('RR now', v.rr, '/min'),
        input('VT now', v.vt, 'mL'),
        input(deadSpace === null ? 'VD (cancels out: VT unchanged)' : 'VD', Math.round(vd), 'mL'),
      ],
      source: 'west',
    },
  );
  const observed = c.gas.pco2;
  const difference = observed - predicted;
  const tolerance = Math.max(SERIAL.pco2Absolute, SERIAL.pco2Relative * predicted);
  out.prediction = {
    vaBefore,
    vaNow,
    predicted,
    observed,
    difference,
    verdict:
      Math.abs(difference) <= tolerance ? 'as_predicted' : difference > 0 ? 'higher' : 'lower',
  };
  return out;
}
