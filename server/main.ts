// Start the server: 127.0.0.1:3000 unless PORT and HOST say otherwise. The settings are read and checked first
// (server/config.ts); then Node's own limits are set (headers and request timeouts, a connection cap), the event
// loop is watched for overload, and SIGTERM or SIGINT stops the process gracefully (server/shutdown.ts).
import { createAdaptorServer } from '@hono/node-server';
import cluster from 'node:cluster';
import type { Server } from 'node:http';
import { createApp } from './app.ts';
import { LOOPBACK, readConfig } from './config.ts';
import { watchEventLoop, type LoopWatch } from './overload.ts';
import { gracefulStop } from './shutdown.ts';

/** connections waiting to be accepted (listen's backlog; the kernel caps it at net.core.somaxconn) */
const LISTEN_BACKLOG = 4096;

export function startServer(env: NodeJS.ProcessEnv = process.env) {
  // a cluster's workers, or pods under Kubernetes (which sets KUBERNETES_SERVICE_HOST): one shared key is needed
  const read = readConfig(env, {
    severalProcesses: cluster.isWorker || env.KUBERNETES_SERVICE_HOST !== undefined,
  });
  if (!read.ok) {
    console.error(read.error);
    process.exit(2);
  }
  const config = read.config;
  const { hostname, limits } = config;
  if (!LOOPBACK.has(hostname)) {
    console.warn(
      `WARNING: listening on ${hostname}. Gasline has no login of its own: put it behind the hospital's authentication and reverse proxy.`,
    );
  }
  if (!cluster.isWorker || cluster.worker?.id === 1)
    for (const message of config.messages) console.log(message);
  // watched from the moment it listens: the start itself (compiling templates) is one long turn, not overload
  let loop: LoopWatch | null = null;
  const app = createApp({
    renderer: config.renderer,
    units: config.units,
    launch: config.launch,
    frameAncestors: config.frameAncestors,
    allowedOrigins: config.allowedOrigins,
    allowedHosts: config.allowedHosts,
    hsts: config.hsts,
    cspReports: config.cspReports,
    busy: () => loop?.lagging() ?? false,
    maxInFlight: limits.maxInFlight,
    log: config.requestLog ? (line) => console.log(line) : undefined,
  });
  const server = createAdaptorServer({
    fetch: app.fetch,
    serverOptions: {
      headersTimeout: limits.headersTimeoutMs,
      requestTimeout: limits.requestTimeoutMs,
      // how often Node checks those two timeouts (its default, 30 s, would let a slow client stay 40 s)
      connectionsCheckingInterval: 1000,
    },
  }) as Server;
  // a queue of connections not yet accepted long enough for a burst (Node's default is 511: past it the kernel
  // drops a new connection's first packet, and the client waits a second or more to try again)
  server.listen({ port: config.port, host: hostname, backlog: LISTEN_BACKLOG }, () => {
    loop = watchEventLoop(limits.overloadLagMs);
    const address = server.address();
    const port = typeof address === 'object' && address ? address.port : config.port;
    console.log(
      `Gasline listening on http://${hostname.includes(':') ? `[${hostname}]` : hostname}:${port}`,
    );
  });
  // past the cap Node closes a new connection at once: a client sees it refused, not a request left waiting
  server.maxConnections = limits.maxConnections;
  const stopper = gracefulStop(server, limits.shutdownMs);
  const stop = (signal: string) => {
    if (stopper.stopping()) return;
    console.log(
      `Gasline: ${signal}, finishing the requests in progress (at most ${limits.shutdownMs / 1000} s)`,
    );
    stopper.stop(() => {
      loop?.stop();
      process.exit(0);
    });
  };
  process.on('SIGINT', () => stop('SIGINT'));
  process.on('SIGTERM', () => stop('SIGTERM'));
  return server;
}

startServer();
