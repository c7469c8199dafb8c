// A graceful stop (SIGTERM, SIGINT): stop accepting, let the requests in progress finish, answer every request
// still arriving on an open connection with "Connection: close", and close whatever is left at the deadline.
//
// Why not server.close() alone: since Node 19 it also drops every idle keep-alive connection at once, and under
// load an "idle" connection often has its next request already sent and not yet read: that request would be lost.
// So the listening socket is closed first (net.Server's close), each open connection ends after its next
// answer, connections that stay silent end with Node's keep-alive timeout, and the deadline closes the rest.
import type { Server } from 'node:http';
import { Server as NetServer } from 'node:net';

export interface Stopper {
  /** begin the stop; done() runs once, when the last connection has closed or the deadline has passed */
  stop(done: () => void): void;
  stopping(): boolean;
}

export function gracefulStop(server: Server, deadlineMs: number): Stopper {
  let stopping = false;
  // runs before the app's own listener, so that the answer carries the header whatever the app sends
  server.prependListener('request', (_request, response) => {
    if (stopping) response.setHeader('connection', 'close');
  });
  return {
    stopping: () => stopping,
    stop(done) {
      if (stopping) return;
      stopping = true;
      let finished = false;
      const finish = () => {
        if (finished) return;
        finished = true;
        clearTimeout(deadline);
        done();
      };
      const deadline = setTimeout(() => {
        // slow or silent connections past the deadline: closed, so that the process ends in time
        server.closeAllConnections();
        finish();
      }, deadlineMs);
      deadline.unref();
      NetServer.prototype.close.call(server, () => finish());
      // a connection that has answered everything and waits: it gets Node's keep-alive timeout, as before
    },
  };
}
