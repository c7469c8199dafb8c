// The oxygenation part of a reading (arterial samples only), and what a venous or capillary sample can show.
import type { CanonicalCase } from './canonical.ts';
import { OXYGENATION, PHYSIOLOGY, SEVERE_HYPOXAEMIA, VENOUS } from './reference.ts';
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
import { input, record, round, type How } from './explain.ts';
import { type Book, type Oxygenation, type Venous, has } from './findings.ts';

const P = 'mmHg';

export function notAssessed(c: CanonicalCase): Oxygenation {
  return {
    target: null,
    saturation: null,
    aboveTarget: false,
    belowTarget: false,
    severeHypoxaemia: false,
    ardsCriterionMet: false,
    gasExchangeImpaired: false,
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
    lowInspiredPo2: false,
    pfBandFrom: null,
  };
}

/** The barometric pressure: entered, from the altitude (ISO 2533), or sea level. */
function barometric(c: CanonicalCase, book: Book, o: Oxygenation): number {
  const { barometricPressure, altitudeM } = c.context;
  const how = { label: 'Barometric pressure', unit: P, decimals: 0 } as const;
  let pb: number;
  let explained: Pick<How, 'formula' | 'inputs' | 'source'>;
  if (has(barometricPressure)) {
    pb = barometricPressure;
    o.barometricSource = 'entered';
    explained = { formula: 'as entered', inputs: [input('PB', pb, P)], source: 'commonPractice' };
  } else if (has(altitudeM)) {
    pb = barometricPressureAtAltitude(altitudeM);
    o.barometricSource = 'altitude';
    explained = {
      formula: 'PB = 760 x (1 - 2.25577e-5 x altitude m)^5.25588',
      inputs: [input('Altitude', altitudeM, 'm')],
      source: 'isa',
    };
  } else {
    pb = PHYSIOLOGY.seaLevelMmHg;
    explained = {
      formula: 'sea level (no altitude or pressure given)',
      inputs: [input('PB at sea level', pb, P)],
      source: 'isa',
    };
  }
  return record(book, 'barometricPressure', pb, { ...how, ...explained });
}

export function oxygenationPart(c: CanonicalCase, book: Book, flags: Flag[]): Oxygenation {
  const o = notAssessed(c);
  const g = c.gas;
  const { fio2, spo2, peep } = c.oxygen;
  // SpO2/FiO2 needs no arterial PO2: it is the 2024 global definition's measure when no arterial gas is at hand
  if (has(spo2) && has(fio2)) {
    const sf = record(book, 'sfRatio', sfRatio(spo2, fio2), {
      label: 'SpO2/FiO2',
      unit: '',
      decimals: 0,
      formula: 'S/F = SpO2 % / FiO2',
      inputs: [input('SpO2', spo2, '%'), input('FiO2', fio2, '')],
      source: 'ardsGlobal2024',
    });
    o.sfMeetsCriterion = sfMeetsCriterion(spo2, sf);
    o.ardsCriterionMet = o.sfMeetsCriterion === true;
  }
  if (c.sample !== 'arterial') {
    flags.push(flag('oxygenation_not_assessable', 'info', { sample: c.sample }));
    return o;
  }
  o.assessable = has(g.po2);
  const pb = barometric(c, book, o);
  if (has(g.hb) && has(g.sao2) && has(g.po2)) {
    record(book, 'oxygenContent', oxygenContent(g.hb, g.sao2, g.po2), {
      label: 'O2 content',
      unit: 'mL/dL',
      decimals: 1,
      formula: 'CaO2 = 1.34 x Hb x SaO2 + 0.003 x PaO2',
      inputs: [
        input('Hb', round(g.hb, 1), 'g/dL'),
        input('SaO2', g.sao2, '%'),
        input('PaO2', g.po2, P),
      ],
      source: 'oxygenContent',
    });
  }
  if (!has(g.po2)) return o;
  o.level = oxygenationLevel(g.po2);
  if (g.po2 < OXYGENATION.respiratoryFailure)
    o.failureType = g.pco2 > OXYGENATION.hypercapnia ? 2 : 1;
  if (!has(fio2)) {
    flags.push(flag('fio2_missing', 'info', {}));
    return o;
  }
  const alveolar = record(book, 'alveolarPo2', alveolarPo2(fio2, g.pco2, pb), {
    label: 'Alveolar PO2',
    unit: P,
    decimals: 1,
    formula: 'PAO2 = FiO2 x (PB - 47) - PaCO2 / 0.8',
    inputs: [input('FiO2', fio2, ''), input('PB', round(pb, 0), P), input('PaCO2', g.pco2, P)],
    source: 'alveolarGas',
  });
  const gradient = record(book, 'aaGradient', aaGradient(alveolar, g.po2), {
    label: 'A-a gradient',
    unit: P,
    decimals: 1,
    formula: 'A-a = PAO2 - PaO2',
    inputs: [input('PAO2', alveolar, P), input('PaO2', g.po2, P)],
    source: 'alveolarGas',
  });
  if (g.po2 > alveolar)
    flags.push(
      flag('po2_above_alveolar', 'warning', {
        po2: round(g.po2, 1),
        alveolarPo2: round(alveolar, 1),
        fio2,
      }),
    );
  const roomAir = Math.abs(fio2 - OXYGENATION.roomAirFio2) < 0.005;
  const atAltitude = pb < PHYSIOLOGY.seaLevelMmHg - 0.5;
  const age = c.patient.ageYears;
  if (has(age)) {
    const expected = record(book, 'aaGradientExpected', expectedAaGradient(age), {
      label: 'Expected A-a gradient (room air)',
      unit: P,
      decimals: 0,
      formula: 'age / 4 + 4',
      inputs: [input('Age', age, 'years')],
      source: 'aaAge',
    });
    if (roomAir) {
      o.aaRaised = gradient > expected;
      o.gasExchangeImpaired = o.aaRaised;
      o.lowInspiredOrHypoventilation = o.level !== 'normal' && !o.aaRaised;
      if (atAltitude) lowInspiredPo2(c, o, { pb, alveolar, gradient }, flags);
    } else flags.push(flag('aa_reference_room_air_only', 'info', { fio2 }));
  }
  const pf = record(book, 'pfRatio', pfRatio(g.po2, fio2), {
    label: 'P/F ratio',
    unit: P,
    decimals: 0,
    formula: 'P/F = PaO2 / FiO2',
    inputs: [input('PaO2', g.po2, P), input('FiO2', fio2, '')],
    source: 'ardsBerlin',
  });
  o.pfBandApplies = has(peep) && peep >= OXYGENATION.pfMinimumPeep;
  o.pfBand = pfBand(pf);
  o.pfBandFrom = 'measured';
  // on oxygen the age-expected gradient does not hold; a P/F of 300 or less shows impaired gas exchange (Berlin)
  if (!roomAir && pf <= OXYGENATION.pfMild) o.gasExchangeImpaired = true;
  severeHypoxaemia(pf, fio2, peep, o, flags);
  // Berlin definition: below sea-level pressure the oxygenation criterion uses P/F x PB/760
  if (atAltitude) {
    const adjusted = record(book, 'pfRatioAdjusted', pf * (pb / PHYSIOLOGY.seaLevelMmHg), {
      label: 'P/F ratio adjusted for altitude',
      unit: P,
      decimals: 0,
      formula: 'P/F x PB / 760',
      inputs: [input('P/F', round(pf, 0), P), input('PB', round(pb, 0), P)],
      source: 'ardsBerlin',
    });
    o.pfBand = pfBand(adjusted);
    o.pfBandFrom = 'altitude_adjusted';
    o.ardsCriterionMet ||= o.pfBandApplies && o.pfBand !== 'none';
    flags.push(
      flag('pf_adjusted_for_altitude', 'info', {
        pfRatio: round(pf, 0),
        pfRatioAdjusted: round(adjusted, 0),
        barometricPressure: round(pb, 0),
        band: o.pfBand,
        bandApplies: o.pfBandApplies,
      }),
    );
  }
  if (!atAltitude) o.ardsCriterionMet ||= o.pfBandApplies && o.pfBand !== 'none';
  return o;
}

// P/F below 150 on FiO2 0.6 or more with PEEP 5 or more: prone positioning 16 h a day or more (PROSEVA 2013)
function severeHypoxaemia(
  pf: number,
  fio2: number,
  peep: number | null,
  o: Oxygenation,
  flags: Flag[],
) {
  const S = SEVERE_HYPOXAEMIA;
  o.severeHypoxaemia =
    pf < S.pfBelow && fio2 >= S.fio2AtLeast && has(peep) && peep >= S.peepAtLeast;
  if (o.severeHypoxaemia)
    flags.push(flag('severe_hypoxaemia', 'warning', { pfRatio: round(pf, 0), fio2, peep }));
}

// Below sea-level pressure, hypoxaemia with a normal A-a gradient and no hypercapnia is the low inspired PO2 of
// altitude, not type 1 respiratory failure (clinical-scope section 10).
function lowInspiredPo2(
  c: CanonicalCase,
  o: Oxygenation,
  at: { pb: number; alveolar: number; gradient: number },
  flags: Flag[],
) {
  o.lowInspiredPo2 = o.lowInspiredOrHypoventilation && c.gas.pco2 <= OXYGENATION.hypercapnia;
  if (!o.lowInspiredPo2) return;
  if (o.failureType === 1) o.failureType = null;
  flags.push(
    flag('low_inspired_po2', 'info', {
      barometricPressure: round(at.pb, 0),
      altitudeM: o.barometricSource === 'altitude' ? c.context.altitudeM : null,
      alveolarPo2: round(at.alveolar, 1),
      aaGradient: round(at.gradient, 1),
    }),
  );
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
