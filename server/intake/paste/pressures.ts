// PaCO2 and PaO2 share the pressure unit of the case, so they are decided together: the unit written on either
// line, else the one unit in which both are plausible; two units, or none that fits, are asked about.
import { FIELD, readUnit, units } from '../../../calc/index.ts';
import type { Candidate } from './collect.ts';
import { WINDOWS, inWindow, take, type Ask, type Fill } from './decideUnit.ts';
import { questionOf, wrongUnit } from './doubts.ts';

/** PaCO2 and PaO2 share the pressure unit of the case: decided together. */
export function decidePressures(cands: Candidate[], ask: Ask, fill: Fill): void {
  if (!cands.length) return;
  const readings = new Map(
    cands.map((c) => [c, c.unit === null ? null : readUnit(FIELD[c.path], c.unit, c.value)]),
  );
  const pressures = cands.filter((c) => {
    const r = readings.get(c);
    if (r && !r.ok) ask(wrongUnit(FIELD[c.path], c, r.reason));
    return !r || r.ok;
  });
  if (!pressures.length) return;
  const unitOf = (c: Candidate) => {
    const r = readings.get(c);
    return r?.ok ? (r.setting?.unit as 'mmHg' | 'kPa') : null;
  };
  const explicit = new Set(pressures.map(unitOf).filter((u) => u !== null));
  const options = ['mmHg', 'kPa'];
  const label = (c: Candidate) => FIELD[c.path].label;
  const reading = (c: Candidate, unit: string) => ({
    ok: true as const,
    value: c.value,
    setting: { quantity: 'pressure' as const, unit },
  });

  if (explicit.size === 2) {
    for (const c of pressures)
      ask(
        questionOf(
          FIELD[c.path],
          c,
          `one pressure line says kPa and another mmHg: confirm the unit of ${label(c)} ${c.value}`,
          options,
        ),
      );
    return;
  }
  if (explicit.size === 1) {
    const unit = [...explicit][0]!;
    for (const c of pressures) {
      if (c.unit !== null)
        take(FIELD[c.path], c, reading(c, unit), c.headerUnit ? 'printout' : 'text', ask, fill);
      else if (inWindow(c.value, WINDOWS[c.path]![unit]!))
        take(FIELD[c.path], c, reading(c, unit), 'printout', ask, fill);
      else
        ask(
          questionOf(
            FIELD[c.path],
            c,
            `${label(c)} ${c.value} has no unit and is not plausible in ${unit}, the unit of the other pressure`,
            options,
          ),
        );
    }
    return;
  }
  // no unit anywhere: the unit in which every pressure is plausible
  const fits = (['mmHg', 'kPa'] as const).filter((u) =>
    pressures.every((c) => inWindow(c.value, WINDOWS[c.path]![u]!)),
  );
  if (fits.length === 1) {
    for (const c of pressures) take(FIELD[c.path], c, reading(c, fits[0]!), 'magnitude', ask, fill);
    return;
  }
  for (const c of pressures) {
    const reason =
      fits.length === 2
        ? `${label(c)} ${c.value} has no unit: ${c.value} mmHg and ${c.value} kPa (${Math.round(c.value * units.MMHG_PER_KPA)} mmHg) are both possible`
        : `${label(c)} ${c.value} has no unit, and the pressures together are not plausible in either mmHg or kPa`;
    ask(questionOf(FIELD[c.path], c, reason, options));
  }
}
