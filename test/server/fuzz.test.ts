// HTTP fuzz of every route through app.request (fast-check): random and hostile JSON, forms and bytes.
// Properties: never a 5xx; every JSON error is { ok: false, errors: [{ path, message }] }; no HTML response
// carries a payload unescaped (every '<' in it opens a tag the templates or the preview sanitiser write,
// no event-handler attribute, no script: URL, no evaluated template expression); the CSP is on every response.
// The XSS strings are the usual probes of OWASP's XSS filter-evasion cheat sheet (from memory), our own variants.
//
// Default run: a few seconds. The long run:  FUZZ_RUNS=10000 npx vitest run test/server/fuzz.test.ts
import { readFileSync, readdirSync } from 'node:fs';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { createApp } from '../../server/app.ts';
import { STATIC_FILES } from '../../server/static.ts';
import { LOINC_CODES } from '../../server/intake/index.ts';
import { BODY_LIMIT_BYTES } from '../../server/errors.ts';
import {
  CHEMISTRY_RANGES,
  CONTEXT_RANGES,
  GAS_RANGES,
  OXYGEN_RANGES,
  PATIENT_RANGES,
  VENTILATOR_RANGES,
  type Range,
} from '../calc/helpers.ts';
import { parseCase } from '../../calc/index.ts';
import { STEPS, STEP_IDS, contextOf, ownedPaths } from '../../views/steps.ts';

const RUNS = Number.parseInt(process.env.FUZZ_RUNS ?? '', 10) || 300;
const TIMEOUT = Math.max(60_000, RUNS * 60);
const app = createApp();

// ---------- hostile text ----------

const XSS = [
  '<script>alert(1)</script>',
  '"><img src=x onerror=alert(1)>',
  "'><svg onload=alert(1)>",
  'javascript:alert(1)',
  '{{7*7}}',
  '${7*7}',
  '</textarea><script>alert(1)</script>',
  '</title><script>alert(1)</script>',
  '<!--',
  '--><script>alert(1)</script>',
  '<scr<script>ipt>alert(1)</script>',
  '<<script>>alert(1)',
  '<a href="javascript:alert(1)">x</a>',
  '[x](javascript:alert(1))',
  '![x](javascript:alert(1))',
  '<javascript:alert(1)>',
  '<details open ontoggle=alert(1)>',
  '<math><mtext><table><mglyph><style><img src=x onerror=alert(1)>',
  '<iframe srcdoc="<script>alert(1)</script>">',
  '&lt;script&gt;alert(1)&lt;/script&gt;',
  '&#60;script&#62;alert(1)',
  '" hx-get="/healthz" hx-trigger="load" x="',
  "';alert(1);//",
  '\\"><script>alert(1)</script>',
  '```\n</code><script>alert(1)</script>\n```',
  '<style>*{color:red}</style>',
];
// template-injection probes whose evaluated result is a number no page or note ever shows
const SSTI_RESULT = String(1337 * 7331);
const SSTI = [
  '{{1337*7331}}',
  '${1337*7331}',
  '{% set x = 1337*7331 %}{{x}}',
  '<%= 1337*7331 %>',
  '#{1337*7331}',
  '{{ 1337*7331 | safe }}',
];
// never in an HTML response, whatever was sent: only an unescaped payload could put them there
const RAW_MARKERS = [
  '<script>alert(1)</script>',
  'onerror=alert(1)>',
  '<img src=x',
  '<svg onload',
  '</textarea><script>',
  'ontoggle=alert(1)>',
  '<iframe',
  '<style>',
];

const SPECIAL = [
  '\u202e',
  '\u202d',
  '\u200f',
  '\u200e',
  '\u200b',
  '\u200d',
  '\ufeff',
  '\u0000',
  '\r\n',
  '\u2028',
  '\u0301',
  '\ud800',
  '\udfff',
  '\ud83d',
  '\u{1F9EA}',
  '\uffff',
];
const PROTO_KEYS = [
  '__proto__',
  'constructor',
  'prototype',
  'toString',
  'valueOf',
  'hasOwnProperty',
  'then',
  'toJSON',
];

const xss = fc.constantFrom(...XSS, ...SSTI);
const text: fc.Arbitrary<string> = fc.oneof(
  { weight: 5, arbitrary: xss },
  { weight: 2, arbitrary: fc.string({ unit: 'binary', maxLength: 40 }) },
  { weight: 1, arbitrary: fc.string({ unit: 'grapheme', maxLength: 20 }) },
  {
    weight: 2,
    arbitrary: fc
      .array(fc.oneof(fc.constantFrom(...SPECIAL), xss, fc.string({ maxLength: 4 })), {
        maxLength: 6,
      })
      .map((a) => a.join('')),
  },
  { weight: 1, arbitrary: fc.constantFrom(...PROTO_KEYS) },
);
// very long: around the 64 KiB limit, either side
const longText = fc
  .tuple(
    fc.constantFrom('A', '<script>', '\u{1F600}', 'é', '\u200b'),
    fc.integer({ min: 1000, max: BODY_LIMIT_BYTES + 8000 }),
  )
  .map(([s, n]) => s.repeat(Math.ceil(n / s.length)));
const anyText = fc.oneof({ weight: 12, arbitrary: text }, { weight: 1, arbitrary: longText });
// numbers as a clinician (or an attacker) might type them
const numberText = fc.oneof(
  fc.constantFrom(
    '1e308',
    '-1e308',
    '5e-324',
    '-0',
    '0',
    'NaN',
    'Infinity',
    '-Infinity',
    ' 7.4 ',
    '7,4',
    '\u22127',
    '\uff17\uff0e\uff14',
    '0x10',
    '1_000',
    '+7.4',
    '.5',
    '5.',
    '\u0661\u0662',
    '9'.repeat(400),
    `0.${'0'.repeat(300)}1`,
    '7.4.1',
    '1e',
    '',
    ' ',
  ),
  fc.double().map(String),
  fc.integer().map(String),
);

// ---------- JSON with raw tokens (numbers JSON.stringify cannot write) ----------

/** Lone surrogate halves to U+FFFD, as a browser's encoder does (String#toWellFormed is ES2024). */
const wellFormed = (s: string) =>
  s.replace(/[\ud800-\udbff](?![\udc00-\udfff])|(?<![\ud800-\udbff])[\udc00-\udfff]/g, '\ufffd');

class Raw {
  constructor(readonly text: string) {}
}
function toJson(v: unknown): string {
  if (v instanceof Raw) return v.text;
  if (Array.isArray(v)) return `[${v.map(toJson).join(',')}]`;
  if (v !== null && typeof v === 'object')
    return `{${Object.entries(v)
      .map(([k, x]) => `${JSON.stringify(k)}:${toJson(x)}`)
      .join(',')}}`;
  return JSON.stringify(v) ?? 'null';
}
const rawNumber = fc
  .constantFrom(
    '-0',
    '1e308',
    '-1e308',
    '5e-324',
    '-5e-324',
    '1e999',
    '-1e999',
    '1e-400',
    '0e0',
    '1E2',
    '7.40000000000000000000001',
    '00',
    '01',
    'NaN',
    'Infinity',
    '-',
    '1.',
    '.1',
  )
  .map((t) => new Raw(t));
const deep = fc
  .tuple(fc.integer({ min: 1, max: 12_000 }), fc.constantFrom('[', '{"a":'))
  .map(
    ([d, open]) =>
      new Raw(
        open === '[' ? `${'['.repeat(d)}${']'.repeat(d)}` : `${'{"a":'.repeat(d)}1${'}'.repeat(d)}`,
      ),
  );
const weird: fc.Arbitrary<unknown> = fc.oneof(
  { weight: 3, arbitrary: rawNumber },
  { weight: 2, arbitrary: numberText },
  { weight: 3, arbitrary: anyText },
  {
    weight: 1,
    arbitrary: fc.constantFrom(
      1e308,
      -1e308,
      5e-324,
      -5e-324,
      Number.MAX_SAFE_INTEGER + 2,
      0,
      true,
      false,
      null,
      {},
      [],
    ),
  },
  { weight: 1, arbitrary: fc.double() },
  { weight: 1, arbitrary: fc.jsonValue({ maxDepth: 2 }) },
  { weight: 1, arbitrary: deep },
);
const key = fc.oneof(fc.constantFrom(...PROTO_KEYS), text, fc.string({ maxLength: 8 }));
const extras = fc.dictionary(key, weird, { maxKeys: 2 });
const sometimes = <T>(a: fc.Arbitrary<T>) =>
  fc.oneof({ weight: 6, arbitrary: a }, { weight: 1, arbitrary: weird });

// ---------- cases: mostly of the right shape, with a wrong type or a hostile value here and there ----------

const inRange = (r: Range) => fc.double({ min: r.min, max: r.max, noNaN: true });
const numbers = (ranges: Record<string, Range>) =>
  fc.record(
    Object.fromEntries(Object.entries(ranges).map(([k, r]) => [k, sometimes(inRange(r))])),
    { requiredKeys: [] },
  );
const oneOf = (...values: string[]) => sometimes(fc.constantFrom(...values));
const group = <T>(a: fc.Arbitrary<T>) =>
  fc.oneof(
    { weight: 8, arbitrary: a },
    { weight: 1, arbitrary: weird },
    { weight: 1, arbitrary: fc.tuple(a, extras).map(([g, x]) => ({ ...(g as object), ...x })) },
  );
const previous = fc.record(
  {
    takenAt: sometimes(fc.oneof(text, fc.constant('2026-03-02T04:10'))),
    label: sometimes(text),
    gas: group(numbers({ ph: GAS_RANGES.ph, pco2: GAS_RANGES.pco2, hco3: GAS_RANGES.hco3 })),
  },
  { requiredKeys: ['gas'] },
);

const caseArb = fc.record(
  {
    sample: oneOf('arterial', 'venous', 'capillary'),
    units: group(
      fc.record(
        {
          pressure: oneOf('mmHg', 'kPa'),
          albumin: oneOf('g/dL', 'g/L'),
          hb: oneOf('g/dL', 'g/L'),
          glucose: oneOf('mg/dL', 'mmol/L'),
          urea: oneOf('bun-mg/dL', 'urea-mmol/L'),
          creatinine: oneOf('mg/dL', 'umol/L'),
          ethanol: oneOf('mg/dL', 'mmol/L'),
        },
        { requiredKeys: [] },
      ),
    ),
    gas: group(numbers(GAS_RANGES)),
    chemistry: group(numbers(CHEMISTRY_RANGES)),
    patient: group(
      fc
        .tuple(
          numbers(PATIENT_RANGES),
          fc.record(
            { sex: oneOf('male', 'female'), pregnant: sometimes(fc.boolean()) },
            { requiredKeys: [] },
          ),
        )
        .map(([a, b]) => ({ ...a, ...b })),
    ),
    context: group(
      fc
        .tuple(
          numbers(CONTEXT_RANGES),
          fc.record(
            {
              timing: oneOf('acute', 'chronic', 'unknown'),
              baseline: group(
                numbers({ pco2: GAS_RANGES.pco2, hco3: GAS_RANGES.hco3, ph: GAS_RANGES.ph }),
              ),
            },
            { requiredKeys: [] },
          ),
        )
        .map(([a, b]) => ({ ...a, ...b })),
    ),
    oxygen: group(
      fc
        .tuple(
          numbers(OXYGEN_RANGES),
          fc.record(
            {
              fio2: sometimes(
                fc.oneof(
                  fc.double({ min: 0.21, max: 1, noNaN: true }),
                  fc.integer({ min: 21, max: 100 }),
                ),
              ),
            },
            { requiredKeys: [] },
          ),
        )
        .map(([a, b]) => ({ ...a, ...b })),
    ),
    ventilator: group(numbers(VENTILATOR_RANGES)),
    previous: sometimes(fc.array(previous, { maxLength: 3 })),
  },
  { requiredKeys: ['gas'] },
);
// all of the right shape and in range (the ones the core can read): the paths to a full note
const span = (min: number, max: number) => fc.double({ min, max, noNaN: true });
const plausible = fc.record(
  {
    sample: fc.constantFrom('arterial', 'venous', 'capillary'),
    units: fc.record({ pressure: fc.constant('mmHg') }),
    gas: fc.record(
      { ph: span(7.0, 7.65), pco2: span(18, 90), po2: span(40, 300), lactate: span(0.5, 12) },
      { requiredKeys: ['ph', 'pco2'] },
    ),
    chemistry: fc.record(
      { na: span(120, 160), k: span(2.5, 6.5), cl: span(85, 125), albumin: span(1.5, 5) },
      { requiredKeys: [] },
    ),
    context: fc.record({ timing: fc.constantFrom('acute', 'chronic', 'unknown') }),
    oxygen: fc.record({ fio2: span(0.21, 1), peep: span(0, 15) }, { requiredKeys: [] }),
    ventilator: fc.record(
      { vt: span(300, 700), rr: span(8, 35), targetPh: span(7.2, 7.45) },
      { requiredKeys: [] },
    ),
    patient: fc.record(
      { ageYears: span(18, 95), sex: fc.constantFrom('male', 'female'), heightCm: span(150, 200) },
      { requiredKeys: [] },
    ),
    previous: fc.array(previous, { maxLength: 2 }),
  },
  { requiredKeys: ['gas'] },
);
const topLevel = fc.oneof(
  { weight: 6, arbitrary: caseArb },
  { weight: 3, arbitrary: plausible },
  { weight: 1, arbitrary: fc.tuple(caseArb, extras).map(([c, x]) => ({ ...c, ...x })) },
  { weight: 1, arbitrary: fc.jsonValue() },
  { weight: 1, arbitrary: fc.object() },
  { weight: 1, arbitrary: weird },
);

// FHIR R4: Observations with LOINC codes we read, wrong types and hostile strings in every field
const fhirValue = fc.record(
  {
    value: sometimes(fc.double({ min: -10, max: 800, noNaN: true })),
    unit: sometimes(text),
    system: oneOf('http://unitsofmeasure.org', 'urn:x'),
    code: oneOf('mm[Hg]', 'kPa', 'mmol/L', '[pH]', '1', '%', 'g/dL', 'g/L', 'mm[hg]'),
    comparator: fc.constantFrom('<', '>='),
  },
  { requiredKeys: [] },
);
const observation = fc.record(
  {
    resourceType: oneOf('Observation', 'Patient'),
    id: sometimes(fc.string({ maxLength: 6 })),
    status: oneOf('final', 'amended', 'preliminary', 'cancelled'),
    code: group(
      fc.record(
        {
          coding: sometimes(
            fc.array(
              group(
                fc.record(
                  {
                    system: oneOf('http://loinc.org'),
                    code: sometimes(
                      fc.constantFrom(...LOINC_CODES.map((c) => c.code), '59408-5', '24336-0'),
                    ),
                    display: sometimes(text),
                  },
                  { requiredKeys: [] },
                ),
              ),
              { maxLength: 2 },
            ),
          ),
          text: sometimes(text),
        },
        { requiredKeys: [] },
      ),
    ),
    effectiveDateTime: sometimes(fc.oneof(text, fc.constant('2026-03-02T04:10:00Z'))),
    valueQuantity: group(fhirValue),
    dataAbsentReason: weird,
    component: sometimes(
      fc.array(
        group(fc.record({ code: weird, valueQuantity: group(fhirValue) }, { requiredKeys: [] })),
        { maxLength: 2 },
      ),
    ),
    hasMember: sometimes(fc.array(fc.record({ reference: sometimes(text) }), { maxLength: 2 })),
  },
  { requiredKeys: ['resourceType', 'code', 'status'] },
);
const fhirArb = fc.oneof(
  fc.record({
    resourceType: oneOf('Bundle'),
    type: oneOf('collection', 'searchset', 'transaction', 'document'),
    entry: sometimes(
      fc.array(
        group(
          fc.record(
            { fullUrl: sometimes(text), resource: group(observation), request: weird },
            { requiredKeys: [] },
          ),
        ),
        { maxLength: 6 },
      ),
    ),
  }),
  fc.array(group(observation), { maxLength: 5 }),
  observation,
  fc.jsonValue(),
  fc.object(),
  weird,
);

// ---------- bytes: valid UTF-8, or with invalid sequences spliced in (lone surrogate halves, overlongs, truncations) ----------

const BAD_BYTES = [
  [0xff],
  [0xfe],
  [0x80],
  [0xc0, 0x80],
  [0xed, 0xa0, 0x80],
  [0xed, 0xbf, 0xbf],
  [0xe2, 0x82],
  [0xf4, 0x90, 0x80, 0x80],
  [0xf8, 0x88, 0x80, 0x80, 0x80],
];
const corruption = fc.array(fc.tuple(fc.nat(), fc.constantFrom(...BAD_BYTES)), { maxLength: 3 });
function spliced(textBody: string, cuts: [number, number[]][]): Uint8Array<ArrayBuffer> {
  let bytes: Uint8Array<ArrayBuffer> = new Uint8Array(new TextEncoder().encode(textBody));
  for (const [at, bad] of cuts) {
    const i = bytes.length ? at % (bytes.length + 1) : 0;
    const next = new Uint8Array(bytes.length + bad.length);
    next.set(bytes.subarray(0, i));
    next.set(bad, i);
    next.set(bytes.subarray(i), i + bad.length);
    bytes = next;
  }
  return bytes;
}
const body = (s: string, cuts: [number, number[]][]) => (cuts.length ? spliced(s, cuts) : s);

// ---------- the form posts ----------

const FIELD_NAMES = [
  ...new Set(
    (['arterial', 'venous', 'capillary'] as const).flatMap((sample) =>
      STEP_IDS.flatMap((id) =>
        ownedPaths(
          STEPS[id].groups(contextOf({ sample, ventilator: {}, patient: { sex: 'female' } }, true)),
        ),
      ),
    ),
  ),
];
const META = [
  'step',
  'action',
  'open',
  'done',
  'format',
  'note',
  'handover',
  'unitAsked',
  'ventilated',
  'paste',
  'pasteRead',
  'when',
  'sample',
];

// invented patients: a metabolic acidosis on air, a ventilated acute respiratory acidosis, a venous gas in kPa
const BASES: Record<string, unknown>[] = [
  {
    sample: 'arterial',
    units: { pressure: 'mmHg' },
    gas: { ph: 7.22, pco2: 21, po2: 96, hco3: 8.5, lactate: 6.1 },
    chemistry: { na: 137, k: 4.9, cl: 100, albumin: 3.2 },
    oxygen: { fio2: 0.21 },
    patient: { ageYears: 47, pregnant: false },
  },
  {
    sample: 'arterial',
    gas: { ph: 7.26, pco2: 62, po2: 71, hco3: 27 },
    context: { timing: 'acute' },
    oxygen: { fio2: 0.5, peep: 8 },
    ventilator: { vt: 480, rr: 14, pplat: 26, targetPh: 7.32 },
    patient: { ageYears: 66, sex: 'male', heightCm: 171 },
  },
  {
    sample: 'venous',
    units: { pressure: 'kPa' },
    gas: { ph: 7.47, pco2: 4.3, hco3: 23 },
    oxygen: {},
    patient: { ageYears: 30, sex: 'female' },
  },
];
const prior = fc
  .array(
    fc.record({
      takenAt: text,
      label: text,
      gas: fc.record({ ph: fc.constantFrom(7.1, 7.3, 7.45), pco2: fc.constantFrom(30, 45, 70) }),
    }),
    { minLength: 1, maxLength: 2 },
  )
  .map((list) =>
    list.map((p) => ({ ...p, takenAt: p.takenAt.slice(0, 40), label: p.label.slice(0, 80) })),
  );
const validState = fc
  .record({
    base: fc.constantFrom(...BASES),
    previous: fc.option(prior, { nil: undefined }),
    done: fc.oneof(fc.constant([...STEP_IDS] as string[]), fc.subarray([...STEP_IDS] as string[])),
    format: fc.constantFrom('text', 'markdown'),
  })
  .map(({ base, previous: p, done, format }) => {
    // earlier gases in the base case's own pressure unit
    const kpa = (base.units as { pressure?: string } | undefined)?.pressure === 'kPa';
    const earlier = p?.map((g) =>
      kpa ? { ...g, gas: { ...g.gas, pco2: Math.round(g.gas.pco2 * 1.333) / 10 } } : g,
    );
    return {
      case: JSON.stringify(earlier ? { ...base, previous: earlier } : base),
      done: done.join(' '),
      format,
    };
  });
const junkState = fc.record(
  {
    case: fc.oneof(
      text,
      topLevel.map(toJson),
      fc.constant(''),
      fc.constant('{"sample":"arterial"}'),
      fc.dictionary(key, weird, { maxKeys: 2 }).map(toJson),
    ),
    done: fc.oneof(
      text,
      fc.subarray([...STEP_IDS] as string[]).map((d) => d.join(',')),
    ),
    format: fc.oneof(text, fc.constant('markdown')),
  },
  { requiredKeys: [] },
);

const fieldValue = fc.oneof(
  anyText,
  numberText,
  fc.constantFrom(
    'yes',
    'no',
    'next',
    'skip',
    'read',
    'confirm',
    'cancel',
    'mmHg',
    'kPa',
    'g/L',
    'arterial',
    'venous',
    'markdown',
    ...STEP_IDS,
  ),
);

// pasted text: printout-like lines (our own invented layout) with hostile labels, numbers and units, the
// shorthand pH/PaCO2/PaO2/HCO3, FHIR JSON, or anything
const printLine = fc
  .tuple(
    fc.oneof(
      fc.constantFrom(
        'pH',
        'pCO2',
        'pO2',
        'HCO3',
        'cHCO3-',
        'BE',
        'Na+',
        'K+',
        'Cl-',
        'Lac',
        'Glu',
        'sO2',
        'ctHb',
        'FiO2',
        'Sample type:',
        'Specimen:',
      ),
      text,
    ),
    fc.oneof(numberText, fc.constantFrom('arterial', 'venous', 'capillary')),
    fc.oneof(fc.constantFrom('mmHg', 'kPa', 'mmol/L', '%', 'g/dL', 'mg/dL', ''), text),
  )
  .map((parts) => parts.join(fc.sample(fc.constantFrom(' ', '  ', '\t', ': '), 1)[0]));
// a readable invented printout, with hostile lines mixed in
const readable = fc
  .tuple(
    fc.constantFrom('arterial', 'venous'),
    fc.double({ min: 7.1, max: 7.55, noNaN: true }),
    fc.integer({ min: 25, max: 70 }),
    fc.array(fc.oneof(xss, text), { maxLength: 3 }),
  )
  .map(([sample, ph, pco2, noise]) =>
    [`Sample type: ${sample}`, `pH ${ph.toFixed(2)}`, `pCO2 ${pco2} mmHg`, ...noise].join('\n'),
  );
const pasted = fc.oneof(
  { weight: 3, arbitrary: readable },
  {
    weight: 4,
    arbitrary: fc.array(printLine, { minLength: 1, maxLength: 12 }).map((l) => l.join('\n')),
  },
  {
    weight: 2,
    arbitrary: fc
      .tuple(numberText, numberText, numberText, numberText, text)
      .map((n) => n.join('/')),
  },
  { weight: 2, arbitrary: fhirArb.map(toJson) },
  { weight: 2, arbitrary: anyText },
  { weight: 1, arbitrary: topLevel.map(toJson) },
);
// one step answered from a valid state, its own fields typed with numbers and payloads: what is typed comes back
const stepFields = (id: (typeof STEP_IDS)[number]) => [
  ...new Set(
    (['arterial', 'venous'] as const).flatMap((sample) =>
      ownedPaths(
        STEPS[id].groups(contextOf({ sample, ventilator: {}, patient: { sex: 'female' } }, true)),
      ),
    ),
  ),
];
const answerArb = fc
  .constantFrom(...STEP_IDS)
  .chain((step) =>
    fc.record({
      state: validState,
      step: fc.constant(step),
      action: fc.constantFrom('next', 'skip'),
      fields: fc.dictionary(
        fc.constantFrom(...stepFields(step), 'ventilated'),
        fc.oneof(numberText, text, fc.constantFrom('7.4', '40', 'yes', 'no', 'mmHg', 'kPa')),
        { minKeys: 1, maxKeys: 6 },
      ),
    }),
  )
  .map(
    ({ state, step, action, fields }) =>
      ({ ...state, step, action, ...fields }) as Record<string, string>,
  );
const anyForm = fc
  .record({
    state: fc.oneof({ weight: 3, arbitrary: validState }, { weight: 2, arbitrary: junkState }),
    fields: fc.dictionary(fc.constantFrom(...FIELD_NAMES, ...META), fieldValue, { maxKeys: 8 }),
    step: fc.oneof(fc.constantFrom(...STEP_IDS), text),
    stray: fc.dictionary(key, text, { maxKeys: 2 }),
  })
  .map(
    ({ state, fields, step, stray }) =>
      ({ ...stray, ...state, step, ...fields }) as Record<string, string>,
  );
const formArb = fc.oneof(anyForm, answerArb);

type Encoding =
  | 'urlencoded'
  | 'multipart'
  | 'raw-urlencoded'
  | 'raw-multipart'
  | 'broken-multipart';
/** Well-formed multipart (a browser's encoding of names), its values as raw bytes. */
function multipart(
  fields: Record<string, string>,
  cuts: [number, number[]][],
  boundary = 'fuzz0boundary',
): Uint8Array<ArrayBuffer> {
  const enc = new TextEncoder();
  const parts: Uint8Array[] = [];
  const esc = (s: string) => s.replace(/"/g, '%22').replace(/\r/g, '%0D').replace(/\n/g, '%0A');
  Object.entries(fields).forEach(([name, value], i) => {
    const file = i === 0 && cuts.length > 1 ? '; filename="x.txt"' : '';
    parts.push(
      enc.encode(
        `--${boundary}\r\nContent-Disposition: form-data; name="${esc(name)}"${file}\r\n\r\n`,
      ),
    );
    parts.push(cuts.length ? spliced(value, cuts) : enc.encode(value), enc.encode('\r\n'));
  });
  parts.push(enc.encode(`--${boundary}--\r\n`));
  const out = new Uint8Array(parts.reduce((n, p) => n + p.length, 0));
  parts.reduce((at, p) => {
    out.set(p, at);
    return at + p.length;
  }, 0);
  return out;
}
function formRequest(
  fields: Record<string, string>,
  encoding: Encoding,
  cuts: [number, number[]][],
): { headers: Record<string, string>; body: BodyInit } {
  if (encoding === 'urlencoded')
    return {
      headers: { 'content-type': 'application/x-www-form-urlencoded' },
      body: new URLSearchParams(fields).toString(),
    };
  if (encoding === 'raw-urlencoded') {
    // percent-encoded bad bytes, invalid escapes and raw bytes
    const tail = (k: string) => (k === 'case' ? '' : '%ED%A0%80%FF%E2%82%ZZ%');
    const raw = Object.entries(fields)
      .map(
        ([k, v]) =>
          `${encodeURIComponent(wellFormed(k))}=${encodeURIComponent(wellFormed(v))}${tail(k)}`,
      )
      .join('&');
    return {
      headers: { 'content-type': 'application/x-www-form-urlencoded; charset=utf-8' },
      body: spliced(raw, cuts),
    };
  }
  if (encoding === 'multipart') {
    const fd = new FormData();
    for (const [k, v] of Object.entries(fields)) fd.append(k, v);
    return { headers: {}, body: fd };
  }
  if (encoding === 'broken-multipart') {
    // no boundary, a boundary the body does not use, or a body cut short: a 400, never a 500
    const variants = [
      'multipart/form-data',
      'multipart/form-data; boundary=other',
      'multipart/form-data; boundary=fuzz0boundary',
    ];
    const body = multipart(fields, cuts);
    return {
      headers: { 'content-type': variants[cuts.length % 3]! },
      body: cuts.length % 3 === 2 ? body.slice(0, Math.max(1, body.length >> 1)) : body,
    };
  }
  return {
    headers: { 'content-type': 'multipart/form-data; boundary=fuzz0boundary' },
    body: multipart(fields, cuts),
  };
}

// ---------- the checks ----------

const VIEWS = new URL('../../views/', import.meta.url);
// every tag the page's templates and view modules write (the H+/CO2 chart is SVG built in views/chart*.ts)
const TEMPLATE_TAGS = new Set(
  readdirSync(VIEWS)
    .filter((f) => f.endsWith('.njk') || f.endsWith('.ts'))
    .flatMap((f) =>
      [...readFileSync(new URL(f, VIEWS), 'utf8').matchAll(/<\/?([a-zA-Z][a-zA-Z0-9-]*)/g)].map(
        (m) => m[1]!.toLowerCase(),
      ),
    ),
);
// the tags the Markdown preview's sanitiser lets through (views/render.ts, markdownPreview)
const PREVIEW_TAGS = [
  'p',
  'br',
  'strong',
  'em',
  'b',
  'i',
  'ul',
  'ol',
  'li',
  'h1',
  'h2',
  'h3',
  'h4',
  'h5',
  'h6',
  'blockquote',
  'code',
  'pre',
  'hr',
  'table',
  'thead',
  'tbody',
  'tr',
  'th',
  'td',
  'del',
];
const ALLOWED_TAGS = new Set([...TEMPLATE_TAGS, ...PREVIEW_TAGS]);
const URL_ATTRIBUTES = new Set([
  'href',
  'src',
  'action',
  'formaction',
  'hx-get',
  'hx-post',
  'hx-put',
  'hx-delete',
  'hx-patch',
  'poster',
  'data',
  'xlink:href',
]);
const decodeEntities = (s: string) =>
  s
    .replace(/&#x([0-9a-f]+);?/gi, (_, h) => String.fromCodePoint(Number.parseInt(h, 16)))
    .replace(/&#(\d+);?/g, (_, d) => String.fromCodePoint(Number(d)))
    .replace(/&quot;/g, '"')
    .replace(/&#39;|&apos;/g, "'")
    .replace(/&lt;/g, '<')
    .replace(/&gt;/g, '>')
    .replace(/&amp;/g, '&');

const START_TAG =
  /<([a-zA-Z][a-zA-Z0-9-]*)((?:\s+[^\s"'>/=]+(?:\s*=\s*(?:"[^"]*"|'[^']*'|[^\s"'=<>`]+))?)*)\s*\/?>/y;
const END_TAG = /<\/([a-zA-Z][a-zA-Z0-9-]*)\s*>/y;
const ATTRIBUTE = /\s+([^\s"'>/=]+)(?:\s*=\s*(?:"([^"]*)"|'([^']*)'|([^\s"'=<>`]+)))?/g;

/** Why this HTML could run or inject something sent to it, or null when it cannot. */
export function htmlProblem(html: string): string | null {
  for (const marker of RAW_MARKERS)
    if (html.includes(marker)) return `raw payload ${JSON.stringify(marker)}`;
  if (html.includes(SSTI_RESULT)) return 'an evaluated template expression';
  const counts: Record<string, number> = {};
  for (let i = html.indexOf('<'); i !== -1; i = html.indexOf('<', i + 1)) {
    if (i === 0 && html.startsWith('<!doctype html>')) continue;
    START_TAG.lastIndex = i;
    END_TAG.lastIndex = i;
    const start = START_TAG.exec(html);
    const end = start ? null : END_TAG.exec(html);
    if (!start && !end) return `an unescaped "<" at ${i}: ${JSON.stringify(html.slice(i, i + 40))}`;
    const name = (start ?? end)![1]!.toLowerCase();
    if (!ALLOWED_TAGS.has(name)) return `a <${name}> tag no template writes`;
    counts[`${start ? '' : '/'}${name}`] = (counts[`${start ? '' : '/'}${name}`] ?? 0) + 1;
    if (!start) continue;
    for (const a of start[2]!.matchAll(ATTRIBUTE)) {
      const attribute = a[1]!.toLowerCase();
      const value = decodeEntities(a[2] ?? a[3] ?? a[4] ?? '').replace(/[\s\u0000-\u001f]+/g, '');
      if (attribute.startsWith('on')) return `an event-handler attribute ${attribute} on <${name}>`;
      if (URL_ATTRIBUTES.has(attribute) && /^(javascript|vbscript|data):/i.test(value))
        return `a script URL in ${attribute}`;
      if (
        name === 'script' &&
        !(attribute === 'src' && value.startsWith('/static/')) &&
        attribute !== 'defer'
      )
        return 'a script that is not one of our files';
    }
  }
  for (const raw of ['textarea', 'title', 'script']) {
    if ((counts[raw] ?? 0) !== (counts[`/${raw}`] ?? 0))
      return `<${raw}> opened ${counts[raw] ?? 0} times and closed ${counts[`/${raw}`] ?? 0}`;
  }
  return null;
}

/** The state a page carries in its hidden fields, as a browser would post it back. */
function hiddenState(html: string): Record<string, string> {
  const out: Record<string, string> = {};
  for (const name of ['case', 'done', 'format']) {
    const m = html.match(new RegExp(`<input type="hidden" name="${name}" value="([^"]*)"`));
    if (m) out[name] = decodeEntities(m[1]!);
  }
  return out;
}

// escaped forms of the payloads: seen in a page, they show the payloads did reach the HTML (and were escaped)
const ESCAPED_ECHOES = [
  '&lt;script&gt;alert(1)&lt;/script&gt;',
  'onerror=alert(1)&gt;',
  '&lt;/textarea&gt;',
  '&lt;svg onload=alert(1)&gt;',
];
interface Seen {
  statuses: Map<number, number>;
  echoes: number;
}
const seen = (): Seen => ({ statuses: new Map(), echoes: 0 });

/** Send one request and check what every response must be. */
async function check(
  path: string,
  init: RequestInit,
  s: Seen,
): Promise<{ status: number; type: string; text: string }> {
  const res = await app.request(path, init);
  const text = await res.text();
  const type = res.headers.get('content-type') ?? '';
  const where = `${init.method ?? 'GET'} ${path.slice(0, 80)} -> ${res.status} ${type}`;
  s.statuses.set(res.status, (s.statuses.get(res.status) ?? 0) + 1);
  if (res.status >= 500) throw new Error(`${where}: a server error: ${text.slice(0, 300)}`);
  const csp = res.headers.get('content-security-policy') ?? '';
  if (
    !csp.includes("default-src 'self'") ||
    !csp.includes("script-src 'self'") ||
    /unsafe-inline|unsafe-eval/.test(csp)
  )
    throw new Error(`${where}: CSP missing or weak: ${csp}`);
  if (res.headers.get('x-content-type-options') !== 'nosniff')
    throw new Error(`${where}: no nosniff`);
  if (text.includes(SSTI_RESULT)) throw new Error(`${where}: an evaluated template expression`);
  if (init.method === 'HEAD') {
    if (text.length) throw new Error(`${where}: a body on HEAD`);
  } else if (type.startsWith('application/json')) {
    let json: { ok?: unknown; errors?: unknown };
    try {
      json = JSON.parse(text);
    } catch {
      throw new Error(`${where}: JSON content type, body not JSON`);
    }
    if (res.status >= 400 || json.ok !== true) {
      const errors = json.errors;
      if (json.ok !== false || !Array.isArray(errors) || errors.length === 0)
        throw new Error(
          `${where}: an error without ok:false and a list of errors: ${text.slice(0, 300)}`,
        );
      for (const e of errors as { path?: unknown; message?: unknown }[]) {
        if (typeof e?.path !== 'string' || !e.path || typeof e.message !== 'string' || !e.message)
          throw new Error(
            `${where}: an error without path and message: ${JSON.stringify(e).slice(0, 200)}`,
          );
      }
    }
  } else if (type.startsWith('text/html')) {
    const problem = htmlProblem(text);
    if (problem) throw new Error(`${where}: ${problem}`);
    if (ESCAPED_ECHOES.some((e) => text.includes(e))) s.echoes++;
  } else if (text.length) {
    // nothing else may carry a body the browser would render: only our static files
    if (!Object.values(STATIC_FILES).some((f) => f.type === type))
      throw new Error(`${where}: an unexpected content type`);
  }
  return { status: res.status, type, text };
}

const run = <Ts extends [unknown, ...unknown[]]>(property: fc.IAsyncPropertyWithHooks<Ts>) =>
  fc.assert(property, { numRuns: RUNS });
const htmx = fc.option(fc.constantFrom('true', 'false', '1'), { nil: undefined });
const query = fc
  .dictionary(
    fc.oneof(fc.constantFrom('format', 'sample', 'step', 'case'), text),
    fc.oneof(text, fc.constantFrom('markdown', 'arterial')),
    { maxKeys: 3 },
  )
  .map((q) => {
    const s = new URLSearchParams(
      Object.entries(q).map(([k, v]) => [wellFormed(k), wellFormed(v)]),
    ).toString();
    return s ? `?${s}` : '';
  });
const origin = fc.oneof(
  { weight: 5, arbitrary: fc.constant(undefined) },
  {
    weight: 1,
    arbitrary: fc.record(
      {
        origin: fc.constantFrom(
          'http://localhost',
          'https://attacker.example',
          'null',
          'http://localhost:3000',
        ),
        'sec-fetch-site': fc.constantFrom('same-origin', 'cross-site', 'none', 'same-site'),
      },
      { requiredKeys: [] },
    ),
  },
);

// ---------- the properties ----------

describe('the fixtures and the checker', () => {
  it('the invented base cases pass the schema, so the draft generator starts from valid states', () => {
    for (const base of BASES) expect(parseCase(base).ok).toBe(true);
  });

  it('finds an unescaped payload, a foreign tag, a handler, a script URL and a broken textarea', () => {
    expect(
      htmlProblem(
        '<p>&lt;script&gt;alert(1)&lt;/script&gt; &quot;&gt;&lt;img src=x onerror=alert(1)&gt;</p>',
      ),
    ).toBeNull();
    expect(htmlProblem('<p><script>alert(1)</script></p>')).toMatch(/raw payload/);
    expect(htmlProblem('<p>"><img src=y onerror=alert(2)></p>')).toMatch(/img/);
    expect(htmlProblem('<p a="b" onclick="x">z</p>')).toMatch(/event-handler/);
    expect(htmlProblem('<a href=" java&#115;cript:alert(1)">x</a>')).toMatch(/script URL/);
    expect(htmlProblem('<textarea>x</textarea></textarea>')).toMatch(/textarea/);
    expect(htmlProblem('<p>1 < 2</p>')).toMatch(/unescaped/);
    expect(htmlProblem(`<p>${SSTI_RESULT}</p>`)).toMatch(/template/);
  });
});

describe('found by this fuzz, fixed, pinned', () => {
  it('an unknown field with an empty name gets an error whose path names it (calc/schema.ts toFieldErrors)', async () => {
    const res = await app.request('/api/interpret', {
      method: 'POST',
      headers: { 'content-type': 'application/json' },
      body: '{"gas":{"ph":7.4,"pco2":40,"":1},"":null}',
    });
    expect(res.status).toBe(422);
    const paths = ((await res.json()) as { errors: { path: string }[] }).errors
      .map((e) => e.path)
      .sort();
    expect(paths).toEqual(['""', 'gas.""']);
  });
});

describe('HTTP fuzz: never a 5xx, errors in the contract shape, no payload unescaped, CSP everywhere', () => {
  it('GET, HEAD and other methods on every path (pages, health, static files, unknown paths) with hostile queries', {
    timeout: TIMEOUT,
  }, async () => {
    const s = seen();
    const paths = [
      '/',
      '/healthz',
      ...Object.keys(STATIC_FILES),
      '/step',
      '/open',
      '/preview',
      '/api/interpret',
      '/static/',
      '/static/../server/app.ts',
      '/%2e%2e/package.json',
      '/%ZZ%E0%A4%A',
      '//healthz',
    ];
    await run(
      fc.asyncProperty(
        fc.constantFrom('GET', 'GET', 'GET', 'HEAD', 'POST', 'PUT', 'DELETE', 'PATCH', 'OPTIONS'),
        fc.oneof(
          fc.constantFrom(...paths),
          text.map((t) => `/${encodeURIComponent(wellFormed(t))}`),
          text.map((t) => `/static/${encodeURI(wellFormed(t))}`),
        ),
        query,
        htmx,
        fc.option(fc.constantFrom('*', '"abc"', 'W/"x"'), { nil: undefined }),
        async (method, path, q, hx, etag) => {
          const headers: Record<string, string> = {
            ...(hx ? { 'hx-request': hx } : {}),
            ...(etag ? { 'if-none-match': etag } : {}),
          };
          await check(path + q, { method, headers }, s);
        },
      ),
    );
    expect(s.statuses.get(200)).toBeGreaterThan(0);
    expect(s.statuses.get(404)).toBeGreaterThan(0);
  });

  it('POST /api/interpret as application/json: cases with wrong types, extreme numbers, deep nesting, bad bytes', {
    timeout: TIMEOUT,
  }, async () => {
    const s = seen();
    await run(
      fc.asyncProperty(
        topLevel,
        corruption,
        query,
        fc.constantFrom(
          'application/json',
          'application/json; charset=utf-8',
          'Application/JSON',
          'application/json;charset=latin1',
        ),
        async (c, cuts, q, type) => {
          const got = await check(
            `/api/interpret${q}`,
            { method: 'POST', headers: { 'content-type': type }, body: body(toJson(c), cuts) },
            s,
          );
          expect([200, 400, 413, 422]).toContain(got.status);
          if (got.status === 200) expect(typeof JSON.parse(got.text).note.text).toBe('string');
        },
      ),
    );
    expect(s.statuses.get(200)).toBeGreaterThan(0);
    expect(s.statuses.get(422)).toBeGreaterThan(0);
  });

  it('POST /api/interpret as application/fhir+json: Bundles, lists and Observations with hostile fields', {
    timeout: TIMEOUT,
  }, async () => {
    const s = seen();
    await run(
      fc.asyncProperty(fhirArb, corruption, query, async (payload, cuts, q) => {
        const got = await check(
          `/api/interpret${q}`,
          {
            method: 'POST',
            headers: { 'content-type': 'application/fhir+json' },
            body: body(toJson(payload), cuts),
          },
          s,
        );
        expect([200, 400, 413, 422]).toContain(got.status);
      }),
    );
    expect(s.statuses.get(422)).toBeGreaterThan(0);
  });

  it('POST /api/interpret with another content type or none: 415, never a 5xx', {
    timeout: TIMEOUT,
  }, async () => {
    const s = seen();
    await run(
      fc.asyncProperty(
        fc.oneof(
          fc.constantFrom(
            'text/plain',
            'application/x-www-form-urlencoded',
            'multipart/form-data',
            'application/xml',
            'application/jsonp',
            'json',
            '',
          ),
          fc.stringMatching(/^[ -~]{0,40}$/),
        ),
        fc.oneof(topLevel.map(toJson), text),
        corruption,
        async (type, payload, cuts) => {
          const got = await check(
            '/api/interpret',
            {
              method: 'POST',
              headers: type ? { 'content-type': type } : {},
              body: body(payload, cuts),
            },
            s,
          );
          const media = type.split(';')[0]!.trim().toLowerCase();
          if (media !== 'application/json' && media !== 'application/fhir+json')
            expect([413, 415]).toContain(got.status);
        },
      ),
    );
  });

  it('POST /step, /open and /preview: forms (urlencoded, multipart, raw bytes) with payloads in every field and in the hidden case', {
    timeout: TIMEOUT,
  }, async () => {
    const s = seen();
    await run(
      fc.asyncProperty(
        fc.constantFrom('/step', '/open', '/preview'),
        formArb,
        fc.constantFrom<Encoding>(
          'urlencoded',
          'multipart',
          'raw-urlencoded',
          'raw-multipart',
          'broken-multipart',
        ),
        corruption,
        htmx,
        origin,
        query,
        async (path, fields, encoding, cuts, hx, from, q) => {
          const req = formRequest(fields, encoding, cuts);
          const got = await check(
            path + q,
            {
              method: 'POST',
              headers: { ...req.headers, ...(hx ? { 'hx-request': hx } : {}), ...from },
              body: req.body,
            },
            s,
          );
          expect([200, 400, 403, 413, 415, 422]).toContain(got.status);
        },
      ),
    );
    for (const status of [200, 400, 422])
      expect(s.statuses.get(status), `status ${status} reached`).toBeGreaterThan(0);
    expect(s.echoes, 'payloads reach the HTML').toBeGreaterThan(0);
  });

  it('POST /paste: read, then confirm what was read with hostile answers to its questions', {
    timeout: TIMEOUT,
  }, async () => {
    const s = seen();
    let confirmed = 0;
    await run(
      fc.asyncProperty(
        pasted,
        fc.oneof(
          { weight: 4, arbitrary: fc.constant({}) },
          { weight: 1, arbitrary: junkState },
          { weight: 1, arbitrary: validState },
        ),
        fc.constantFrom<Encoding>('urlencoded', 'multipart'),
        htmx,
        fc.array(
          fc.option(fc.oneof(fieldValue, fc.constant('leave-out')), { nil: undefined, freq: 2 }),
          { maxLength: 6 },
        ),
        async (paste, state, encoding, hx, answers) => {
          const headers: Record<string, string> = hx === 'true' ? { 'hx-request': 'true' } : {};
          const read = formRequest({ ...state, paste, action: 'read' }, encoding, []);
          const first = await check(
            '/paste',
            { method: 'POST', headers: { ...read.headers, ...headers }, body: read.body },
            s,
          );
          const fingerprint = first.text.match(/name="pasteRead" value="([^"]*)"/)?.[1];
          if (!fingerprint) return;
          // answer each question the page asked, with one of its options or with something else
          const names = [
            ...new Set(
              [...first.text.matchAll(/<input type="radio" id="[^"]*" name="([^"]*)"/g)].map(
                (m) => m[1]!,
              ),
            ),
          ];
          const given = Object.fromEntries(
            names.map((n, i) => [
              n,
              answers[i] ??
                first.text.match(
                  new RegExp(`name="${n.replace(/[.*+?^${}()|[\]\\]/g, '\\$&')}" value="([^"]*)"`),
                )?.[1] ??
                '',
            ]),
          );
          const confirm = formRequest(
            {
              ...hiddenState(first.text),
              paste,
              pasteRead: fingerprint,
              action: 'confirm',
              ...given,
            },
            encoding,
            [],
          );
          const second = await check(
            '/paste',
            { method: 'POST', headers: { ...confirm.headers, ...headers }, body: confirm.body },
            s,
          );
          if (second.status === 200) confirmed++;
        },
      ),
    );
    expect(s.statuses.get(200), 'a paste read').toBeGreaterThan(0);
    expect(s.statuses.get(422), 'a paste refused').toBeGreaterThan(0);
    expect(confirmed, 'a paste confirmed').toBeGreaterThan(0);
    expect(s.echoes, 'payloads reach the HTML').toBeGreaterThan(0);
  });

  it('POST /followup: the current gas becomes an earlier one, with a hostile time or label', {
    timeout: TIMEOUT,
  }, async () => {
    const s = seen();
    let moved = 0;
    await run(
      fc.asyncProperty(
        fc.oneof({ weight: 4, arbitrary: validState }, { weight: 1, arbitrary: junkState }),
        fc.oneof(text, longText, fc.constant('2026-03-02T04:10'), numberText),
        fc.constantFrom<Encoding>('urlencoded', 'multipart', 'raw-urlencoded'),
        corruption,
        htmx,
        async (state, when, encoding, cuts, hx) => {
          const req = formRequest(
            { ...state, when },
            encoding,
            encoding === 'raw-urlencoded' ? cuts : [],
          );
          const got = await check(
            '/followup',
            {
              method: 'POST',
              headers: { ...req.headers, ...(hx === 'true' ? { 'hx-request': 'true' } : {}) },
              body: req.body,
            },
            s,
          );
          if (got.status !== 200) return;
          moved++;
          // finish the follow-up gas and show the draft with the earlier gas in it
          const next = formRequest(
            {
              ...hiddenState(got.text),
              step: 'gas',
              'gas.ph': '7.33',
              'gas.pco2': '44',
              'gas.hco3': '22.6',
              'units.pressure': 'mmHg',
            },
            'urlencoded',
            [],
          );
          const after = await check(
            '/step',
            { method: 'POST', headers: next.headers, body: next.body },
            s,
          );
          const open = formRequest({ ...hiddenState(after.text), open: 'x' }, 'urlencoded', []);
          await check('/open', { method: 'POST', headers: open.headers, body: open.body }, s);
        },
      ),
    );
    expect(moved, 'a follow-up started').toBeGreaterThan(0);
    expect(s.echoes, 'payloads reach the HTML').toBeGreaterThan(0);
  });

  it('the draft: a finished case whose earlier gases carry payloads in takenAt and label, previewed and reopened', {
    timeout: TIMEOUT,
  }, async () => {
    const s = seen();
    let drafts = 0;
    await run(
      fc.asyncProperty(
        validState,
        fc.constantFrom('/open', '/preview'),
        fc.record(
          { note: anyText, handover: text, open: fc.oneof(fc.constantFrom(...STEP_IDS), text) },
          { requiredKeys: [] },
        ),
        fc.constantFrom<Encoding>('urlencoded', 'multipart'),
        htmx,
        async (state, path, extra, encoding, hx) => {
          const req = formRequest({ ...state, ...extra }, encoding, []);
          const got = await check(
            path,
            {
              method: 'POST',
              headers: { ...req.headers, ...(hx === 'true' ? { 'hx-request': 'true' } : {}) },
              body: req.body,
            },
            s,
          );
          if (got.text.includes('id="note-text"')) drafts++;
        },
      ),
    );
    expect(drafts, 'the generator reaches the draft').toBeGreaterThan(0);
    expect(s.echoes, 'payloads reach the HTML').toBeGreaterThan(0);
  });
});
