// Properties of the paste intake (fast-check): noise never changes what is read, and no text can put a
// number into the case that it does not contain. FC_RUNS=10000 runs them longer.
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { parsePaste, type PasteResult } from '../../../server/intake/index.ts';
import { FIELD, type CaseInput, type FieldPath } from '../../../calc/index.ts';

const RUNS = Number(process.env.FC_RUNS ?? 300);

// Two invented printouts (mmHg and kPa); the values each one must give.
const PRINTOUT_MMHG = [
  'Sample type: Arterial',
  'pH        7.31   L   [7.35-7.45]',
  'pH(T)     7.29',
  'pCO2      48     mmHg H  (35-45)',
  'pO2       72     mmHg    (80-100)',
  'cHCO3-(P) 23.5   mmol/L',
  'BE(B)     -2.1   mmol/L',
  'BE(ecf)   -2.6   mmol/L',
  'sO2       93 %',
  'ctHb      12.1 g/dL',
  'Na+ 138 mmol/L',
  'K+ 4.1 mmol/L',
  'Cl- 104 mmol/L',
  'cLac 1.1 mmol/L',
  'Glu 110 mg/dL',
];
const PRINTOUT_KPA = [
  'Specimen: arterial blood',
  'pH                  7,28                 7,35 - 7,45    L',
  'pCO2                7,9       kPa        4,7 - 6,0      H',
  'pO2                 8,1       kPa        10,0 - 13,3    L',
  'HCO3 act            27,4      mmol/L     22 - 26        H',
  'Albumin             31        g/L        35 - 50        L',
  'Creatinine          104       µmol/L     45 - 90        H',
  'Glucose             7,4       mmol/L',
];

// Lines a printout or a copied page carries around its results, none of them a result.
const REALISTIC_NOISE = [
  'DEMO GENERAL - BLOOD GAS',
  'Patient ID: 4471-22   DOB 03/04/1961',
  '02/03/2026 04:10',
  'Operator 0042',
  'Analyser S/N 55-1234',
  'Printed 02.03.2026 06:45 page 1 of 2',
  '*** END OF REPORT ***',
  '-----------------------------',
  'H = above range, L = below range',
  'Barcode 0012345678',
  'Ward 7, bed 12',
  'Test   Result   Units   Reference',
  'Requested by: ED registrar',
  'Comment: sample received on ice',
  '',
  '   ',
  '====',
  'Results validated 06:50',
];

// Random noise from characters that cannot spell a label, a unit, a sample type (no label uses j, q, w, x,
// y or z on its own) or the slash shorthand, so any change in what is read would be the parser's fault.
const NO_LABEL_CHARS = [...'0123456789 -:.#*=()[]_~!?\'"@&;,+jqwxyzJQWXYZ'];
const noiseLine = fc.oneof(
  fc.constantFrom(...REALISTIC_NOISE),
  fc.string({ unit: fc.constantFrom(...NO_LABEL_CHARS), maxLength: 60 }),
  fc
    .array(
      fc.constantFrom(
        'Ward',
        'bed',
        '12',
        '04:10',
        'ID',
        'S/N',
        '***',
        'Printed',
        'Result',
        'Flag',
        'Ref',
        'page',
        '2 of 3',
        '#',
        '0042',
        'on ice',
      ),
      { maxLength: 8 },
    )
    .map((w) => w.join(' ')),
);

/** Any line at all, including ones that happen to look like a result ("K 0") or a sample type ("vbg"). */
const anyLine = fc.oneof(
  noiseLine,
  fc.string({ maxLength: 60 }).map((s) => s.replace(/[\r\n]/g, ' ')),
  fc
    .string({ unit: 'grapheme', maxLength: 30 })
    .map((s) => s.replace(/[\r\n\u2028\u2029\u0085]/g, ' ')),
  fc
    .tuple(
      fc.constantFrom('K', 'Na', 'pH', 'pCO2', 'Glu', 'vbg', 'HCO3'),
      fc.integer({ min: 0, max: 300 }),
    )
    .map(([l, n]) => `${l} ${n}`),
);

/** The lines of the printout in order, with other lines between and around them. */
const interleave = (printout: string[], line: fc.Arbitrary<string>) =>
  fc
    .array(fc.array(line, { maxLength: 3 }), {
      minLength: printout.length + 1,
      maxLength: printout.length + 1,
    })
    .map((gaps) =>
      gaps
        .flatMap((noise, i) => (i < printout.length ? [...noise, printout[i]!] : noise))
        .join('\n'),
    );

const valuesRead = (r: PasteResult) =>
  r.read.map((x) => ({ path: x.path, value: x.value, unit: x.unit }));

describe('noise lines around a known printout never change what is read', () => {
  for (const [name, printout] of [
    ['mmHg printout', PRINTOUT_MMHG],
    ['kPa printout', PRINTOUT_KPA],
  ] as const) {
    const clean = parsePaste(printout.join('\n'));
    it(`${name}: the clean printout reads fully and without questions`, () => {
      expect(clean.questions).toEqual([]);
      expect(clean.missing).toEqual([]);
      expect(clean.read.length).toBeGreaterThanOrEqual(printout.length - 3);
    });
    it(`${name}: with noise the case, the values read and the questions are the same`, () => {
      fc.assert(
        fc.property(interleave([...printout], noiseLine), (text) => {
          const noisy = parsePaste(text);
          expect(noisy.case).toEqual(clean.case);
          expect(valuesRead(noisy)).toEqual(valuesRead(clean));
          expect(noisy.questions).toEqual(clean.questions);
        }),
        { numRuns: RUNS },
      );
    });
    it(`${name}: with any lines at all, a value read is never replaced by a different one (it may be withdrawn, with a question)`, () => {
      fc.assert(
        fc.property(interleave([...printout], anyLine), (text) => {
          const noisy = parsePaste(text);
          for (const x of clean.read) {
            const now = noisy.read.find((y) => y.path === x.path);
            if (now)
              expect({ value: now.value, unit: now.unit }).toEqual({
                value: x.value,
                unit: x.unit,
              });
            else expect(noisy.questions.some((q) => q.path === x.path)).toBe(true);
          }
          if (noisy.case.sample !== clean.case.sample)
            expect(noisy.questions.some((q) => q.path === 'sample')).toBe(true);
        }),
        { numRuns: RUNS },
      );
    });
  }
});

// ---------- random text ----------

const LABEL_WORDS = [
  'pH',
  'PH',
  'pCO2',
  'PaCO2',
  'pO2',
  'PaO2',
  'HCO3',
  'cHCO3-(P)',
  'Std HCO3',
  'BE',
  'BE(B)',
  'SBE',
  'sO2',
  'SpO2',
  'O2Hb',
  'Hb',
  'ctHb',
  'Lac',
  'Glu',
  'Na+',
  'Na',
  'K',
  'K+',
  'Cl',
  'Alb',
  'Urea',
  'BUN',
  'Creat',
  'Cr',
  'Osm',
  'FiO2',
  'pH(T)',
  'PAO2',
  'Base deficit',
  'tCO2',
  'Ca++',
  'iCa',
  'Ca',
  'Mg',
  'PO4',
];
const UNIT_WORDS = [
  'mmHg',
  'kPa',
  'mmol/L',
  'mg/dL',
  'g/dL',
  'g/L',
  'µmol/L',
  '%',
  'mOsm/kg',
  'mm Hg',
  'mEq/L',
];
const OTHER = [
  ' ',
  '  ',
  ':',
  '=',
  '|',
  '\t',
  ', ',
  '\n',
  '\n',
  '/',
  ' / ',
  '(35-45)',
  '[7.35-7.45]',
  'H',
  'L',
  '*',
  'arterial',
  'venous',
  'the',
  'was',
  'at',
  '°C',
  '-',
  '+',
  '<',
  '.',
];

const numberText = fc.oneof(
  fc.integer({ min: 0, max: 999 }).map(String),
  fc
    .tuple(
      fc.integer({ min: 0, max: 200 }),
      fc.integer({ min: 0, max: 99 }),
      fc.constantFrom('.', ','),
    )
    .map(([a, b, sep]) => `${a}${sep}${String(b).padStart(2, '0')}`),
  fc
    .tuple(fc.integer({ min: 6, max: 7 }), fc.integer({ min: 0, max: 99 }))
    .map(([a, b]) => `${a}.${String(b).padStart(2, '0')}`),
  fc
    .tuple(
      fc.constantFrom('-', '+'),
      fc.integer({ min: 0, max: 30 }),
      fc.integer({ min: 0, max: 9 }),
    )
    .map(([s, a, b]) => `${s}${a}.${b}`),
);

const token = fc.oneof(
  { weight: 3, arbitrary: fc.constantFrom(...LABEL_WORDS) },
  { weight: 3, arbitrary: numberText },
  { weight: 2, arbitrary: fc.constantFrom(...UNIT_WORDS) },
  { weight: 3, arbitrary: fc.constantFrom(...OTHER) },
  { weight: 1, arbitrary: fc.string({ maxLength: 6 }).map((s) => s.replace(/[<>]/g, '')) },
);

const resultLikeText = fc.array(token, { maxLength: 60 }).map((tokens) => tokens.join(' '));

/** Every number written in the text, read with a decimal point or a decimal comma. */
function numbersIn(text: string): Set<number> {
  const out = new Set<number>();
  for (const m of text.replace(/[\u2212\u2013\u2014]/g, '-').matchAll(/\d+(?:[.,]\d+)?/g)) {
    out.add(Number(m[0].replace(',', '.')));
    for (const part of m[0].split(/[.,]/)) out.add(Number(part));
  }
  return out;
}

const caseNumbers = (c: CaseInput): number[] =>
  [c.gas, c.chemistry ?? {}, c.oxygen ?? {}, c.context ?? {}].flatMap((g) =>
    Object.values(g as Record<string, number>),
  );
const valueAt = (c: CaseInput, path: string): unknown =>
  path
    .split('.')
    .reduce<unknown>((node, key) => (node as Record<string, unknown> | undefined)?.[key], c);

describe('no text puts a number into the case that it does not contain', () => {
  const check = (text: string) => {
    const r = parsePaste(text);
    const written = numbersIn(text);
    // a value read from mEq/L is the written number over the ion's charge (the table's); any other is as written
    const fromMeq = new Map(r.read.filter((x) => x.written).map((x) => [x.value, x]));
    for (const v of caseNumbers(r.case)) {
      const x = fromMeq.get(v);
      if (x) {
        expect(x.written!.unit).toBe('mEq/L');
        expect(x.value * FIELD[x.path as FieldPath].charge!).toBeCloseTo(x.written!.value, 10);
        expect(written.has(Math.abs(x.written!.value))).toBe(true);
      } else expect(written.has(Math.abs(v))).toBe(true);
    }
    // what is read is what is in the case, and its source is in the text
    for (const x of r.read) {
      expect(valueAt(r.case, x.path)).toBe(x.value);
      expect(text.includes(x.sourceText.split(' / ')[0]!.split(' (column')[0]!)).toBe(true);
    }
    // a value that is asked about is not also filled
    for (const q of r.questions) {
      if (!q.path.includes('.') || q.path.startsWith('units')) continue;
      expect(valueAt(r.case, q.path)).toBeUndefined();
    }
  };

  it('random result-like text (labels, numbers, units, noise)', () => {
    fc.assert(fc.property(resultLikeText, check), { numRuns: RUNS });
  });

  it('random strings of any characters', () => {
    fc.assert(fc.property(fc.string({ unit: 'grapheme', maxLength: 200 }), check), {
      numRuns: RUNS,
    });
    fc.assert(fc.property(fc.string({ unit: 'binary', maxLength: 200 }), check), { numRuns: RUNS });
  });
});

describe('the shorthand never gives a number other than the one written', () => {
  it('with the unit written: exactly the four values', () => {
    const gas = fc.record({
      ph: fc.integer({ min: 680, max: 780 }).map((x) => x / 100),
      pco2: fc.integer({ min: 20, max: 120 }),
      po2: fc.integer({ min: 40, max: 500 }),
      hco3: fc.integer({ min: 4, max: 50 }),
    });
    fc.assert(
      fc.property(gas, ({ ph, pco2, po2, hco3 }) => {
        const r = parsePaste(`${ph.toFixed(2)}/${pco2}/${po2}/${hco3} mmHg`);
        expect(r.case.gas).toEqual({ ph, pco2, po2, hco3 });
        expect(r.case.units).toEqual({ pressure: 'mmHg' });
      }),
      { numRuns: RUNS },
    );
  });

  it('without a unit: each pressure is the number written, or is asked about', () => {
    const gas = fc.record({
      ph: fc.integer({ min: 680, max: 780 }).map((x) => x / 100),
      pco2: fc.integer({ min: 20, max: 1500 }).map((x) => x / 10),
      po2: fc.integer({ min: 20, max: 5000 }).map((x) => x / 10),
      hco3: fc.integer({ min: 4, max: 50 }),
    });
    fc.assert(
      fc.property(gas, ({ ph, pco2, po2, hco3 }) => {
        const r = parsePaste(`${ph.toFixed(2)}/${pco2}/${po2}/${hco3}`);
        for (const [key, value] of [
          ['pco2', pco2],
          ['po2', po2],
        ] as const) {
          const got = r.case.gas[key];
          if (got === undefined)
            expect(r.questions.some((q) => q.path === `gas.${key}`)).toBe(true);
          else expect(got).toBe(value);
        }
      }),
      { numRuns: RUNS },
    );
  });
});
