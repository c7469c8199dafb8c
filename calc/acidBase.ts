// pH, hydrogen ion and the Henderson equation, solved for any term.
import { CONSISTENCY } from './reference.ts';

// Definition of pH: [H+] nmol/L = 10^(9 - pH).
export const hydrogenIon = (ph: number): number => 10 ** (9 - ph);

// Inverse of the definition of pH.
export const phFromHydrogenIon = (hPlus: number): number => 9 - Math.log10(hPlus);

// Henderson equation: [H+] = 24 x PaCO2 / HCO3 (nmol/L, mmHg, mmol/L).
export const hendersonHydrogenIon = (pco2: number, hco3: number): number => (24 * pco2) / hco3;

// Henderson equation solved for HCO3: HCO3 = 24 x PaCO2 / [H+].
export const hendersonBicarbonate = (hPlus: number, pco2: number): number => (24 * pco2) / hPlus;

// Henderson equation solved for PaCO2: PaCO2 = [H+] x HCO3 / 24.
export const hendersonPco2 = (hPlus: number, hco3: number): number => (hPlus * hco3) / 24;

// Henderson equation with PaCO2 in kPa: [H+] = 180 x PaCO2 / HCO3 (24 x 7.50062 = 180.0).
export const hendersonHydrogenIonKpa = (pco2Kpa: number, hco3: number): number =>
  (180 * pco2Kpa) / hco3;

// Henderson-Hasselbalch: pH = 6.1 + log10(HCO3 / (0.0307 x PaCO2)).
export const hendersonHasselbalchPh = (pco2: number, hco3: number): number =>
  6.1 + Math.log10(hco3 / (0.0307 * pco2));

export interface Consistency {
  reported: number;
  calculated: number;
  difference: number;
  relative: number;
  consistent: boolean;
}

// Clinical-scope section 2: reported HCO3 against 24 x PaCO2 / [H+]; beyond 3 mmol/L or 10% is inconsistent.
export function hendersonConsistency(ph: number, pco2: number, reportedHco3: number): Consistency {
  const calculated = hendersonBicarbonate(hydrogenIon(ph), pco2);
  const difference = reportedHco3 - calculated;
  const relative = Math.abs(difference) / calculated;
  const consistent =
    Math.abs(difference) <= CONSISTENCY.absolute && relative <= CONSISTENCY.relative;
  return { reported: reportedHco3, calculated, difference, relative, consistent };
}
