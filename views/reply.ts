// What the assistant says after each answer: what it reads now (the note's one line), what changed since the
// earlier gas, the questions it passed over and why, and what it asks next and why. The same words go to the
// live region for a screen reader.
import { replyOf, type Read } from './flow.ts';
import { changeText, changesSince } from './followUp.ts';
import type { StepId } from './steps.ts';

/** Since the last earlier gas: the gas then and now, and the settings changed ("RR 22 to 28/min"). */
function changesView(read: Read) {
  const c = changesSince(read.state.answers);
  if (!c) return null;
  return { when: c.when, gas: c.gas.map(changeText), settings: c.settings.map(changeText) };
}

export function replyView(
  read: Read,
  open: StepId | null,
  answered: { id: StepId; reopened: StepId[] } | null,
  line: string | null,
) {
  const reply = replyOf(read, open, answered?.id ?? null, answered?.reopened);
  return {
    type: 'reply' as const,
    id: 'reply',
    reads: line,
    passed: reply.passed,
    reopened: reply.reopened,
    next: reply.next,
    finished: !open && line !== null,
    changes: changesView(read),
  };
}

export type ReplyView = ReturnType<typeof replyView>;

/** The live region says what the reply says. */
export function announceOf(said: ReplyView): string {
  const parts: string[] = [];
  if (said.reads) parts.push(`Reads now: ${said.reads}`);
  if (said.changes) {
    const { when, gas, settings } = said.changes;
    parts.push(
      `Since the earlier gas${when ? ` (${when})` : ''}: ${gas.join('; ')}${settings.length ? `. Changed: ${settings.join('; ')}` : ''}.`,
    );
  }
  parts.push(...said.passed);
  if (said.reopened) parts.push(said.reopened);
  if (said.next)
    parts.push(
      `Next, ${said.next.title.toLowerCase()}${said.next.why ? `: ${said.next.why}` : '.'}`,
    );
  else if (said.finished) parts.push('Nothing more to ask: the draft is ready to copy.');
  return parts.join(' ');
}
