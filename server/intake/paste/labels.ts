// Labels on a printout. What a case field is called comes from calc's table (FIELDS[].printed, with the variants
// that tell actual from standard base excess, sO2 from O2Hb, BUN from urea); the reader adds the labels it knows
// and deliberately does not read (standard bicarbonate, total CO2, gaps and ratios it works out itself) and the
// ones it only asks about (a base deficit, "PAO2").
import { FIELDS, type FieldPath, type FieldSpec, type Printed } from '../../../calc/index.ts';

export type Variant = NonNullable<Printed['variant']>;
export type LabelTarget =
  | { field: FieldPath; variant?: Variant }
  | { skip: string }
  | { ask: 'baseDeficit' | 'capsPAO2' };

export interface LabelDef {
  re: RegExp;
  target: LabelTarget;
}

const label = (source: string, flags: string, target: LabelTarget): LabelDef => ({
  re: new RegExp(String.raw`(?<![A-Za-z0-9])(?:${source})(?![A-Za-z0-9])`, `g${flags}`),
  target,
});

export const TEMPERATURE_CORRECTED = 'temperature-corrected value; the 37 °C value is the one read';
const TOTAL_CO2 =
  'total CO2 is not the blood-gas HCO3 (it runs about 1-2 mmol/L higher); enter it as HCO3 by hand if that is meant';
const ANION_GAP = 'anion gap: Gasline works it out from Na, Cl and HCO3';
const TOTAL_CALCIUM =
  'total calcium is not ionised calcium; enter ionised calcium by hand if it was measured';

// Recognised and deliberately not read, or asked about and never filled. The c-, ct-, F- and s- prefixes and the
// (B), (ecf), (P), (T) marks are the quantity symbols of the IFCC/CLSI blood-gas recommendations (CLSI C46; from
// memory), not one maker's print.
const NOT_READ: readonly LabelDef[] = [
  label(
    String.raw`(?:std\.?|st\.?|standard)\s?HCO3-?|HCO3-?\s?(?:std|st)|HCO3-?\s?\(\s*(?:P\s*,\s*)?st(?:d|andard)?\s*\)|SBC|standard\s+bicarbonate|st(?:d|andard)?\.?\s+bicarb(?:onate)?`,
    'i',
    { skip: 'standard bicarbonate is not the actual HCO3' },
  ),
  label(
    String.raw`t\s?CO2|total\s+CO2|CO2,?\s+total|CO2\s+content|carbon\s+dioxide(?:,?\s+total)?`,
    'i',
    { skip: TOTAL_CO2 },
  ),
  label(String.raw`CO2`, '', { skip: TOTAL_CO2 }),
  label(String.raw`E\s?T\s?CO2|P\s?ET\s?CO2`, 'i', {
    skip: 'end-tidal CO2 is not the blood PaCO2',
  }),
  label(String.raw`p[aA]?O2\s?\/\s?F[iI]O2|P\s?\/\s?F(?:\s+ratio)?`, '', {
    skip: 'ratio: Gasline works it out from PaO2 and FiO2',
  }),
  label(String.raw`A\s?-\s?a(?:\s?DO2|\s+gradient)?|AaDO2|a\s?\/\s?A(?:\s+ratio)?`, '', {
    skip: 'alveolar-arterial values: Gasline works them out',
  }),
  label(String.raw`AG|AnGap|anion\s+gap`, '', { skip: ANION_GAP }),
  label(String.raw`anion\s+gap`, 'i', { skip: ANION_GAP }),
  label(
    String.raw`calc(?:ulated)?\.?\s+osm(?:olality|olarity)?|osm(?:olality|olarity)?\s*\(\s*calc(?:ulated)?\.?\s*\)|osmolarity|osm(?:olal|olar)?\s+gap`,
    'i',
    { skip: 'calculated osmolality is not the measured osmolality' },
  ),
  label(String.raw`S\s?c?v\s?O2`, 'i', { skip: 'venous saturation is not SaO2' }),
  // "Ca" alone is total calcium; the ionised calcium's own labels (Ca++, iCa) are longer and win
  label(String.raw`Ca|CA(?=\s*[=:])`, '', { skip: TOTAL_CALCIUM }),
  label(String.raw`(?:total\s+|corrected\s+|adjusted\s+)?calcium`, 'i', { skip: TOTAL_CALCIUM }),
  label(String.raw`base\s+deficit`, 'i', { ask: 'baseDeficit' }),
  label(String.raw`PA\s?O2`, '', { ask: 'capsPAO2' }),
];

/** Every label the reader knows: its own first, then the table's, in table order. */
export const LABELS: readonly LabelDef[] = [
  ...NOT_READ,
  ...(FIELDS as readonly FieldSpec[]).flatMap((f) =>
    (f.printed ?? []).map((p) =>
      label(p.pattern, p.anyCase ? 'i' : '', {
        field: f.path as FieldPath,
        ...(p.variant ? { variant: p.variant } : {}),
      }),
    ),
  ),
];

export interface LabelMatch {
  start: number;
  end: number;
  def: LabelDef;
  order: number;
}

/** The labels on a line, left to right; where two overlap, the earlier, then the longer, then the first listed. */
export function findLabels(line: string): LabelMatch[] {
  const all: LabelMatch[] = [];
  LABELS.forEach((def, order) => {
    def.re.lastIndex = 0;
    for (let m = def.re.exec(line); m; m = def.re.exec(line)) {
      all.push({ start: m.index, end: m.index + m[0].length, def, order });
      if (m[0].length === 0) def.re.lastIndex++;
    }
  });
  all.sort((a, b) => a.start - b.start || b.end - b.start - (a.end - a.start) || a.order - b.order);
  const kept: LabelMatch[] = [];
  for (const m of all) if (!kept.length || m.start >= kept[kept.length - 1]!.end) kept.push(m);
  return kept;
}
