// Invented printouts shared by the page's fragment and browser tests.

// An invented 52-year-old after a prolonged seizure: a raised-lactate metabolic acidosis on room air.
export const PRINTOUT = `POINT-OF-CARE BLOOD GAS        Ward 7B
Sample: ARTERIAL
pH          7.26
pCO2        29    mmHg
pO2         84    mmHg
HCO3-       13.6  mmol/L
Std HCO3    15.2  mmol/L
BE(B)       -12.4 mmol/L
Lac         7.8   mmol/L
Na+         141   mmol/L
K+          4.6   mmol/L
Cl-         103   mmol/L
FiO2        21 %
Operator 117`;
