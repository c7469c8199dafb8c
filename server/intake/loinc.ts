// The LOINC codes the FHIR intake reads are calc's (FIELDS[].loinc: each code with its specimen, its long common
// name and the published list it was checked against). Here: the lookup by code, the UCUM codes each code takes,
// and the codes a gas bundle often carries that are deliberately not read, with the reason shown to the clinician.
import {
  FIELDS,
  units,
  type FieldPath,
  type FieldSpec,
  type Loinc,
  type UnitDef,
} from '../../calc/index.ts';

export const LOINC_SYSTEM = 'http://loinc.org';
export const UCUM_SYSTEM = 'http://unitsofmeasure.org';

/** A code of the table with the field it fills. */
export interface LoincEntry extends Loinc {
  path: FieldPath;
  field: FieldSpec;
}

/** Every code read, in table order: a view of FIELDS[].loinc, not a list of its own. */
export const LOINC_CODES: readonly LoincEntry[] = (FIELDS as readonly FieldSpec[]).flatMap(
  (field) => (field.loinc ?? []).map((l) => ({ ...l, path: field.path as FieldPath, field })),
);

const BY_CODE = new Map(LOINC_CODES.map((entry) => [entry.code, entry]));
export const loincEntry = (code: string): LoincEntry | undefined => BY_CODE.get(code);

// UCUM writes the milliequivalent "meq" (case-sensitive codes; both liter symbols are valid UCUM)
const MEQ = ['meq/L', 'meq/l'];

/**
 * The UCUM codes a code's value may come in (case-sensitive, as FHIR sends them): for a kind with a unit choice,
 * the units of the kind (only the one the code's property implies, mass or moles, where the table says); else the
 * field's own codes, and mEq/L for an ion of known charge.
 */
export function ucumCodes(entry: LoincEntry): readonly string[] {
  const f = entry.field;
  if (f.quantity) {
    const defs = units.QUANTITIES[f.quantity].units as Readonly<Record<string, UnitDef>>;
    const chosen = entry.unit ? [defs[entry.unit]!] : Object.values(defs);
    return [...new Set(chosen.flatMap((d) => d.ucum))];
  }
  return [...(f.ucum ?? []), ...(f.charge ? MEQ : [])];
}

/** Codes a gas bundle often carries that are deliberately not read, with the reason shown to the clinician. */
export const LOINC_NOT_READ: Readonly<Record<string, { name: string; reason: string }>> = {
  '33254-4': {
    name: "pH of Arterial blood adjusted to patient's actual temperature",
    reason: 'temperature-corrected value; the 37 °C value is the one read',
  }, // checked: VSAC ...1248.96
  '32771-8': {
    name: "Carbon dioxide [Partial pressure] adjusted to patient's actual temperature in Arterial blood",
    reason: 'temperature-corrected value; the 37 °C value is the one read',
  }, // checked: VSAC ...1248.95
  '19255-9': {
    name: "Oxygen [Partial pressure] adjusted to patient's actual temperature in Arterial blood",
    reason: 'temperature-corrected value; the 37 °C value is the one read',
  }, // checked: VSAC ...1248.94
  '19230-2': {
    name: 'Bicarbonate [Moles/volume] standard in Arterial blood',
    reason: 'standard bicarbonate is not the actual HCO3',
  }, // checked: VSAC 2.16.840.1.113762.1.4.1045.139
  '19232-8': {
    name: 'Bicarbonate [Moles/volume] standard in Venous blood',
    reason: 'standard bicarbonate is not the actual HCO3',
  }, // checked: VSAC 2.16.840.1.113762.1.4.1045.139
  '1963-8': {
    name: 'Bicarbonate [Moles/volume] in Serum or Plasma',
    reason:
      'serum bicarbonate is a chemistry value, not the blood-gas HCO3; enter it by hand to use it',
  }, // checked: VSAC 2.16.840.1.113762.1.4.1045.139
  '2028-9': {
    name: 'Carbon dioxide, total [Moles/volume] in Serum or Plasma',
    reason: 'total CO2 is not the blood-gas HCO3 (it runs about 1-2 mmol/L higher)',
  }, // checked: VSAC 2.16.840.1.113762.1.4.1045.139
  '59260-0': {
    name: 'Hemoglobin [Moles/volume] in Blood',
    reason: 'Hb in mmol/L is not a unit the case takes; enter Hb in g/dL or g/L',
  }, // checked: VSAC 2.16.840.1.113762.1.4.1248.219
  '14937-7': {
    name: 'Urea nitrogen [Moles/volume] in Serum or Plasma',
    reason: 'urea nitrogen in moles is read differently from lab to lab; enter urea by hand',
  }, // checked: VSAC 2.16.840.1.113762.1.4.1248.218
  '24336-0': {
    name: 'Gas panel - Arterial blood',
    reason: 'a panel: its member results are read one by one',
  }, // from memory (seen as the arterial blood gas panel code in an HL7 example)
  // mass codes of the ions the case takes in mmol/L only: converting needs the molar mass, so the clinician does it
  '17861-6': {
    name: 'Calcium [Mass/volume] in Serum or Plasma',
    reason:
      'total calcium is not ionised calcium; enter ionised calcium by hand if it was measured',
  }, // checked: HL7 PDDI CDS calcium value set
  '17864-0': {
    name: 'Calcium.ionized [Mass/volume] in Serum or Plasma by Ion-selective membrane electrode (ISE)',
    reason:
      'ionised calcium in mass units: the case takes mmol/L (mg/dL / 4.008, molar mass 40.08); enter it converted',
  }, // checked: HL7 PDDI CDS calcium value set
  '19123-9': {
    name: 'Magnesium [Mass/volume] in Serum or Plasma',
    reason:
      'magnesium in mass units: the case takes mmol/L (mg/dL / 2.431, molar mass 24.31); enter it converted',
  }, // checked: HL7 PDDI CDS magnesium value set
  '2777-1': {
    name: 'Phosphate [Mass/volume] in Serum or Plasma',
    reason:
      'phosphate in mass units (as phosphorus): the case takes mmol/L (mg/dL / 3.097, molar mass of phosphorus 30.97); enter it converted',
  }, // checked: a published national LOINC code list (beside 14879-1)
};
