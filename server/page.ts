// The step-by-step page. Every step is a plain form post; htmx requests get the fragment to swap,
// other requests the full page. The case travels in each form and is checked by the schema each time.
import { Hono, type Context } from 'hono';
import { bodyLimit } from 'hono/body-limit';
import type { InterpretOptions } from '../calc/index.ts';
import type { NoteRenderer } from '../templates/index.ts';
import { BODY_LIMIT_BYTES } from './errors.ts';
import { mediaType } from './api.ts';
import { staticRoutes } from './static.ts';
import { answerStep, contextFor, emptyState, readState, statuses, type FlowState } from '../views/flow.ts';
import { flowView, markdownPreview, renderFragment, renderPage, renderPreview, renderProblem, type Presentation } from '../views/render.ts';
import { STEPS, isStepId, summary, type FormValues, type StepId } from '../views/steps.ts';

export interface PageDeps {
  renderer: NoteRenderer;
  interpretOptions?: InterpretOptions;
}

const FORM_TYPES = new Set(['application/x-www-form-urlencoded', 'multipart/form-data']);

const isHtmx = (c: Context) => c.req.header('hx-request') === 'true';

const NO_STORE = { 'cache-control': 'no-store', vary: 'HX-Request' };

function problem(c: Context, status: 400 | 413 | 415, message: string) {
  return c.html(renderProblem(message, isHtmx(c)), status, NO_STORE);
}

/** Form fields as strings; a file or a repeated name is not something these forms send. */
async function readForm(c: Context): Promise<FormValues | null> {
  if (!FORM_TYPES.has(mediaType(c))) return null;
  const body = await c.req.parseBody();
  const out: FormValues = {};
  for (const [key, value] of Object.entries(body)) {
    if (typeof value === 'string') out[key] = value;
  }
  return out;
}

/** What the live region says after an answer: what was kept, what was not asked and why, what comes next. */
function afterAnswer(after: FlowState, id: StepId, reopened: StepId[], deps: PageDeps): string {
  const ctx = contextFor(after, deps.interpretOptions);
  const phrases = summary(STEPS[id], ctx, { ventilatedAnswered: after.done.includes('oxygen') });
  const parts = [`${STEPS[id].title}: ${phrases.length ? phrases.join(', ') : 'nothing entered'}.`];
  const list = statuses(after, ctx);
  const next = list.find((s) => s.status === 'todo');
  const from = list.findIndex((s) => s.id === id);
  const to = next ? list.findIndex((s) => s.id === next.id) : list.length;
  for (const s of list.slice(from + 1, to)) if (s.status === 'skipped' && s.reason) parts.push(s.reason);
  if (reopened.length) parts.push(`Check ${reopened.map((s) => STEPS[s].title.toLowerCase()).join(' and ')} again: the question changed.`);
  parts.push(next ? `Next: ${STEPS[next.id].title.toLowerCase()}.` : 'The draft note is ready below.');
  return parts.join(' ');
}

export function pageRoutes(deps: PageDeps): Hono {
  const page = new Hono();
  const limit = bodyLimit({ maxSize: BODY_LIMIT_BYTES, onError: (c) => problem(c, 413, `The form is larger than ${BODY_LIMIT_BYTES / 1024} KiB.`) });

  const send = (c: Context, state: FlowState, p: Presentation, status: 200 | 422 = 200) => {
    const view = flowView(state, deps, p);
    return c.html(isHtmx(c) ? renderFragment(view) : renderPage(view), status, NO_STORE);
  };

  /** The form and the state it carried, or the response that explains why not. */
  const withState = async (c: Context): Promise<{ form: FormValues; state: FlowState } | Response> => {
    const form = await readForm(c);
    if (!form) return problem(c, 415, 'Send the form as an ordinary form post.');
    const read = readState(form);
    if (!read.ok) return problem(c, 400, read.message);
    return { form, state: read.state };
  };

  page.route('/', staticRoutes());

  page.get('/', (c) => send(c, emptyState(), { announce: '' }));
  // after a post without script the address bar shows the post's path: a reload or a bookmark starts afresh
  for (const path of ['/step', '/open', '/preview']) page.get(path, (c) => c.redirect('/', 303));

  page.post('/step', limit, async (c) => {
    const got = await withState(c);
    if (got instanceof Response) return got;
    const { form, state } = got;
    const id = form.step ?? '';
    if (!isStepId(id)) return problem(c, 400, 'The form did not say which step it answers.');
    const outcome = answerStep(state, id, form, form.action === 'skip', deps.interpretOptions);
    if (outcome.invalid) {
      const n = outcome.invalid.errors.length;
      const announce = `${n === 1 ? 'One answer needs' : `${n} answers need`} a change: ${outcome.invalid.errors[0]!.message}.`;
      return send(c, state, { invalid: outcome.invalid, announce }, 422);
    }
    return send(c, outcome.state, { announce: afterAnswer(outcome.state, id, outcome.reopened, deps), reopened: outcome.reopened });
  });

  // reopen an answered step, or show the same flow in another note format
  page.post('/open', limit, async (c) => {
    const got = await withState(c);
    if (got instanceof Response) return got;
    const { form, state } = got;
    const open = form.open ?? '';
    if (isStepId(open)) {
      const status = statuses(state, contextFor(state, deps.interpretOptions)).find((s) => s.id === open)!;
      const canOpen = status.status === 'done' || (status.status === 'skipped' && open === 'timing');
      if (canOpen) return send(c, state, { open, announce: `Changing ${STEPS[open].title.toLowerCase()}.` });
    }
    return send(c, state, { keepFocus: true, announce: state.format === 'markdown' ? 'The draft is now in Markdown.' : 'The draft is now plain text.' });
  });

  // the Markdown preview of the clinician's own text: the fragment for htmx, the whole page otherwise
  page.post('/preview', limit, async (c) => {
    const got = await withState(c);
    if (got instanceof Response) return got;
    const { form, state } = got;
    const note = form.note ?? '';
    if (isHtmx(c)) return c.html(renderPreview(markdownPreview(note)), 200, NO_STORE);
    return send(c, { ...state, format: 'markdown' }, { edited: { note, handover: form.handover ?? '' }, keepFocus: true, announce: 'Preview updated.' });
  });

  return page;
}
