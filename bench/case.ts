// An invented ventilated patient with full chemistry: the benchmark's workload.
export const BENCH_CASE = {
  sample: 'arterial',
  units: { pressure: 'mmHg', albumin: 'g/dL', glucose: 'mg/dL', urea: 'bun-mg/dL' },
  gas: {
    ph: 7.24,
    pco2: 52,
    po2: 68,
    hco3: 21.8,
    baseExcess: -5.6,
    sao2: 91,
    lactate: 3.1,
    hb: 10.4,
  },
  chemistry: {
    na: 136,
    k: 4.9,
    cl: 99,
    albumin: 2.6,
    glucose: 164,
    urea: 31,
    creatinine: 1.7,
    osmolality: 301,
  },
  patient: { ageYears: 71, sex: 'male', heightCm: 176, pregnant: false },
  context: { timing: 'unknown', temperatureC: 37.4 },
  oxygen: { fio2: 0.55, peep: 10, spo2: 92 },
  ventilator: { vt: 520, rr: 18, pplat: 27, deadSpaceMl: 50, targetPh: 7.32 },
} as const;
