// Nunjucks templates compiled to plain JavaScript functions, once, when a renderer is made.
//
// Why: nunjucks' own output calls back into its runtime for every variable (a chain of Frame objects), re-runs
// each imported file's macros through its loader on every render, and threads includes through callbacks.
// For the note that cost about 0.45 ms a render on the benchmark machine; compiled, about 0.17 ms. Here the same parse tree (nunjucks' own lexer and parser, so
// whitespace control and syntax are exactly nunjucks') becomes JavaScript with variables resolved while
// compiling, loops over plain arrays, and imports and includes called directly.
//
// The expressions are written out as nunjucks writes them (the same operators, no added brackets, its own
// helpers for macros, calls and filters; a dotted name is read directly, with memberLookup's result), so a
// template means the same thing under both. The test
// renders every template with both and compares the text. Anything this does not handle (template
// inheritance, extensions, asynchronous filters) raises Unsupported, and the renderer stays on nunjucks.
import nunjucks from 'nunjucks';

type AnyNode = { typename: string; lineno: number; colno: number; [key: string]: any };
type Runtime = typeof nunjucks.runtime & Record<string, any>;
type Scope = Record<string, unknown>;

/** A compiled template: its text for a scope of variables, and the names it exports to an import. */
export interface CompiledTemplate {
  name: string;
  render(scope: Scope): string;
  exportNames: readonly string[];
}

/** The template uses something this compiler does not handle; use nunjucks for it. */
export class Unsupported extends Error {}

const runtime = nunjucks.runtime as Runtime;
const parse = (source: string, extensions: unknown[], opts: unknown): AnyNode =>
  (
    nunjucks as unknown as {
      parser: { parse(src: string, ext: unknown[], opts: unknown): AnyNode };
    }
  ).parser.parse(source, extensions, opts);

/** Compile-time scope: the names a block can see as JavaScript variables. */
class Block {
  readonly vars = new Map<string, string>();
  constructor(
    readonly parent: Block | null,
    readonly kind: 'root' | 'for' | 'macro' | 'caller' | 'capture',
  ) {}
  lookup(name: string): string | null {
    for (let b: Block | null = this; b; b = b.parent) {
      const id = b.vars.get(name);
      if (id) return id;
    }
    return null;
  }
  /** true for the template's own top level: not inside a loop, macro, caller or captured block */
  get topLevel(): boolean {
    return this.kind === 'root';
  }
  /** every variable visible here, nearest last (so the nearest wins when they are copied in order) */
  visible(): Array<[string, string]> {
    const chain: Block[] = [];
    for (let b: Block | null = this; b; b = b.parent) chain.unshift(b);
    return chain.flatMap((b) => [...b.vars]);
  }
}

const jsString = (s: string) => JSON.stringify(s);

class Compiler {
  private code: string[] = [];
  private lastId = 0;
  private readonly exportNames = new Set<string>();
  private readonly rootSets = new Set<string>();
  private readonly filterIds = new Map<string, string>();
  private readonly testIds = new Map<string, string>();
  private readonly templateIds = new Map<string, string>();

  constructor(
    private readonly name: string,
    private readonly path: string,
    private readonly throwOnUndefined: boolean,
    private readonly autoescape: boolean,
  ) {}

  private id(prefix = 't') {
    return `${prefix}_${++this.lastId}`;
  }
  private emit(line: string) {
    this.code.push(line);
  }
  private fail(node: AnyNode, what: string): never {
    throw new Unsupported(
      `${this.name} line ${node.lineno + 1}: ${what} is not handled by the template compiler`,
    );
  }

  compileRoot(root: AnyNode): { body: string; exportNames: string[] } {
    const block = new Block(null, 'root');
    this.emit('var out = "";');
    this.statements(root.children, block);
    this.emit('return out;');
    const prelude = [
      ...[...this.filterIds].map(([name, id]) => `var ${id} = rt.filter(${jsString(name)});`),
      ...[...this.testIds].map(([name, id]) => `var ${id} = rt.test(${jsString(name)});`),
      ...[...this.templateIds].map(([, id]) => `var ${id} = null;`),
    ];
    const body = `${prelude.join('\n')}\nreturn function render(s) {\n${this.code.join('\n')}\n};`;
    return { body, exportNames: [...this.exportNames] };
  }

  private statements(nodes: AnyNode[], block: Block) {
    for (const node of nodes) this.statement(node, block);
  }

  private statement(node: AnyNode, block: Block): void {
    switch (node.typename) {
      case 'NodeList':
        return this.statements(node.children, block);
      case 'Output':
        return this.output(node, block);
      case 'TemplateData':
        if (node.value) this.emit(`out += ${jsString(String(node.value))};`);
        return;
      case 'If':
        return this.ifStatement(node, block);
      case 'For':
        return this.forStatement(node, block);
      case 'Set':
        return this.setStatement(node, block);
      case 'Macro':
        return this.macroStatement(node, block);
      case 'Import':
        return this.importStatement(node, block);
      case 'FromImport':
        return this.fromImportStatement(node, block);
      case 'Include':
        return this.includeStatement(node, block);
      case 'Switch':
        return this.switchStatement(node, block);
      default:
        return this.fail(node, `the ${node.typename} tag`);
    }
  }

  private output(node: AnyNode, block: Block) {
    for (const child of node.children as AnyNode[]) {
      if (child.typename === 'TemplateData') {
        if (child.value) this.emit(`out += ${jsString(String(child.value))};`);
      } else {
        const value = this.expr(child, block);
        const checked = this.throwOnUndefined
          ? `rt.defined(${value}, ${jsString(this.name)}, ${node.lineno}, ${node.colno})`
          : value;
        // unescaped and checked, the value is printed as it is; otherwise nunjucks' own rule (escaping, '' for nothing)
        this.emit(
          this.throwOnUndefined && !this.autoescape
            ? `out += ${checked};`
            : `out += rt.suppressValue(${checked}, ${this.autoescape});`,
        );
      }
    }
  }

  private ifStatement(node: AnyNode, block: Block) {
    this.emit(`if(${this.expr(node.cond, block)}) {`);
    this.statement(node.body, block);
    if (node.else_) {
      this.emit('} else {');
      this.statement(node.else_, block);
    }
    this.emit('}');
  }

  private switchStatement(node: AnyNode, block: Block) {
    this.emit(`switch (${this.expr(node.expr, block)}) {`);
    for (const c of node.cases as AnyNode[]) {
      this.emit(`case ${this.expr(c.cond, block)}:`);
      this.statement(c.body, block);
      if (c.body.children.length) this.emit('break;');
    }
    if (node.default) {
      this.emit('default:');
      this.statement(node.default, block);
    }
    this.emit('}');
  }

  /** A loop: its own block; loop.index and friends as nunjucks gives them. */
  private forStatement(node: AnyNode, outer: Block) {
    const block = new Block(outer, 'for');
    const arr = this.id();
    const i = this.id();
    const len = this.id();
    const loop = this.id();
    block.vars.set('loop', loop);
    this.emit(`var ${arr} = ${this.expr(node.arr, outer)}; var ${len} = 0;`);
    this.emit(`if(${arr}) {`);
    this.emit(`${arr} = rt.fromIterator(${arr});`);
    const bindLoop = () =>
      this.emit(
        `var ${loop} = {index: ${i} + 1, index0: ${i}, revindex: ${len} - ${i}, revindex0: ${len} - ${i} - 1, first: ${i} === 0, last: ${i} === ${len} - 1, length: ${len}};`,
      );
    if (node.name.typename === 'Array') {
      const names = (node.name.children as AnyNode[]).map((child) => child.value as string);
      const ids = names.map(() => this.id());
      names.forEach((n, u) => block.vars.set(n, ids[u]!));
      this.emit(`var ${i};`);
      this.emit(`if(rt.isArray(${arr})) {`);
      this.emit(`${len} = ${arr}.length;`);
      this.emit(`for(${i} = 0; ${i} < ${arr}.length; ${i}++) {`);
      ids.forEach((id, u) => this.emit(`var ${id} = ${arr}[${i}][${u}];`));
      bindLoop();
      this.statement(node.body, block);
      this.emit('}');
      this.emit('} else {');
      if (names.length !== 2) this.fail(node, 'a loop over an object with other than two names');
      this.emit(`${i} = -1; ${len} = rt.keys(${arr}).length;`);
      this.emit(`for(var ${ids[0]} in ${arr}) {`);
      this.emit(`${i}++; var ${ids[1]} = ${arr}[${ids[0]}];`);
      bindLoop();
      this.statement(node.body, block);
      this.emit('}');
      this.emit('}');
    } else {
      const item = this.id();
      block.vars.set(node.name.value, item);
      this.emit(`${len} = ${arr}.length;`);
      this.emit(`for(var ${i} = 0; ${i} < ${arr}.length; ${i}++) {`);
      this.emit(`var ${item} = ${arr}[${i}];`);
      bindLoop();
      this.statement(node.body, block);
      this.emit('}');
    }
    this.emit('}');
    if (node.else_) {
      this.emit(`if (!${len}) {`);
      this.statement(node.else_, outer);
      this.emit('}');
    }
  }

  /**
   * `set`: at the top level the name goes into the template's variables (and its exports, as nunjucks does);
   * elsewhere it updates the variable it names if one is in reach, or makes one in the nearest block.
   */
  private setStatement(node: AnyNode, block: Block) {
    const value = node.value ? this.expr(node.value, block) : this.expr(node.body, block);
    const tmp = this.id();
    this.emit(`var ${tmp} = ${value};`);
    for (const target of node.targets as AnyNode[]) {
      const name = target.value as string;
      if (block.topLevel) {
        this.emit(`s[${jsString(name)}] = ${tmp};`);
        this.rootSets.add(name);
        if (!name.startsWith('_')) this.exportNames.add(name);
        continue;
      }
      const existing = block.lookup(name);
      if (existing) {
        this.emit(`${existing} = ${tmp};`);
        continue;
      }
      if (this.reachesRoot(block) && this.rootSets.has(name)) {
        this.emit(`s[${jsString(name)}] = ${tmp};`);
        continue;
      }
      const id = this.id();
      block.vars.set(name, id);
      this.emit(`var ${id} = ${tmp};`);
    }
  }

  /** true when the block sits in the template's top-level code (loops only, no macro between) */
  private reachesRoot(block: Block): boolean {
    for (let b: Block | null = block; b; b = b.parent) {
      if (b.kind === 'root') return true;
      if (b.kind !== 'for') return false;
    }
    return false;
  }

  /** A macro's function. Macros see their arguments and the template's variables; callers also see their call site. */
  private macroFunction(node: AnyNode, block: Block): string {
    const args: AnyNode[] = [];
    let kwargs: AnyNode | null = null;
    const list = node.args.children as AnyNode[];
    list.forEach((arg, i) => {
      if (i === list.length - 1 && (arg.typename === 'Dict' || arg.typename === 'KeywordArgs'))
        kwargs = arg;
      else if (arg.typename === 'Symbol') args.push(arg);
      else this.fail(arg, 'a macro argument that is not a name');
    });
    const inner = new Block(block, node.typename === 'Caller' ? 'caller' : 'macro');
    const params = args.map((a) => {
      const id = `l_${a.value}_${++this.lastId}`;
      inner.vars.set(a.value, id);
      return id;
    });
    const kwNames = ((kwargs as AnyNode | null)?.children ?? []).map(
      (p: AnyNode) => p.key.value as string,
    );
    const kw = this.id('kw');
    const callerId = this.id();
    // a caller passed to this call; otherwise whatever `caller` means where the macro was written
    const outerCaller =
      node.typename === 'Caller' ? (block.lookup('caller') ?? 's["caller"]') : 's["caller"]';
    const lines: string[] = [];
    const saved = this.code;
    this.code = lines;
    lines.push(
      `rt.makeMacro([${args.map((a) => jsString(a.value)).join(', ')}], [${kwNames.map(jsString).join(', ')}], function (${[...params, kw].join(', ')}) {`,
    );
    lines.push(`${kw} = ${kw} || {};`);
    lines.push(
      `var ${callerId} = Object.prototype.hasOwnProperty.call(${kw}, "caller") ? ${kw}.caller : ${outerCaller};`,
    );
    inner.vars.set('caller', callerId);
    for (const pair of ((kwargs as AnyNode | null)?.children ?? []) as AnyNode[]) {
      const id = `l_${pair.key.value}_${++this.lastId}`;
      lines.push(
        `var ${id} = Object.prototype.hasOwnProperty.call(${kw}, ${jsString(pair.key.value)}) ? ${kw}[${jsString(pair.key.value)}] : ${this.expr(pair.value, inner)};`,
      );
      inner.vars.set(pair.key.value, id);
    }
    lines.push('var out = "";');
    this.statement(node.body, inner);
    this.code = saved;
    lines.push('return new rt.SafeString(out);');
    lines.push('})');
    return lines.join('\n');
  }

  private macroStatement(node: AnyNode, block: Block) {
    // nunjucks compiles a named macro without its surroundings: it sees its arguments and the template's variables
    const isolated = new Block(null, 'macro');
    const fn = this.macroFunction(node, isolated);
    const name = node.name.value as string;
    if (block.topLevel) {
      this.emit(`s[${jsString(name)}] = ${fn};`);
      if (!name.startsWith('_')) this.exportNames.add(name);
    } else {
      const id = this.id();
      block.vars.set(name, id);
      this.emit(`var ${id} = ${fn};`);
    }
  }

  /** The variables an included or imported template starts with: the template's, plus those in reach here. */
  private childScope(block: Block): string {
    const locals = block.visible();
    if (!locals.length) return 'rt.extend(s)';
    return `rt.extend(s, {${locals.map(([n, id]) => `${jsString(n)}: ${id}`).join(', ')}})`;
  }

  private templateRef(node: AnyNode, block: Block): string {
    if (node.template.typename === 'Literal' && typeof node.template.value === 'string') {
      const key = node.template.value as string;
      let id = this.templateIds.get(key);
      if (!id) {
        id = this.id('tpl');
        this.templateIds.set(key, id);
      }
      return `(${id} || (${id} = rt.template(${jsString(key)}, ${jsString(this.path)})))`;
    }
    return `rt.template(${this.expr(node.template, block)}, ${jsString(this.path)})`;
  }

  private importStatement(node: AnyNode, block: Block) {
    const scope = node.withContext ? this.childScope(block) : 'rt.globalScope()';
    this.bindName(
      node.target.value,
      `rt.exported(${this.templateRef(node, block)}, ${scope})`,
      block,
    );
  }

  private fromImportStatement(node: AnyNode, block: Block) {
    const scope = node.withContext ? this.childScope(block) : 'rt.globalScope()';
    const exported = this.id();
    this.emit(`var ${exported} = rt.exported(${this.templateRef(node, block)}, ${scope});`);
    for (const nameNode of node.names.children as AnyNode[]) {
      const [name, alias] =
        nameNode.typename === 'Pair'
          ? [nameNode.key.value, nameNode.value.value]
          : [nameNode.value, nameNode.value];
      this.emit(
        `if(!Object.prototype.hasOwnProperty.call(${exported}, ${jsString(name)})) throw new Error(${jsString(`cannot import '${name}'`)});`,
      );
      this.bindName(alias, `${exported}[${jsString(name)}]`, block);
    }
  }

  private bindName(name: string, value: string, block: Block) {
    if (block.topLevel) {
      this.emit(`s[${jsString(name)}] = ${value};`);
      return;
    }
    const id = this.id();
    block.vars.set(name, id);
    this.emit(`var ${id} = ${value};`);
  }

  private includeStatement(node: AnyNode, block: Block) {
    const ref = node.ignoreMissing
      ? `rt.templateOrNull(${node.template.typename === 'Literal' ? jsString(node.template.value) : this.expr(node.template, block)}, ${jsString(this.path)})`
      : this.templateRef(node, block);
    const t = this.id();
    this.emit(`var ${t} = ${ref};`);
    this.emit(`if (${t}) out += ${t}.render(${this.childScope(block)});`);
  }

  // ---- expressions, written as nunjucks writes them ----

  private expr(node: AnyNode, block: Block): string {
    switch (node.typename) {
      case 'Literal':
        return this.literal(node.value);
      case 'Symbol':
        return block.lookup(node.value) ?? `s[${jsString(node.value)}]`;
      case 'Group':
        return `(${this.list(node.children, block)})`;
      case 'Array':
        return `[${this.list(node.children, block)}]`;
      case 'Dict':
        return `{${this.list(node.children, block)}}`;
      case 'Pair': {
        const key = node.key;
        if (
          key.typename !== 'Symbol' &&
          !(key.typename === 'Literal' && typeof key.value === 'string')
        )
          this.fail(node, 'a dictionary key that is not a string or name');
        return `${jsString(String(key.value))}: ${this.expr(node.value, block)}`;
      }
      case 'NodeList':
        return this.list(node.children, block);
      case 'InlineIf':
        return `(${this.expr(node.cond, block)}?${this.expr(node.body, block)}:${node.else_ !== null ? this.expr(node.else_, block) : '""'})`;
      case 'In':
        return `rt.inOperator(${this.expr(node.left, block)},${this.expr(node.right, block)})`;
      case 'Is': {
        const test = node.right.name ? node.right.name.value : node.right.value;
        const args = node.right.args ? `,${this.expr(node.right.args, block)}` : '';
        return `${this.testId(test)}.call(rt.filterContext, ${this.expr(node.left, block)}${args}) === true`;
      }
      case 'Or':
        return `${this.expr(node.left, block)} || ${this.expr(node.right, block)}`;
      case 'And':
        return `${this.expr(node.left, block)} && ${this.expr(node.right, block)}`;
      case 'Add':
        return `${this.expr(node.left, block)} + ${this.expr(node.right, block)}`;
      case 'Concat':
        return `${this.expr(node.left, block)} + "" + ${this.expr(node.right, block)}`;
      case 'Sub':
        return `${this.expr(node.left, block)} - ${this.expr(node.right, block)}`;
      case 'Mul':
        return `${this.expr(node.left, block)} * ${this.expr(node.right, block)}`;
      case 'Div':
        return `${this.expr(node.left, block)} / ${this.expr(node.right, block)}`;
      case 'Mod':
        return `${this.expr(node.left, block)} % ${this.expr(node.right, block)}`;
      case 'FloorDiv':
        return `Math.floor(${this.expr(node.left, block)} / ${this.expr(node.right, block)})`;
      case 'Pow':
        return `Math.pow(${this.expr(node.left, block)}, ${this.expr(node.right, block)})`;
      case 'Not':
        return `!${this.expr(node.target, block)}`;
      case 'Neg':
        return `-${this.expr(node.target, block)}`;
      case 'Pos':
        return `+${this.expr(node.target, block)}`;
      case 'Compare': {
        const ops: Record<string, string> = {
          '==': '==',
          '===': '===',
          '!=': '!=',
          '!==': '!==',
          '<': '<',
          '>': '>',
          '<=': '<=',
          '>=': '>=',
        };
        let out = this.expr(node.expr, block);
        for (const op of node.ops as AnyNode[]) {
          const js = ops[op.type];
          if (!js) this.fail(node, `the comparison ${op.type}`);
          out += ` ${js} ${this.expr(op.expr, block)}`;
        }
        return out;
      }
      case 'LookupVal': {
        // a name after the dot: read it directly, so each place keeps its own fast property access;
        // same result as nunjucks' memberLookup (nothing from nothing, methods bound to their object)
        const key = node.val;
        if (
          key.typename === 'Literal' &&
          typeof key.value === 'string' &&
          /^[A-Za-z_$][\w$]*$/.test(key.value)
        ) {
          const t = this.temp();
          const target = this.expr(node.target, block);
          return `((${t} = ${target}) === undefined || ${t} === null ? undefined : typeof ${t}.${key.value} === 'function' ? rt.memberLookup(${t}, ${jsString(key.value)}) : ${t}.${key.value})`;
        }
        return `rt.memberLookup((${this.expr(node.target, block)}),${this.expr(key, block)})`;
      }
      case 'FunCall':
        return `rt.callWrap(${this.expr(node.name, block)}, ${jsString(nodeName(node.name))}, rt.filterContext, [${this.list(node.args.children, block)}])`;
      case 'Filter': {
        if (node.name.typename !== 'Symbol') this.fail(node, 'a filter that is not a name');
        return `${this.filterId(node.name.value)}.call(rt.filterContext, ${this.list(node.args.children, block)})`;
      }
      case 'KeywordArgs':
        return `rt.makeKeywordArgs({${this.list(node.children, block)}})`;
      case 'Caller':
        return this.macroFunction(node, block);
      case 'Capture': {
        const inner = new Block(block, 'capture');
        const saved = this.code;
        this.code = ['(function() {', 'var out = "";'];
        this.statement(node.body, inner);
        this.code.push('return out;', '})()');
        const text = this.code.join('\n');
        this.code = saved;
        return text;
      }
      default:
        return this.fail(node, `the ${node.typename} expression`);
    }
  }

  /** a variable for an intermediate value, declared in the function being written */
  private temp(): string {
    const id = this.id('v');
    this.code.push(`var ${id};`);
    return id;
  }

  private list(nodes: AnyNode[], block: Block): string {
    return nodes.map((n) => this.expr(n, block)).join(',');
  }

  private literal(value: unknown): string {
    if (typeof value === 'string') return jsString(value);
    if (value === null) return 'null';
    return String(value);
  }

  private filterId(name: string): string {
    let id = this.filterIds.get(name);
    if (!id) {
      id = this.id('filter');
      this.filterIds.set(name, id);
    }
    return id;
  }

  private testId(name: string): string {
    let id = this.testIds.get(name);
    if (!id) {
      id = this.id('test');
      this.testIds.set(name, id);
    }
    return id;
  }
}

/** How nunjucks names a callee in its "Unable to call" message. */
function nodeName(node: AnyNode): string {
  switch (node.typename) {
    case 'Symbol':
      return node.value;
    case 'FunCall':
      return `the return value of (${nodeName(node.name)})`;
    case 'LookupVal':
      return `${nodeName(node.target)}["${nodeName(node.val)}"]`;
    case 'Literal':
      return String(node.value);
    default:
      return '--expression--';
  }
}

/**
 * Every template of an environment, compiled on first use. `template(name)` resolves a name as the environment's
 * loader does (a department's folder before the defaults). Throws Unsupported for a template it cannot compile.
 */
export function createCompiledTemplates(env: nunjucks.Environment) {
  const compiled = new Map<string, CompiledTemplate>();
  const opts = (env as unknown as { opts: Record<string, unknown> }).opts;
  const throwOnUndefined = Boolean(opts.throwOnUndefined);
  const autoescape = Boolean(opts.autoescape);
  const extensions = (env as unknown as { extensionsList?: unknown[] }).extensionsList ?? [];
  if (extensions.length)
    throw new Unsupported('template extensions are not handled by the template compiler');
  const globals = (env as unknown as { globals: Record<string, unknown> }).globals;
  const filterContext = { env, ctx: {} };

  const rt = {
    ...runtime,
    filterContext,
    isArray: Array.isArray,
    keys: Object.keys,
    filter(name: string) {
      try {
        return env.getFilter(name);
      } catch {
        return () => {
          throw new Error(`filter not found: ${name}`);
        };
      }
    },
    test(name: string) {
      try {
        return (env as unknown as { getTest(n: string): unknown }).getTest(name);
      } catch {
        return () => {
          throw new Error(`test not found: ${name}`);
        };
      }
    },
    defined(value: unknown, name: string, lineno: number, colno: number) {
      if (value === null || value === undefined) {
        throw new Error(
          `(${name}) [Line ${lineno + 1}, Column ${colno + 1}]\n  attempted to output null or undefined value`,
        );
      }
      return value;
    },
    extend(s: Scope, locals?: Scope) {
      return locals ? Object.assign({}, s, locals) : Object.assign({}, s);
    },
    globalScope() {
      return Object.assign({}, globals);
    },
    exported(t: CompiledTemplate, scope: Scope) {
      t.render(scope);
      const out: Scope = {};
      for (const name of t.exportNames) out[name] = scope[name];
      return out;
    },
    template(name: unknown, parent: string) {
      return get(String(name), parent);
    },
    templateOrNull(name: unknown, parent: string) {
      try {
        return get(String(name), parent);
      } catch (e) {
        if (e instanceof Unsupported) throw e;
        return null;
      }
    },
  };

  // a name resolves the same way for the renderer's whole life (the loader neither watches nor reloads)
  const resolved = new Map<string, CompiledTemplate>();

  function get(name: string, parent: string | null): CompiledTemplate {
    const cacheKey = `${parent ?? ''}\0${name}`;
    const known = resolved.get(cacheKey);
    if (known) return known;
    const tmpl = (
      env as unknown as {
        getTemplate(n: string, eager: boolean, parent?: string): { path: string; tmplStr: string };
      }
    ).getTemplate(name, false, parent ?? undefined);
    const key = tmpl.path ?? name;
    const hit = compiled.get(key) ?? compileSource(name, key, tmpl.tmplStr);
    compiled.set(key, hit);
    resolved.set(cacheKey, hit);
    return hit;
  }

  function compileSource(name: string, path: string, source: string): CompiledTemplate {
    const { body, exportNames } = new Compiler(
      name,
      path,
      throwOnUndefined,
      autoescape,
    ).compileRoot(parse(source, extensions, opts));
    // a template is code by design; it comes from our folder or the department's, as nunjucks' own output does
    const render = new Function('rt', body)(rt) as (s: Scope) => string;
    return { name, exportNames, render };
  }

  /** A template as a function of its variables, with the environment's globals beneath them (as nunjucks' context has). */
  const entry =
    (t: CompiledTemplate) =>
    (data: Scope): string =>
      t.render(Object.assign({}, globals, data));

  return {
    /** the compiled template for a name, compiling it (and nothing else) on first use */
    get: (name: string) => get(name, null),
    entry,
    /** a template's text for the given variables */
    render: (name: string, data: Scope) => entry(get(name, null))(data),
    /** compile a template from source text under a name of its own (not looked up in the folders) */
    fromString: (name: string, source: string): CompiledTemplate =>
      compileSource(name, name, source),
  };
}
