// Serial gases: earlier gases in time order, what changed, and the PaCO2 predicted after a ventilator change.
import type { CanonicalCase } from './canonical.ts';
import { SERIAL } from './reference.ts';
import { alveolarVentilation, predictedPco2AfterChange } from './ventilation.ts';
import { explanation, input, round } from './explain.ts';
import {
  type Derived,
  type PreviousGas,
  type Change,
  type Serial,
  has,
  type Explainers,
} from './findings.ts';

/** Earlier gases in time order: by takenAt when every one has an ISO date and time, else as entered. */
export function inTimeOrder<T extends { takenAt: string | null }>(gases: T[]): T[] {
  const iso = /^\d{4}-\d{2}-\d{2}([T ]\d{2}:\d{2}(:\d{2})?)?/;
  if (!gases.every((g) => g.takenAt !== null && iso.test(g.takenAt))) return gases;
  return gases
    .map((g, i) => ({ g, i }))
    .sort((a, b) =>
      a.g.takenAt! < b.g.takenAt! ? -1 : a.g.takenAt! > b.g.takenAt! ? 1 : a.i - b.i,
    )
    .map((x) => x.g);
}

export function changesSince(c: CanonicalCase): Change[] {
  const last = inTimeOrder(c.previous).at(-1);
  if (!last) return [];
  const out: Change[] = [];
  const fields = ['ph', 'pco2', 'hco3', 'po2', 'lactate'] as const;
  for (const field of fields) {
    const from = last.gas[field],
      to = c.gas[field];
    if (has(from) && has(to)) out.push({ field, from, to, change: to - from });
  }
  return out;
}

/** Did the new PaCO2 follow the ventilator change as the alveolar ventilation equation predicts (West)? */
export function serialPart(
  c: CanonicalCase,
  last: PreviousGas | null,
  d: Derived,
  explain: Explainers,
): Serial | null {
  if (!last) return null;
  const v = c.ventilator;
  const out: Serial = {
    last,
    ventilatorChanged: false,
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
  const vd = d.deadSpaceMl ?? (v.vt === last.vt ? 0 : null);
  if (vd === null || last.vt - vd <= 0 || v.vt - vd <= 0) {
    out.predictionUnavailable = 'dead_space_unknown';
    return out;
  }
  const vaBefore = alveolarVentilation(last.rr, last.vt, vd),
    vaNow = alveolarVentilation(v.rr, v.vt, vd);
  const predicted = predictedPco2AfterChange(last.gas.pco2, vaBefore, vaNow);
  const observed = c.gas.pco2,
    difference = observed - predicted;
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
  d.predictedPco2 = predicted;
  explain.predictedPco2 = () =>
    explanation(
      'predictedPco2',
      'PaCO2 predicted after the ventilator change',
      round(predicted, 1),
      'mmHg',
      'PaCO2_new = PaCO2_before x VA_before / VA_now, VA = RR x (VT - VD)',
      [
        input('PaCO2 before', round(last.gas.pco2, 1), 'mmHg'),
        input('RR before', last.rr!, '/min'),
        input('VT before', last.vt!, 'mL'),
        input('RR now', v.rr!, '/min'),
        input('VT now', v.vt!, 'mL'),
        input(d.deadSpaceMl === null ? 'VD (cancels out: VT unchanged)' : 'VD', round(vd, 0), 'mL'),
      ],
      'west',
    );
  return out;
}
