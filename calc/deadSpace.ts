// Dead space from expired CO2: the Bohr equation with Enghoff's modification, and the alveolar dead space that an
// end-tidal CO2 shows (clinical-scope section 10).

// Enghoff's modification of Bohr: VD/VT = (PaCO2 - PECO2) / PaCO2, PECO2 mixed-expired (physiological dead space).
export const deadSpaceFraction = (pco2: number, expiredPco2: number): number =>
  (pco2 - expiredPco2) / pco2;

// The same form with the end-tidal CO2: (PaCO2 - PetCO2) / PaCO2, the alveolar dead-space fraction of the alveolar
// part of each breath (the anatomic dead space holds no alveolar gas, so it is not in this fraction).
export const alveolarDeadSpaceFraction = (pco2: number, etco2: number): number =>
  (pco2 - etco2) / pco2;

// Physiological dead space = anatomic (and apparatus) + alveolar: VD = VDaw + (VT - VDaw) x (PaCO2 - PetCO2) / PaCO2.
export const physiologicalDeadSpace = (
  vt: number,
  anatomic: number,
  pco2: number,
  etco2: number,
): number => anatomic + (vt - anatomic) * alveolarDeadSpaceFraction(pco2, etco2);
