// Free text a clinician or an integration sends (a gas's label or time) cannot reorder what the note shows,
// and cannot become a live link or HTML when the Markdown note is rendered. Renderers checked: marked with its
// GitHub-flavoured defaults (autolinks for https:// and www. included), as the page's preview uses it.
import { describe, expect, it } from 'vitest';
import { marked } from 'marked';
import { interpret, type Findings } from '../../calc/index.ts';
import { createNoteRenderer } from '../../templates/index.ts';

const renderer = createNoteRenderer();
const RLO = '\u202e';
const read = (c: unknown): Findings => {
  const f = interpret(c);
  if (!f.ok) throw new Error(JSON.stringify(f.errors));
  return f;
};

// Invented: a 70-year-old woman on the ward, a follow-up gas after nebulisers; the earlier gas's label and time
// carry hostile text.
const kase = (label: string, takenAt: string) => ({
  gas: { ph: 7.33, pco2: 52, hco3: 26.8 },
  previous: [{ takenAt, label, gas: { ph: 7.28, pco2: 58, hco3: 26.6 } }],
});

describe('bidirectional and invisible controls', () => {
  it.each([
    ['\u202a', 'left-to-right embedding'],
    ['\u202e', 'right-to-left override'],
    ['\u2066', 'left-to-right isolate'],
    ['\u2069', 'pop directional isolate'],
    ['\u200e', 'left-to-right mark'],
    ['\u200f', 'right-to-left mark'],
    ['\u061c', 'Arabic letter mark'],
    ['\u200b', 'zero-width space'],
  ])('%j (%s, Unicode) is removed from a label and a time before anything reads it', (char) => {
    const f = read(kase(`before ${char}nebulisers`, `2026-04-07${char} 02:10`));
    expect(f.previous[0]!.label).toBe('before nebulisers');
    expect(f.previous[0]!.takenAt).toBe('2026-04-07 02:10');
    for (const format of ['text', 'markdown'] as const) {
      const note = renderer.render(f, { format });
      for (const text of [note.line, note.text, note.handover]) expect(text).not.toContain(char);
    }
  });

  it('a right-to-left override cannot turn "PaCO2 58 to 52" around in the note', () => {
    const note = renderer.render(read(kase(`${RLO}tuo`, '2026-04-07T02:10')));
    expect(note.text).toContain('PaCO2 58 to 52 mmHg');
    expect(note.text).not.toContain(RLO);
  });
});

describe('free text in the Markdown note stays text', () => {
  it.each([
    'https://evil.example/login',
    'www.evil.example',
    '<https://evil.example>',
    '[click](javascript:alert(1))',
    '<img src=x onerror=alert(1)> evil',
    'https&#58;//evil.example',
    'ward evil.desk@hospital.example',
    '**bold** _it_ `code` # heading | table ~ evil',
  ])('label %j: no link, no HTML element', (label) => {
    const note = renderer.render(read(kase(label, '2026-04-07T02:10')), { format: 'markdown' });
    const html = marked.parse(note.text, { async: false });
    // the label is in the note (as text), so these checks are not vacuous
    expect(html).toMatch(/evil|click|bold/);
    expect(html).not.toMatch(/<a\b/i);
    expect(html).not.toMatch(/<img\b|<script\b/i);
    expect(html).not.toMatch(/<strong>bold|<em>it|<code>code/);
  });
});
