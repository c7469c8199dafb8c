// GET /launch (an EHR launch with iss and launch, a standalone launch with iss alone) and GET /callback: discovery,
// the authorization request, the token, and the patient's results read into the confirm view of a paste.
import { Hono } from 'hono';
import { emptyState } from '../../views/flow.ts';
import { setRecord, setTransaction, takeTransaction } from './cookies.ts';
import { discover } from './discovery.ts';
import { readPatient, readResults } from './fhir.ts';
import { LaunchProblem } from './http.ts';
import { readRecordText, recordText } from './intake.ts';
import { authorizationUrl, exchangeCode, newTransaction } from './oauth.ts';
import { recordView } from './forms.ts';
import { responder, type LaunchDeps } from './respond.ts';
import { baseOf, checkBaseUrl } from './settings.ts';

export function launchRoutes(deps: LaunchDeps): Hono {
  const { settings } = deps;
  const routes = new Hono();
  const { now, send, problem } = responder(deps);

  routes.get('/launch', async (c) => {
    try {
      const iss = c.req.query('iss') ?? '';
      const launch = c.req.query('launch');
      if (!iss)
        throw new LaunchProblem(
          'bad-request',
          'The launch did not say which FHIR server to read (no iss).',
        );
      const checked = checkBaseUrl(iss, 'The FHIR server (iss)');
      if ('error' in checked) throw new LaunchProblem('bad-request', `${checked.error}.`);
      const fhirBase = baseOf(checked.url);
      if (settings.issuers.length && !settings.issuers.includes(fhirBase))
        throw new LaunchProblem(
          'bad-request',
          'This FHIR server is not one Gasline is set up to launch from (SMART_ISSUERS).',
        );
      if (launch !== undefined && !/^[\x21-\x7e]{1,512}$/.test(launch))
        throw new LaunchProblem('bad-request', 'The launch id is empty or not plain text.');
      const server = await discover(fhirBase);
      const t = newTransaction(fhirBase, launch);
      const url = await authorizationUrl(server, settings, t);
      await setTransaction(c, settings, t);
      c.header('cache-control', 'no-store');
      return c.redirect(url.href, 302);
    } catch (error) {
      return problem(c, error);
    }
  });

  routes.get('/callback', async (c) => {
    try {
      const opened = await takeTransaction(c, settings);
      if (!opened.ok)
        throw opened.reason === 'expired'
          ? new LaunchProblem(
              'expired',
              'The sign-in took longer than 10 minutes: launch again from the record.',
            )
          : new LaunchProblem(
              'stray',
              'No launch from this browser is waiting for it (it was used already, or started elsewhere): launch again from the record.',
            );
      const t = opened.data;
      const server = await discover(t.iss);
      const callbackUrl = new URL(`${settings.redirectUri}?${new URL(c.req.url).searchParams}`);
      const granted = await exchangeCode(server, settings, t, callbackUrl);
      const access = { fhirBase: t.iss, token: granted.accessToken, insecure: server.insecure };
      const [patient, observations] = await Promise.all([
        readPatient(access, granted.patient),
        readResults(access, granted.patient, now()),
      ]);
      const text = recordText(patient, observations);
      const read = readRecordText(text, now());
      if (settings.fileBack) {
        const kept = await setRecord(
          c,
          settings,
          {
            iss: t.iss,
            token: granted.accessToken,
            patient: granted.patient,
            ...(granted.encounter ? { encounter: granted.encounter } : {}),
            ...(granted.fhirUser ? { author: granted.fhirUser } : {}),
            related: read.related,
          },
          granted.expiresIn,
        );
        if (kept === 'none')
          read.notes.push(
            'Filing the note back is not available for this launch (its access is too large to keep).',
          );
        if (kept === 'some')
          read.notes.push(
            'A filed note will list the newest results it was read from, not every earlier one (too many to keep).',
          );
      }
      if (!read.intake.read.length) {
        const message =
          read.intake.problems[0] && observations.length
            ? `The record's results could not be read as a gas: ${read.intake.problems[0]}`
            : `No blood gas for this patient in the record in the last 48 hours.`;
        return send(c, emptyState(), {
          notice: { title: 'No gas to read from the record', message },
          announce: message,
        });
      }
      const view = recordView(read, null);
      const n = read.intake.read.length;
      return send(c, emptyState(), {
        open: 'sample',
        paste: view,
        announce: `Read ${n} value${n === 1 ? '' : 's'} from the record: check them, then use them.`,
      });
    } catch (error) {
      return problem(c, error);
    }
  });

  return routes;
}
