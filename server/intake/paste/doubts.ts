// The questions the paste reader asks about one value: a unit the field does not take, a value outside the
// schema's range, and the readings a printout allows that the case must not take as written.
import {
  rangeText,
  resolveUnits,
  units,
  type FieldPath,
  type FieldSpec,
  type UnitDef,
  type Units,
} from '../../../calc/index.ts';
import type { Question } from '../case.ts';
import type { Candidate } from './collect.ts';

export const questionOf = (
  f: FieldSpec,
  c: Candidate,
  reason: string,
  options?: string[],
): Question => ({
  path: f.path,
  reason,
  ...(options ? { options } : {}),
  value: c.value,
  sourceText: c.sourceText,
});

/** The units a field takes, as the clinician reads them. */
export function expectedUnits(f: FieldSpec): string {
  if (f.path === 'oxygen.fio2') return '% or a fraction';
  if (f.quantity)
    return Object.values(units.QUANTITIES[f.quantity].units as Record<string, UnitDef>)
      .map((d) => d.label)
      .join(' or ');
  return f.unit || 'no unit';
}

export const wrongUnit = (f: FieldSpec, c: Candidate, reason: string): Question =>
  questionOf(
    f,
    c,
    c.unit === 'mEq/L'
      ? reason
      : `${f.label} ${c.value} is given in ${c.unit}; expected ${expectedUnits(f)}`,
  );

export function outside(
  f: FieldSpec,
  c: Candidate,
  value: number,
  shown: string,
  settings: Partial<Units>,
) {
  if (f.path === 'oxygen.fio2')
    return questionOf(
      f,
      c,
      `FiO2 ${value} is neither a fraction (0.21-1.00) nor a percent (21-100)`,
    );
  const as = value === c.value ? '' : ` (${c.value} ${c.unit})`;
  return questionOf(
    f,
    c,
    `${f.label} ${value}${shown ? ` ${shown}` : ''}${as} is not plausible (plausible range ${rangeText(f, resolveUnits(settings))}): check the value and its unit`,
  );
}

// Readings a printout allows that the case must not take as written: asked, with what to do.
export const SPECIAL: Partial<Record<FieldPath, (f: FieldSpec, c: Candidate) => Question | null>> =
  {
    'gas.lactate': (f, c) =>
      c.unit === 'mg/dL'
        ? questionOf(
            f,
            c,
            `Lactate ${c.value} mg/dL: the case takes lactate in mmol/L (mmol/L = mg/dL / 9.01, molar mass 90.08); enter it converted`,
          )
        : null,
    'gas.hb': (f, c) =>
      c.unit === 'mmol/L'
        ? questionOf(
            f,
            c,
            `Hb ${c.value} mmol/L: the case takes Hb in g/dL or g/L; enter it converted`,
          )
        : null,
    'chemistry.osmolality': (f, c) =>
      c.unit === 'mOsm/L'
        ? questionOf(
            f,
            c,
            `Osmolality ${c.value} mOsm/L: osmolarity is usually calculated; the case takes the measured osmolality in mOsm/kg`,
          )
        : null,
    'chemistry.urea': (f, c) => {
      if (c.variant === 'bun')
        return c.unit !== null && c.unit !== 'mg/dL'
          ? questionOf(
              f,
              c,
              `BUN ${c.value} ${c.unit}: urea nitrogen is taken in mg/dL; enter urea in mmol/L by hand if that is meant`,
            )
          : null;
      return c.unit === 'mg/dL'
        ? questionOf(
            f,
            c,
            `Urea ${c.value} mg/dL: is it urea nitrogen (BUN) or urea itself (BUN = urea x 0.467)?`,
            ['BUN mg/dL', 'urea mg/dL'],
          )
        : null;
    },
    'oxygen.fio2': (f, c) =>
      c.unit === '%' && c.value <= 1
        ? questionOf(f, c, `FiO2 ${c.value} % is not plausible: was it a fraction?`)
        : null,
  };

/** A saturation written as a fraction (0.95) is asked about as a percent, never converted silently. */
export function fractionOfPercent(f: FieldSpec, c: Candidate): Question | null {
  if (!f.percent || (c.unit !== null && c.unit !== '%') || c.value <= 0 || c.value > 1) return null;
  const percent = String(Math.round(c.value * 1000) / 10);
  return questionOf(f, c, `${f.label} ${c.value} looks like a fraction: is it ${percent} %?`, [
    percent,
  ]);
}
