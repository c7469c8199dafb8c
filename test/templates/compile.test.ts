// The template compiler (templates/compile.ts) against nunjucks itself, the reference: the same templates and
// data must give the same text, character for character. First the note's own templates over every invented
// case and random cases of the whole schema, then small templates for each construct, then the fallback.
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import fc from 'fast-check';
import nunjucks from 'nunjucks';
import { afterAll, describe, expect, it } from 'vitest';
import { interpret, type Findings } from '../../calc/index.ts';
import { createCompiledTemplates, Unsupported } from '../../templates/compile.ts';
import { createNoteRenderer } from '../../templates/index.ts';
import { anyCase, FC_RUNS } from '../calc/helpers.ts';
import { ALL_CASES, read } from './cases.ts';

const compiled = createNoteRenderer({ engine: 'compiled' });
const reference = createNoteRenderer({ engine: 'nunjucks' });

function sameNote(f: Findings) {
  for (const format of ['text', 'markdown'] as const) {
    expect(compiled.render(f, { format })).toEqual(reference.render(f, { format }));
  }
  for (const flag of f.flags)
    expect(compiled.flagMessage(flag, f)).toBe(reference.flagMessage(flag, f));
}

describe('the note under the compiled templates', () => {
  it('uses them by default', () => {
    expect(createNoteRenderer().engine).toBe('compiled');
    expect(reference.engine).toBe('nunjucks');
  });

  it.each(Object.entries(ALL_CASES))(
    '%s: the same note, line, handover and flag sentences as nunjucks gives',
    (_name, c) => {
      sameNote(read(c));
    },
  );

  it('the same text as nunjucks for random cases over the whole schema', () => {
    let rendered = 0;
    fc.assert(
      fc.property(anyCase, (c) => {
        const f = interpret(c);
        if (!f.ok) return;
        rendered++;
        sameNote(f);
      }),
      { numRuns: Math.min(FC_RUNS, 300) },
    );
    expect(rendered).toBeGreaterThan(0);
  });
});

// small templates, one construct each, rendered by nunjucks and by the compiler from the same folder
const folder = mkdtempSync(path.join(os.tmpdir(), 'gasline-compile-'));
afterAll(() => rmSync(folder, { recursive: true, force: true }));
const OPTIONS = { autoescape: false, throwOnUndefined: true, trimBlocks: true, lstripBlocks: true };

function pair(files: Record<string, string>, options: Record<string, unknown> = OPTIONS) {
  const dir = mkdtempSync(path.join(folder, 'case-'));
  for (const [name, text] of Object.entries(files)) writeFileSync(path.join(dir, name), text);
  const env = new nunjucks.Environment(new nunjucks.FileSystemLoader([dir]), options);
  env.addFilter('shout', (s: unknown) => `${String(s)}!`);
  return { env, fast: createCompiledTemplates(env) };
}

const DATA = {
  n: 3,
  s: 'Text',
  xs: [1, 2, 3],
  empty: [],
  pairs: [
    ['a', 1],
    ['b', 2],
  ],
  obj: { k: 'v', j: 'w' },
  nested: { deep: { value: 7 } },
  word: 'mmHg',
  nothing: null,
  flag: true,
  list: ['x', 'y'],
  zero: 0,
};

const CONSTRUCTS: Record<string, Record<string, string>> = {
  'output and literals': {
    'main.njk': '{{ n }} {{ s }} {{ "q\\"uote" }} {{ 1.5 }} {{ true }} {{ xs }}',
  },
  'member lookup, dotted and bracketed': {
    'main.njk':
      '{{ nested.deep.value }} {{ nested["deep"]["value"] }} {{ pairs[1][0] }} {{ list.length }}',
  },
  'methods keep their object': { 'main.njk': '{{ list.join("+") }} {{ s.toUpperCase() }}' },
  'if, elif, else and truthiness': {
    'main.njk':
      '{% for x in [0, 1, 2, "", "a", none] %}{% if x == 1 %}one{% elif x %}[{{ x }}]{% else %}-{% endif %}{% endfor %}',
  },
  'comparisons and logic as nunjucks writes them': {
    'main.njk':
      '{{ n > 2 and s == "Text" }} {{ not flag }} {{ not (n == 3) }} {{ zero or "z" }} {{ n != 4 }} {{ 2 < n <= 3 }}',
  },
  'arithmetic and concatenation': {
    'main.njk':
      '{{ n + 1 }} {{ n - 1 }} {{ n * 2 }} {{ n / 2 }} {{ n // 2 }} {{ n % 2 }} {{ n ** 2 }} {{ -n }} {{ s ~ n }}',
  },
  'inline if': { 'main.njk': '{{ "yes" if flag else "no" }}|{{ "shown" if nothing }}|' },
  'in and is': {
    'main.njk':
      '{{ 2 in xs }} {{ "q" in s }} {{ n is defined }} {{ missing is defined }} {{ n is odd }}',
  },
  'for with loop variables and else': {
    'main.njk':
      '{% for x in xs %}{{ loop.index }}/{{ loop.index0 }}/{{ loop.revindex }}/{{ loop.revindex0 }}/{{ loop.first }}/{{ loop.last }}/{{ loop.length }};{% endfor %}{% for x in empty %}never{% else %}none{% endfor %}{% for x in nothing %}never{% else %}nothing{% endfor %}',
  },
  'for over pairs and over an object': {
    'main.njk':
      '{% for a, b in pairs %}{{ a }}={{ b }},{% endfor %}{% for k, v in obj %}{{ k }}:{{ v }}:{{ loop.index }},{% endfor %}',
  },
  'nested loops keep their own loop': {
    'main.njk':
      '{% for a in xs %}{% for b in list %}{{ loop.index }}{% endfor %}{{ loop.index }};{% endfor %}',
  },
  'set at the top, in a loop and as a block': {
    'main.njk':
      '{% set a = 1 %}{% for x in xs %}{% set a = x %}{% set inner = x %}{% endfor %}{{ a }}{% if inner is defined %}leaked{% endif %}{% set block %}  captured {{ n }} {% endset %}[{{ block }}]',
  },
  'filters, built in and added': {
    'main.njk':
      '{{ s | upper }} {{ list | join(", ") }} {{ missing | default("d") }} {{ nothing | default("n", true) }} {{ s | replace("T", "N") }} {{ xs | length }} {{ s | shout }} {{ "  a  " | trim }}',
  },
  'filter blocks': { 'main.njk': '{% filter upper %}inside {{ s }}{% endfilter %}' },
  'macros: positional, keyword, defaults, extra positionals': {
    'main.njk':
      '{% macro m(a, b, c="C", d="D") %}<{{ a }}|{{ b }}|{{ c }}|{{ d }}>{% endmacro %}{{ m(1, 2) }}{{ m(1, b=5) }}{{ m(1, 2, 3, 4) }}{{ m(a=9, b=8, d=7) }}{{ m(1, 2, d="x") }}',
  },
  'macro defaults see earlier arguments': {
    'main.njk': '{% macro m(a, b=a) %}{{ a }}{{ b }}{% endmacro %}{{ m("x") }}{{ m("x", "y") }}',
  },
  // (macros called with a body are written in their own file, as the note's are: nunjucks loses the loop
  // variables of a call block when the macro is defined in the same file)
  'call blocks, with and without arguments, inside a loop': {
    'lib.njk':
      '{% macro wrap(t) %}[{{ t }}:{{ caller() }}]{% endmacro %}{% macro each(items) %}{% for i in items %}{{ caller(i) }}{% endfor %}{% endmacro %}',
    'main.njk':
      '{% import "lib.njk" as l %}{% for x in xs %}{% call l.wrap(x) %}body {{ x }} {{ loop.index }}{% endcall %}{% endfor %}{% call(item) l.each(list) %}<{{ item }}>{% endcall %}',
  },
  "macros see the template's variables, not the caller's locals": {
    'main.njk':
      '{% set top = "T" %}{% macro m() %}{{ top }}{% if x is defined %}x{% endif %}{% endmacro %}{% for x in xs %}{{ m() }}{% endfor %}',
  },
  'import with and without context, and from-import': {
    'lib.njk':
      '{% set shared = "S" %}{% macro greet(name) %}hello {{ name }}{% if n is defined %} n={{ n }}{% endif %}{% endmacro %}{% macro _hidden() %}h{% endmacro %}printed text is dropped',
    'main.njk':
      '{% import "lib.njk" as lib with context %}{% import "lib.njk" as bare %}{% from "lib.njk" import greet as g, shared %}{{ lib.greet("a") }}|{{ bare.greet("b") }}|{{ g("c") }}|{{ shared }}|{% if lib._hidden is defined %}hidden exported{% endif %}',
  },
  "include sees the includer's variables and loop": {
    'part.njk': '({{ n }} {{ x }} {{ loop.index }}{% set local = 1 %})',
    'main.njk':
      '{% for x in list %}{% include "part.njk" %}{% endfor %}{% if local is defined %}leaked{% endif %}',
  },
  'include of a missing file, ignored': {
    'main.njk': 'a{% include "absent.njk" ignore missing %}b',
  },
  switch: {
    'main.njk':
      '{% for x in xs %}{% switch x %}{% case 1 %}one{% case 2 %}{% case 3 %}two-or-three{% default %}other{% endswitch %};{% endfor %}',
  },
  'whitespace control and trimmed blocks': {
    'main.njk':
      '<ul>\n  {% for x in xs -%}\n    <li>{{ x }}</li>\n  {%- endfor %}\n</ul>\n{#- comment -#}\n  {% if flag %}\n  kept\n  {% endif %}\nend',
  },
  globals: {
    'main.njk':
      '{% for i in range(3) %}{{ i }}{% endfor %}{% set j = joiner("; ") %}{% for x in xs %}{{ j() }}{{ x }}{% endfor %}',
  },
};

describe('each construct gives what nunjucks gives', () => {
  it.each(Object.entries(CONSTRUCTS))('%s', (_name, files) => {
    const { env, fast } = pair(files);
    const expected = env.render('main.njk', DATA);
    expect(fast.render('main.njk', DATA)).toBe(expected);
    // and a second time, since a render must leave nothing behind for the next
    expect(fast.render('main.njk', DATA)).toBe(expected);
  });

  it("a call block inside a macro reaches that macro's own caller (Jinja's meaning, from memory; nunjucks overflows its stack here)", () => {
    const { fast } = pair({
      'lib.njk':
        '{% macro inner() %}({{ caller() }}){% endmacro %}{% macro outer() %}{% call inner() %}{{ caller() }}{% endcall %}{% endmacro %}',
      'main.njk': '{% import "lib.njk" as l %}{% call l.outer() %}deep{% endcall %}',
    });
    expect(fast.render('main.njk', DATA)).toBe('(deep)');
  });

  it('autoescaping: the same escaping as nunjucks for values, macros, captures, filters and includes', () => {
    const payload = {
      ...DATA,
      s: '<script>alert("x")</script> & \'q\'',
      list: ['<b>', '"quoted"'],
    };
    const { env, fast } = pair(
      {
        'part.njk': '<i>{{ s }}</i>',
        'main.njk':
          '{% macro m(x) %}<em>{{ x }}</em>{% endmacro %}{{ s }}|{{ m(s) }}|{{ s | safe }}|{{ s | escape }}|{{ list | join("<br>") }}|{% set c %}<u>{{ s }}</u>{% endset %}{{ c }}|{% include "part.njk" %}|{{ s | upper }}|{{ m(s) | upper }}',
      },
      { ...OPTIONS, autoescape: true },
    );
    const expected = env.render('main.njk', payload);
    expect(expected.split('|')[0]).toBe(
      '&lt;script&gt;alert(&quot;x&quot;)&lt;/script&gt; &amp; &#39;q&#39;',
    );
    expect(fast.render('main.njk', payload)).toBe(expected);
  });

  it('printing a missing value throws, naming the template and line, as nunjucks does under throwOnUndefined', () => {
    const { env, fast } = pair({ 'main.njk': 'line one\n{{ nothing }}' });
    expect(() => env.render('main.njk', DATA)).toThrow(/null or undefined/);
    expect(() => fast.render('main.njk', DATA)).toThrow(
      /main\.njk.*Line 2[\s\S]*null or undefined/,
    );
  });

  it('without throwOnUndefined a missing value prints nothing, in both', () => {
    const { env, fast } = pair(
      { 'main.njk': '[{{ nothing }}{{ missing.deeper }}]' },
      { ...OPTIONS, throwOnUndefined: false },
    );
    expect(fast.render('main.njk', DATA)).toBe(env.render('main.njk', DATA));
    expect(fast.render('main.njk', DATA)).toBe('[]');
  });

  it('an unknown filter fails when it is reached, as in nunjucks', () => {
    const { fast } = pair({ 'main.njk': '{% if flag %}{{ s | nosuchfilter }}{% endif %}' });
    expect(fast.render('main.njk', { ...DATA, flag: false })).toBe('');
    expect(() => fast.render('main.njk', DATA)).toThrow(/filter not found: nosuchfilter/);
  });
});

describe('what the compiler leaves to nunjucks', () => {
  it('template inheritance is Unsupported', () => {
    const { fast } = pair({
      'base.njk': '{% block body %}base{% endblock %}',
      'main.njk': '{% extends "base.njk" %}{% block body %}child{% endblock %}',
    });
    expect(() => fast.get('main.njk')).toThrow(Unsupported);
  });

  it('a department template the compiler cannot take keeps the renderer on nunjucks, and it still renders', () => {
    const { env } = pair({});
    void env;
    const dir = mkdtempSync(path.join(folder, 'dept-'));
    writeFileSync(path.join(dir, 'base.njk'), 'Reviewed: {% block body %}{% endblock %}');
    writeFileSync(
      path.join(dir, 'line.njk'),
      '{% extends "base.njk" %}{% block body %}pH {{ v.gas.ph }}{% endblock %}',
    );
    const renderer = createNoteRenderer({ templateDir: dir });
    expect(renderer.engine).toBe('nunjucks');
    const f = read(ALL_CASES.ventilatedMmHg);
    expect(renderer.render(f).line).toBe('Reviewed: pH 7.31');
  });
});
