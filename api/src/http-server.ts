// The HTTP server around the Express app, with limits for slow clients: a request whose headers or
// body do not arrive in time gets 408 and its connection is closed (Node's requestTimeout and
// headersTimeout), so a client that declares a long body and sends nothing cannot hold a socket.
import http, { type RequestListener } from 'node:http';
import type { Config } from './config';

export function createHttpServer(app: RequestListener, config: Pick<Config, 'RW_REQUEST_TIMEOUT_MS' | 'RW_HEADERS_TIMEOUT_MS'>): http.Server {
  return http.createServer(
    {
      requestTimeout: config.RW_REQUEST_TIMEOUT_MS,
      headersTimeout: config.RW_HEADERS_TIMEOUT_MS,
      // Node looks for timed-out requests every 30 s by default, so a 15 s limit could take 45 s to
      // bite; look at a quarter of the headers timeout instead (between 0.25 and 5 s).
      connectionsCheckingInterval: Math.max(250, Math.min(5000, Math.floor(config.RW_HEADERS_TIMEOUT_MS / 4))),
    },
    app,
  );
}
