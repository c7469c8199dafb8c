// A department's own template folder: a file there overrides the default of the same name, the rest fall
// back to the defaults, and everything is read once when the renderer is made.
import { mkdtempSync, readFileSync, readdirSync, rmSync, writeFileSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterEach, describe, expect, it } from 'vitest';
import { createNoteRenderer, DEFAULT_TEMPLATE_DIR, TemplateError } from '../../templates/index.ts';
import * as C from './cases.ts';
import { read } from './cases.ts';

const folders: string[] = [];
function departmentFolder(files: Record<string, string>): string {
  const dir = mkdtempSync(path.join(os.tmpdir(), 'gasline-note-'));
  folders.push(dir);
  for (const [name, text] of Object.entries(files)) writeFileSync(path.join(dir, name), text);
  return dir;
}
afterEach(() => {
  while (folders.length) rmSync(folders.pop() as string, { recursive: true, force: true });
});

const CUSTOM_LINE =
  '{% import "words.njk" as w with context %}Gas ({{ w.sampleName() }}) reviewed: pH {{ v.gas.ph }}{% if v.gas.pco2 %}, PaCO2 {{ v.gas.pco2 }}{% endif %}.';

describe('department templates', () => {
  const findings = read(C.ventilatedMmHg);
  const standard = createNoteRenderer().render(findings);

  it('a file in the folder replaces the default of the same name', () => {
    const dir = departmentFolder({ 'line.njk': CUSTOM_LINE });
    const note = createNoteRenderer({ templateDir: dir }).render(findings);
    expect(note.line).toBe('Gas (ABG) reviewed: pH 7.31, PaCO2 48 mmHg.');
    // the note opens with the line, so the department line heads the note too
    expect(note.full.split('\n')[0]).toBe(note.line);
  });

  it('the other templates fall back to the defaults', () => {
    const dir = departmentFolder({ 'line.njk': CUSTOM_LINE });
    const note = createNoteRenderer({ templateDir: dir }).render(findings);
    expect(note.handover).toBe(standard.handover);
    expect(note.full.split('\n').slice(1)).toEqual(standard.full.split('\n').slice(1));
  });

  it('a section included by the note can be overridden on its own', () => {
    const dir = departmentFolder({
      'cautions.njk':
        '{% import "format.njk" as f with context %}{% call f.section("Local cautions") %}- Ward 7 policy: call the ICU registrar for any critical value.{% endcall %}',
    });
    const note = createNoteRenderer({ templateDir: dir }).render(findings, { format: 'markdown' });
    expect(note.full).toMatch(/^## Local cautions$/m);
    expect(note.full).toContain('Ward 7 policy');
    expect(note.full).not.toMatch(/^## Cautions$/m);
    expect(note.full).toMatch(/^## Interpretation$/m);
  });

  it('every template is read when the renderer is made: deleting the folder afterwards changes nothing', () => {
    const dir = departmentFolder({ 'line.njk': CUSTOM_LINE });
    const renderer = createNoteRenderer({ templateDir: dir });
    rmSync(dir, { recursive: true, force: true });
    const first = renderer.render(findings);
    const again = renderer.render(read(C.ketoacidosis));
    expect(first.line).toBe('Gas (ABG) reviewed: pH 7.31, PaCO2 48 mmHg.');
    expect(again.line).toBe('Gas (ABG) reviewed: pH 7.18, PaCO2 18 mmHg.');
    expect(again.full).toMatch(/^INTERPRETATION$/m);
  });

  it('a folder that does not exist is a clear error, not a silent fall-back', () => {
    expect(() =>
      createNoteRenderer({ templateDir: path.join(os.tmpdir(), 'gasline-no-such-folder-4f1c') }),
    ).toThrow(/does not exist/);
  });

  it('no folder, null or empty: the defaults', () => {
    expect(createNoteRenderer({ templateDir: null }).render(findings)).toEqual(standard);
    expect(createNoteRenderer({ templateDir: '' }).render(findings)).toEqual(standard);
  });

  it('a department template that prints a missing value fails loudly instead of writing a gap into the note', () => {
    // it renders the ventilated example, but the minimal one has no PaO2: such a folder is refused at start-up
    const dir = departmentFolder({ 'line.njk': 'pH {{ v.gas.ph }}, PaO2 {{ v.gas.po2 }}.' });
    expect(() => createNoteRenderer({ templateDir: dir })).toThrow(/line\.njk failed/);
  });
});

describe('the default templates hold wording, not arithmetic', () => {
  const files = readdirSync(DEFAULT_TEMPLATE_DIR).filter((f) => f.endsWith('.njk'));

  it.each(files)('%s: no arithmetic or number filters inside template tags', (file) => {
    const text = readFileSync(path.join(DEFAULT_TEMPLATE_DIR, file), 'utf8').replace(
      /\{#[\s\S]*?#\}/g,
      '',
    );
    const tags = [...text.matchAll(/\{([{%])-?([\s\S]*?)-?[}%]\}/g)].map((m) => m[2] ?? '');
    for (const tag of tags) {
      const code = tag.replace(/"[^"]*"|'[^']*'/g, '""');
      expect(code, tag).not.toMatch(/[*/%]/);
      expect(code, tag).not.toMatch(/\d\s*[-+]|[-+]\s*\d/);
      expect(code, tag).not.toMatch(/\|\s*(round|float|int|abs|sum)\b/);
    }
  });
});

describe('a department folder is code: checked at start-up, failures named without values', () => {
  it('a template that prints a value some cases lack is refused when the renderer is made, naming the example and the file', () => {
    // "lactate" is absent from most invented examples: printing it unguarded fails for them
    const dir = departmentFolder({ 'line.njk': 'Lactate {{ v.gas.lactate }}.' });
    expect(() => createNoteRenderer({ templateDir: dir })).toThrow(
      /cannot render the invented example "[^"]+": line\.njk failed \((Template render error|Error)\)[\s\S]*will not start/,
    );
  });

  it('a template with a syntax error is refused too', () => {
    const dir = departmentFolder({ 'plan.njk': '{% if %}' });
    expect(() => createNoteRenderer({ templateDir: dir })).toThrow();
  });

  it('a render error carries the template name and error class only, never the data', () => {
    const renderer = createNoteRenderer();
    const f = read(C.ventilatedMmHg);
    // a findings object whose view cannot be built the way the templates expect
    const broken = { ...f, case: { ...f.case, gas: { ...f.case.gas, ph: Number.NaN } } };
    try {
      renderer.render(broken as typeof f);
    } catch (error) {
      expect(error).toBeInstanceOf(TemplateError);
      expect(String((error as Error).message)).not.toMatch(/7\.31|48/);
      return;
    }
    throw new Error('expected the render to fail');
  });
});
