// The hard cases of clinical-scope section 10 through the note: the line and the paragraph a clinician signs.
// Invented patients in scenarios of our own, each gas Henderson-consistent; the figures are worked out by hand from
// the published formulas named beside them.
import { describe, expect, it } from 'vitest';
import type { Flag } from '../../calc/index.ts';
import { createNoteRenderer, type Note } from '../../templates/index.ts';
import { read } from './cases.ts';
import { noteProblems, section } from './helpers.ts';

const renderer = createNoteRenderer();
const note = (c: unknown, format: 'text' | 'markdown' = 'text'): Note =>
  renderer.render(read(c), { format });
const interpretation = (n: Note) => section(n.full, 'INTERPRETATION');
const plan = (n: Note) => section(n.full, 'PLAN (SUGGESTIONS)');

const CASES = {
  // a 72-year-old with COPD, usual pH 7.37, ventilated, the team asks for pH 7.40
  usualPh: {
    gas: { ph: 7.3, pco2: 54, po2: 78, hco3: 25.9 },
    patient: { ageYears: 72, sex: 'male', heightCm: 175 },
    context: { baseline: { ph: 7.37 } },
    oxygen: { fio2: 0.35, peep: 5 },
    ventilator: { vt: 480, rr: 14, targetPh: 7.4 },
  },
  // COPD with a chest infection and no usual values: HCO3 between the acute and chronic rules
  between: { gas: { ph: 7.24, pco2: 80, hco3: 33 } },
  // a known retainer (stated chronic) with a lactic acidosis, urine sent
  retainer: {
    gas: { ph: 7.28, pco2: 60, hco3: 27.4, lactate: 5.2 },
    chemistry: { na: 140, cl: 95, k: 4.4 },
    urine: { na: 40, k: 30, cl: 60 },
    context: { timing: 'chronic' },
  },
  // 34 weeks pregnant with a lactic acidosis
  pregnant: {
    gas: { ph: 7.33, pco2: 26, hco3: 13.3, lactate: 4.6 },
    chemistry: { na: 136, cl: 103 },
    patient: { sex: 'female', ageYears: 29, pregnant: true },
  },
  // an overdose found after hours, timing unknown, raised gap
  overdose: { gas: { ph: 7.2, pco2: 60, hco3: 22.8 }, chemistry: { na: 140, cl: 98 } },
  // a week of vomiting, HCO3 48
  vomiting: {
    gas: { ph: 7.59, pco2: 51, hco3: 48 },
    chemistry: { na: 133, cl: 74, k: 2.6 },
    urine: { na: 25, k: 45, cl: 8 },
  },
  // a resident at 3,600 m on room air
  altitude: {
    gas: { ph: 7.44, pco2: 28, po2: 52, hco3: 18.5 },
    oxygen: { fio2: 0.21 },
    context: { altitudeM: 3600 },
    patient: { ageYears: 45, sex: 'male' },
  },
  // ventilated at 2,400 m, PB measured 565 mmHg
  altitudeVentilated: {
    gas: { ph: 7.36, pco2: 41, po2: 110, hco3: 22.6 },
    oxygen: { fio2: 0.5, peep: 10 },
    context: { barometricPressure: 565 },
  },
  // type 1 diabetes, glucose 612 mg/dL, K 5.9
  ketoacidosis: {
    units: { glucose: 'mg/dL' },
    gas: { ph: 7.08, pco2: 16, hco3: 4.6 },
    chemistry: { na: 129, k: 5.9, cl: 95, glucose: 612 },
    context: { conditions: ['diabetes'] },
  },
  // glucose 52 mmol/L, Na 148, K 3.1
  hyperosmolar: {
    units: { glucose: 'mmol/L' },
    gas: { ph: 7.34, pco2: 38, hco3: 20.1 },
    chemistry: { na: 148, k: 3.1, cl: 110, glucose: 52 },
  },
  // confused, ethanol measured, raised osmolar and anion gaps
  ethanol: {
    units: { glucose: 'mmol/L', urea: 'urea-mmol/L', ethanol: 'mmol/L' },
    gas: { ph: 7.22, pco2: 24, hco3: 9.6 },
    chemistry: { na: 138, cl: 104, glucose: 5.5, urea: 5, osmolality: 330, ethanol: 22 },
  },
  // an asthma attack with PaCO2 42
  asthma: {
    gas: { ph: 7.36, pco2: 42, po2: 68, hco3: 23.1 },
    oxygen: { fio2: 0.4 },
    context: { conditions: ['asthma'] },
  },
  // a bowel perforation with a lactic acidosis, albumin 4.0 g/dL
  albuminNormal: {
    gas: { ph: 7.14, pco2: 30, hco3: 9.9, lactate: 11 },
    chemistry: { na: 141, cl: 94, albumin: 4.0 },
  },
  // profuse diarrhoea, no albumin, urine sent
  diarrhoea: {
    gas: { ph: 7.28, pco2: 29, hco3: 13.3 },
    chemistry: { na: 137, cl: 114 },
    urine: { na: 30, k: 25, cl: 70 },
  },
} as const;

describe('every hard case, plain text and Markdown', () => {
  for (const [name, c] of Object.entries(CASES))
    for (const format of ['text', 'markdown'] as const)
      it(`${name} (${format}): no leaked placeholders, bare numbers or empty parts; cautions present`, () => {
        expect(noteProblems(note(c, format))).toEqual([]);
      });

  it('every flag these cases raise is one clean sentence with its units', () => {
    for (const c of Object.values(CASES)) {
      const f = read(c);
      for (const flag of f.flags as Flag[]) {
        const m = renderer.flagMessage(flag, f);
        expect(m, flag.code).toMatch(/^[A-Z].*\.$/);
        expect(m, flag.code).not.toMatch(/[.!?] [A-Z]/);
      }
    }
  });
});

describe('usual values', () => {
  it("a usual pH alone: acute-on-chronic, the usual PaCO2 from today's HCO3, and the target below it flagged", () => {
    const n = note(CASES.usualPh);
    expect(n.line).toMatch(/: acute-on-chronic respiratory acidosis;/);
    // 10^(9 - 7.37) x 25.9 / 24 = 46.0 (Henderson)
    expect(interpretation(n)).toContain(
      "usual PaCO2 of about 46 mmHg, estimated from the usual pH and today's HCO3 (Henderson equation)",
    );
    expect(interpretation(n).match(/25.9 mmol\/L/g)).toHaveLength(1);
    expect(interpretation(n)).not.toMatch(/compensation is as expected/);
    // the usual value becomes the target (clinical-scope section 10), with why full correction is not advised
    expect(plan(n)).toMatch(
      /this patient's usual PaCO2 of 46 mmHg \(estimated\), not the 4\d mmHg asked for/,
    );
    expect(plan(n)).toMatch(/full correction to pH 7.40 would leave the HCO3/);
  });

  it('no usual values, HCO3 between the rules: the usual point on the chronic line is said, as an estimate', () => {
    const n = note(CASES.between);
    // P0 = (33 - 10 - 8) / 0.25 = 60, HCO3 24 + 0.35 x 20 = 31 (Berend 2014 rates; clinical-scope section 10)
    expect(interpretation(n)).toContain(
      'read as acute-on-chronic, the usual PaCO2 would be about 60 mmHg with HCO3 about 31.0 mmol/L',
    );
  });
});

describe('mixed disorders and timing', () => {
  it('a chronic retainer with a lactic acidosis: one added acidosis, no invented alkalosis, no timing question', () => {
    const n = note(CASES.retainer);
    expect(n.line).toMatch(
      /: chronic respiratory acidosis with raised-AG metabolic acidosis; AG 17.6 mmol\/L, raised, delta ratio 1.56;/,
    );
    // (17.6 - 12) / (31 - 27.4) = 1.56 against the chronic rule's 24 + 3.5 x 2 = 31 (Berend 2014; Wrenn 1990)
    expect(interpretation(n)).toContain(
      'Delta ratio against the HCO3 of 31.0 mmol/L that the chronic respiratory rule expects: 1.56 (0.8 to 2)',
    );
    expect(n.full).not.toMatch(/Added metabolic alkalosis|Metabolic alkalosis:/);
    expect(n.full).not.toMatch(/is the stated timing right/);
    expect(interpretation(n)).toMatch(/below it, which the raised-AG acidosis explains/);
    expect(plan(n)).not.toMatch(/urine chloride/);
    expect(interpretation(n)).toMatch(/Urine values were given but are not read here/);
  });

  it('pregnancy: the gap measured from an HCO3 of 20, a single raised-AG acidosis', () => {
    const n = note(CASES.pregnant);
    // (19.7 - 12) / (20 - 13.3) = 1.15 (pregnancy HCO3 18-22, common practice; Wrenn 1990)
    expect(n.line).toMatch(
      /: raised-AG metabolic acidosis, compensation as expected; .*delta ratio 1.15/,
    );
    expect(n.full).not.toMatch(/normal-AG/);
  });

  it('timing unknown with a raised gap: the timing is not read, and the delta ratio is given both ways', () => {
    const n = note(CASES.overdose);
    expect(n.line).toMatch(
      /: respiratory acidosis with raised-AG metabolic acidosis; AG 19.2 mmol\/L, raised\./,
    );
    expect(interpretation(n)).toMatch(
      /Timing not stated, and this gas cannot tell it: the raised anion gap shows a metabolic acidosis has lowered the HCO3/,
    );
    // acute 24 + 2 = 26: 7.2 / 3.2 = 2.25; chronic 24 + 7 = 31: 7.2 / 8.2 = 0.88 (Berend 2014; Wrenn 1990)
    expect(interpretation(n)).toMatch(
      /against the 26.0 mmol\/L expected if acute, 2.25 \(above 2\)/,
    );
    expect(interpretation(n)).toMatch(
      /against the 31.0 mmol\/L expected if chronic, 0.88 \(0.8 to 2\)/,
    );
    expect(plan(n)).not.toMatch(/Metabolic alkalosis/);
  });
});

describe('metabolic alkalosis near its ceiling; urine tests', () => {
  it('HCO3 48 with PaCO2 51: compensation near its limit, urine chloride read, urine anion gap not', () => {
    const n = note(CASES.vomiting);
    expect(n.line).toMatch(/: metabolic alkalosis, compensation near its limit;/);
    expect(interpretation(n)).toMatch(/seldom takes PaCO2 above about 55-60 mmHg/);
    expect(n.full).not.toMatch(/Added respiratory alkalosis/);
    expect(interpretation(n)).toMatch(
      /Urine chloride 8 mmol\/L: below 20 mmol\/L, a chloride-responsive/,
    );
    expect(n.full).not.toMatch(/Urine anion gap -?\d/);
  });
});

describe('altitude', () => {
  it('a resident at 3,600 m: a low inspired PO2, not type 1 failure, and no oxygen bullet in the plan', () => {
    const n = note(CASES.altitude);
    const oxygenation = section(n.full, 'OXYGENATION');
    expect(oxygenation).not.toMatch(/respiratory failure \(below 60 mmHg\), type 1/);
    expect(oxygenation).toMatch(
      /explained by the altitude, not by lung disease, so it is not type 1/,
    );
    // 248 x 486.95 / 760 = 159 (Berlin definition; ISO 2533 pressure), said once
    expect(oxygenation).toMatch(/P\/F ratio 248 mmHg, or 159 mmHg adjusted to sea level/);
    expect(oxygenation.match(/159 mmHg/g)).toHaveLength(1);
    expect(plan(n)).not.toMatch(/adjust oxygen/);
  });

  it('ventilated at PB 565: the line gives the adjusted P/F beside the measured one', () => {
    // 220 x 565 / 760 = 164 (Berlin definition)
    expect(note(CASES.altitudeVentilated).line).toMatch(
      /P\/F 220 mmHg \(164 mmHg adjusted for altitude\) on PEEP 10 cmH2O/,
    );
  });
});

describe('glucose', () => {
  it('ketoacidosis: corrected Na (Katz) and effective osmolality, the pattern, ketones, and the high K', () => {
    const n = note(CASES.ketoacidosis);
    expect(n.line).toMatch(/; ketoacidosis pattern/);
    // 129 + 1.6 x (612 - 100) / 100 = 137.2 (Katz 1973); 2 x 129 + 33.97 = 292.0 (Kitabchi 2009)
    expect(interpretation(n)).toContain(
      'Glucose is high: sodium corrected for it 137 mmol/L (Katz',
    );
    expect(interpretation(n).match(/612 mg\/dL/g)).toHaveLength(1); // said once, in the chemistry
    expect(interpretation(n)).toContain('effective osmolality 292.0 mOsm/kg');
    expect(interpretation(n)).toMatch(/K 5.9 mmol\/L is above 5.5 mmol\/L/);
    expect(plan(n)).toMatch(/Ketoacidosis pattern: measure blood ketones/);
    expect(plan(n)).not.toMatch(/send .*blood ketones/); // asked once, in its own bullet
  });

  it('hyperosmolar with K 3.1: the hyperosmolar range named, potassium replaced before insulin', () => {
    const n = note(CASES.hyperosmolar);
    expect(n.line).toMatch(/; hyperosmolar/);
    // 2 x 148 + 52 = 348 (Kitabchi 2009)
    expect(interpretation(n)).toMatch(
      /effective osmolality 348.0 mOsm\/kg .*in the hyperosmolar range/,
    );
    expect(interpretation(n)).toMatch(/Before any insulin: K 3.1 mmol\/L is below 3.5 mmol\/L/);
  });
});

describe('osmolar gap with a measured ethanol', () => {
  it('says the ethanol is already counted, and names the antidote and dialysis discussion', () => {
    const n = note(CASES.ethanol);
    expect(interpretation(n)).toMatch(
      /calculated 313.9 mOsm\/kg with the measured ethanol included/,
    );
    expect(plan(n)).toMatch(/antidote \(fomepizole, or ethanol\) and haemodialysis/);
    expect(plan(n)).toMatch(/already counted in the calculated osmolality/);
    expect(n.full).not.toMatch(/ethanol[^.]*also widen/);
  });
});

describe('a "normal" PaCO2 that is not normal', () => {
  it('an asthma attack with PaCO2 42: said in the line and the interpretation, escalation in the plan', () => {
    const n = note(CASES.asthma);
    expect(n.line).toMatch(/PaCO2 not low in known asthma/);
    expect(interpretation(n)).toMatch(/life-threatening sign of tiring/);
    expect(plan(n)).toMatch(/^- Escalate now: .*senior and critical-care review/m);
  });
});

describe('wording', () => {
  it('albumin 4.0 g/dL: the gap is said once, not "37.1, 37.1 corrected"', () => {
    const n = note(CASES.albuminNormal);
    expect(n.full).not.toMatch(/37.1 mmol\/L, 37.1 mmol\/L corrected/);
    expect(interpretation(n)).toMatch(
      /Anion gap 37.1 mmol\/L \(albumin 4.0 g\/dL, so the albumin correction does not change it\)/,
    );
  });

  it('no albumin: no "albumin-corrected" anywhere; a gap within the limit: no delta ratio anywhere', () => {
    const n = note(CASES.diarrhoea);
    expect(n.full).not.toMatch(/albumin-corrected|corrected for albumin/);
    // AG 137 - (114 + 13.3) = 9.7, not raised (Kraut and Madias 2007): no ratio such as -0.21
    expect(n.full).not.toMatch(/delta ratio/i);
  });

  it('one format per kind of figure: the same lactate reads the same in the line, the note and the cautions', () => {
    const n = note(CASES.albuminNormal);
    expect(n.line).toContain('lactate 11.0 mmol/L');
    expect(interpretation(n)).toContain('Lactate 11.0 mmol/L');
    expect(section(n.full, 'CAUTIONS')).toContain('lactate 11.0 mmol/L');
    // every HCO3 figure with one decimal (the table of fields reports HCO3 to 0.1 mmol/L)
    for (const m of n.full.matchAll(/HCO3 (?:of )?(-?\d+(?:\.\d+)?) mmol\/L/g))
      expect(m[1], m[0]).toMatch(/\.\d$/);
  });
});
