// The JSON API of interface-contract.md: POST /api/interpret and GET /healthz.
import { Hono, type Context } from 'hono';
import { bodyLimit } from './limits.ts';
import { zValidator } from '@hono/zod-validator';
import {
  caseSchema,
  interpret,
  interpretParsed,
  round,
  toFieldErrors,
  type Findings,
  type InterpretOptions,
  type ReferencePoint,
} from '../calc/index.ts';
import type { NoteRenderer } from '../templates/index.ts';
import { BODY_LIMIT_BYTES, boundedErrors, jsonError } from './errors.ts';
import { caseFromFhir, type FhirResult } from './intake/index.ts';

export interface ApiDeps {
  renderer: NoteRenderer;
  interpretOptions?: InterpretOptions;
}

const JSON_TYPE = 'application/json';
const FHIR_TYPE = 'application/fhir+json';
const SAMPLES = new Set(['arterial', 'venous', 'capillary']);

export const mediaType = (c: Context): string =>
  (c.req.header('content-type') ?? '').split(';')[0]!.trim().toLowerCase();

/** The contract's `reference`: the point the reading was judged against, canonical units (mmHg, mmol/L), and
 *  beside it the patient's usual point however it was obtained (stated, from a usual pH, or estimated). */
export function referenceResponse(r: ReferencePoint) {
  return {
    pco2: round(r.pco2, 1),
    hco3: round(r.hco3, 1),
    kind: r.kind,
    estimated: { pco2: r.estimated.pco2, hco3: r.estimated.hco3 },
    usualPhIgnored: r.usualPhIgnored,
    usual: r.usual
      ? {
          pco2: round(r.usual.pco2, 1),
          hco3: round(r.usual.hco3, 1),
          source: r.usual.source,
          estimated: { pco2: r.usual.estimated.pco2, hco3: r.usual.estimated.hco3 },
        }
      : null,
  };
}

/** The response body for a reading: the contract's fields first, then what the page needs to explain. */
export function interpretResponse(
  f: Findings,
  renderer: NoteRenderer,
  format: 'text' | 'markdown' = 'text',
) {
  const note = renderer.render(f, { format });
  return {
    ok: true as const,
    withheld: f.withheld,
    derived: f.derived,
    disorders: f.disorders.map((d) => ({
      code: d.code,
      detail: d.detail,
      role: d.role,
      basis: d.basis,
    })),
    flags: f.flags.map((flag) => ({
      code: flag.code,
      severity: flag.severity,
      message: renderer.flagMessage(flag, f),
      values: flag.values,
    })),
    note: {
      line: note.line,
      text: note.text,
      full: note.full,
      handover: note.handover,
      format: note.format,
    },
    phStatus: f.phStatus,
    compensation: f.compensation,
    reference: referenceResponse(f.reference),
    metabolic: f.metabolic,
    oxygenation: f.oxygenation,
    ventilation: f.ventilation,
    venous: f.venous,
    changes: f.changes,
    explain: f.explain,
    units: f.units,
  };
}

const noteFormat = (c: Context): 'text' | 'markdown' =>
  c.req.query('format') === 'markdown' ? 'markdown' : 'text';

/** What the FHIR reader found, beside the reading: nothing it did not use is dropped silently. */
const fhirReport = (r: FhirResult) => ({
  read: r.read,
  takenAt: r.takenAt,
  previous: r.previous,
  earlier: r.earlier,
  unused: r.unused,
  conversions: r.conversions,
  notes: r.notes,
});

/**
 * FHIR R4 Observations (a Bundle, a list, or one) coded with LOINC and UCUM. A sample type the codes do not
 * state can be given as ?sample=arterial|venous|capillary; any other question is answered with 422.
 */
async function interpretFhir(c: Context, deps: ApiDeps) {
  let json: unknown;
  try {
    json = await c.req.json();
  } catch {
    return jsonError(c, 400, 'The body is not valid JSON');
  }
  const fhir = caseFromFhir(json);
  const sample = c.req.query('sample');
  if (sample !== undefined && !SAMPLES.has(sample))
    return jsonError(c, 422, 'sample must be one of: arterial, venous, capillary', 'sample');
  const questions = fhir.questions.filter((q) => !(q.path === 'sample' && sample));
  if (fhir.errors.length || questions.length) {
    const errors = [
      ...fhir.errors,
      ...questions.map((q) => ({
        path: q.path,
        message: q.options?.length ? `${q.reason} (one of: ${q.options.join(', ')})` : q.reason,
      })),
    ];
    return c.json({ ok: false, errors: boundedErrors(errors), fhir: fhirReport(fhir) }, 422);
  }
  const kase = sample ? { ...fhir.case, sample } : fhir.case;
  const result = interpret(kase, deps.interpretOptions);
  if (!result.ok)
    return c.json({ ok: false, errors: boundedErrors(result.errors), fhir: fhirReport(fhir) }, 422);
  return c.json({
    ...interpretResponse(result, deps.renderer, noteFormat(c)),
    fhir: fhirReport(fhir),
  });
}

export function apiRoutes(deps: ApiDeps): Hono {
  const api = new Hono();

  api.get('/healthz', (c) => c.json({ ok: true }));

  api.post(
    '/api/interpret',
    bodyLimit({
      maxSize: BODY_LIMIT_BYTES,
      onError: (c) => jsonError(c, 413, `The body is larger than ${BODY_LIMIT_BYTES / 1024} KiB`),
    }),
    async (c, next) => {
      const type = mediaType(c);
      if (type === FHIR_TYPE) return interpretFhir(c, deps);
      if (type !== JSON_TYPE)
        return jsonError(
          c,
          415,
          `Send the case as Content-Type: ${JSON_TYPE}, or FHIR R4 Observations as ${FHIR_TYPE}`,
        );
      await next();
    },
    zValidator('json', caseSchema, (result, c) => {
      if (!result.success)
        return c.json({ ok: false, errors: boundedErrors(toFieldErrors(result.error)) }, 422);
    }),
    (c) => {
      // the schema already passed in the validator; the core still rejects an implausible worked-out value
      const result = interpretParsed(c.req.valid('json'), deps.interpretOptions);
      if (!result.ok) return c.json({ ok: false, errors: boundedErrors(result.errors) }, 422);
      return c.json(interpretResponse(result, deps.renderer, noteFormat(c)));
    },
  );

  return api;
}
