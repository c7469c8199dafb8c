// Invented patients for the second-round ventilator and oxygen rules (clinical-scope section 10), shared by the core's
// worked cases and the note's.
// 1. a 62-year-old woman, 160 cm (PBW 45.5 + 0.91 x 7.6 = 52.42 kg, ARDS Network 2000), ventilated for pneumonia
export const stiffLungs = {
  gas: { ph: 7.28, pco2: 55, po2: 78, hco3: 25.1 },
  patient: { ageYears: 62, sex: 'female', heightCm: 160 },
  oxygen: { fio2: 0.5, peep: 12 },
  ventilator: { vt: 360, rr: 18, pplat: 26, targetPh: 7.33 },
};

// 2. a 31-year-old woman, 165 cm (PBW 56.97 kg), known asthma, ventilated in a severe attack, Ti 1.0 s
export const asthma = {
  gas: { ph: 7.2, pco2: 64, po2: 110, hco3: 24.2 },
  patient: { ageYears: 31, sex: 'female', heightCm: 165 },
  context: { conditions: ['asthma'], timing: 'acute' },
  oxygen: { fio2: 0.4, peep: 5 },
  ventilator: { vt: 400, rr: 14, pplat: 29, inspiratoryTime: 1.0, targetPh: 7.3 },
};

// 3. a 48-year-old man, 181 cm (PBW 76.03 kg), septic shock with acute kidney injury, asked target PaCO2 40
export const septic = {
  gas: { ph: 7.1, pco2: 36, po2: 95, hco3: 10.9, lactate: 9 },
  chemistry: { na: 138, cl: 100, creatinine: 3.2 },
  patient: { ageYears: 48, sex: 'male', heightCm: 181 },
  oxygen: { fio2: 0.4, peep: 8 },
  ventilator: { vt: 450, rr: 28, pplat: 22, targetPco2: 40 },
};

// 4. a 55-year-old man, 175 cm (PBW 70.57 kg), ARDS on 6 mL/kg, plateau 29 on PEEP 14
export const ards = {
  gas: { ph: 7.18, pco2: 68, po2: 70, hco3: 24.9 },
  patient: { ageYears: 55, sex: 'male', heightCm: 175 },
  context: { timing: 'acute' },
  oxygen: { fio2: 0.6, peep: 14 },
  ventilator: { vt: 420, rr: 30, pplat: 29, targetPh: 7.35 },
};

// 5. a 70-year-old man, 172 cm, COPD with a usual PaCO2 of 58, ventilated for an exacerbation
export const copd = {
  gas: { ph: 7.28, pco2: 76, po2: 72, hco3: 34.5 },
  patient: { ageYears: 70, sex: 'male', heightCm: 172 },
  context: { conditions: ['copd'], baseline: { pco2: 58, hco3: 34 } },
  oxygen: { fio2: 0.35, peep: 5 },
  ventilator: { vt: 480, rr: 14, pplat: 22, targetPh: 7.4 },
};

// 11. a 66-year-old woman, 158 cm (PBW 45.5 + 0.91 x 5.6 = 50.6 kg), ventilated after a pulmonary embolism
export const embolism = {
  gas: { ph: 7.3, pco2: 52, po2: 82, hco3: 25.1 },
  patient: { ageYears: 66, sex: 'female', heightCm: 158 },
  oxygen: { fio2: 0.5, peep: 8 },
  ventilator: { vt: 380, rr: 20, pplat: 23, etco2: 29, targetPh: 7.36 },
};
