// The target PaCO2 of a ventilated patient (clinical-scope sections 8 and 10): as requested (a PaCO2, or the one that
// gives a target pH with acute buffering), then the one the patient needs in its place: Winters' compensation in a
// metabolic acidosis, the usual PaCO2 in chronic hypercapnia.
import type { CanonicalCase } from './canonical.ts';
import { FIELD } from './fields.ts';
import { NORMAL } from './reference.ts';
import { hydrogenIon } from './acidBase.ts';
import { wintersPco2 } from './compensation.ts';
import type { Classification } from './classify.ts';
import { usualPco2, type ReferencePoint } from './referencePoint.ts';
import { targetPco2Buffered, targetPco2Simple } from './ventilation.ts';
import { flag, type Flag } from './flags.ts';
import { input, record, round } from './explain.ts';
import { type Book, type N, type Ventilation, has } from './findings.ts';

const P = 'mmHg';
type Vent = NonNullable<CanonicalCase['ventilator']>;

/** The target PaCO2 (clinical-scope section 8): as given, or for a target pH with acute buffering. */
export function targetOf(
  c: CanonicalCase,
  v: Vent,
  book: Book,
  flags: Flag[],
  out: Ventilation,
): N {
  const g = c.gas;
  if (has(v.targetPco2)) {
    out.targetSource = 'target_pco2';
    out.targetForm = 'as_given';
    return record(book, 'targetPco2', v.targetPco2, {
      label: 'Target PaCO2 (as given)',
      unit: P,
      decimals: 1,
      formula: 'as entered',
      inputs: [input('Target PaCO2', v.targetPco2, P)],
      source: 'commonPractice',
    });
  }
  if (!has(v.targetPh)) return null;
  out.targetSource = 'target_ph';
  out.targetForm = 'acute_buffering';
  const hTarget = hydrogenIon(v.targetPh);
  record(book, 'targetPco2Simple', targetPco2Simple(hTarget, g.hco3), {
    label: 'Target PaCO2 (HCO3 held constant)',
    unit: P,
    decimals: 1,
    formula: 'PaCO2_t = [H+]_t x HCO3 / 24',
    inputs: [
      input('[H+] at target pH', round(hTarget, 1), 'nmol/L'),
      input('HCO3', g.hco3, 'mmol/L'),
    ],
    source: 'henderson',
  });
  const target = targetPco2Buffered(hTarget, g.hco3, g.pco2);
  if (target === null) {
    flags.push(flag('target_not_reachable', 'warning', { targetPh: v.targetPh }));
    return null;
  }
  // a target below the lowest plausible PaCO2 is not a ventilator setting to suggest
  if (target < FIELD['ventilator.targetPco2'].range[0]) {
    flags.push(
      flag('target_not_reachable', 'warning', {
        targetPh: v.targetPh,
        targetPco2: round(target, 1),
      }),
    );
    return null;
  }
  return record(book, 'targetPco2', target, {
    label: 'Target PaCO2 (acute buffering)',
    unit: P,
    decimals: 1,
    formula: 'PaCO2_t = [H+]_t x (HCO3 - 0.1 x PaCO2) / (24 - 0.1 x [H+]_t)',
    inputs: [
      input('Target pH', v.targetPh, ''),
      input('[H+] at target pH', round(hTarget, 1), 'nmol/L'),
      input('HCO3', g.hco3, 'mmol/L'),
      input('PaCO2 now', g.pco2, P),
    ],
    source: 'targetPco2',
  });
}

/**
 * The target the suggestions aim at: in a metabolic acidosis, never above Winters' band (the band's middle replaces a
 * higher or missing target while the PaCO2 is above the band); in chronic hypercapnia, never below the usual PaCO2
 * (clinical-scope sections 8 and 10). The flags of the contract say when the requested target was replaced.
 */
export function targetInUse(
  c: CanonicalCase,
  requested: N,
  cl: Classification,
  ref: ReferencePoint,
  book: Book,
  flags: Flag[],
  out: Ventilation,
): N {
  const g = c.gas;
  out.targetBasis = requested === null ? null : 'requested';
  const metabolicAcidosis = cl.disorders.some((x) => x.code === 'metabolic_acidosis');
  if (metabolicAcidosis && g.hco3 < NORMAL.hco3.low) {
    const band = wintersPco2(g.hco3);
    out.compensationTarget = band;
    if (requested !== null && requested > band.high)
      flags.push(
        flag('target_pco2_above_compensation', 'warning', {
          target: round(requested, 1),
          expectedLow: round(band.low, 1),
          expectedHigh: round(band.high, 1),
        }),
      );
    if (requested === null ? g.pco2 > band.high : requested > band.high)
      return compensationTarget(g.hco3, band, requested, book, out);
    return requested;
  }
  const usual = usualPco2(ref);
  out.usualPco2 = usual;
  if (usual !== null && requested !== null && requested < usual) {
    flags.push(
      flag('target_pco2_below_baseline', 'warning', {
        target: round(requested, 1),
        usual: round(usual, 1),
        estimated: ref.usual?.estimated.pco2 === true,
      }),
    );
    out.requestedTarget = round(requested, 1);
    out.targetBasis = 'usual';
    return record(book, 'targetPco2', usual, {
      label: "Target PaCO2 (the patient's usual value)",
      unit: P,
      decimals: 1,
      formula: 'usual PaCO2 in place of a lower requested target',
      inputs: [input('Usual PaCO2', usual, P), input('Requested target', requested, P)],
      source: 'commonPractice',
    });
  }
  return requested;
}

function compensationTarget(
  hco3: number,
  band: { low: number; high: number },
  requested: N,
  book: Book,
  out: Ventilation,
): number {
  out.requestedTarget = requested === null ? null : round(requested, 1);
  out.targetBasis = 'compensation';
  const mid = (band.low + band.high) / 2;
  return record(book, 'targetPco2', mid, {
    label: "Target PaCO2 (Winters' compensation)",
    unit: P,
    decimals: 1,
    formula: '1.5 x HCO3 + 8',
    inputs: [
      input('HCO3', hco3, 'mmol/L'),
      ...(requested === null ? [] : [input('Requested target', requested, P)]),
    ],
    source: 'winters',
  });
}
