// The step-by-step page. Every step is a plain form post; htmx requests get the fragment to swap,
// other requests the full page. The case travels in each form and is checked by the schema each time.
import { Hono, type Context } from 'hono';
import { bodyLimit } from './limits.ts';
import type { NoteRenderer } from '../templates/index.ts';
import { BODY_LIMIT_BYTES } from './errors.ts';
import { mediaType } from './api.ts';
import { staticRoutes } from './static.ts';
import { formStrings } from './form.ts';
import type { InterpretOptions, ParsedCase } from '../calc/index.ts';
import {
  answerStep,
  canOpen,
  emptyState,
  readOf,
  readState,
  startsCase,
  type FlowState,
  type Read,
} from '../views/flow.ts';
import { cancelFollowUp, startFollowUp } from '../views/followUp.ts';
import { intakeOf, withChosenSample, type RawIntake } from '../views/intake.ts';
import { fingerprint, pasteView } from '../views/paste.ts';
import { confirmPaste } from '../views/pasteConfirm.ts';
import {
  caseFromFhir,
  parsePaste,
  MAX_PASTE_CHARS,
  type FhirResult,
  type PasteResult,
} from './intake/index.ts';
import {
  flowView,
  markdownPreview,
  renderFragment,
  renderPage,
  renderPreview,
  renderProblem,
  type Presentation,
} from '../views/render.ts';
import { GAS_STEP, PASTE_STEP, STEPS, isStepId } from '../views/steps.ts';
import { rememberUnits, startingUnits, type UnitChoices } from './unitsSetting.ts';
import type { FormValues } from '../views/paths.ts';

export interface PageDeps {
  renderer: NoteRenderer;
  interpretOptions?: InterpretOptions;
  /** the launch from the record, when on: its start link and whether this browser may file the draft back */
  launchView?: (c: Context) => Presentation['launch'];
  /** the units a new case starts in (UNITS), before this browser's own preference */
  units?: UnitChoices;
}

const MODES = { skip: 'skip', finish: 'finish' } as const;

const FORM_TYPES = new Set(['application/x-www-form-urlencoded', 'multipart/form-data']);

const isHtmx = (c: Context) => c.req.header('hx-request') === 'true';

const isObject = (x: unknown): x is Record<string, unknown> =>
  x !== null && typeof x === 'object' && !Array.isArray(x);
const isResource = (x: unknown) => isObject(x) && typeof x.resourceType === 'string';

/** What the intake read, as the server has it: handed to the views, which read it as their RawIntake. */
export type IntakeRead =
  | Exclude<RawIntake, { kind: 'paste' | 'fhir' }>
  | { kind: 'paste'; result: PasteResult }
  | { kind: 'fhir'; result: FhirResult };

/** Which intake reads the text: JSON with a resourceType goes to the FHIR intake, any other text to the paste intake. */
export function readIntake(text: string): IntakeRead {
  if (text.trim() === '') return { kind: 'empty' };
  if (text.length > MAX_PASTE_CHARS)
    return { kind: 'too-long', limit: MAX_PASTE_CHARS, length: text.length };
  const trimmed = text.trim();
  if (trimmed.startsWith('{') || trimmed.startsWith('[')) {
    let json: unknown;
    try {
      json = JSON.parse(trimmed);
    } catch {
      json = undefined;
    }
    if (json !== undefined) {
      if (isResource(json) || (Array.isArray(json) && json.length > 0 && json.every(isResource)))
        return { kind: 'fhir', result: caseFromFhir(json) };
      return { kind: 'json-not-fhir' };
    }
  }
  return { kind: 'paste', result: parsePaste(text) };
}

const NO_STORE = { 'cache-control': 'no-store', vary: 'HX-Request' };

function problem(c: Context, status: 400 | 413 | 415, message: string) {
  return c.html(renderProblem(message, isHtmx(c)), status, NO_STORE);
}

/** Form fields as strings, read at the edge (server/form.ts); a file or a repeated name is not something these forms send. */
async function readForm(c: Context): Promise<FormValues | null | 'malformed'> {
  if (!FORM_TYPES.has(mediaType(c))) return null;
  return formStrings(c);
}

export function pageRoutes(deps: PageDeps): Hono {
  const page = new Hono();
  const limit = bodyLimit({
    maxSize: BODY_LIMIT_BYTES,
    onError: (c) => problem(c, 413, `The form is larger than ${BODY_LIMIT_BYTES / 1024} KiB.`),
  });

  /** The page for a state, from its reading (made once per request: see views/flow.ts readOf). */
  const send = (c: Context, read: Read, p: Presentation, status: 200 | 422 = 200) => {
    const view = flowView(read, deps, { launch: deps.launchView?.(c), ...p });
    return c.html(isHtmx(c) ? renderFragment(view) : renderPage(view), status, NO_STORE);
  };

  /** The form and the state it carried, or the response that explains why not. */
  const withState = async (
    c: Context,
  ): Promise<{ form: FormValues; state: FlowState; parsed: ParsedCase | null } | Response> => {
    const form = await readForm(c);
    if (!form) return problem(c, 415, 'Send the form as an ordinary form post.');
    if (form === 'malformed')
      return problem(c, 400, 'The form could not be read: send it again from the page.');
    const got = readState(form);
    if (!got.ok) return problem(c, 400, got.message);
    return { form, state: got.state, parsed: got.parsed };
  };
  const opts = deps.interpretOptions;
  // a state read for the page; its case was parsed when the form was read, and is not parsed again
  const readIn = (state: FlowState, parsed: ParsedCase | null) => readOf(state, opts, parsed);

  page.route('/', staticRoutes());

  page.get('/', (c) =>
    send(c, readOf(emptyState(startingUnits(c, deps.units ?? {}))), { announce: '' }),
  );
  // after a post without script the address bar shows the post's path: a reload or a bookmark starts afresh
  for (const path of ['/step', '/open', '/preview', '/paste', '/followup'])
    page.get(path, (c) => c.redirect('/', 303));

  page.post('/step', limit, async (c) => {
    const got = await withState(c);
    if (got instanceof Response) return got;
    const { form, state } = got;
    const id = form.step ?? '';
    if (!isStepId(id)) return problem(c, 400, 'The form did not say which step it answers.');
    const mode = MODES[form.action as keyof typeof MODES] ?? 'next';
    const outcome = answerStep(state, id, form, mode, opts);
    if (!outcome.read) {
      const invalid = outcome.invalid!;
      const n = invalid.errors.length;
      const doubt = invalid.doubts?.[0];
      const announce = doubt
        ? `${doubt.message} ${doubt.switchLabel}?`
        : `${n === 1 ? 'One answer needs' : `${n} answers need`} a look: ${invalid.errors[0]!.message}.`;
      return send(c, readIn(state, got.parsed), { invalid, announce }, doubt && !n ? 200 : 422);
    }
    rememberUnits(c, outcome.read.state.answers.units);
    return send(c, outcome.read, {
      answered: { id, reopened: outcome.reopened },
      reopened: outcome.reopened,
    });
  });

  // reopen an answered step, or show the same flow in another note format
  page.post('/open', limit, async (c) => {
    const got = await withState(c);
    if (got instanceof Response) return got;
    const { form, state } = got;
    const open = form.open ?? '';
    if (open === 'cancel-followup') {
      const restored = cancelFollowUp(state);
      if (restored)
        return send(c, readOf(restored.state, opts, restored.parsed), {
          announce: 'Follow-up cancelled: the gas is the current gas again.',
        });
    }
    const read = readIn(state, got.parsed);
    if (isStepId(open) && canOpen(read, open))
      return send(c, read, { open, announce: `Changing ${STEPS[open].title.toLowerCase()}.` });
    return send(c, read, {
      keepFocus: true,
      announce:
        state.format === 'markdown'
          ? 'The draft is now in Markdown.'
          : 'The draft is now plain text.',
    });
  });

  // the Markdown preview of the clinician's own text: the fragment for htmx, the whole page otherwise
  page.post('/preview', limit, async (c) => {
    const got = await withState(c);
    if (got instanceof Response) return got;
    const { form, state } = got;
    const note = form.note ?? '';
    if (isHtmx(c)) return c.html(renderPreview(markdownPreview(note)), 200, NO_STORE);
    return send(c, readIn({ ...state, format: 'markdown' }, got.parsed), {
      edited: { note, handover: form.handover ?? '' },
      keepFocus: true,
      announce: 'Preview updated.',
    });
  });

  // a paste on the first step: read it and show what was read; on confirm, fill the case and go on. A paste may be
  // a whole printout or FHIR payload (up to MAX_PASTE_CHARS characters); the paste forms post multipart/form-data,
  // which carries the text as it is (URL-encoding would triple JSON), so it fits the same 64 KiB as any body
  const pasteLimit = bodyLimit({
    maxSize: BODY_LIMIT_BYTES,
    onError: (c) =>
      problem(
        c,
        413,
        `The pasted text is too long: paste the result lines only (at most ${MAX_PASTE_CHARS} characters).`,
      ),
  });
  page.post('/paste', pasteLimit, async (c) => {
    const got = await withState(c);
    if (got instanceof Response) return got;
    const { form, state } = got;
    if (!startsCase(state.answers))
      return problem(
        c,
        400,
        'A paste starts a new case: this case already holds a gas. Start a new case to paste another.',
      );
    const action = form.action ?? 'read';
    // before a gas the case holds at most a sample and units: nothing to interpret
    const before = readOf(state);
    if (action === 'cancel') return send(c, before, { announce: 'Enter the values step by step.' });
    const text = form.paste ?? '';
    const intake = withChosenSample(intakeOf(readIntake(text), text), state.answers.sample);
    if (action === 'confirm') {
      // confirm only what was shown: a text changed since it was read is read again and shown first
      if (form.pasteRead !== fingerprint(text)) {
        const view = pasteView(
          intake,
          null,
          [],
          'The text changed after it was read: here is what was read from it now. Check it, then use it.',
        );
        return send(c, before, {
          open: PASTE_STEP,
          paste: view,
          announce: 'The text changed: check what was read from it now.',
        });
      }
      const outcome = confirmPaste(state, intake, form, opts);
      if (outcome.ok)
        return send(c, outcome.read, { lead: outcome.announce, pasted: outcome.remarks });
      const view = pasteView(intake, form, outcome.errors);
      return send(
        c,
        before,
        { open: PASTE_STEP, paste: view, announce: `Not used yet: ${outcome.errors[0]!.message}` },
        422,
      );
    }
    const view = pasteView(intake, null);
    const n = intake.read.length;
    const announce = view.canConfirm
      ? `Read ${n} value${n === 1 ? '' : 's'}${intake.questions.length ? ` and ${intake.questions.length} question${intake.questions.length === 1 ? '' : 's'} to answer` : ''}: check them, then use them.`
      : `Nothing could be used: ${intake.problems[0] ?? 'no result was read'}`;
    return send(
      c,
      before,
      { open: PASTE_STEP, paste: view, announce },
      view.canConfirm ? 200 : 422,
    );
  });

  // the current gas becomes an earlier one; the gas (and oxygen and ventilator) steps open for the follow-up
  page.post('/followup', limit, async (c) => {
    const got = await withState(c);
    if (got instanceof Response) return got;
    const { form, state } = got;
    const typed = form.when ?? '';
    const outcome = startFollowUp(state, typed);
    if (!outcome.ok) {
      if (!('gas' in state.answers)) return problem(c, 400, outcome.message);
      return send(
        c,
        readIn(state, got.parsed),
        { followUp: { error: outcome.message, typed }, announce: outcome.message },
        422,
      );
    }
    const what = [outcome.moved.takenAt, outcome.moved.label].filter(Boolean).join(', ');
    // the follow-up form may carry the new gas itself: then it is answered at once, as on the gas step
    const withGas = Object.keys(form).some(
      (k) => k.startsWith('gas.') && (form[k] ?? '').trim() !== '',
    );
    if (withGas) {
      const answered = answerStep(outcome.state, GAS_STEP, form, 'next', opts);
      if (answered.read)
        return send(c, answered.read, { answered: { id: GAS_STEP, reopened: [] } });
      return send(
        c,
        readOf(outcome.state),
        {
          invalid: answered.invalid,
          announce: `The follow-up gas needs a look: ${answered.invalid?.errors[0]?.message ?? answered.invalid?.doubts?.[0]?.message ?? ''}`,
        },
        422,
      );
    }
    // awaiting the follow-up gas, the case holds no gas to interpret
    return send(c, readOf(outcome.state), {
      announce: `The gas${what ? ` (${String(what)})` : ''} is now the earlier gas. Enter the follow-up gas.`,
    });
  });

  return page;
}
