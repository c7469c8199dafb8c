// What the launch's routes answer with: the page (or the htmx fragment) of the flow, with the launch's start link
// and filing back for this browser, and a problem said above the flow with the manual path still open.
import type { Context, MiddlewareHandler } from 'hono';
import type { InterpretOptions } from '../../calc/index.ts';
import type { NoteRenderer } from '../../templates/index.ts';
import { emptyState, type FlowState } from '../../views/flow.ts';
import {
  flowView,
  renderFragment,
  renderPage,
  renderProblem,
  type Presentation,
} from '../../views/render.ts';
import { BODY_LIMIT_BYTES } from '../errors.ts';
import { bodyLimit } from '../limits.ts';
import { clearCookie, hasRecord } from './cookies.ts';
import { LaunchProblem, PROBLEM_STATUS } from './http.ts';
import type { LaunchSettings } from './settings.ts';

export interface LaunchDeps {
  settings: LaunchSettings;
  renderer: NoteRenderer;
  interpretOptions?: InterpretOptions;
  now?: () => Date;
}

export const NO_STORE = { 'cache-control': 'no-store', vary: 'HX-Request' };
export const isHtmx = (c: Context) => c.req.header('hx-request') === 'true';
const TITLES: Record<string, string> = {
  'bad-request': 'This launch could not start',
  stray: 'This sign-in answer was not expected',
  expired: 'The launch took too long',
  refused: 'The record did not grant access',
  token: 'The sign-in could not be completed',
  forbidden: 'The record refused',
  'bad-server': "The record's server cannot be used",
  unreachable: "The record's server did not answer",
};

const FORGOTTEN = 'gaslineRecordForgotten';

/** What the page shows of the launch for this browser: the standalone start, and filing back once granted. */
export function launchView(settings: LaunchSettings, c: Context): Presentation['launch'] {
  const home = settings.issuers.length === 1 ? settings.issuers[0]! : null;
  return {
    standalone: home ? `/launch?iss=${encodeURIComponent(home)}` : null,
    fileBack: settings.fileBack && hasRecord(c, settings) && c.get(FORGOTTEN) !== true,
  };
}

/**
 * A new case (the first page, "New case", a paste) may be another patient: the launch's filing grant is dropped,
 * so that no note typed afterwards can be filed into the chart of the patient who was launched.
 */
export const forgetOnNewCase =
  (settings: LaunchSettings): MiddlewareHandler =>
  async (c, next) => {
    if (hasRecord(c, settings)) {
      clearCookie(c, settings, 'record');
      c.set(FORGOTTEN, true);
    }
    await next();
  };

export type Status = 200 | 400 | 403 | 413 | 422 | 502 | 504;

export function responder(deps: LaunchDeps) {
  const { settings } = deps;
  const now = () => deps.now?.() ?? new Date();
  const limit = bodyLimit({
    maxSize: BODY_LIMIT_BYTES,
    onError: (c) => c.html(renderProblem('The form is too large.', isHtmx(c)), 413, NO_STORE),
  });

  const send = (c: Context, state: FlowState, p: Presentation, status: Status = 200) => {
    const view = flowView(state, deps, { launch: launchView(settings, c), ...p });
    return c.html(isHtmx(c) ? renderFragment(view) : renderPage(view), status, NO_STORE);
  };
  const problem = (
    c: Context,
    error: unknown,
    state: FlowState = emptyState(),
    p: Presentation = {},
  ) => {
    // a fault nobody foresaw is still a page a clinician can act on; its class is logged, never its message
    if (!(error instanceof LaunchProblem)) {
      console.error(`launch: unexpected ${error instanceof Error ? error.name : typeof error}`);
      return problem(
        c,
        new LaunchProblem('bad-server', "The record's answer could not be used."),
        state,
        p,
      );
    }
    return send(
      c,
      state,
      {
        ...p,
        notice: { title: TITLES[error.kind]!, message: error.message },
        announce: error.message,
      },
      PROBLEM_STATUS[error.kind],
    );
  };

  return { now, limit, send, problem };
}
