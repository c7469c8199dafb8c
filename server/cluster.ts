// Several processes on one port (Node's cluster): the server keeps no state, so any worker answers any request.
// WORKERS sets the count (default: the number of CPU cores). A worker that dies is replaced.
import cluster from 'node:cluster';
import { availableParallelism } from 'node:os';

const requested =
  process.env.WORKERS === undefined ? availableParallelism() : Number(process.env.WORKERS);
if (!Number.isInteger(requested) || requested < 1 || requested > 64) {
  console.error(`WORKERS must be a whole number from 1 to 64 (got "${process.env.WORKERS}")`);
  process.exit(2);
}

if (cluster.isPrimary) {
  let stopping = false;
  console.log(`Gasline: starting ${requested} worker processes`);
  for (let i = 0; i < requested; i++) cluster.fork();
  cluster.on('exit', (worker, code, signal) => {
    if (stopping) return;
    console.error(`worker ${worker.process.pid} exited (${signal ?? code}); starting another`);
    cluster.fork();
  });
  const stop = () => {
    stopping = true;
    for (const worker of Object.values(cluster.workers ?? {})) worker?.process.kill('SIGTERM');
    setTimeout(() => process.exit(0), 2000).unref();
  };
  process.on('SIGINT', stop);
  process.on('SIGTERM', stop);
} else {
  await import('./main.ts');
}
