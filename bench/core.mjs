// The core's speed in a process of its own, on the compiled JavaScript that npm start runs.
// Called by bench/run.ts: argv[2] is the case as JSON, argv[3] the iteration count; prints JSON.
const core = await import(new URL('../dist/calc/index.js', import.meta.url).href);
const kase = JSON.parse(process.argv[2]);
const n = Number(process.argv[3]);
const parsed = core.parseCase(kase);
if (!parsed.ok) throw new Error('the benchmark case is invalid');
const out = {};
for (const [name, fn] of [
  ['interpret', () => core.interpret(kase)],
  ['validated', () => core.interpretParsed(parsed.value)],
]) {
  for (let i = 0; i < Math.min(50_000, n); i++) fn();
  const start = process.hrtime.bigint();
  for (let i = 0; i < n; i++) fn();
  out[name] = n / (Number(process.hrtime.bigint() - start) / 1e9);
}
console.log(JSON.stringify(out));
