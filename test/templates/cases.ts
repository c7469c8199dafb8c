// Invented patients for the note tests. Each gas is built to be internally consistent by the Henderson
// equation, [H+] = 24 x PaCO2 / HCO3 (clinical-scope section 2), so the core reads it as entered.
import { createRequire } from 'node:module';
import { interpret, type CaseInput, type Findings } from '../../calc/index.ts';
import { EXAMPLES } from '../../templates/examples.ts';

// @lhncbc/ucum-lhc ships CommonJS without type declarations; loaded through require it is typed `any`.
const ucumUtils = createRequire(import.meta.url)('@lhncbc/ucum-lhc').UcumLhcUtils.getInstance();

/** Convert with the UCUM library, an outside reference for the units the note prints. */
export function ucum(
  fromCode: string,
  value: number,
  toCode: string,
  molecularWeight?: number,
): number {
  const result = ucumUtils.convertUnitTo(
    fromCode,
    value,
    toCode,
    molecularWeight === undefined ? {} : { molecularWeight },
  );
  if (result.status !== 'succeeded')
    throw new Error(`UCUM could not convert ${fromCode} to ${toCode}: ${result.msg}`);
  return result.toVal as number;
}

/** mmHg to kPa by UCUM (mm[Hg] = 133.322 Pa), printed as the note prints kPa: 1 decimal. */
export const kpaText = (mmHg: number): string => `${ucum('mm[Hg]', mmHg, 'kPa').toFixed(1)} kPa`;

/** interpret() that must succeed. */
export function read(c: unknown): Findings {
  const result = interpret(c);
  if (!result.ok) throw new Error(`case rejected: ${JSON.stringify(result.errors)}`);
  return result;
}

// The invented examples (templates/examples.json), one name each, as the tests use them.
const example = (name: string): CaseInput & Record<string, any> => {
  const found = EXAMPLES[name];
  if (!found) throw new Error(`no invented example "${name}"`);
  return found as CaseInput & Record<string, any>;
};
export const ALL_CASES: Record<string, unknown> = EXAMPLES;
export const ventilatedMmHg = example('ventilatedMmHg');
export const ventilatedKpa = example('ventilatedKpa');
export const ketoacidosis = example('ketoacidosis');
export const septicMixed = example('septicMixed');
export const triple = example('triple');
export const diarrhoea = example('diarrhoea');
export const vomiting = example('vomiting');
export const copdVentilated = example('copdVentilated');
export const breathless = example('breathless');
export const venousLow = example('venousLow');
export const venousVentilated = example('venousVentilated');
export const capillary = example('capillary');
export const pregnancy = example('pregnancy');
export const withheld = example('withheld');
export const inconsistent = example('inconsistent');
export const toxicAlcohol = example('toxicAlcohol');
export const minimal = example('minimal');
export const adolescent = example('adolescent');
export const ards = example('ards');
export const noFio2 = example('noFio2');
export const estimatedBaseline = example('estimatedBaseline');
export const coldAltitude = example('coldAltitude');
export const shortStature = example('shortStature');
export const deadSpace = example('deadSpace');
export const kpaWithheld = example('kpaWithheld');
