// Saturations: the SpO2 target band and the saturation judged against it (BTS 2017), and CO-oximetry (COHb, MetHb,
// the gap between pulse oximetry and the measured SaO2).
import type { CanonicalCase } from './canonical.ts';
import { CO_OXIMETRY } from './reference.ts';
import { aboveTarget, spo2Target } from './oxygenTargets.ts';
import { cohbBand, methbRaised, saturationGap } from './coOximetry.ts';
import { usualPco2, type ReferencePoint } from './referencePoint.ts';
import { flag, type Flag } from './flags.ts';
import { input, record, round } from './explain.ts';
import { type Book, type Oxygenation, has } from './findings.ts';

export function saturationPart(
  c: CanonicalCase,
  ref: ReferencePoint,
  book: Book,
  flags: Flag[],
  o: Oxygenation,
) {
  const g = c.gas;
  const { spo2, fio2 } = c.oxygen;
  const arterial = c.sample === 'arterial';
  o.target = spo2Target({
    conditions: c.context.conditions,
    usualPco2: usualPco2(ref),
    pregnant: c.patient.pregnant,
  });
  // pulse oximetry reads falsely high with COHb or MetHb: the measured SaO2 is then the one to judge
  const coOximetry =
    (has(g.cohb) && g.cohb > CO_OXIMETRY.cohbNonSmoker) || (has(g.methb) && methbRaised(g.methb));
  if (has(spo2) && !(coOximetry && arterial && has(g.sao2)))
    o.saturation = { value: spo2, source: 'spo2' };
  else if (arterial && has(g.sao2)) o.saturation = { value: g.sao2, source: 'sao2' };
  if (o.saturation) {
    const s = o.saturation.value;
    o.belowTarget = s < o.target.low;
    if (has(fio2) && aboveTarget(s, fio2, o.target)) {
      o.aboveTarget = true;
      flags.push(
        flag('spo2_above_target', o.target.basis === 'hypercapnic_risk' ? 'warning' : 'info', {
          saturation: s,
          source: o.saturation.source,
          low: o.target.low,
          high: o.target.high,
          basis: o.target.basis,
          fio2,
        }),
      );
    }
  }
  coOximetryFlags(c, book, flags);
}

function coOximetryFlags(c: CanonicalCase, book: Book, flags: Flag[]) {
  const g = c.gas;
  if (has(g.cohb)) {
    const band = cohbBand(g.cohb);
    if (band !== 'normal')
      flags.push(
        flag('cohb_raised', band === 'raised' ? 'critical' : 'warning', { cohb: g.cohb, band }),
      );
  }
  if (has(g.methb) && methbRaised(g.methb))
    flags.push(flag('methb_raised', 'warning', { methb: g.methb }));
  const spo2 = c.oxygen.spo2;
  if (c.sample === 'arterial' && has(spo2) && has(g.sao2)) {
    const gap = record(book, 'saturationGap', saturationGap(spo2, g.sao2), {
      label: 'Saturation gap (SpO2 - SaO2)',
      unit: '%',
      decimals: 0,
      formula: 'SpO2 - SaO2',
      inputs: [input('SpO2', spo2, '%'), input('SaO2', g.sao2, '%')],
      source: 'commonPractice',
    });
    if (gap > CO_OXIMETRY.saturationGap)
      flags.push(
        flag('saturation_gap', 'warning', {
          spo2,
          sao2: g.sao2,
          gap: round(gap, 0),
          cohb: g.cohb ?? null,
          methb: g.methb ?? null,
        }),
      );
  }
}
