// Deciding: one value per field from the candidates collected (the most direct label first; readings that
// disagree are asked about), then its unit (decideUnit.ts), a Henderson hint for an open PaCO2 unit question, and
// the sample type.
import { FIELD, acidBase, units, type FieldPath, type Units } from '../../../calc/index.ts';
import { missingGas, setCaseValue, type Question } from '../case.ts';
import type { Candidate, Collector } from './collect.ts';
import { decideOne, type Fill } from './decideUnit.ts';
import { decidePressures } from './pressures.ts';
import type { Variant } from './labels.ts';
import type { PasteResult } from './types.ts';

const VARIANT_RANK: Record<Variant, number> = {
  actual: 0,
  so2: 0,
  plain: 1,
  bun: 1,
  o2hb: 2,
  standard: 3,
};
const VARIANT_SKIP: Partial<Record<Variant, string>> = {
  standard: 'standard base excess: the actual base excess is read',
  o2hb: 'oxyhaemoglobin fraction: sO2 is read (they differ when COHb or MetHb is raised)',
  plain: 'a second base excess: the actual base excess is read',
};
const rank = (c: Candidate) => (c.variant ? VARIANT_RANK[c.variant] : 1);

/** The collected candidates decided into the result's case, read values and questions. */
export function resolve(col: Collector, result: PasteResult): void {
  const c = result.case;
  const pending = new Set<string>();
  const ask = (q: Question) => {
    result.questions.push(q);
    pending.add(q.path);
  };
  const fill: Fill = (cand, read, settings?: Partial<Units>) => {
    setCaseValue(c, cand.path, read.value);
    if (settings) c.units = { ...c.units, ...settings };
    result.read.push({
      path: cand.path,
      value: read.value,
      unit: read.unit,
      sourceText: cand.sourceText,
      line: cand.line,
      unitFrom: read.unitFrom,
      ...(read.note ? { note: read.note } : {}),
      ...(read.written ? { written: read.written } : {}),
    });
  };

  for (const q of col.questions) ask(q);
  result.skipped.push(...col.skipped);
  result.ignored.push(...col.ignored);

  const chosen = choose(col.candidates, pending, result, ask);
  decidePressures(
    (['gas.pco2', 'gas.po2'] as const).flatMap((p) => chosen.get(p) ?? []),
    ask,
    fill,
  );
  for (const [path, cand] of chosen)
    if (path !== 'gas.pco2' && path !== 'gas.po2') decideOne(path, cand, ask, fill);

  addHendersonSuggestion(result);
  decideSample(col, result, ask);
  result.missing = missingGas(c, pending);
}

/** One candidate per field: the best label variant, and every reading of it must agree. */
function choose(
  candidates: Candidate[],
  pending: ReadonlySet<string>,
  result: PasteResult,
  ask: (q: Question) => void,
): Map<FieldPath, Candidate> {
  const byPath = new Map<FieldPath, Candidate[]>();
  for (const cand of candidates) byPath.set(cand.path, [...(byPath.get(cand.path) ?? []), cand]);
  const chosen = new Map<FieldPath, Candidate>();
  for (const [path, list] of byPath) {
    if (pending.has(path)) {
      for (const cand of list)
        result.skipped.push({
          sourceText: cand.sourceText,
          reason: 'not used while the question about this value is open',
          line: cand.line,
        });
      continue;
    }
    const best = Math.min(...list.map(rank));
    const top = list.filter((x) => rank(x) === best);
    for (const x of list)
      if (rank(x) !== best)
        result.skipped.push({
          sourceText: x.sourceText,
          reason: VARIANT_SKIP[x.variant ?? 'plain'] ?? 'a less direct reading of the same value',
          line: x.line,
        });
    const distinct = new Map(top.map((x) => [`${x.value}|${x.unit ?? ''}`, x]));
    const values = new Set(top.map((x) => x.value));
    const unitsSeen = new Set(top.map((x) => x.unit).filter((u) => u !== null));
    if (values.size > 1 || unitsSeen.size > 1) {
      const shown = [...distinct.values()].slice(0, 6);
      ask({
        path,
        reason: `${FIELD[path].label} is written more than once with different values (${shown.map((x) => `${x.value}${x.unit ? ` ${x.unit}` : ''}`).join(', ')}${distinct.size > shown.length ? ', ...' : ''}): which one is this sample?`,
        options: [...values].slice(0, 6).map(String),
        sourceText: top
          .slice(0, 6)
          .map((x) => x.sourceText)
          .join(' | '),
      });
      continue;
    }
    chosen.set(path, top.find((x) => x.unit !== null) ?? top[0]!);
  }
  return chosen;
}

/** For an open PaCO2 unit question, the Henderson equation with the pH and HCO3 read may point to one unit. */
function addHendersonSuggestion(result: PasteResult): void {
  const { ph, hco3 } = result.case.gas;
  if (typeof ph !== 'number' || typeof hco3 !== 'number') return;
  const expected = acidBase.hendersonPco2(acidBase.hydrogenIon(ph), hco3); // mmHg
  for (const q of result.questions) {
    if (q.path !== 'gas.pco2' || q.value === undefined || !q.options?.includes('kPa')) continue;
    // within 10%: the consistency limit of clinical-scope section 2
    const near = (mmHg: number) => Math.abs(mmHg - expected) / expected <= 0.1;
    const hits = [
      near(q.value) ? 'mmHg' : null,
      near(q.value * units.MMHG_PER_KPA) ? 'kPa' : null,
    ].filter((x): x is string => x !== null);
    if (hits.length === 1) {
      q.suggested = hits[0]!;
      q.reason += ` (with the pH and HCO3 read, ${hits[0]} fits the Henderson equation)`;
    }
  }
}

function decideSample(col: Collector, result: PasteResult, ask: (q: Question) => void): void {
  const kinds = [...new Set(col.samples.map((s) => s.sample))];
  // asked only once a value of the gas itself was read (lactate or Hb alone do not need it)
  const g = result.case.gas;
  const anyGas = [g.ph, g.pco2, g.po2, g.hco3, g.baseExcess, g.sao2].some(
    (v) => v !== undefined && v !== null,
  );
  if (kinds.length === 1) {
    result.case.sample = kinds[0]!;
    return;
  }
  if (kinds.length > 1) {
    ask({
      path: 'sample',
      reason: `the paste names more than one sample type (${kinds.join(', ')}): which one is this gas?`,
      options: kinds,
      sourceText: col.samples.map((s) => s.sourceText).join(' | '),
    });
    return;
  }
  if (anyGas)
    ask({
      path: 'sample',
      reason:
        'the paste does not say whether the sample is arterial, venous or capillary (without it the gas is read as arterial)',
      options: ['arterial', 'venous', 'capillary'],
    });
}
