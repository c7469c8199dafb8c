// POST /launch/confirm (the record's results confirmed like a paste, with the patient and the earlier gases) and
// POST /launch/file (the draft note filed back as a DocumentReference with the launch's access, when granted).
import { Hono, type Context } from 'hono';
import { readState } from '../../views/flow.ts';
import { withChosenSample } from '../../views/intake.ts';
import { fingerprint, pasteView } from '../../views/paste.ts';
import { confirmPaste } from '../../views/pasteConfirm.ts';
import { renderProblem } from '../../views/render.ts';
import type { FormValues } from '../../views/steps.ts';
import { formStrings } from '../form.ts';
import { clearCookie, readRecord } from './cookies.ts';
import { draftNote } from './document.ts';
import { create } from './fhir.ts';
import { LaunchProblem, PROBLEM_STATUS } from './http.ts';
import { readRecordText, type RecordRead } from './intake.ts';
import { NO_STORE, isHtmx, responder, type LaunchDeps, type Status } from './respond.ts';

export /** The confirm view of a record read: the paste's view, posting to the launch's confirm, with the rest listed. */
function recordView(
  read: RecordRead,
  form: FormValues | null,
  errors = [] as Parameters<typeof pasteView>[2],
) {
  return {
    ...pasteView(read.intake, form, errors),
    title: 'Check what the record gave',
    action: '/launch/confirm',
    record: { patient: read.patient, earlier: read.earlier, notes: read.notes },
  };
}

export function formRoutes(deps: LaunchDeps): Hono {
  const { settings } = deps;
  const routes = new Hono();
  const { now, limit, send } = responder(deps);

  /** The form and the case it carried, or the page that explains why not. */
  const readForm = async (c: Context) => {
    const form = await formStrings(c);
    if (form === 'malformed')
      return c.html(
        renderProblem('The form could not be read: send it again from the page.', isHtmx(c)),
        400,
        NO_STORE,
      );
    const read = readState(form);
    if (!read.ok) return c.html(renderProblem(read.message, isHtmx(c)), 400, NO_STORE);
    return { form, state: read.state };
  };

  routes.post('/launch/confirm', limit, async (c) => {
    const got = await readForm(c);
    if (got instanceof Response) return got;
    const { form, state } = got;
    if (form.action === 'cancel')
      return send(c, state, { announce: 'Enter the values step by step.' });
    // a form sends its text area's line breaks as CRLF; the record's text was shown (and fingerprinted) with LF
    const text = (form.paste ?? '').replace(/\r\n?/g, '\n');
    const read = readRecordText(text, now());
    read.intake = withChosenSample(read.intake, state.answers.sample);
    if (form.action === 'confirm' && form.pasteRead === fingerprint(text)) {
      const outcome = confirmPaste(state, read.intake, form, deps.interpretOptions);
      if (outcome.ok)
        return send(c, outcome.read.state, { announce: outcome.announce, pasted: outcome.remarks });
      const view = recordView(read, form, outcome.errors);
      return send(
        c,
        state,
        { open: 'sample', paste: view, announce: `Not used yet: ${outcome.errors[0]!.message}` },
        422,
      );
    }
    const view = recordView(read, null);
    if (form.action === 'confirm')
      view.remark =
        'The text changed after it was read: here is what was read from it now. Check it, then use it.';
    return send(
      c,
      state,
      { open: 'sample', paste: view, announce: 'Check what was read, then use it.' },
      view.canConfirm ? 200 : 422,
    );
  });

  routes.post('/launch/file', limit, async (c) => {
    const got = await readForm(c);
    if (got instanceof Response) return got;
    const { form, state } = got;
    const note = (form.note ?? '').trim();
    const edited = { note: form.note ?? '', handover: form.handover ?? '' };
    const say = (ok: boolean, message: string, status: Status) =>
      send(
        c,
        state,
        { edited, filed: { ok, message }, announce: message, keepFocus: true },
        status,
      );
    if (!settings.fileBack)
      return say(false, 'Filing back is not switched on here: copy the note into the record.', 403);
    if (!note)
      return say(false, 'The note is empty: write or copy the note first, then file it.', 422);
    const grant = await readRecord(c, settings);
    if (!grant.ok)
      return say(
        false,
        grant.reason === 'missing' || grant.reason === 'expired'
          ? 'The launch from the record has ended (its access lasts only a short time), so the note was not filed: copy it into the record, or launch again.'
          : 'The launch could not be read back, so the note was not filed: copy it into the record, or launch again.',
        grant.reason === 'unreadable' ? 400 : 403,
      );
    try {
      const g = grant.data;
      const id = await create(
        { fhirBase: g.iss, token: g.token, insecure: new URL(g.iss).protocol === 'http:' },
        draftNote(g, note, now()),
      );
      return say(
        true,
        `Filed in the record as a draft note${id ? ` (DocumentReference/${id})` : ''}: review and sign it there.`,
        200,
      );
    } catch (error) {
      if (!(error instanceof LaunchProblem)) throw error;
      if (error.kind === 'forbidden') clearCookie(c, settings, 'record');
      return say(
        false,
        `Not filed: ${error.message} Copy the note into the record instead.`,
        PROBLEM_STATUS[error.kind],
      );
    }
  });

  return routes;
}
