import { mkdtempSync, rmSync } from 'node:fs';
import { connect, type Socket } from 'node:net';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { startServerProcess } from './server-process.js';

const dataDir = mkdtempSync(path.join(tmpdir(), 'treadwise-drain-'));
afterAll(() => rmSync(dataDir, { recursive: true, force: true }));

/** A client that asks for a large answer over a raw socket and reads only when told to. */
function slowReader(url: string, pathName: string) {
  const { hostname, port } = new URL(url);
  const socket: Socket = connect(Number(port), hostname);
  const chunks: Buffer[] = [];
  socket.on('data', (c: Buffer) => chunks.push(c));
  const ended = new Promise<void>((resolve) => socket.on('close', () => resolve()));
  socket.on('error', () => undefined); // a reset shows as a short body below
  socket.write(`GET ${pathName} HTTP/1.1\r\nHost: ${hostname}\r\nConnection: keep-alive\r\n\r\n`);
  // The first chunk proves the answer is under way; then stop reading, as a slow link would.
  const started = new Promise<void>((resolve) => socket.once('data', () => (socket.pause(), resolve())));
  return {
    started,
    /** Reads the rest and resolves with the declared and the received body length. */
    async readAll() {
      socket.resume();
      await ended;
      const raw = Buffer.concat(chunks);
      const split = raw.indexOf('\r\n\r\n');
      const head = raw.subarray(0, split).toString();
      return { head, declared: Number(/content-length: (\d+)/i.exec(head)?.[1]), received: raw.length - split - 4 };
    },
  };
}

/** Resolves once a new connection is refused: the server has stopped accepting. */
async function refusesConnections(url: string): Promise<void> {
  const { hostname, port } = new URL(url);
  for (;;) {
    const refused = await new Promise<boolean>((resolve) => {
      const s = connect(Number(port), hostname);
      s.once('connect', () => (s.destroy(), resolve(false)));
      s.once('error', () => resolve(true));
    });
    if (refused) return;
    await new Promise((r) => setTimeout(r, 20));
  }
}

/** A request whose body arrives in two parts, the second only when told: in flight at SIGTERM. */
function slowSender(url: string) {
  const { hostname, port } = new URL(url);
  const socket: Socket = connect(Number(port), hostname);
  const chunks: Buffer[] = [];
  socket.on('data', (c: Buffer) => chunks.push(c));
  socket.on('error', () => undefined);
  const ended = new Promise<void>((resolve) => socket.on('close', () => resolve()));
  const body = JSON.stringify({ email: 'nobody@example.test', password: 'not-the-password' });
  socket.write(`POST /v1/auth/sign-in HTTP/1.1\r\nHost: ${hostname}\r\nContent-Type: application/json\r\nContent-Length: ${body.length}\r\n\r\n${body.slice(0, 10)}`);
  return {
    async finish() {
      socket.write(body.slice(10));
      await ended;
      return Buffer.concat(chunks).toString();
    },
  };
}

describe('graceful shutdown on SIGTERM', () => {
  it('stops accepting, answers a request already in flight in full with Connection: close, then exits 0', async () => {
    const server = await startServerProcess({ DATA_DIR: dataDir, SHUTDOWN_DRAIN_MS: '60000' });
    const sender = slowSender(server.url);
    // The headers have reached the server before the signal (its answer to a fetch proves the
    // process is serving; the sender's bytes went out before it).
    expect((await fetch(`${server.url}/v1/health`)).status).toBe(200);
    const exited = server.stop();
    await refusesConnections(server.url);
    const answer = await sender.finish();
    const [head, body] = answer.split('\r\n\r\n');
    expect(head).toMatch(/^HTTP\/1.1 401/); // a wrong password: a real answer, not a reset
    expect(head).toMatch(/\r\nConnection: close/i);
    expect(body.length).toBe(Number(/content-length: (\d+)/i.exec(head)![1]));
    expect(await exited).toBe(0);
  });
});
