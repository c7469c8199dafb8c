// The chart in words: everything the drawing says, for a screen reader, for print and for anyone who prefers
// sentences. Numbers are written as the note writes them.
import { acidBase, reference, type Findings, type PressureUnit } from '../calc/index.ts';
import {
  CHART_WINDOW,
  HCO3_LINES,
  type Clamped,
  type TargetPoint,
  normalZone,
} from './chartGeometry.ts';
import type { Placed } from './chartMarks.ts';
import { hPlusText, hco3Text, phText, pressureText, trim, whenText } from './chartText.ts';

const { hendersonBicarbonate, hendersonConsistency, hydrogenIon, phFromHydrogenIon } = acidBase;
const { NORMAL, VENOUS, PHYSIOLOGY } = reference;

const co2Label = (sample: string) =>
  sample === 'venous' ? 'PvCO2' : sample === 'capillary' ? 'PcCO2' : 'PaCO2';

export function introText(unit: PressureUnit): string {
  const z = normalZone();
  const p = (mmHg: number) => pressureText(mmHg, unit, 'label');
  const lines = HCO3_LINES.map(String);
  return `H+/CO2 chart: [H+] from 0 to ${CHART_WINDOW.hPlus.max} nmol/L (up, with pH beside it) against PaCO2 from 0 to ${p(CHART_WINDOW.pco2.max)} ${unit} (across), both on even scales. Each straight line from the corner is one HCO3 (${lines.slice(0, -1).join(', ')} and ${lines.at(-1)} mmol/L), because [H+] = 24 x PaCO2 / HCO3 (the Henderson equation): a steeper line is a lower HCO3. The normal range is the box of PaCO2 ${pressureText(z.pco2.low, unit)}-${pressureText(z.pco2.high, unit)} ${unit} and pH ${phText(NORMAL.ph.low)}-${phText(NORMAL.ph.high)} ([H+] ${hPlusText(z.hPlus.low)}-${hPlusText(z.hPlus.high)} nmol/L).`;
}

/** Where a gas sits against the normal box, in the chart's own directions. */
export function whereText(g: Placed): string {
  if (g.normal) return 'inside the normal range';
  const z = normalZone();
  const { pco2, hPlus } = g.placement.point;
  const side = (
    v: number,
    band: { low: number; high: number },
    name: string,
    more: string,
    less: string,
  ) =>
    v > band.high
      ? `${name} above normal${more}`
      : v < band.low
        ? `${name} below normal${less}`
        : `${name} normal`;
  const up = side(hPlus, z.hPlus, '[H+]', ' (acidaemia)', ' (alkalaemia)');
  const across = side(pco2, z.pco2, 'PaCO2', '', '');
  return `${up}, ${across}`;
}

export function offText(off: Clamped['off'], unit: PressureUnit): string | null {
  const parts: string[] = [];
  if (off.pco2 === 'high')
    parts.push(`PaCO2 above ${pressureText(CHART_WINDOW.pco2.max, unit, 'label')} ${unit}`);
  if (off.hPlus === 'high') parts.push(`[H+] above ${CHART_WINDOW.hPlus.max} nmol/L`);
  return parts.length ? `outside the drawn window (${parts.join(', ')}), shown at its edge` : null;
}

export function gasSentence(g: Placed, f: Findings, total: number): string {
  const unit = f.units.pressure;
  const v = g.gas;
  const name = g.current
    ? `Today's gas (${g.number} of ${total})`
    : `Gas ${g.number} of ${total}${g.label?.trim() ? `, ${g.label.trim()}` : ''}${g.takenAt?.trim() ? `, taken ${whenText(g.takenAt)}` : ''}`;
  const computed = v.computed
    ? ` (${v.computed === 'ph' ? 'pH' : v.computed === 'pco2' ? co2Label(f.case.sample) : 'HCO3'} worked out from the other two)`
    : '';
  const parts: string[] = [];
  const e = g.estimate;
  if (e) {
    parts.push(
      `venous, measured pH ${phText(v.ph)}, PvCO2 ${pressureText(v.pco2, unit)} ${unit}, HCO3 ${hco3Text(v.hco3)} mmol/L${computed}`,
      `placed at its arterial estimate: pH about ${phText(e.ph)} ([H+] ${hPlusText(hydrogenIon(e.ph))} nmol/L), PaCO2 about ${pressureText(e.pco2Low, unit)}-${pressureText(e.pco2High, unit)} ${unit} (the bar), HCO3 about ${hco3Text(e.hco3)} mmol/L`,
    );
  } else {
    parts.push(
      `pH ${phText(v.ph)} ([H+] ${hPlusText(hydrogenIon(v.ph))} nmol/L), ${co2Label(f.case.sample)} ${pressureText(v.pco2, unit)} ${unit}, HCO3 ${hco3Text(v.hco3)} mmol/L${computed}`,
    );
  }
  parts.push(whereText(g));
  const off = offText(g.clamped.off, unit);
  if (off) parts.push(off);
  if (v.complete && !hendersonConsistency(v.ph, v.pco2, v.hco3).consistent) {
    parts.push(
      `its reported HCO3 does not agree with pH and ${co2Label(f.case.sample)} by the Henderson equation, which give about ${trim(hendersonBicarbonate(hydrogenIon(v.ph), v.pco2), 0)} mmol/L; the chart places it by pH and ${co2Label(f.case.sample)}`,
    );
  }
  return `${name}: ${parts.join('; ')}.`;
}

export function targetText(t: TargetPoint, unit: PressureUnit): string {
  return `A dashed arrow runs from today's gas to the ventilator target: PaCO2 ${pressureText(t.pco2, unit)} ${unit}; with acute buffering (HCO3 moves about ${PHYSIOLOGY.acuteBufferPerMmHg} mmol/L per mmHg) HCO3 would be about ${hco3Text(t.hco3)} mmol/L there, so [H+] about ${hPlusText(t.hPlus)} nmol/L (pH ${phText(phFromHydrogenIon(t.hPlus))}). A rule of thumb: recheck a gas after the change.`;
}

export function sampleText(sample: Findings['case']['sample'], unit: PressureUnit): string | null {
  if (sample === 'venous')
    return `This is a venous sample: each gas is placed at its arterial estimate (pH about ${VENOUS.ph} higher, PCO2 ${VENOUS.pco2Low}-${VENOUS.pco2High} mmHg lower, HCO3 about ${VENOUS.hco3} mmol/L lower), with the PaCO2 span as a bar; single venous and arterial values can differ by about ${pressureText(VENOUS.pco2Limits, unit)} ${unit}.`;
  if (sample === 'capillary')
    return 'This is a capillary sample: the gases are placed as measured, and may differ from arterial values.';
  return null;
}

export interface WordsInput {
  placed: Placed[];
  byTakenAt: boolean;
  target: TargetPoint | null;
  /** why a target the note gives is not drawn */
  targetWithheld: string | null;
}

export function textAlternative(f: Findings, w: WordsInput): string {
  const unit = f.units.pressure;
  const r = f.reference;
  const lines = [introText(unit)];
  if (r.kind !== 'textbook') {
    const how =
      r.kind === 'pregnancy'
        ? 'the pregnancy reference'
        : `the patient's usual values${r.estimated.pco2 || r.estimated.hco3 ? ' (partly estimated)' : ''}`;
    lines.push(
      `A cross marks ${how}: PaCO2 ${pressureText(r.pco2, unit)} ${unit}, HCO3 ${hco3Text(r.hco3)} mmol/L.`,
    );
  }
  if (f.withheld) {
    lines.push(
      'No gas is placed on the chart: the PaCO2 may be in the other pressure unit. Confirm whether it was entered in mmHg or kPa.',
    );
  } else {
    const total = w.placed.length;
    lines.push(gasSentence(w.placed.at(-1) as Placed, f, total));
    if (total > 1) {
      const order = w.byTakenAt
        ? 'oldest first, by time taken'
        : 'in the order entered (not every earlier gas has a date and time)';
      lines.push(`Earlier gases, ${order}:`);
      for (const g of w.placed.slice(0, -1)) lines.push(gasSentence(g, f, total));
      lines.push(`A line with arrows joins the gases from 1 to ${total}, ending at today's gas.`);
    }
    if (w.target) lines.push(targetText(w.target, unit));
    else if (w.targetWithheld) lines.push(w.targetWithheld);
  }
  const sample = sampleText(f.case.sample, unit);
  if (sample) lines.push(sample);
  lines.push(
    'Positions follow the Henderson equation from the values entered. Decision support for licensed clinicians: check the sample and the patient, and follow local protocols and senior advice.',
  );
  return lines.join('\n');
}
