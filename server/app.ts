// The application: routes wired to calc/, templates/ and views/, with headers, limits and errors.
import { Hono, type Context } from 'hono';
import { HTTPException } from 'hono/http-exception';
import { originCheck, securityHeaders } from './security.ts';
import { apiRoutes } from './api.ts';
import { pageRoutes } from './page.ts';
import { jsonError } from './errors.ts';
import { launch, launchView, type LaunchSettings } from './launch/index.ts';
import { createNoteRenderer, TemplateError, type NoteRenderer } from '../templates/index.ts';
import type { InterpretOptions } from '../calc/index.ts';
import type { UnitChoices } from './unitsSetting.ts';

export interface AppOptions {
  /** a department's folder of note templates (NOTE_TEMPLATES) */
  templateDir?: string | null;
  renderer?: NoteRenderer;
  interpretOptions?: InterpretOptions;
  /** public origins allowed to post forms besides the request's own (ALLOWED_ORIGINS, behind a TLS proxy) */
  allowedOrigins?: string[];
  /** request log sink: method, path, status and time only, never a value from a case */
  log?: (line: string) => void;
  /** where faults of ours are reported (default stderr): a class and a name, never a value from a case */
  errorLog?: (line: string) => void;
  /** SMART App Launch settings (SMART_CLIENT_ID and the rest); null or absent: no launch */
  launch?: LaunchSettings | null;
  /** origins of the record allowed to embed the page (FRAME_ANCESTORS); none: no framing */
  frameAncestors?: string[];
  /** the units a new case starts in (UNITS, read by server/unitsSetting.ts) */
  units?: UnitChoices;
}

export function createApp(options: AppOptions = {}): Hono {
  const renderer =
    options.renderer ?? createNoteRenderer({ templateDir: options.templateDir ?? null });
  const app = new Hono();
  const log = options.log;

  if (log) {
    app.use(async (c, next) => {
      const start = performance.now();
      await next();
      log(
        `${c.req.method} ${c.req.path} ${c.res.status} ${(performance.now() - start).toFixed(1)}ms`,
      );
    });
  }

  app.use(securityHeaders(options.frameAncestors ?? []));
  app.use(originCheck(options.allowedOrigins ?? []));

  app.route('/', apiRoutes({ renderer, interpretOptions: options.interpretOptions }));
  const settings = options.launch ?? null;
  const launchViewFor = settings ? (c: Context) => launchView(settings, c) : undefined;
  app.route('/', launch({ settings, renderer, interpretOptions: options.interpretOptions }));
  app.route(
    '/',
    pageRoutes({
      renderer,
      interpretOptions: options.interpretOptions,
      launchView: launchViewFor,
      units: options.units,
    }),
  );

  app.notFound((c) => jsonError(c, 404, `No route for ${c.req.method} ${c.req.path}`));
  app.onError((err, c) => {
    if (err instanceof HTTPException) {
      const status = err.status;
      if (status === 400) return jsonError(c, 400, 'The body is not valid JSON');
      if (status === 413) return jsonError(c, 413, 'The body is too large');
      if (status === 403)
        return jsonError(
          c,
          403,
          'Refused: this form was not posted from this page (cross-origin request)',
        );
      return jsonError(c, status as 400, err.message || 'Bad request');
    }
    // a template that fails is named, with its error class, and nothing of the case (a department's folder is code)
    if (err instanceof TemplateError)
      (options.errorLog ?? console.error)(`note template error: ${err.kind} in ${err.template}`);
    // a fault of ours, not of the request: say so without echoing anything from it
    return jsonError(c, 500, 'Internal error: the request was not processed');
  });
  return app;
}
