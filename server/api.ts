// The JSON API of interface-contract.md: POST /api/interpret and GET /healthz.
import { Hono, type Context } from 'hono';
import { bodyLimit } from 'hono/body-limit';
import { zValidator } from '@hono/zod-validator';
import { caseSchema, interpret, toFieldErrors, type Findings, type InterpretOptions } from '../calc/index.ts';
import type { NoteRenderer } from '../templates/index.ts';
import { BODY_LIMIT_BYTES, jsonError } from './errors.ts';

export interface ApiDeps {
  renderer: NoteRenderer;
  interpretOptions?: InterpretOptions;
}

const JSON_TYPES = new Set(['application/json']);

export const mediaType = (c: Context): string => (c.req.header('content-type') ?? '').split(';')[0]!.trim().toLowerCase();

/** The response body for a reading: the contract's fields first, then what the page needs to explain. */
export function interpretResponse(f: Findings, renderer: NoteRenderer, format: 'text' | 'markdown' = 'text') {
  const note = renderer.render(f, { format });
  return {
    ok: true as const,
    withheld: f.withheld,
    derived: f.derived,
    disorders: f.disorders.map((d) => ({ code: d.code, detail: d.detail, role: d.role, basis: d.basis })),
    flags: f.flags.map((flag) => ({ code: flag.code, severity: flag.severity, message: renderer.flagMessage(flag, f), values: flag.values })),
    note: { line: note.line, text: note.text, handover: note.handover, format: note.format },
    phStatus: f.phStatus,
    compensation: f.compensation,
    reference: f.reference,
    metabolic: f.metabolic,
    oxygenation: f.oxygenation,
    ventilation: f.ventilation,
    venous: f.venous,
    changes: f.changes,
    explain: f.explain,
    units: f.units,
  };
}

export function apiRoutes(deps: ApiDeps): Hono {
  const api = new Hono();

  api.get('/healthz', (c) => c.json({ ok: true }));

  api.post(
    '/api/interpret',
    bodyLimit({ maxSize: BODY_LIMIT_BYTES, onError: (c) => jsonError(c, 413, `The body is larger than ${BODY_LIMIT_BYTES / 1024} KiB`) }),
    async (c, next) => {
      if (!JSON_TYPES.has(mediaType(c))) return jsonError(c, 415, 'Send the case as Content-Type: application/json');
      await next();
    },
    zValidator('json', caseSchema, (result, c) => {
      if (!result.success) return c.json({ ok: false, errors: toFieldErrors(result.error) }, 422);
    }),
    (c) => {
      // the schema already passed in the validator; interpret() also rejects an implausible worked-out value
      const format = c.req.query('format') === 'markdown' ? 'markdown' : 'text';
      const result = interpret(c.req.valid('json'), deps.interpretOptions);
      if (!result.ok) return c.json({ ok: false, errors: result.errors }, 422);
      return c.json(interpretResponse(result, deps.renderer, format));
    },
  );

  return api;
}
