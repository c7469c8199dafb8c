// The note, line and handover for invented patients: the figures and units that must appear, worked out
// here from the published formulas (source beside each), and the rules every note keeps.
import { describe, expect, it } from 'vitest';
import { createNoteRenderer, type Note } from '../../templates/index.ts';
import * as C from './cases.ts';
import { kpaText, read, ucum } from './cases.ts';
import { CAUTION_PHRASES, noteProblems, section } from './helpers.ts';

const renderer = createNoteRenderer();
const note = (c: unknown, format: 'text' | 'markdown' = 'text'): Note =>
  renderer.render(read(c), { format });
const round = (x: number, d = 0) => Math.round(x * 10 ** d) / 10 ** d;
// [H+] nmol/L = 10^(9 - pH) (definition of pH)
const hPlus = (ph: number) => 10 ** (9 - ph);

describe('every case, plain text and Markdown', () => {
  for (const [name, c] of Object.entries(C.ALL_CASES)) {
    for (const format of ['text', 'markdown'] as const) {
      it(`${name} (${format}): no leaked placeholders, empty headings, dangling bullets or bare numbers; cautions present`, () => {
        const n = note(c, format);
        expect(n.format).toBe(format);
        expect(noteProblems(n)).toEqual([]);
      });
    }
  }

  it('Markdown has section headings; plain text has none of its marks', () => {
    for (const c of Object.values(C.ALL_CASES)) {
      const md = note(c, 'markdown'),
        text = note(c, 'text');
      expect(md.full).toMatch(/^## \S/m);
      expect(md.text).toMatch(/^### Assessment$/m);
      expect(md.handover).toMatch(/^### /m);
      expect(text.full).toMatch(/^[A-Z][A-Z ()]+$/m);
      expect(text.text).not.toMatch(/^#/m);
      expect(text.full).not.toMatch(/^#/m);
      expect(text.full).not.toContain('**');
    }
  });

  it('the note opens with the one-line interpretation', () => {
    const n = note(C.ventilatedMmHg);
    expect(n.full.split('\n')[0]).toBe(n.line);
  });
});

describe('the checks themselves can fail', () => {
  it('catch a leaked value, an empty heading, a dangling bullet, a bare number and a missing caution', () => {
    const bad: Note = {
      format: 'text',
      line: 'ABG pH 7.31, PaCO2 48: undefined',
      text: 'INTERPRETATION\n\nOXYGENATION\n- \nA-a gradient 153.',
      full: 'INTERPRETATION\n\nOXYGENATION\n- \nA-a gradient 153.',
      handover: 'Result:',
    };
    const problems = noteProblems(bad).join('\n');
    expect(problems).toMatch(/prints "undefined"/);
    expect(problems).toMatch(/empty heading "INTERPRETATION"/);
    expect(problems).toMatch(/dangling bullet/);
    expect(problems).toMatch(/number without a unit: 48/);
    expect(problems).toMatch(/number without a unit: 153/);
    expect(problems).toMatch(/lacks the caution/);
  });
});

describe('ventilated patient, mmHg (case 1)', () => {
  const n = note(C.ventilatedMmHg);
  const g = C.ventilatedMmHg.gas;

  it('one line: gas, primary process, compensation, corrected AG, P/F with PEEP', () => {
    // AG = 138 - (104 + 23.5) = 10.5; + 2.5 x (4.0 - 3.1) = 12.75 (Figge 1998); P/F = 72 / 0.4 = 180 (Berlin 2012);
    // pH 7.31 is 0.04 from the target 7.35, beyond the 0.02 counted as at target (common practice, from memory)
    expect(n.line).toBe(
      'ABG pH 7.31, PaCO2 48 mmHg, HCO3 23.5 mmol/L: acute respiratory acidosis, compensation as expected; AG 12.8 mmol/L (albumin-corrected); P/F 180 mmHg on PEEP 8 cmH2O; since the previous gas (2026-03-02 04:10), pH 7.22 to 7.31, PaCO2 61 to 48 mmHg; target pH 7.35 not yet reached.',
    );
  });

  it('interpretation: expected HCO3 band for an acute rise, [H+], trend since the last gas', () => {
    const text = section(n.full, 'INTERPRETATION');
    // acute rule: 24 + 1 x (48 - 40) / 10 = 24.8 +/- 2 (Berend 2014)
    expect(text).toContain(
      `${round(24 + (48 - 40) / 10 - 2, 1)}-${round(24 + (48 - 40) / 10 + 2, 1)} mmol/L`,
    );
    expect(text).toContain(`[H+] ${round(hPlus(g.ph as number))} nmol/L`);
    expect(text).toContain('PaCO2 61 to 48 mmHg');
    expect(text).toMatch(/Primary process: acute respiratory acidosis/);
  });

  it('oxygenation: PAO2, A-a gradient, P/F band with the PEEP condition, and not an ARDS diagnosis', () => {
    const text = section(n.full, 'OXYGENATION');
    // PAO2 = 0.4 x (760 - 47) - 48 / 0.8 = 225.2 (alveolar gas equation); A-a = 225.2 - 72 = 153.2
    const pao2 = 0.4 * (760 - 47) - 48 / 0.8;
    expect(text).toContain(`PAO2 ${round(pao2)} mmHg`);
    expect(text).toContain(`A-a gradient ${round(pao2 - 72)} mmHg`);
    // age / 4 + 4 = 20 (common practice) applies on room air only
    expect(text).toContain(`${64 / 4 + 4} mmHg`);
    expect(text).toMatch(/room air only/);
    expect(text).toContain('P/F ratio 180 mmHg');
    expect(text).toMatch(/PEEP 8 cmH2O \(5 cmH2O or more\), this is in the moderate band/);
    expect(text).toMatch(/not a diagnosis of ARDS/);
    expect(text).toMatch(/imaging/);
    expect(text).toMatch(/cardiac failure/);
  });

  it('ventilation: PBW, VT per kg, driving pressure, target PaCO2 and its form, RR and VT with their assumptions', () => {
    const text = section(n.full, 'VENTILATION');
    // PBW female = 45.5 + 0.91 x (162 - 152.4) = 54.2 kg; 450 / 54.2 = 8.3 mL/kg (ARDS Network 2000)
    const pbw = 45.5 + 0.91 * (162 - 152.4);
    expect(text).toContain(`PBW ${round(pbw, 1)} kg`);
    expect(text).toContain(`VT ${round(450 / pbw, 1).toFixed(1)} mL/kg PBW`);
    // driving pressure = 24 - 8 = 16 cmH2O (Amato 2015)
    expect(text).toContain('Driving pressure 16 cmH2O');
    // target with acute buffering: [H+]t (HCO3 - 0.1 PaCO2) / (24 - 0.1 [H+]t) (clinical-scope section 8)
    const ht = hPlus(7.35);
    const target = (ht * (23.5 - 0.1 * 48)) / (24 - 0.1 * ht);
    expect(text).toContain(`Target PaCO2 ${round(target)} mmHg for a pH of 7.35`);
    expect(text).toMatch(/acute buffering/);
    // simple form: [H+]t x HCO3 / 24
    expect(text).toContain(`${round((ht * 23.5) / 24)} mmHg`);
    // RR_new = 16 x 48 / target (West, constant VCO2 and dead space)
    expect(text).toContain(`RR ${round((16 * 48) / target)}/min at the same VT 450 mL`);
    expect(text).toMatch(/CO2 production and dead space stay as they are/);
    expect(text).toMatch(/recheck a gas 20-30 min/);
    // every safety flag of the case is in the section
    expect(text).toMatch(/VT 450 mL is 8.3 mL\/kg PBW, which is above 8 mL\/kg PBW/);
    expect(text).toMatch(/Driving pressure 16 cmH2O is above 15 cmH2O/);
    expect(text).toMatch(
      /The VT that would reach the target \(490 mL, 9.0 mL\/kg PBW\) is above 8 mL\/kg PBW/,
    );
  });

  it('plan offers only the lung-protective route, and the recheck time', () => {
    const plan = section(n.full, 'PLAN (SUGGESTIONS)');
    expect(plan).toMatch(/consider RR 18\/min at the same VT/);
    expect(plan).toMatch(/volume route \(VT 490 mL\) is not offered/);
    expect(plan).toMatch(/Repeat the gas 20-30 min after any ventilator change/);
  });

  it('handover in the ISBAR order (identify, situation, background, assessment, recommendation; common practice)', () => {
    const headings = n.handover.split('\n').filter((l) => /^[A-Z][a-z]+:$/.test(l));
    expect(headings).toEqual([
      'Identify:',
      'Situation:',
      'Background:',
      'Assessment:',
      'Recommendation:',
    ]);
    // the identify line is left for the clinician: no name is asked or kept
    expect(n.handover).toMatch(/^- Patient and location: \(to complete\)$/m);
    expect(n.handover).toContain('VT 450 mL (8.3 mL/kg PBW)');
    expect(n.handover).toMatch(/Repeat the gas 20-30 min/);
  });
});

describe('the same patient in kPa and SI units (case 1b)', () => {
  const n = note(C.ventilatedKpa);
  const all = [n.line, n.full, n.handover].join('\n');

  it('prints kPa and never mmHg; SI chemistry units', () => {
    expect(all).not.toContain('mmHg');
    expect(all).not.toContain('mg/dL');
    expect(all).toContain('PaCO2 6.4 kPa');
    expect(all).toContain('PaO2 9.6 kPa');
    expect(all).toContain('albumin 31 g/L');
    expect(all).toContain('glucose 6.1 mmol/L');
    expect(all).toContain('urea 6.4 mmol/L');
  });

  it('derived pressures are converted, with 1 decimal (UCUM mm[Hg] to kPa)', () => {
    const pco2 = 6.4 * 7.50062,
      po2 = 9.6 * 7.50062;
    const pao2 = 0.4 * (760 - 47) - pco2 / 0.8;
    expect(n.full).toContain(`PAO2 ${kpaText(pao2)}`);
    expect(n.full).toContain(`A-a gradient ${kpaText(pao2 - po2)}`);
    // P/F in kPa = 9.6 / 0.4 = 24.0 kPa
    expect(n.full).toContain(`P/F ratio ${(9.6 / 0.4).toFixed(1)} kPa`);
    // Berlin bands 100/200/300 mmHg in kPa
    expect(n.full).toContain(`over ${kpaText(100)}, up to ${kpaText(200)}`);
    const ht = hPlus(7.35);
    expect(n.full).toContain(
      `Target PaCO2 ${kpaText((ht * (23.5 - 0.1 * pco2)) / (24 - 0.1 * ht))}`,
    );
    // the acute rule per 10 mmHg, in kPa
    expect(n.full).toContain(`per ${kpaText(10)}`);
    // acute buffering per kPa: 0.1 x 7.50062 = 0.75 mmol/L per kPa
    expect(n.full).toContain('0.75 mmol/L per kPa');
    expect(ucum('kPa', 6.4, 'mm[Hg]')).toBeCloseTo(48, 0);
  });

  it('reads the same as the mmHg note apart from the units', () => {
    const mmHg = note(C.ventilatedMmHg);
    const words = (t: string) =>
      t
        .replace(/-?\d+(\.\d+)?/g, '#')
        .replace(/\b(mmHg|kPa|g\/dL|g\/L|mg\/dL|mmol\/L|BUN|urea)\b/g, 'U');
    expect(words(n.line)).toBe(words(mmHg.line));
    expect(n.full.split('\n').filter((l) => /^[A-Z ()]+$/.test(l))).toEqual(
      mmHg.full.split('\n').filter((l) => /^[A-Z ()]+$/.test(l)),
    );
  });
});

describe('each disorder', () => {
  it('ketoacidosis: raised-AG acidosis, Winters band, raised-AG work-up, critical pH', () => {
    const n = note(C.ketoacidosis);
    // Winters: 1.5 x 6.5 + 8 = 17.75 +/- 2 (Albert, Dell, Winters 1967)
    const w = 1.5 * 6.5 + 8;
    expect(n.full).toContain(
      `Expected PaCO2 by Winters' formula is ${round(w - 2)}-${round(w + 2)} mmHg`,
    );
    expect(n.line).toMatch(/raised-AG metabolic acidosis, compensation as expected/);
    // AG = 134 - (98 + 6.5) = 29.5 (Kraut and Madias 2007)
    expect(n.full).toContain('Anion gap 29.5 mmol/L');
    // delta ratio = (29 - 12) / (24 - 6.5) = 0.97 (Wrenn 1990), corrected AG 29.5 + 2.5 x (4.0 - 4.2) = 29
    expect(n.full).toContain(
      `Delta ratio (from the corrected gap) against a textbook HCO3 of 24.0 mmol/L: ${round((29 - 12) / (24 - 6.5), 2)} (0.8 to 2)`,
    );
    const plan = section(n.full, 'PLAN (SUGGESTIONS)');
    expect(plan).toMatch(/ketones/);
    expect(plan).toMatch(/salicylate and paracetamol/);
    expect(plan).toMatch(/osmolality/);
    expect(plan).not.toMatch(/send lactate/); // already measured
    expect(section(n.full, 'CAUTIONS')).toMatch(/Critical values: pH 7.18 \(below 7.20\)/);
    expect(n.full).toContain('glucose 540 mg/dL');
  });

  it('septic shock: added respiratory acidosis with its reason, and a target above the compensation', () => {
    const n = note(C.septicMixed);
    expect(n.full).toMatch(
      /Added respiratory acidosis: the PaCO2 is higher than compensation explains/,
    );
    const w = 1.5 * 13.5 + 8; // Winters
    const band = `${round(w - 2)}-${round(w + 2)} mmHg`;
    expect(section(n.full, 'VENTILATION')).toContain(
      `above the ${band} that Winters' formula expects`,
    );
    expect(section(n.full, 'PLAN (SUGGESTIONS)')).toContain(`(${band} by Winters' formula)`);
    expect(section(n.full, 'CAUTIONS')).toMatch(/lactate 6.2 mmol\/L \(at or above 4 mmol\/L\)/);
  });

  it('triple disorder: primary first, then each added process with its reason', () => {
    const n = note(C.triple);
    // the raised gap has lowered the HCO3, so the timing of the respiratory alkalosis is not read from it
    // (clinical-scope section 10); before this, the line called it "acute" from the lowered HCO3
    expect(n.line).toMatch(
      /: respiratory alkalosis with raised-AG metabolic acidosis and metabolic alkalosis/,
    );
    expect(n.full).toMatch(/Timing not stated, and this gas cannot tell it/);
    // against the HCO3 the respiratory alkalosis predicts, 24 - 2 x 1.2 = 21.6 if acute and 24 - 4.5 x 1.2 = 18.6
    // if chronic (Berend 2014), HCO3 21.5 has not fallen: a metabolic alkalosis beside the raised gap (Wrenn 1990)
    expect(n.full).toContain(
      'against the HCO3 the respiratory process expects, 21.6 mmol/L if acute and 18.6 mmol/L if chronic',
    );
    expect(n.full).toMatch(/Added raised-AG metabolic acidosis: the anion gap \(below\) is raised/);
    const plan = section(n.full, 'PLAN (SUGGESTIONS)');
    expect(plan).toMatch(/urine chloride/);
    expect(plan).toMatch(/ketones/);
  });

  it('diarrhoea: normal-AG acidosis with a negative urine anion gap', () => {
    const n = note(C.diarrhoea);
    expect(n.line).toMatch(/normal-AG metabolic acidosis/);
    // urine AG = 30 + 20 - 80 = -30 (common practice)
    expect(n.full).toContain('Urine anion gap -30 mmol/L: negative');
    expect(section(n.full, 'PLAN (SUGGESTIONS)')).toMatch(/chloride-rich fluids/);
  });

  it('normal-AG acidosis without urine electrolytes: the plan asks for the urine anion gap', () => {
    const n = note(C.venousLow);
    expect(section(n.full, 'PLAN (SUGGESTIONS)')).toMatch(
      /urine Na, K and Cl for the urine anion gap/,
    );
  });

  it('vomiting: metabolic alkalosis, its expected PaCO2, chloride-responsive, critical K', () => {
    const n = note(C.vomiting);
    // expected PaCO2 = 0.7 x 38 + 21 = 47.6 +/- 2 (Berend 2014)
    const e = 0.7 * 38 + 21;
    expect(n.full).toContain(`${round(e - 2)}-${round(e + 2)} mmHg`);
    expect(n.full).toMatch(
      /Urine chloride 12 mmol\/L: below 20 mmol\/L, a chloride-responsive alkalosis/,
    );
    expect(section(n.full, 'CAUTIONS')).toMatch(/K 2.6 mmol\/L \(below 2.8 mmol\/L\)/);
  });

  it('metabolic alkalosis without urine chloride: the plan asks for it', () => {
    expect(section(note(C.inconsistent).full, 'PLAN (SUGGESTIONS)')).toMatch(
      /urine chloride \(below 20 mmol\/L/,
    );
  });

  it('COPD on the ventilator: acute-on-chronic from the usual values; target below the baseline', () => {
    const n = note(C.copdVentilated);
    expect(n.line).toMatch(/acute-on-chronic respiratory acidosis/);
    // acute rise from the baseline: 32 + 1 x (72 - 55) / 10 = 33.7 +/- 2 (Berend 2014 rule from a stated baseline)
    const e = 32 + (72 - 55) / 10;
    expect(n.full).toContain(`${round(e - 2, 1)}-${round(e + 2, 1)} mmol/L`);
    expect(n.full).toMatch(/usual PaCO2 55 mmHg and HCO3 32.0 mmol\/L/);
    expect(section(n.full, 'VENTILATION')).toMatch(/below this patient's usual 55 mmHg/);
    expect(section(n.full, 'CAUTIONS')).toMatch(/PaCO2 72 mmHg \(above 70 mmHg\)/);
  });

  it('acute respiratory alkalosis on room air: A-a gradient against the age expectation', () => {
    const n = note(C.breathless);
    // PAO2 = 0.21 x 713 - 30 / 0.8 = 112.2; A-a 44.2; age 40: 40 / 4 + 4 = 14 (common practice)
    const aa = 0.21 * (760 - 47) - 30 / 0.8 - 68;
    expect(n.full).toContain(`A-a gradient ${round(aa)} mmHg`);
    expect(n.full).toMatch(/up to 14 mmHg, so this one is raised/);
    // acute rule: 24 - 2 x (40 - 30) / 10 = 22 +/- 2 (Berend 2014), with the one decimal of every HCO3 figure
    expect(n.full).toContain('20.0-24.0 mmol/L');
  });

  it('severe ARDS: severe band, S/F criterion, RR beyond 35/min, no safe route offered', () => {
    const n = note(C.ards);
    // P/F = 70 / 0.8 = 87.5, severe (<= 100 mmHg, Berlin 2012); S/F = 92 / 0.8 = 115 (<= 315, 2024 global definition)
    expect(n.full).toContain(`P/F ratio ${round(70 / 0.8)} mmHg`);
    expect(n.full).toMatch(/severe band/);
    expect(n.full).toContain(`SpO2/FiO2 ${round(92 / 0.8)}`);
    expect(n.full).toMatch(/meets the oxygenation criterion of the 2024 global ARDS definition/);
    expect(section(n.full, 'VENTILATION')).toMatch(
      /The RR that would reach the target \(\d+\/min\) is above 35\/min/,
    );
    expect(section(n.full, 'VENTILATION')).toMatch(/Plateau pressure 32 cmH2O is above 30 cmH2O/);
    expect(section(n.full, 'PLAN (SUGGESTIONS)')).toMatch(
      /no setting reaches .* within lung-protective limits/,
    );
  });

  it('toxic alcohol: raised osmolar gap named with its work-up', () => {
    const n = note(C.toxicAlcohol);
    // calculated osmolality 2 x 140 + 5.0 + 5.0 = 290; gap 330 - 290 = 40 (Purssell 2001)
    expect(n.full).toContain(`Osmolar gap ${(330 - (2 * 140 + 5 + 5)).toFixed(1)} mOsm/kg`);
    expect(n.full).toMatch(/raised, above 10 mOsm\/kg/);
    // with a raised anion gap (140 - 100 - 9.5 = 30.5) the plan names the antidote and dialysis discussion
    // (clinical-scope section 10; common practice)
    const plan = section(n.full, 'PLAN (SUGGESTIONS)');
    expect(plan).toMatch(/toxic alcohol poisoning \(methanol, ethylene glycol\)/);
    expect(plan).toMatch(/antidote \(fomepizole, or ethanol\) and haemodialysis/);
    // the raised anion gap makes it the toxic alcohol pattern, not a list of other things that widen the gap
    expect(n.full).not.toMatch(/also widen the gap/);
  });
});

describe('venous and capillary samples', () => {
  it('venous, PvCO2 below 45: why oxygenation cannot be judged, what a venous gas shows, hypercapnia unlikely', () => {
    const n = note(C.venousLow);
    const text = section(n.full, 'OXYGENATION');
    expect(n.line).toMatch(/^VBG /);
    expect(text).toMatch(/oxygenation cannot be judged/);
    expect(text).not.toMatch(/P\/F ratio \d/);
    expect(text).not.toMatch(/A-a gradient \d/);
    // Byrne 2014 (from memory): pH about 0.03 lower, HCO3 about 1 higher, PCO2 about 4-6 mmHg higher, +/- 20 limits
    expect(text).toMatch(/pH about 0.03 lower/);
    expect(text).toMatch(/HCO3 about 1 mmol\/L higher/);
    expect(text).toMatch(/PCO2 about 4-6 mmHg higher/);
    expect(text).toMatch(/±20 mmHg/);
    expect(text).toMatch(
      /below 45 mmHg makes arterial hypercapnia unlikely; here it is 42 mmHg, so arterial hypercapnia is unlikely/,
    );
    expect(n.full).toMatch(/PvCO2 42 mmHg/);
  });

  it('venous, ventilated: the suggestion is flagged as resting on a venous PCO2', () => {
    const n = note(C.venousVentilated);
    expect(section(n.full, 'VENTILATION')).toMatch(/rests on a venous PCO2/);
    expect(section(n.full, 'OXYGENATION')).toMatch(/neither confirms nor excludes hypercapnia/);
  });

  it('capillary: oxygenation not judged, and why', () => {
    const n = note(C.capillary);
    expect(n.line).toMatch(/^CBG .*oxygenation not assessable \(capillary sample\)/);
    expect(section(n.full, 'OXYGENATION')).toMatch(/capillary PO2 depends on local perfusion/);
    expect(n.full).not.toMatch(/P\/F ratio \d/);
  });
});

describe('special readings', () => {
  it('pregnancy: the pregnancy reference is named with its ranges', () => {
    const n = note(C.pregnancy);
    expect(n.full).toMatch(/pregnancy reference \(PaCO2 28-32 mmHg, HCO3 18-22 mmol\/L\)/);
    expect(n.line).toMatch(/no acid-base disorder/);
  });

  it('Henderson mismatch: warned in the interpretation and acted on first in the plan', () => {
    const n = note(C.inconsistent);
    // HCO3 = 24 x 40 / 10^(9 - 7.35) = 21.5 (Henderson)
    const calculated = (24 * 40) / hPlus(7.35);
    expect(section(n.full, 'INTERPRETATION')).toContain(
      `does not match the HCO3 of ${round(calculated, 1)} mmol/L calculated from pH and PCO2`,
    );
    expect(section(n.full, 'PLAN (SUGGESTIONS)').trim().split('\n')[0]).toMatch(
      /resolve the mismatch/,
    );
  });

  it('minimal gas: HCO3 marked as calculated, no empty sections, no ventilation section', () => {
    const n = note(C.minimal);
    expect(n.full).toMatch(/HCO3 23.5 mmol\/L \(calculated from pH and PaCO2\)/);
    expect(n.full).not.toMatch(/^VENTILATION$/m);
    expect(n.full).toMatch(/No PaO2 reported/);
    expect(section(n.full, 'PLAN (SUGGESTIONS)')).toMatch(/Send Na, Cl and albumin/);
  });

  it('under 16: the adult-rules warning', () => {
    expect(note(C.adolescent).full).toMatch(
      /Age 14 years: these rules are for adults aged 16 years and over/,
    );
  });
});

describe('missing or doubtful inputs', () => {
  it('no FiO2: says what cannot be worked out', () => {
    const text = section(note(C.noFio2).full, 'OXYGENATION');
    expect(text).toMatch(/FiO2 not given, so no PAO2, A-a gradient or P\/F ratio/);
    expect(text).not.toMatch(/PAO2 \d/);
  });

  it("estimated baseline: marked as estimated, with today's HCO3 as the chronic part (clinical-scope section 10)", () => {
    // usual pH 7.38 ([H+] 41.69) with HCO3 24.3: usual PaCO2 = 41.69 x 24.3 / 24 = 42.2 (Henderson)
    expect(note(C.estimatedBaseline).full).toMatch(
      /usual PaCO2 of about 42 mmHg, estimated from the usual pH and today's HCO3/,
    );
  });

  it('cold, at altitude, PaO2 above PAO2: temperature check, PB from altitude, impossible gradient, S/F not usable', () => {
    const n = note(C.coldAltitude);
    // ICAO standard atmosphere (ISO 2533): 760 x (1 - 2.25577e-5 x 1600)^5.25588
    const pb = 760 * (1 - 2.25577e-5 * 1600) ** 5.25588;
    expect(n.full).toContain(`PB ${round(pb)} mmHg for 1600 m altitude`);
    expect(n.full).toMatch(/Body temperature is 33 °C/);
    expect(n.full).toMatch(/not physically possible/);
    expect(n.full).not.toMatch(/so this one is within it/);
    expect(n.full).toMatch(/unreliable with SpO2 above 97%/);
  });

  it('height outside the PBW formula, no target: said, and no suggestion', () => {
    const text = section(note(C.shortStature).full, 'VENTILATION');
    expect(text).toMatch(/Height 125 cm is outside the range/);
    expect(text).toMatch(/No target pH or PCO2 given/);
    expect(text).not.toMatch(/RR \d+\/min at the same VT/);
  });

  it('dead space as large as the VT: no VT for the target, the rate route alone', () => {
    const text = section(note(C.deadSpace).full, 'VENTILATION');
    // 2.2 mL/kg x PBW (50 + 0.91 x (180 - 152.4) = 75.1 kg) + 300 mL = 465 mL (Radford 1955, from memory)
    expect(text).toContain(`dead space ${round(2.2 * (50 + 0.91 * (180 - 152.4)) + 300)} mL`);
    expect(text).toMatch(/This assumes that CO2 production/);
    expect(text).not.toMatch(/VT \d+ mL \(/);
  });

  it('kPa entry that looks like mmHg: withheld, quoted in kPa', () => {
    const n = note(C.kpaWithheld);
    expect(n.line).toMatch(/PaCO2 18 kPa \(unit in doubt\)/);
    expect(n.full).toMatch(/fits a value in mmHg/);
  });
});

describe('withheld: pressure unit in doubt', () => {
  const n = note(C.withheld);
  const md = note(C.withheld, 'markdown');

  it('says plainly that interpretation is withheld until mmHg or kPa is confirmed', () => {
    expect(n.line).toMatch(
      /PaCO2 5.3 mmHg \(unit in doubt\): interpretation withheld until mmHg or kPa is confirmed/,
    );
    expect(n.full).toMatch(/^INTERPRETATION WITHHELD$/m);
    expect(n.full).toMatch(/fits a value in kPa/);
    expect(md.full).toMatch(/^## Interpretation withheld$/m);
  });

  it('shows only what does not depend on the pressure unit', () => {
    for (const text of [n.full, n.handover]) {
      expect(text).not.toMatch(
        /Primary process|Expected|P\/F|PAO2|A-a|Target|PBW|compensation as expected/,
      );
      expect(text).not.toContain('12.1'); // the PaO2, in the same doubtful unit
    }
    expect(n.full).toContain('Shown as entered, not interpreted: pH 7.40');
    expect(n.full).toContain(`[H+] ${round(hPlus(7.4), 1)} nmol/L`);
  });

  it('still names critical values that do not depend on the unit, and carries the cautions', () => {
    expect(n.full).toMatch(/Critical values: K 6.5 mmol\/L \(above 6.2 mmol\/L\)/);
    for (const phrase of CAUTION_PHRASES) expect(n.full).toMatch(phrase);
  });
});

describe('free text from the request', () => {
  it('a previous gas label stays on one line and is inert in Markdown', () => {
    const c = {
      ...C.ventilatedMmHg,
      previous: [
        { label: 'after *bicarb*\n## not a heading', gas: { ph: 7.22, pco2: 61, hco3: 24.3 } },
      ],
    };
    const md = note(c, 'markdown'),
      text = note(c, 'text');
    expect(md.full).toContain('Since the previous gas (after \\*bicarb\\* \\#\\# not a heading)');
    expect(md.full).not.toMatch(/^## not a heading/m);
    expect(text.full).toContain('Since the previous gas (after *bicarb* ## not a heading)');
  });
});

describe('the renderer refuses what it cannot render', () => {
  it('a rejected case, or an unknown format, is a clear error', () => {
    expect(() => renderer.render({ ok: false, errors: [] } as never)).toThrow(/accepted case/);
    expect(() => renderer.render(read(C.minimal), { format: 'html' as never })).toThrow(
      /Unknown note format/,
    );
  });
});
