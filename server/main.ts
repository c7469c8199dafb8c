// Start the server: 127.0.0.1:3000 unless PORT and HOST say otherwise.
import { serve } from '@hono/node-server';
import cluster from 'node:cluster';
import { createApp } from './app.ts';
import { readSettings } from './launch/index.ts';
import { parseUnits } from './unitsSetting.ts';

const LOOPBACK = new Set(['127.0.0.1', 'localhost', '::1']);

export function startServer(env: NodeJS.ProcessEnv = process.env) {
  const port = Number(env.PORT ?? 3000);
  if (!Number.isInteger(port) || port < 0 || port > 65535) {
    console.error(`PORT must be a whole number from 0 to 65535 (got "${env.PORT}")`);
    process.exit(2);
  }
  const hostname = env.HOST?.trim() || '127.0.0.1';
  if (!LOOPBACK.has(hostname)) {
    console.warn(
      `WARNING: listening on ${hostname}. Gasline has no login of its own: put it behind the hospital's authentication and reverse proxy.`,
    );
  }
  // a cluster's workers, or pods under Kubernetes (which sets KUBERNETES_SERVICE_HOST): one shared key is needed
  const settings = readSettings(env, {
    severalProcesses: cluster.isWorker || env.KUBERNETES_SERVICE_HOST !== undefined,
  });
  if (!settings.ok) {
    console.error(settings.error);
    process.exit(2);
  }
  if (!cluster.isWorker || cluster.worker?.id === 1)
    for (const message of settings.messages) console.log(message);
  const units = parseUnits(env.UNITS ?? '');
  if (!units.ok) {
    console.error(units.error);
    process.exit(2);
  }
  const app = createApp({
    units: units.units,
    launch: settings.launch,
    frameAncestors: settings.frameAncestors,
    templateDir: env.NOTE_TEMPLATES?.trim() || null,
    allowedOrigins: (env.ALLOWED_ORIGINS ?? '')
      .split(',')
      .map((o) => o.trim())
      .filter(Boolean),
    log: env.REQUEST_LOG === 'off' ? undefined : (line) => console.log(line),
  });
  const server = serve({ fetch: app.fetch, port, hostname }, (info) => {
    console.log(
      `Gasline listening on http://${hostname.includes(':') ? `[${hostname}]` : hostname}:${info.port}`,
    );
  });
  const stop = () => server.close(() => process.exit(0));
  process.on('SIGINT', stop);
  process.on('SIGTERM', stop);
  return server;
}

startServer();
