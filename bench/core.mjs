// The calculation core's CPU cost in a process of its own, on the compiled JavaScript the server runs: interpret()
// on the benchmark case (schema check included, no note). Called by bench/run.ts with the server's Node flags:
// argv[2] is the case as JSON, argv[3] the number of calls; prints the CPU µs per call.
const core = await import(new URL('../dist/calc/index.js', import.meta.url).href);
const kase = JSON.parse(process.argv[2]);
const calls = Number(process.argv[3]);
if (core.interpret(kase).ok === false) throw new Error('the benchmark case is invalid');
for (let i = 0; i < Math.min(20_000, calls); i++) core.interpret(kase);
const before = process.cpuUsage();
for (let i = 0; i < calls; i++) core.interpret(kase);
const used = process.cpuUsage(before);
console.log((used.user + used.system) / calls);
