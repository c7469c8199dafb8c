// The application: routes wired to calc/, templates/ and views/, with headers, limits and errors.
import { Hono, type Context } from 'hono';
import { HTTPException } from 'hono/http-exception';
import { hostCheck, originCheck, securityHeaders } from './security.ts';
import { requestLog } from './log.ts';
import { shedWhenBusy } from './overload.ts';
import { CSP_REPORT_PATH, cspReportRoute } from './cspReport.ts';
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
  /** host names answered besides localhost and IP addresses (server/security.ts hostCheck); absent: no check */
  allowedHosts?: string[];
  /** send Strict-Transport-Security (HSTS=on); off by default, the TLS proxy sends it */
  hsts?: boolean;
  /** take CSP violation reports at /csp-report and log their directive (CSP_REPORTS=on) */
  cspReports?: boolean;
  /** true while the process is too busy to answer in time: requests get 503 at once (server/overload.ts) */
  busy?: () => boolean;
  /** requests in progress at most in this process; more are answered 503 at once (MAX_IN_FLIGHT) */
  maxInFlight?: number;
  /** the units a new case starts in (UNITS, read by server/unitsSetting.ts) */
  units?: UnitChoices;
}

export function createApp(options: AppOptions = {}): Hono {
  const renderer =
    options.renderer ?? createNoteRenderer({ templateDir: options.templateDir ?? null });
  const app = new Hono();
  const log = options.log;

  if (log) app.use(requestLog(log));
  if (options.busy || options.maxInFlight)
    app.use(shedWhenBusy(options.busy ?? (() => false), options.maxInFlight));
  if (options.allowedHosts) app.use(hostCheck(options.allowedHosts));
  // no answer of ours is kept by a browser or a proxy unless it says otherwise (pages, static files)
  app.use(async (c, next) => {
    await next();
    if (!c.res.headers.has('cache-control')) c.res.headers.set('cache-control', 'no-store');
  });
  app.use(
    securityHeaders({
      frameAncestors: options.frameAncestors ?? [],
      hsts: options.hsts ?? false,
      reportUri: options.cspReports ? CSP_REPORT_PATH : null,
    }),
  );
  app.use(originCheck(options.allowedOrigins ?? []));

  if (options.cspReports) app.route('/', cspReportRoute(options.errorLog ?? console.error));
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
