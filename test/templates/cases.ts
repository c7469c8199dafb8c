// Invented patients for the note tests. Each gas is built to be internally consistent by the Henderson
// equation, [H+] = 24 x PaCO2 / HCO3 (clinical-scope section 2), so the core reads it as entered.
import { createRequire } from 'node:module';
import { interpret, type Findings } from '../../calc/index.ts';

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

export * from '../../templates/examples.ts';
export { EXAMPLES as ALL_CASES } from '../../templates/examples.ts';
