// The H+/CO2 chart: [H+] against PaCO2, both linear, so that every HCO3 is a straight line through the origin
// (the Henderson equation made visible); the patient's gases joined in time order, a venous gas at its arterial
// estimate with its span, and for a ventilated patient a dashed arrow to the PaCO2 the suggestion aims for.
// Drawn as SVG on the server; every physiological number comes from calc/. No inline style, no script (CSP).
import type { Findings } from '../calc/index.ts';
import { hco3Labels, hco3Lines, axes, normalZoneMark, referenceMark } from './chartAxes.ts';
import {
  type TargetPoint,
  arterialEstimateOf,
  clampToWindow,
  inNormalZone,
  placeGas,
  targetPoint,
  toPoint,
} from './chartGeometry.ts';
import {
  KEY,
  type KeyEntry,
  type Placed,
  arrowDefs,
  key,
  markers,
  path,
  targetArrow,
} from './chartMarks.ts';
import {
  type ChartOptions,
  type ChartResult,
  FONT,
  INK,
  PAPER,
  checkOptions,
  layout,
  n2,
} from './chartStyle.ts';
import { escapeXml, gasesInTimeOrder } from './chartText.ts';
import { textAlternative } from './chartWords.ts';

export type { ChartOptions, ChartResult } from './chartStyle.ts';

/** Each gas where the chart puts it: measured, or (venous) at its arterial estimate, the note's own figures. */
function placeAll(f: Findings): { placed: Placed[]; byTakenAt: boolean } {
  const { gases, byTakenAt } = gasesInTimeOrder(f);
  const venous = f.case.sample === 'venous';
  // with a unit in doubt nothing is computed from the pressure, so no gas is placed (clinical-scope section 3)
  const placed = (f.withheld ? [] : gases).map((g) => {
    const estimate = !venous
      ? null
      : g.current
        ? (f.venous?.arterialEstimate ?? null)
        : arterialEstimateOf(g.gas);
    const placement = placeGas(g.gas, estimate);
    const clamped = clampToWindow(placement.point);
    return {
      ...g,
      estimate,
      placement,
      clamped,
      at: { x: 0, y: 0 },
      normal: inNormalZone(placement.point),
    };
  });
  return { placed, byTakenAt };
}

/** The ventilator target, drawn for an arterial gas only: a venous PCO2 is no base for a target (the note cautions). */
function targetOf(
  f: Findings,
  current: Placed | undefined,
): { target: TargetPoint | null; withheld: string | null } {
  const targetPco2 = f.derived.targetPco2;
  if (!current || targetPco2 === null || !f.ventilation?.ventilated)
    return { target: null, withheld: null };
  if (f.case.sample !== 'arterial')
    return {
      target: null,
      withheld: `No target arrow: the ventilator suggestion rests on a ${f.case.sample} PCO2, not an arterial one (see the note's caution).`,
    };
  return {
    target: targetPoint({ pco2: current.gas.pco2, hco3: current.gas.hco3 }, targetPco2),
    withheld: null,
  };
}

export function acidBaseChart(f: Findings, options: ChartOptions = {}): ChartResult {
  const o = checkOptions(options);
  const unit = f.units.pressure;
  const id = (s: string) => `${o.idPrefix}-${s}`;
  const { placed, byTakenAt } = placeAll(f);
  const current = placed.at(-1);
  const { target, withheld } = targetOf(f, current);

  const entries: KeyEntry[] = [KEY.today];
  if (placed.length > 1) entries.push(KEY.earlier);
  entries.push(KEY.line, KEY.normal);
  if (target) entries.push(KEY.target);
  if (placed.some((g) => g.estimate)) entries.push(KEY.venous);
  if (f.reference.kind !== 'textbook') entries.push(KEY.reference);
  const L = layout(entries.length);
  const fr = L.frame;
  const zone = normalZoneMark(fr);
  for (const g of placed) g.at = toPoint(fr, g.clamped.point);

  const text = textAlternative(f, { placed, byTakenAt, target, targetWithheld: withheld });
  const out = [
    `<svg xmlns="http://www.w3.org/2000/svg" class="gl-chart" viewBox="0 0 ${L.width} ${L.height}" width="${L.width}" height="${L.height}" role="img" aria-labelledby="${id('title')}" aria-describedby="${id('desc')}" font-family="system-ui, 'Segoe UI', 'DejaVu Sans', Arial, sans-serif" font-size="${FONT.label}" fill="${INK}">`,
    `<title id="${id('title')}">${escapeXml(o.title)}</title>`,
    `<desc id="${id('desc')}">${escapeXml(text)}</desc>`,
    `<defs><clipPath id="${id('clip')}"><rect x="${n2(fr.left)}" y="${n2(fr.top)}" width="${n2(fr.width)}" height="${n2(fr.height)}"/></clipPath>${arrowDefs(id)}</defs>`,
    `<rect class="gl-chart-paper" x="0" y="0" width="${L.width}" height="${L.height}" fill="${PAPER}"/>`,
    axes(fr, unit),
    `<g class="gl-chart-plot" clip-path="url(#${id('clip')})">`,
    zone.svg,
    hco3Lines(fr),
    '</g>',
    hco3Labels(fr),
    f.reference.kind !== 'textbook' ? referenceMark(fr, f.reference) : '',
    `<rect class="gl-chart-frame" x="${n2(fr.left)}" y="${n2(fr.top)}" width="${n2(fr.width)}" height="${n2(fr.height)}" fill="none" stroke="${INK}" id="${id('plot')}"/>`,
    target && current ? targetArrow(fr, placed, target, zone.points, id) : '',
    path(placed, id),
    markers(placed, fr, id, target ? toPoint(fr, clampToWindow(target).point) : null, zone.points),
    f.withheld
      ? `<text class="gl-chart-withheld" x="${n2(fr.left + fr.width / 2)}" y="${n2(fr.top + 28)}" text-anchor="middle" font-size="${FONT.label}" font-weight="600" stroke="${PAPER}" stroke-width="4" paint-order="stroke"><tspan x="${n2(fr.left + fr.width / 2)}">No gas placed: confirm whether</tspan><tspan x="${n2(fr.left + fr.width / 2)}" dy="17">PaCO₂ is in mmHg or kPa</tspan></text>`
      : '',
    key(L, entries),
    '</svg>',
  ];
  return { svg: out.filter((s) => s !== '').join('\n'), text };
}
