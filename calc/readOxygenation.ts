// The oxygenation part of a reading (arterial samples only), and what a venous or capillary sample can show.
import type { CanonicalCase } from './canonical.ts';
import { OXYGENATION, PHYSIOLOGY, VENOUS } from './reference.ts';
import {
  aaGradient,
  alveolarPo2,
  barometricPressureAtAltitude,
  expectedAaGradient,
  oxygenContent,
  oxygenationLevel,
  pfBand,
  pfRatio,
  sfMeetsCriterion,
  sfRatio,
} from './oxygenation.ts';
import { flag, type Flag } from './flags.ts';
import { explanation, input, round } from './explain.ts';
import { type Derived, type Oxygenation, type Venous, has, type Explainers } from './findings.ts';

export function notAssessed(c: CanonicalCase): Oxygenation {
  return {
    assessable: false,
    reason: c.sample === 'arterial' ? null : c.sample,
    barometricSource: 'sea_level',
    level: null,
    failureType: null,
    pfBand: null,
    pfBandApplies: false,
    sfMeetsCriterion: null,
    aaRaised: null,
    lowInspiredOrHypoventilation: false,
  };
}

export function oxygenationPart(
  c: CanonicalCase,
  d: Derived,
  explain: Explainers,
  flags: Flag[],
): Oxygenation {
  const o = notAssessed(c);
  const g = c.gas,
    ox = c.oxygen;
  // SpO2/FiO2 needs no arterial PO2: it is the 2024 global definition's measure when no arterial gas is at hand
  if (has(ox.spo2) && has(ox.fio2)) {
    const sf = sfRatio(ox.spo2, ox.fio2);
    d.sfRatio = sf;
    o.sfMeetsCriterion = sfMeetsCriterion(ox.spo2, sf);
    explain.sfRatio = () =>
      explanation(
        'sfRatio',
        'SpO2/FiO2',
        round(sf, 0),
        '',
        'S/F = SpO2 % / FiO2',
        [input('SpO2', ox.spo2!, '%'), input('FiO2', ox.fio2!, '')],
        'ardsGlobal2024',
      );
  }
  if (c.sample !== 'arterial') {
    flags.push(flag('oxygenation_not_assessable', 'info', { sample: c.sample }));
    return o;
  }
  o.assessable = has(g.po2);
  let pb: number = PHYSIOLOGY.seaLevelMmHg;
  if (has(c.context.barometricPressure)) {
    pb = c.context.barometricPressure;
    o.barometricSource = 'entered';
  } else if (has(c.context.altitudeM)) {
    pb = barometricPressureAtAltitude(c.context.altitudeM);
    o.barometricSource = 'altitude';
    explain.barometricPressure = () =>
      explanation(
        'barometricPressure',
        'Barometric pressure',
        round(pb, 0),
        'mmHg',
        'PB = 760 x (1 - 2.25577e-5 x altitude m)^5.25588',
        [input('Altitude', c.context.altitudeM!, 'm')],
        'isa',
      );
  }
  d.barometricPressure = pb;
  if (has(g.hb) && has(g.sao2)) {
    d.oxygenContent = oxygenContent(g.hb, g.sao2, g.po2 ?? 0);
    if (has(g.po2)) {
      explain.oxygenContent = () =>
        explanation(
          'oxygenContent',
          'O2 content',
          round(d.oxygenContent!, 1),
          'mL/dL',
          'CaO2 = 1.34 x Hb x SaO2 + 0.003 x PaO2',
          [
            input('Hb', round(g.hb!, 1), 'g/dL'),
            input('SaO2', g.sao2!, '%'),
            input('PaO2', round(g.po2!, 1), 'mmHg'),
          ],
          'oxygenContent',
        );
    } else d.oxygenContent = null;
  }
  if (!has(g.po2)) return o;
  o.level = oxygenationLevel(g.po2);
  if (g.po2 < OXYGENATION.respiratoryFailure)
    o.failureType = g.pco2 > OXYGENATION.hypercapnia ? 2 : 1;
  if (!has(ox.fio2)) {
    flags.push(flag('fio2_missing', 'info', {}));
    return o;
  }
  const pao2 = alveolarPo2(ox.fio2, g.pco2, pb);
  d.alveolarPo2 = pao2;
  explain.alveolarPo2 = () =>
    explanation(
      'alveolarPo2',
      'Alveolar PO2',
      round(pao2, 1),
      'mmHg',
      'PAO2 = FiO2 x (PB - 47) - PaCO2 / 0.8',
      [
        input('FiO2', ox.fio2!, ''),
        input('PB', round(pb, 0), 'mmHg'),
        input('PaCO2', round(g.pco2, 1), 'mmHg'),
      ],
      'alveolarGas',
    );
  const gradient = aaGradient(pao2, g.po2);
  d.aaGradient = gradient;
  explain.aaGradient = () =>
    explanation(
      'aaGradient',
      'A-a gradient',
      round(gradient, 1),
      'mmHg',
      'A-a = PAO2 - PaO2',
      [input('PAO2', round(pao2, 1), 'mmHg'), input('PaO2', round(g.po2!, 1), 'mmHg')],
      'alveolarGas',
    );
  if (g.po2 > pao2)
    flags.push(
      flag('po2_above_alveolar', 'warning', {
        po2: round(g.po2, 1),
        alveolarPo2: round(pao2, 1),
        fio2: ox.fio2,
      }),
    );
  const roomAir = Math.abs(ox.fio2 - OXYGENATION.roomAirFio2) < 0.005;
  if (has(c.patient.ageYears)) {
    const expected = expectedAaGradient(c.patient.ageYears);
    d.aaGradientExpected = expected;
    explain.aaGradientExpected = () =>
      explanation(
        'aaGradientExpected',
        'Expected A-a gradient (room air)',
        round(expected, 0),
        'mmHg',
        'age / 4 + 4',
        [input('Age', c.patient.ageYears!, 'years')],
        'aaAge',
      );
    if (roomAir) {
      o.aaRaised = gradient > expected;
      o.lowInspiredOrHypoventilation = o.level !== 'normal' && !o.aaRaised;
    } else flags.push(flag('aa_reference_room_air_only', 'info', { fio2: ox.fio2 }));
  }
  const pf = pfRatio(g.po2, ox.fio2);
  d.pfRatio = pf;
  explain.pfRatio = () =>
    explanation(
      'pfRatio',
      'P/F ratio',
      round(pf, 0),
      'mmHg',
      'P/F = PaO2 / FiO2',
      [input('PaO2', round(g.po2!, 1), 'mmHg'), input('FiO2', ox.fio2!, '')],
      'ardsBerlin',
    );
  o.pfBandApplies = has(ox.peep) && ox.peep >= OXYGENATION.pfMinimumPeep;
  o.pfBand = pfBand(pf);
  return o;
}

export function venousPart(c: CanonicalCase, flags: Flag[]): Venous | null {
  if (c.sample === 'arterial') return null;
  const g = c.gas;
  const venous = c.sample === 'venous';
  flags.push(
    flag(venous ? 'venous_sample' : 'capillary_sample', 'warning', { pco2: round(g.pco2, 1) }),
  );
  return {
    sample: venous ? 'venous' : 'capillary',
    hypercapniaUnlikely: venous && g.pco2 < VENOUS.hypercapniaBelow,
    arterialEstimate:
      venous && g.pco2 >= VENOUS.minPco2
        ? {
            ph: round(g.ph + VENOUS.ph, 2),
            pco2Low: round(g.pco2 - VENOUS.pco2High, 0),
            pco2High: round(g.pco2 - VENOUS.pco2Low, 0),
            hco3: round(g.hco3 - VENOUS.hco3, 1),
          }
        : null,
  };
}
