import type { IncomingMessage, Server, ServerResponse } from 'node:http';
import type { Socket } from 'node:net';

export interface GracefulCloser {
  /**
   * Stops accepting, lets every answer already under way reach its client (however slowly it
   * reads) and tells keep-alive clients to go, then resolves once every connection is closed —
   * or once `deadlineMs` has passed, when the stragglers are cut.
   */
  close(deadlineMs: number): Promise<void>;
}

/**
 * Graceful close for a listening HTTP server. Node's own `server.close()` also calls
 * `closeIdleConnections()`, which destroys a connection as soon as its answer has been handed to
 * the socket — a large answer to a slow reader is then cut off mid-body, though it was logged
 * and metered as a success. Here connections are ended (FIN after the buffered bytes), not
 * destroyed, and only the deadline destroys anything.
 */
export function gracefulCloser(server: Server): GracefulCloser {
  /** Requests on each connection whose answers are not yet done. */
  const inFlight = new Map<Socket, number>();
  const answers = new Set<ServerResponse>();
  let closing = false;

  const endIfIdle = (socket: Socket) => {
    if ((inFlight.get(socket) ?? 0) === 0 && !socket.destroyed) socket.end();
  };

  server.on('connection', (socket: Socket) => {
    inFlight.set(socket, 0);
    socket.once('close', () => inFlight.delete(socket));
  });
  // Before the app's own listener, so the header goes in before any answer starts.
  server.prependListener('request', (req: IncomingMessage, res: ServerResponse) => {
    const socket = req.socket;
    inFlight.set(socket, (inFlight.get(socket) ?? 0) + 1);
    answers.add(res);
    if (closing) res.setHeader('Connection', 'close');
    res.once('close', () => {
      answers.delete(res);
      inFlight.set(socket, Math.max(0, (inFlight.get(socket) ?? 1) - 1));
      if (closing) endIfIdle(socket);
    });
  });

  return {
    close(deadlineMs) {
      return new Promise<void>((resolve) => {
        closing = true;
        for (const res of answers) if (!res.headersSent) res.setHeader('Connection', 'close');
        // server.close() calls this; end idle connections politely instead of destroying them.
        server.closeIdleConnections = () => {
          for (const socket of inFlight.keys()) endIfIdle(socket);
        };
        const deadline = setTimeout(() => {
          server.closeAllConnections();
          for (const socket of inFlight.keys()) socket.destroy();
        }, deadlineMs);
        server.close(() => {
          clearTimeout(deadline);
          resolve();
        });
      });
    },
  };
}
