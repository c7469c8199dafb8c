// What changed since the last gas: the values then and now, the settings changed, the PaCO2 the alveolar
// ventilation equation predicted, and whether the target the clinician set was reached.
import type { Findings, SettingChange } from '../calc/index.ts';
import type { Formatter, Text } from './format.ts';
import { co2Label, o2Label } from './flagView.ts';
import { type Ctx, freeText, has } from './viewShared.ts';

type GasField = 'ph' | 'pco2' | 'hco3' | 'po2' | 'lactate';

function gasText(fmt: Formatter, field: GasField, value: number | null | undefined): Text {
  if (!has(value)) return null;
  if (field === 'ph') return fmt.ph(value);
  if (field === 'pco2' || field === 'po2') return fmt.pressure(value);
  return fmt.mmol(value);
}

/** The same value without its unit, for "61 to 48 mmHg". */
function gasNumber(fmt: Formatter, field: GasField, value: number | null | undefined): Text {
  if (!has(value)) return null;
  if (field === 'ph') return fmt.ph(value);
  if (field === 'pco2' || field === 'po2') return fmt.pressureNumber(value);
  return fmt.plain(value, 1);
}

/** "RR 22 to 28/min", "FiO2 0.6 to 0.5": the first figure shares the unit of the second. */
function settingText(fmt: Formatter, s: SettingChange): string {
  if (s.field === 'rr') return `RR ${fmt.plain(s.from, 0)} to ${fmt.withUnit(s.to, 0, '/min')}`;
  if (s.field === 'vt') return `VT ${fmt.plain(s.from, 0)} to ${fmt.withUnit(s.to, 0, 'mL')}`;
  if (s.field === 'peep')
    return `PEEP ${fmt.plain(s.from, 0)} to ${fmt.withUnit(s.to, 0, 'cmH2O')}`;
  return `FiO2 ${fmt.fixed(s.from, 2)} to ${fmt.fixed(s.to, 2)}`;
}

export function trendView({ f, fmt, withheld, md }: Ctx) {
  const c = f.case;
  const last = f.previous.at(-1);
  if (!last || !f.changes.length || withheld) return null;
  const label = (field: GasField) =>
    field === 'ph'
      ? 'pH'
      : field === 'pco2'
        ? co2Label(c.sample)
        : field === 'hco3'
          ? 'HCO3'
          : field === 'po2'
            ? o2Label(c.sample)
            : 'lactate';
  const items = f.changes.map((x) => ({
    field: x.field,
    label: label(x.field),
    from: gasNumber(fmt, x.field, x.from),
    to: gasText(fmt, x.field, x.to),
    change:
      x.change === 0
        ? null
        : `${x.change > 0 ? '+' : '-'}${gasText(fmt, x.field, Math.abs(x.change))}`,
  }));
  const target = f.serial?.target;
  return {
    when: freeText(
      [last.label, last.takenAt?.replace('T', ' ') ?? null].filter(Boolean).join(', ') || null,
      md,
    ),
    items,
    // the pair a line and a handover carry: pH and PaCO2 then and now
    headline: items.filter((x) => x.field === 'ph' || x.field === 'pco2'),
    settings: (f.serial?.settingChanges ?? []).map((s) => settingText(fmt, s)),
    target: target
      ? {
          text:
            target.kind === 'ph'
              ? `pH ${fmt.ph(target.value)}`
              : `${co2Label(c.sample)} ${fmt.pressure(target.value)}`,
          reached: target.reached,
        }
      : null,
    ventilator: serialView(f, fmt),
  };
}

/** The ventilator change between the two gases and what the alveolar ventilation equation predicted. */
function serialView(f: Findings, fmt: Formatter) {
  const serial = f.serial;
  const v = f.case.ventilator;
  if (!serial?.ventilatorChanged || !v) return null;
  const last = serial.last;
  const p = serial.prediction;
  return {
    before: `RR ${fmt.plain(last.rr, 0)}/min, VT ${fmt.plain(last.vt, 0)} mL`,
    now: `RR ${fmt.plain(v.rr, 0)}/min, VT ${fmt.plain(v.vt, 0)} mL`,
    predicted: p ? fmt.pressure(p.predicted) : null,
    observed: p ? fmt.pressure(p.observed) : null,
    verdict: p ? p.verdict : null,
    unavailable: serial.predictionUnavailable,
  };
}
