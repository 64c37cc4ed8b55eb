import { createServer, type RequestListener, type Server } from 'node:http';
import type { Config } from './config.js';

/**
 * The HTTP server around the app, with tight limits: Node's defaults hold a connection that
 * trickles its headers for a minute and its body for five (checked only every 30 s), with no
 * cap on connections. Here a client must send its headers within HTTP_HEADERS_TIMEOUT_MS and
 * the whole request within HTTP_REQUEST_TIMEOUT_MS (both answered 408), an idle keep-alive
 * connection closes after HTTP_KEEP_ALIVE_TIMEOUT_MS, and connections beyond
 * HTTP_MAX_CONNECTIONS are dropped at once.
 */
export function createHttpServer(app: RequestListener, config: Config): Server {
  const server = createServer(
    {
      headersTimeout: config.httpHeadersTimeoutMs,
      requestTimeout: config.httpRequestTimeoutMs,
      keepAliveTimeout: config.httpKeepAliveTimeoutMs,
      // How often Node looks for requests past those timeouts: a fraction of the shortest.
      connectionsCheckingInterval: Math.max(100, Math.min(1_000, Math.floor(config.httpHeadersTimeoutMs / 4))),
    },
    app,
  );
  server.maxConnections = config.httpMaxConnections;
  return server;
}
