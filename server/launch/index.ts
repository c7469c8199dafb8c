// SMART App Launch from the record: the routes when SMART_CLIENT_ID is set (mounted before the page, whose new
// case drops the filing grant); otherwise /launch and /callback answer with a page that says the launch is not
// set up here, and the manual path.
import { Hono } from 'hono';
import { emptyState } from '../../views/flow.ts';
import { flowView, renderPage } from '../../views/render.ts';
import { formRoutes } from './forms.ts';
import { forgetOnNewCase, launchView, type LaunchDeps } from './respond.ts';
import { launchRoutes } from './routes.ts';

export { readSettings, type LaunchSettings } from './settings.ts';
export { launchView };

export function launch(
  deps: Omit<LaunchDeps, 'settings'> & { settings: LaunchDeps['settings'] | null },
) {
  const { settings } = deps;
  if (settings) {
    const routes = new Hono();
    routes.get('/', forgetOnNewCase(settings));
    routes.post('/paste', forgetOnNewCase(settings));
    routes.route('/', launchRoutes({ ...deps, settings }));
    routes.route('/', formRoutes({ ...deps, settings }));
    return routes;
  }
  const off = new Hono();
  const message = 'Launching from the record is not set up on this server (no SMART_CLIENT_ID).';
  for (const path of ['/launch', '/callback'])
    off.get(path, (c) =>
      c.html(
        renderPage(
          flowView(emptyState(), deps, {
            notice: { title: 'No launch from the record here', message },
            announce: message,
          }),
        ),
        404,
        { 'cache-control': 'no-store' },
      ),
    );
  return off;
}
