// Invented patients in scenarios of our own, one for each kind of reading the note words (no real person). They
// are checked at start-up against a department's own templates (every one must render), and the tests use them.
// Each gas is built to be internally consistent by the Henderson equation, [H+] = 24 x PaCO2 / HCO3
// (clinical-scope section 2), so the core reads it as entered.

// 1. A 64-year-old woman, 162 cm, ventilated after abdominal surgery, mild acute hypercapnia.
export const ventilatedMmHg = {
  sample: 'arterial',
  units: { pressure: 'mmHg', albumin: 'g/dL', glucose: 'mg/dL', urea: 'bun-mg/dL' },
  gas: { ph: 7.31, pco2: 48, po2: 72, hco3: 23.5, lactate: 1.1, sao2: 93, hb: 12.1 },
  chemistry: {
    na: 138,
    k: 4.1,
    cl: 104,
    albumin: 3.1,
    glucose: 110,
    urea: 18,
    creatinine: 1.0,
    osmolality: 290,
  },
  patient: { ageYears: 64, sex: 'female', heightCm: 162 },
  context: { timing: 'acute' },
  oxygen: { fio2: 0.4, peep: 8 },
  ventilator: { vt: 450, rr: 16, pplat: 24, targetPh: 7.35 },
  previous: [{ takenAt: '2026-03-02T04:10', gas: { ph: 7.22, pco2: 61, hco3: 24.3 } }],
} as const;

// 1b. The same patient reported in kPa and SI units: pressures / 7.50062 (SI), albumin g/L = 10 x g/dL,
// glucose mmol/L = mg/dL / 18.016, urea mmol/L = BUN mg/dL / 2.801 (clinical-scope section 1).
export const ventilatedKpa = {
  ...ventilatedMmHg,
  units: { pressure: 'kPa', albumin: 'g/L', glucose: 'mmol/L', urea: 'urea-mmol/L' },
  gas: { ...ventilatedMmHg.gas, pco2: 6.4, po2: 9.6 },
  chemistry: {
    ...ventilatedMmHg.chemistry,
    albumin: 31,
    glucose: 6.1,
    urea: 6.4,
    creatinine: undefined,
  },
  previous: [{ takenAt: '2026-03-02T04:10', gas: { ph: 7.22, pco2: 8.1, hco3: 24.3 } }],
} as const;

// 2. A 23-year-old man with diabetic ketoacidosis: raised-AG acidosis, compensation as expected.
// Winters: 1.5 x 6.5 + 8 = 17.75 (15.75-19.75) contains PaCO2 18; AG = 134 - (98 + 6.5) = 29.5.
export const ketoacidosis = {
  gas: { ph: 7.18, pco2: 18, hco3: 6.5, po2: 110, lactate: 2.4 },
  chemistry: { na: 134, k: 5.6, cl: 98, albumin: 4.2, glucose: 540, urea: 30, creatinine: 1.4 },
  patient: { ageYears: 23, sex: 'male', heightCm: 180 },
  oxygen: { fio2: 0.21 },
} as const;

// 3. A 58-year-old man in septic shock, ventilated: raised-AG acidosis with added respiratory acidosis;
// the team asked for PaCO2 40, above the Winters band 26.25-30.25 for HCO3 13.5.
export const septicMixed = {
  gas: { ph: 7.1, pco2: 45, hco3: 13.5, po2: 88, lactate: 6.2 },
  chemistry: { na: 140, k: 4.8, cl: 104, albumin: 2.5 },
  patient: { ageYears: 58, sex: 'male', heightCm: 178 },
  oxygen: { fio2: 0.5, peep: 10 },
  ventilator: { vt: 500, rr: 18, pplat: 29, targetPco2: 40 },
} as const;

// 4. A 71-year-old woman vomiting for days, then ketotic and septic: triple disorder.
// AG = 140 - (92 + 21.5) = 26.5 with HCO3 21.5; delta ratio (26.5 - 12) / (24 - 21.5) = 5.8, above 2 (Wrenn 1990).
export const triple = {
  gas: { ph: 7.5, pco2: 28, hco3: 21.5, po2: 84 },
  chemistry: { na: 140, k: 3.2, cl: 92, albumin: 4.0 },
  patient: { ageYears: 71, sex: 'female' },
  oxygen: { fio2: 0.28 },
} as const;

// 5. A 35-year-old man with profuse diarrhoea: normal-AG acidosis, negative urine anion gap, SI chemistry.
// AG = 138 - (114 + 14) = 10; urine AG = 30 + 20 - 80 = -30 (common practice: negative in GI loss).
export const diarrhoea = {
  units: { glucose: 'mmol/L', urea: 'urea-mmol/L' },
  gas: { ph: 7.29, pco2: 30, hco3: 14 },
  chemistry: { na: 138, k: 3.1, cl: 114, albumin: 4.0, glucose: 5.2, urea: 9.1 },
  urine: { na: 30, k: 20, cl: 80 },
  patient: { ageYears: 35, sex: 'male' },
} as const;

// 6. A 44-year-old woman with pyloric obstruction: metabolic alkalosis, expected PaCO2 0.7 x 38 + 21 = 47.6
// (45.6-49.6, Berend 2014) contains 48; urine chloride 12 (< 20: chloride-responsive, common practice); K 2.6 critical.
export const vomiting = {
  gas: { ph: 7.52, pco2: 48, hco3: 38, po2: 82 },
  chemistry: { na: 138, k: 2.6, cl: 88 },
  urine: { cl: 12 },
  patient: { ageYears: 44, sex: 'female' },
  oxygen: { fio2: 0.21 },
} as const;

// 7. A 69-year-old man with COPD, usual PaCO2 55 and HCO3 32, now on the ventilator; the team aims for pH 7.40.
export const copdVentilated = {
  gas: { ph: 7.29, pco2: 72, hco3: 33.5, po2: 64 },
  chemistry: { na: 139, k: 4.4, cl: 96 },
  patient: { ageYears: 69, sex: 'male', heightCm: 170 },
  context: { timing: 'acute', baseline: { pco2: 55, hco3: 32 } },
  oxygen: { fio2: 0.35, peep: 5 },
  ventilator: { vt: 480, rr: 14, pplat: 22, targetPh: 7.4 },
} as const;

// 8. A 40-year-old woman, sudden breathlessness, room air: acute respiratory alkalosis with a raised A-a gradient.
// PAO2 = 0.21 x (760 - 47) - 30 / 0.8 = 112.2; A-a = 44.2 against age / 4 + 4 = 14 (common practice).
export const breathless = {
  gas: { ph: 7.49, pco2: 30, hco3: 22.5, po2: 68 },
  patient: { ageYears: 40, sex: 'female' },
  context: { timing: 'acute' },
  oxygen: { fio2: 0.21 },
} as const;

// 9. A 52-year-old man in the ED, peripheral venous gas: PvCO2 42 (< 45: arterial hypercapnia unlikely, Byrne 2014).
export const venousLow = {
  sample: 'venous',
  gas: { ph: 7.33, pco2: 42, hco3: 22, po2: 38, lactate: 3.1 },
  chemistry: { na: 137, k: 4.0, cl: 103 },
  patient: { ageYears: 52, sex: 'male' },
} as const;

// 10. A 61-year-old woman, ventilated, with only a venous gas: PvCO2 58 and a target pH 7.35.
export const venousVentilated = {
  sample: 'venous',
  gas: { ph: 7.28, pco2: 58, hco3: 26.5 },
  patient: { ageYears: 61, sex: 'female', heightCm: 165 },
  oxygen: { fio2: 0.4, peep: 6 },
  ventilator: { vt: 400, rr: 16, targetPh: 7.35 },
} as const;

// 11. A 77-year-old man with COPD on the ward, earlobe capillary gas, chronic hypercapnia.
export const capillary = {
  sample: 'capillary',
  gas: { ph: 7.36, pco2: 52, hco3: 29, po2: 55 },
  patient: { ageYears: 77, sex: 'male' },
  context: { timing: 'chronic' },
  oxygen: { fio2: 0.24 },
} as const;

// 12. A 29-year-old woman at 32 weeks: PaCO2 30 and HCO3 20 sit in the pregnancy reference (28-32, 18-22).
export const pregnancy = {
  gas: { ph: 7.44, pco2: 30, hco3: 20, po2: 104 },
  patient: { ageYears: 29, sex: 'female', pregnant: true },
  oxygen: { fio2: 0.21 },
} as const;

// 13. PaCO2 "5.3 mmHg" with pH 7.40 and HCO3 24: almost certainly kPa; the note must not interpret it.
export const withheld = {
  units: { pressure: 'mmHg' },
  gas: { ph: 7.4, pco2: 5.3, hco3: 24, po2: 12.1 },
  chemistry: { na: 139, k: 6.5, cl: 101 },
  patient: { ageYears: 50, sex: 'male' },
  oxygen: { fio2: 0.21 },
} as const;

// 14. Reported HCO3 30 with pH 7.35 and PaCO2 40: Henderson gives 24 x 40 / 44.7 = 21.5, a mismatch.
export const inconsistent = {
  gas: { ph: 7.35, pco2: 40, hco3: 30 },
  patient: { ageYears: 47, sex: 'female' },
} as const;

// 15. A 33-year-old man found confused: raised-AG acidosis with an osmolar gap, SI units.
// Calculated osmolality 2 x 140 + 5 + 5 = 290; measured 330: gap 40 (Purssell 2001; > 10 raised, common practice).
export const toxicAlcohol = {
  units: { glucose: 'mmol/L', urea: 'urea-mmol/L' },
  gas: { ph: 7.21, pco2: 24, hco3: 9.5 },
  chemistry: { na: 140, k: 4.5, cl: 100, glucose: 5.0, urea: 5.0, osmolality: 330 },
  patient: { ageYears: 33, sex: 'male' },
} as const;

// 16. Only pH and PaCO2, nothing else: HCO3 is calculated; the note must stay clean.
export const minimal = {
  gas: { ph: 7.25, pco2: 55 },
} as const;

// 17. A 14-year-old with ketoacidosis: adult rules flagged.
export const adolescent = {
  gas: { ph: 7.2, pco2: 22, hco3: 8.5 },
  chemistry: { na: 136, cl: 100 },
  patient: { ageYears: 14, sex: 'female' },
} as const;

// 18. A 46-year-old man with severe ARDS on lung-protective settings: the target needs RR above 35/min.
// PBW male 50 + 0.91 x (175 - 152.4) = 70.6 kg (ARDS Network 2000); VT 420 = 5.9 mL/kg; P/F = 70 / 0.8 = 87.5.
export const ards = {
  gas: { ph: 7.22, pco2: 65, hco3: 26, po2: 70 },
  patient: { ageYears: 46, sex: 'male', heightCm: 175 },
  oxygen: { fio2: 0.8, peep: 14, spo2: 92 },
  ventilator: { vt: 420, rr: 30, pplat: 32, targetPh: 7.32 },
} as const;

// 19. A 60-year-old on the ward, oxygen amount not recorded: PaO2 without FiO2.
export const noFio2 = {
  gas: { ph: 7.38, pco2: 41, hco3: 23.8, po2: 70 },
  patient: { ageYears: 60 },
} as const;

// 20. Only a usual pH known (7.38): the usual PaCO2 and HCO3 are estimated by the core.
export const estimatedBaseline = {
  gas: { ph: 7.39, pco2: 41, hco3: 24.3 },
  context: { baseline: { ph: 7.38 } },
} as const;

// 21. A 30-year-old walker, cold (33 °C), at 1600 m, with a PaO2 above the alveolar PO2: a sample to check.
// PB = 760 x (1 - 2.25577e-5 x 1600)^5.25588 = 626 mmHg (ICAO standard atmosphere).
export const coldAltitude = {
  gas: { ph: 7.3, pco2: 50, hco3: 24.2, po2: 90 },
  context: { temperatureC: 33, altitudeM: 1600 },
  oxygen: { fio2: 0.21, spo2: 99 },
  patient: { ageYears: 30 },
} as const;

// 22. A 40-year-old man of 125 cm, ventilated, no target given: PBW formula out of range.
export const shortStature = {
  gas: { ph: 7.4, pco2: 40, hco3: 24.2 },
  ventilator: { vt: 500, rr: 14 },
  patient: { sex: 'male', heightCm: 125, ageYears: 40 },
} as const;

// 23. A ventilator circuit with 300 mL of apparatus dead space and a small VT.
export const deadSpace = {
  gas: { ph: 7.4, pco2: 40, hco3: 24.2 },
  ventilator: { vt: 350, rr: 14, deadSpaceMl: 300, targetPh: 7.35 },
  patient: { sex: 'male', heightCm: 180 },
} as const;

// 24. "18 kPa" with pH 7.42: that is 135 mmHg, surely entered in mmHg; withheld.
export const kpaWithheld = {
  units: { pressure: 'kPa' },
  gas: { ph: 7.42, pco2: 18, hco3: 24, po2: 12 },
  chemistry: { na: 140 },
} as const;

/** Every case by name, for the checks that hold for all notes. */
export const EXAMPLES: Record<string, unknown> = {
  ventilatedMmHg,
  ventilatedKpa,
  ketoacidosis,
  septicMixed,
  triple,
  diarrhoea,
  vomiting,
  copdVentilated,
  breathless,
  venousLow,
  venousVentilated,
  capillary,
  pregnancy,
  withheld,
  inconsistent,
  toxicAlcohol,
  minimal,
  adolescent,
  ards,
  noFio2,
  estimatedBaseline,
  coldAltitude,
  shortStature,
  deadSpace,
  kpaWithheld,
};
