import { createServer, type Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import { connect, type Socket } from 'node:net';
import { afterEach, describe, expect, it } from 'vitest';
import { gracefulCloser } from '../../api/graceful-close.js';

// An answer far larger than the socket buffers hold while the client does not read (about 4 MB
// on loopback here), written with one res.end() as res.json() does.
const ANSWER_BYTES = 32 * 1024 * 1024;

let server: Server;
afterEach(() => server?.closeAllConnections());

async function listen(): Promise<{ port: number; closer: ReturnType<typeof gracefulCloser> }> {
  server = createServer((_req, res) => {
    res.setHeader('Content-Type', 'application/octet-stream');
    res.end(Buffer.alloc(ANSWER_BYTES, 0x61));
  });
  // No keep-alive timeout: an idle connection stays open until the close ends it.
  server.keepAliveTimeout = 0;
  const closer = gracefulCloser(server);
  await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', resolve));
  return { port: (server.address() as AddressInfo).port, closer };
}

/** Asks for the answer, stops reading after the first chunk; readAll() takes the rest. */
function pausedReader(port: number) {
  const socket: Socket = connect(port, '127.0.0.1');
  let bytes = 0;
  let head = '';
  socket.on('data', (c: Buffer) => {
    if (!head) head = c.subarray(0, c.indexOf('\r\n\r\n')).toString();
    bytes += c.length;
  });
  socket.on('error', () => undefined); // a cut shows as a short body
  let complete = () => {};
  const closedOrComplete = new Promise<void>((resolve) => {
    socket.on('close', () => resolve());
    complete = resolve;
  });
  socket.on('data', () => {
    if (head && bytes - head.length - 4 >= ANSWER_BYTES) complete();
  });
  socket.write('GET / HTTP/1.1\r\nHost: test\r\n\r\n');
  const started = new Promise<void>((resolve) => socket.once('data', () => (socket.pause(), resolve())));
  return {
    socket,
    started,
    /** Resolves once the whole answer is in, or the connection has closed. */
    async readAll() {
      socket.resume();
      await closedOrComplete;
      return { declared: Number(/content-length: (\d+)/i.exec(head)![1]), received: bytes - head.length - 4 };
    },
  };
}

describe('graceful close of the HTTP server', () => {
  it('lets a slow reader receive the whole of an answer already written when the close began', async () => {
    const { port, closer } = await listen();
    const reader = pausedReader(port);
    await reader.started;
    const closed = closer.close(60_000);
    // Stopped accepting at once.
    await expect(new Promise((resolve, reject) => connect(port, '127.0.0.1').once('connect', resolve).once('error', reject))).rejects.toThrow(/ECONNREFUSED/);
    const { declared, received } = await reader.readAll();
    expect(declared).toBe(ANSWER_BYTES);
    expect(received).toBe(ANSWER_BYTES);
    await closed;
  });

  it('cuts a reader that never reads once the deadline has passed', async () => {
    const { port, closer } = await listen();
    const reader = pausedReader(port);
    await reader.started;
    await closer.close(200); // resolves although the reader never reads
    const { received } = await reader.readAll();
    expect(received).toBeLessThan(ANSWER_BYTES);
  });

  it('ends idle keep-alive connections instead of waiting for the deadline', async () => {
    const { port, closer } = await listen();
    const reader = pausedReader(port);
    await reader.started;
    const { received } = await reader.readAll(); // answer done; the connection stays open (keep-alive)…
    expect(received).toBe(ANSWER_BYTES);
    expect(reader.socket.destroyed).toBe(false);
    await closer.close(600_000); // …and is ended by the close, well before this deadline
  });
});
