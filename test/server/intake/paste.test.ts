// Paste intake: invented printouts and notes in several layouts and both unit systems.
// Every patient, ward and number below is invented. Unit facts used in the checks: 1 kPa = 7.50062 mmHg
// (SI, via clinical-scope section 1); albumin g/L = 10 x g/dL; plausibility ranges are the project's schema.
import { describe, expect, it } from 'vitest';
import { parsePaste, parseShorthand } from '../../../server/intake/index.ts';
import { parseCase } from '../../../calc/index.ts';

const paths = (qs: { path: string }[]) => qs.map((q) => q.path);
const skippedReasons = (r: ReturnType<typeof parsePaste>) =>
  r.skipped.map((s) => `${s.sourceText.split(/\s+/)[0]}: ${s.reason}`);

describe('printout layouts', () => {
  it('A: vertical analyser strip in mmHg with flags, ranges, pH(T), standard HCO3, BE(ecf) and O2Hb', () => {
    // invented: 64-year-old on a surgical ward, mild acute respiratory acidosis
    const text = `DEMO GENERAL - BLOOD GAS
Patient ID: 4471-22   DOB 03/04/1961
Sample type: Arterial
02/03/2026 04:10   Operator 0042
pH        7.31   L   [7.35-7.45]
pH(T)     7.29
pCO2      48     mmHg H  (35-45)
pO2       72     mmHg    (80-100)
cHCO3-(P) 23.5   mmol/L
Std HCO3  22.1   mmol/L
BE(B)     -2.1   mmol/L
BE(ecf)   -2.6   mmol/L
sO2       93 %
O2Hb      91.8 %
ctHb      12.1 g/dL
Na+ 138 mmol/L
K+ 4.1 mmol/L
Cl- 104 mmol/L
cLac 1.1 mmol/L
Glu 110 mg/dL
FiO2 40 %
*** end of report ***`;
    const r = parsePaste(text);
    expect(r.case).toEqual({
      sample: 'arterial',
      units: { pressure: 'mmHg', hb: 'g/dL', glucose: 'mg/dL' },
      gas: {
        ph: 7.31,
        pco2: 48,
        po2: 72,
        hco3: 23.5,
        baseExcess: -2.1,
        sao2: 93,
        hb: 12.1,
        lactate: 1.1,
      },
      chemistry: { na: 138, k: 4.1, cl: 104, glucose: 110 },
      oxygen: { fio2: 40 },
    });
    expect(r.questions).toEqual([]);
    expect(r.missing).toEqual([]);
    expect(r.read.find((x) => x.path === 'gas.pco2')).toMatchObject({
      value: 48,
      unit: 'mmHg',
      unitFrom: 'text',
      sourceText: 'pCO2      48     mmHg H  (35-45)',
      line: 7,
    });
    expect(skippedReasons(r)).toEqual([
      'pH(T): temperature-corrected value; the 37 °C value is the one read',
      'Std: standard bicarbonate is not the actual HCO3',
      'BE(ecf): standard base excess: the actual base excess is read',
      'O2Hb: oxyhaemoglobin fraction: sO2 is read (they differ when COHb or MetHb is raised)',
    ]);
    expect(r.ignored).toEqual([
      'DEMO GENERAL - BLOOD GAS',
      'Patient ID: 4471-22   DOB 03/04/1961',
      '02/03/2026 04:10   Operator 0042',
      '*** end of report ***',
    ]);
    expect(parseCase(r.case).ok).toBe(true);
  });

  it('B: SI laboratory report in kPa with decimal commas, a units column and ranges with flags after them', () => {
    // invented: 71-year-old with chronic hypercapnia
    const text = `DEMO INFIRMARY LABORATORY          Report printed 02.03.2026 06:45
Specimen: arterial blood
Test                Result    Units      Reference
pH                  7,28                 7,35 - 7,45    L
pCO2                7,9       kPa        4,7 - 6,0      H
pO2                 8,1       kPa        10,0 - 13,3    L
HCO3 act            27,4      mmol/L     22 - 26        H
BE (B)              +2,1      mmol/L     -2 - +2
Na                  141       mmol/L     135 - 145
K                   3,6       mmol/L     3,5 - 5,0
Chloride            99        mmol/L     98 - 107
Albumin             31        g/L        35 - 50        L
Urea                9,2       mmol/L     2,5 - 7,8      H
Creatinine          104       µmol/L     45 - 90        H
Glucose             7,4       mmol/L
Lactate             0,9       mmol/L     0,5 - 2,2
Osmolality          298       mOsm/kg    275 - 295      H`;
    const r = parsePaste(text);
    expect(r.case).toEqual({
      sample: 'arterial',
      units: {
        pressure: 'kPa',
        albumin: 'g/L',
        urea: 'urea-mmol/L',
        creatinine: 'umol/L',
        glucose: 'mmol/L',
      },
      gas: { ph: 7.28, pco2: 7.9, po2: 8.1, hco3: 27.4, baseExcess: 2.1, lactate: 0.9 },
      chemistry: {
        na: 141,
        k: 3.6,
        cl: 99,
        albumin: 31,
        urea: 9.2,
        creatinine: 104,
        glucose: 7.4,
        osmolality: 298,
      },
    });
    expect(r.questions).toEqual([]);
    expect(r.read.find((x) => x.path === 'chemistry.creatinine')).toMatchObject({
      unit: 'µmol/L',
      unitFrom: 'text',
    });
    expect(r.ignored).toEqual([
      'DEMO INFIRMARY LABORATORY          Report printed 02.03.2026 06:45',
      'Test                Result    Units      Reference',
    ]);
    expect(parseCase(r.case).ok).toBe(true);
  });

  it('C: pipe table from a results system, capitals, US units (mg/dL, BUN), "CO2" and anion gap left out', () => {
    // invented: 23-year-old in diabetic ketoacidosis
    const text = `| Component | Value | Flag | Units | Ref |
|---|---|---|---|---|
| PH, ARTERIAL | 7.12 | L | | 7.35-7.45 |
| PCO2, ARTERIAL | 22 | L | mm Hg | 35-45 |
| PO2, ARTERIAL | 104 | | mm Hg | 80-100 |
| HCO3, ARTERIAL | 7 | LL | mmol/L | 22-26 |
| BASE EXCESS, ARTERIAL | -21.4 | L | mmol/L | -2-2 |
| O2 SAT, ARTERIAL | 98 | | % | |
| LACTATE, WHOLE BLOOD | 2.6 | H | mmol/L | 0.5-2.2 |
| SODIUM | 131 | L | mmol/L | 135-145 |
| POTASSIUM | 5.6 | H | mmol/L | 3.5-5.1 |
| CHLORIDE | 96 | L | mmol/L | 98-107 |
| CO2 | 8 | LL | mmol/L | 22-29 |
| ANION GAP | 27 | H | | 8-16 |
| BUN | 31 | H | mg/dL | 7-20 |
| CREATININE | 1.6 | H | mg/dL | 0.6-1.2 |
| GLUCOSE | 486 | HH | mg/dL | 70-99 |
| ALBUMIN | 4.4 | | g/dL | 3.5-5.0 |`;
    const r = parsePaste(text);
    expect(r.case).toEqual({
      sample: 'arterial',
      units: {
        pressure: 'mmHg',
        urea: 'bun-mg/dL',
        creatinine: 'mg/dL',
        glucose: 'mg/dL',
        albumin: 'g/dL',
      },
      gas: { ph: 7.12, pco2: 22, po2: 104, hco3: 7, baseExcess: -21.4, sao2: 98, lactate: 2.6 },
      chemistry: { na: 131, k: 5.6, cl: 96, urea: 31, creatinine: 1.6, glucose: 486, albumin: 4.4 },
    });
    expect(r.questions).toEqual([]);
    expect(r.skipped.map((s) => s.reason)).toEqual([
      'total CO2 is not the blood-gas HCO3 (it runs about 1-2 mmol/L higher); enter it as HCO3 by hand if that is meant',
      'anion gap: Gasline works it out from Na, Cl and HCO3',
    ]);
    expect(parseCase(r.case).ok).toBe(true);
  });

  it('D: a typed note with several results on one line, kPa written beside the pressures', () => {
    // invented: 58-year-old with an exacerbation of COPD on a 28% venturi mask
    const text =
      'ABG on 28% venturi: pH 7.29, PaCO2 8.2 kPa, PaO2 7.1 kPa, HCO3 29, BE +3.4, lactate 1.2. Na 136, K 4.4.';
    const r = parsePaste(text);
    expect(r.case).toEqual({
      sample: 'arterial',
      units: { pressure: 'kPa' },
      gas: { ph: 7.29, pco2: 8.2, po2: 7.1, hco3: 29, baseExcess: 3.4, lactate: 1.2 },
      chemistry: { na: 136, k: 4.4 },
    });
    expect(r.questions).toEqual([]);
    // the venturi percentage is not an FiO2 label: left, and shown as left
    expect(r.ignored).toEqual(['ABG on 28% venturi:']);
  });

  it('E: a horizontal table with units in the column headers (kPa), and a second table of electrolytes', () => {
    // invented: 45-year-old after a seizure
    const text = `Gas 02/03 23:40  capillary
pH    | pCO2 (kPa) | pO2 (kPa) | HCO3 (mmol/L) | BE
7.19  | 5.9        | 7.4       | 16.2          | -11.0
Na    K     Cl    Lac
139   3.9   103   9.8`;
    const r = parsePaste(text);
    expect(r.case).toEqual({
      sample: 'capillary',
      units: { pressure: 'kPa' },
      gas: { ph: 7.19, pco2: 5.9, po2: 7.4, hco3: 16.2, baseExcess: -11, lactate: 9.8 },
      chemistry: { na: 139, k: 3.9, cl: 103 },
    });
    expect(r.read.find((x) => x.path === 'gas.pco2')).toMatchObject({
      unit: 'kPa',
      unitFrom: 'printout',
    });
    expect(r.questions).toEqual([]);
  });

  it('F: compact capitals with "=", no pressure unit: mmHg because 25 is not a believable PaCO2 in kPa', () => {
    // invented: 30-year-old with salicylate poisoning
    const text =
      'pH=7.12 PCO2=25 PO2=96 HCO3=8 BE=-20 SO2=97% HB=13.4 g/dL NA=130 K=5.9 CL=96 GLU=28.4 mmol/L LAC=6.1';
    const r = parsePaste(text);
    expect(r.case.gas).toEqual({
      ph: 7.12,
      pco2: 25,
      po2: 96,
      hco3: 8,
      baseExcess: -20,
      sao2: 97,
      hb: 13.4,
      lactate: 6.1,
    });
    expect(r.case.chemistry).toEqual({ na: 130, k: 5.9, cl: 96, glucose: 28.4 });
    expect(r.case.units).toEqual({ pressure: 'mmHg', hb: 'g/dL', glucose: 'mmol/L' });
    expect(r.read.find((x) => x.path === 'gas.pco2')?.unitFrom).toBe('magnitude');
    // the sample type is not written: asked, because without it the core reads the gas as arterial
    expect(r.questions).toEqual([
      expect.objectContaining({ path: 'sample', options: ['arterial', 'venous', 'capillary'] }),
    ]);
  });

  it('G: a venous gas in the shorthand with a place holder for PO2 and the unit in brackets', () => {
    const r = parsePaste('VBG 7.33/52/-/27 (mmHg)');
    expect(r.case).toEqual({
      sample: 'venous',
      units: { pressure: 'mmHg' },
      gas: { ph: 7.33, pco2: 52, hco3: 27 },
    });
    expect(r.questions).toEqual([]);
    expect(parseCase(r.case).ok).toBe(true);
  });

  it('H: a results page copied as HTML: one table row per line', () => {
    const html =
      '<html><body><h3>Results</h3><table><tr><th>Test</th><th>Result</th></tr>' +
      '<tr><td>pH</td><td>7.41</td></tr><tr><td>PaCO2</td><td>39 mmHg</td></tr><tr><td>PaO2</td><td>88 mmHg</td></tr>' +
      '<tr><td>HCO3</td><td>24.6 mmol/L</td></tr><tr><td>Sample</td><td>Arterial</td></tr></table></body></html>';
    const r = parsePaste(html);
    expect(r.case).toEqual({
      sample: 'arterial',
      units: { pressure: 'mmHg' },
      gas: { ph: 7.41, pco2: 39, po2: 88, hco3: 24.6 },
    });
    expect(r.questions).toEqual([]);
  });

  it('I: values under a "temperature corrected" heading are left out; the 37 °C block is read', () => {
    const text = `Results at 37 °C
pH 7.30
pCO2 6.8 kPa
pO2 9.9 kPa
Temperature corrected (39.2 °C)
pH 7.27
pCO2 7.5 kPa
pO2 11.6 kPa

HCO3 24.5 mmol/L
arterial`;
    const r = parsePaste(text);
    expect(r.case.gas).toEqual({ ph: 7.3, pco2: 6.8, po2: 9.9, hco3: 24.5 });
    expect(r.skipped.filter((s) => s.reason.startsWith('temperature-corrected'))).toHaveLength(3);
    expect(r.questions).toEqual([]);
  });
});

describe('the shorthand pH/PaCO2/PaO2/HCO3', () => {
  it('reads mmHg by magnitude when nothing else fits (48 is not a believable PaCO2 in kPa)', () => {
    const r = parsePaste('7.31/48/72/23');
    expect(r.case.gas).toEqual({ ph: 7.31, pco2: 48, po2: 72, hco3: 23 });
    expect(r.case.units).toEqual({ pressure: 'mmHg' });
    expect(r.read.every((x) => x.sourceText === '7.31/48/72/23')).toBe(true);
  });

  it('reads kPa when the unit is written after it, and by magnitude when it is not (PaO2 9.6 mmHg is below the schema range)', () => {
    for (const text of ['7.31/6.4/9.6/23 kPa', '7.31/6.4/9.6/23', '7,31/6,4/9,6/23']) {
      const r = parsePaste(text);
      expect(r.case.gas).toEqual({ ph: 7.31, pco2: 6.4, po2: 9.6, hco3: 23 });
      expect(r.case.units).toEqual({ pressure: 'kPa' });
    }
    expect(parsePaste('7.31/6.4/9.6/23 kPa').read[0]!.unitFrom).toBe('text');
    expect(parsePaste('7.31/6.4/9.6/23').read[0]!.unitFrom).toBe('magnitude');
  });

  it('asks when PaCO2 and PaO2 fit both units, and fills neither', () => {
    const r = parsePaste('7.31/12/60/23');
    expect(r.case.gas).toEqual({ ph: 7.31, hco3: 23 });
    expect(r.questions.filter((q) => q.path.startsWith('gas.'))).toEqual([
      expect.objectContaining({ path: 'gas.pco2', options: ['mmHg', 'kPa'], value: 12 }),
      expect.objectContaining({ path: 'gas.po2', options: ['mmHg', 'kPa'], value: 60 }),
    ]);
    expect(r.missing).toEqual([]);
  });

  it('asks about five or three numbers rather than guessing their order', () => {
    for (const text of ['7.31/48/72/23/-2', '7.31/48/23']) {
      const r = parsePaste(text);
      expect(r.case.gas).toEqual({});
      expect(r.questions).toEqual([expect.objectContaining({ path: 'gas', sourceText: text })]);
    }
  });

  it('is not confused with a date or a blood pressure', () => {
    const r = parsePaste('Seen 12/03/2026, BP 128/76, HR 92');
    expect(r.case).toEqual({ gas: {} });
    expect(r.questions).toEqual([]);
    expect(parseShorthand('Seen 12/03/2026, BP 128/76')).toBeNull();
  });

  it('parseShorthand returns the numbers as written and the unit, if any', () => {
    expect(parseShorthand('ABG: 7.24/9.1/7.8/29 kPa on 35%')).toEqual({
      ph: 7.24,
      pco2: 9.1,
      po2: 7.8,
      hco3: 29,
      unit: 'kPa',
      sourceText: '7.24/9.1/7.8/29 kPa',
    });
    expect(parseShorthand('VBG 7.28 / 52 / x / 26')).toEqual({
      ph: 7.28,
      pco2: 52,
      po2: null,
      hco3: 26,
      unit: null,
      sourceText: '7.28 / 52 / x / 26',
    });
    expect(parseShorthand('no gas here')).toBeNull();
  });
});

describe('units: read from the text, decided by magnitude only where one reading is plausible', () => {
  const one = (text: string) => parsePaste(text);

  it('albumin: 3.1 is g/dL, 31 is g/L, 7 is neither and is asked about', () => {
    expect(one('Albumin 3.1').case).toMatchObject({
      chemistry: { albumin: 3.1 },
      units: { albumin: 'g/dL' },
    });
    expect(one('Albumin 31').case).toMatchObject({
      chemistry: { albumin: 31 },
      units: { albumin: 'g/L' },
    });
    const r = one('Albumin 7');
    expect(r.case.chemistry).toBeUndefined();
    expect(paths(r.questions)).toEqual(['chemistry.albumin']);
  });

  it('PaCO2 13 with no unit is asked; with pH 7.10 and HCO3 30 the Henderson equation points to kPa', () => {
    // Henderson (clinical-scope section 2): PaCO2 = [H+] x HCO3 / 24 = 79.4 x 30 / 24 = 99 mmHg; 13 kPa = 97.5 mmHg
    const r = one('pH 7.10\npCO2 13\nHCO3 30');
    expect(r.case.gas).toEqual({ ph: 7.1, hco3: 30 });
    const q = r.questions.find((x) => x.path === 'gas.pco2')!;
    expect(q).toMatchObject({ options: ['mmHg', 'kPa'], suggested: 'kPa', value: 13 });
  });

  it('asks when one pressure line says kPa and another says mmHg', () => {
    const r = one('pCO2 6.4 kPa\npO2 72 mmHg');
    expect(r.case.gas).toEqual({});
    expect(paths(r.questions)).toEqual(['gas.pco2', 'gas.po2']);
    expect(r.questions[0]!.reason).toContain('kPa and another mmHg');
  });

  it('takes a bare PaO2 in the unit written on the PaCO2 line when it is plausible there', () => {
    const r = one('pCO2 5.1 kPa\npO2 11.2');
    expect(r.case.gas).toEqual({ pco2: 5.1, po2: 11.2 });
    expect(r.read.find((x) => x.path === 'gas.po2')).toMatchObject({
      unit: 'kPa',
      unitFrom: 'printout',
    });
  });

  it('asks about a pressure written in a unit where it is not plausible', () => {
    const r = one('pCO2 48 kPa');
    expect(r.case.gas).toEqual({});
    expect(r.questions[0]).toMatchObject({ path: 'gas.pco2', value: 48 });
  });

  it('glucose 6.2 is mmol/L, 110 is mg/dL, 35 fits both and is asked', () => {
    expect(one('Glucose 6.2').case).toMatchObject({
      chemistry: { glucose: 6.2 },
      units: { glucose: 'mmol/L' },
    });
    expect(one('Glucose 110').case).toMatchObject({
      chemistry: { glucose: 110 },
      units: { glucose: 'mg/dL' },
    });
    expect(paths(one('Glucose 35').questions)).toEqual(['chemistry.glucose']);
  });

  it('creatinine 1.2 is mg/dL, 88 is µmol/L, 18 is asked', () => {
    expect(one('Creat 1.2').case).toMatchObject({
      chemistry: { creatinine: 1.2 },
      units: { creatinine: 'mg/dL' },
    });
    expect(one('Creat 88').case).toMatchObject({
      chemistry: { creatinine: 88 },
      units: { creatinine: 'umol/L' },
    });
    expect(paths(one('Creat 18').questions)).toEqual(['chemistry.creatinine']);
  });

  it('urea: mmol/L when written, BUN when labelled so, and asked when "urea" comes in mg/dL or without a unit', () => {
    expect(one('Urea 6.4 mmol/L').case).toMatchObject({
      chemistry: { urea: 6.4 },
      units: { urea: 'urea-mmol/L' },
    });
    expect(one('BUN 18').case).toMatchObject({
      chemistry: { urea: 18 },
      units: { urea: 'bun-mg/dL' },
    });
    expect(one('Urea 40 mg/dL').questions[0]).toMatchObject({
      path: 'chemistry.urea',
      options: ['BUN mg/dL', 'urea mg/dL'],
    });
    expect(paths(one('Urea 6.4').questions)).toEqual(['chemistry.urea']);
  });

  it('Hb: g/dL or g/L when written; a bare 12.1 is asked (g/dL, or mmol/L as some countries report it); 121 is g/L', () => {
    expect(one('Hb 12.1 g/dL').case).toMatchObject({ gas: { hb: 12.1 }, units: { hb: 'g/dL' } });
    expect(one('Hb 121').case).toMatchObject({ gas: { hb: 121 }, units: { hb: 'g/L' } });
    expect(one('Hb 12.1').questions[0]).toMatchObject({
      path: 'gas.hb',
      options: ['g/dL', 'g/L', 'mmol/L'],
    });
    expect(paths(one('Hb 7.5 mmol/L').questions)).toEqual(['gas.hb']);
  });

  it('FiO2 as a fraction or a percent as written; impossible ones asked', () => {
    expect(one('FiO2 0.4').read[0]).toMatchObject({ value: 0.4, unit: 'fraction' });
    expect(one('FiO2 40%').read[0]).toMatchObject({ value: 40, unit: '%' });
    expect(paths(one('FiO2 0.4 %').questions)).toEqual(['oxygen.fio2']);
    expect(paths(one('FiO2 150').questions)).toEqual(['oxygen.fio2']);
  });

  it('lactate in mg/dL and a saturation written as a fraction are asked, not converted', () => {
    expect(one('Lactate 18 mg/dL').questions[0]).toMatchObject({ path: 'gas.lactate', value: 18 });
    expect(one('sO2 0.95').questions[0]).toMatchObject({ path: 'gas.sao2', options: ['95'] });
  });

  it('SpO2 goes to oxygen.spo2, never to SaO2', () => {
    expect(one('SpO2 94 %').case).toEqual({ gas: {}, oxygen: { spo2: 94 } });
  });
});

describe('labels that look alike', () => {
  it('standard bicarbonate alone is not HCO3: HCO3 stays missing', () => {
    const r = parsePaste('pH 7.36\npCO2 44 mmHg\nStd HCO3 23.0 mmol/L\nSBC 23.1');
    expect(r.case.gas).toEqual({ ph: 7.36, pco2: 44 });
    expect(r.skipped).toHaveLength(2);
    expect(r.missing).toEqual(['gas.hco3']);
  });

  it('standard base excess is used only when there is no actual one, and says so', () => {
    const r = parsePaste('SBE -4.2 mmol/L');
    expect(r.case.gas).toEqual({ baseExcess: -4.2 });
    expect(r.read[0]!.note).toContain('standard base excess');
  });

  it('O2Hb is used when there is no sO2, with a note that they differ', () => {
    const r = parsePaste('FO2Hb 88.5 %');
    expect(r.case.gas).toEqual({ sao2: 88.5 });
    expect(r.read[0]!.note).toContain('COHb');
  });

  it('alveolar PO2, the P/F ratio, end-tidal CO2 and the osmolal gap are left out with a reason', () => {
    const r = parsePaste('pO2(A) 98 mmHg\npO2/FiO2 230\nEtCO2 36\nOsm gap 14\ncalc. osm 288');
    expect(r.case).toEqual({ gas: {} });
    expect(r.skipped).toHaveLength(5);
  });

  it('"PAO2" is asked about unless the paste writes every label in capitals (PACO2)', () => {
    expect(parsePaste('PAO2 84').questions[0]).toMatchObject({
      path: 'gas.po2',
      options: ['arterial PaO2', 'alveolar PAO2'],
    });
    expect(parsePaste('PACO2 41\nPAO2 84').case.gas).toEqual({ pco2: 41, po2: 84 });
  });

  it('a base deficit is asked about (its sign), not filled', () => {
    const r = parsePaste('Base deficit 6');
    expect(r.case.gas).toEqual({});
    expect(r.questions[0]).toMatchObject({ path: 'gas.baseExcess', options: ['-6'] });
  });
});

describe('conflicts and doubt', () => {
  it('one value written twice with different numbers is asked, not chosen', () => {
    const r = parsePaste('pH 7.31\npCO2 48 mmHg\npH 7.28');
    expect(r.case.gas).toEqual({ pco2: 48 });
    expect(r.questions[0]).toMatchObject({ path: 'gas.ph', options: ['7.31', '7.28'] });
  });

  it('a second number on the line (a previous result column) is asked about', () => {
    const r = parsePaste('pH 7.31 7.26');
    expect(r.case.gas).toEqual({});
    expect(paths(r.questions)).toEqual(['gas.ph']);
  });

  it('a bound and a thousands-looking comma are asked about', () => {
    expect(paths(parsePaste('Lactate <0.5 mmol/L').questions)).toEqual(['gas.lactate']);
    expect(paths(parsePaste('Creatinine 1,200').questions)).toEqual(['chemistry.creatinine']);
  });

  it('a value outside the schema range is asked about, with the range', () => {
    const r = parsePaste('pH 9.1\nK+ 12 mmol/L');
    expect(r.case).toEqual({ gas: {} });
    expect(r.questions.map((q) => q.path)).toEqual(['gas.ph', 'chemistry.k']);
    // the range as calc's rangeText writes it, in the unit read
    expect(r.questions[0]!.reason).toContain('plausible range 6.50-8.00');
    expect(r.questions[1]!.reason).toContain('plausible range 1-10 mmol/L');
  });

  it('two sample types named: asked', () => {
    const r = parsePaste(
      'Arterial sample\npH 7.40\nPaCO2 40 mmHg\n(venous sample sent separately)',
    );
    expect(r.case.sample).toBeUndefined();
    expect(r.questions[0]).toMatchObject({ path: 'sample', options: ['arterial', 'venous'] });
  });

  it('a comment after the value is asked about (a haemolysed K matters)', () => {
    expect(paths(parsePaste('K 6.3 mmol/L haemolysed').questions)).toEqual(['chemistry.k']);
  });
});

describe('partial pastes', () => {
  it('chemistry only: no gas values, the three gas values reported missing, no sample question', () => {
    const r = parsePaste('Na 138 K 4.1 Cl 104 Alb 3.4');
    expect(r.case).toEqual({
      gas: {},
      chemistry: { na: 138, k: 4.1, cl: 104, albumin: 3.4 },
      units: { albumin: 'g/dL' },
    });
    expect(r.missing).toEqual(['gas.ph', 'gas.pco2', 'gas.hco3']);
    expect(r.questions).toEqual([]);
  });

  it('pH and PaCO2 only: enough for the schema, HCO3 missing', () => {
    const r = parsePaste('venous gas\npH 7.35\npvCO2 49 mmHg');
    expect(r.case).toEqual({
      sample: 'venous',
      units: { pressure: 'mmHg' },
      gas: { ph: 7.35, pco2: 49 },
    });
    expect(r.missing).toEqual(['gas.hco3']);
    expect(parseCase(r.case).ok).toBe(true);
  });
});

describe('junk gives no values', () => {
  it.each([
    ['empty', ''],
    ['spaces and blank lines', '   \n\n\t \n'],
    ['random text', 'qz 88 lorem ipsum 7.3 dolor // 12:40 ## ~~ 0x7f'],
    [
      'an email',
      'From: ward7@example.org\nSubject: bloods\nHi, can you check the lactate 4.2 from this morning? Ward K 5, bed 12.\nThanks',
    ],
    [
      'an HTML page',
      '<!doctype html><html><head><title>Login</title><style>p{margin:7.31px}</style></head><body><p>Please sign in</p><script>var pH=7.31;</script></body></html>',
    ],
    ['a list of dates and times', '02/03/2026 04:10\n03.03.2026 06:00\n2026-03-04T08:15'],
  ])('%s', (_name, text) => {
    const r = parsePaste(text);
    expect(r.case).toEqual({ gas: {} });
    expect(r.read).toEqual([]);
    expect(r.questions).toEqual([]);
  });

  it('stays fast on long, hostile pastes (every input is read in one pass per line)', () => {
    const n = 60_000; // about the API body limit of 64 KiB
    for (const text of [
      'K 4 '.repeat(n / 4),
      'pH 1-'.repeat(n / 5),
      'pH 7.31\n'.repeat(n / 8),
      '('.repeat(n),
      '<p><script>'.repeat(n / 11),
      '7.3/'.repeat(n / 4),
    ]) {
      const start = performance.now();
      parsePaste(text);
      expect(performance.now() - start).toBeLessThan(2000);
    }
  });

  it('refuses a text over the size limit with a question, reading nothing', () => {
    const r = parsePaste(`pH 7.31\n${'x'.repeat(100_001)}`);
    expect(r.case).toEqual({ gas: {} });
    expect(paths(r.questions)).toEqual(['(text)']);
  });
});
