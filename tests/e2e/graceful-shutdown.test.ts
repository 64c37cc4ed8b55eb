import { mkdtempSync, rmSync } from 'node:fs';
import { connect, type Socket } from 'node:net';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { startServerProcess } from './server-process.js';

const dataDir = mkdtempSync(path.join(tmpdir(), 'treadwise-drain-'));
afterAll(() => rmSync(dataDir, { recursive: true, force: true }));

// A slow reader of a large answer is tested on the HTTP layer itself
// (tests/api/graceful-close.test.ts): the process has no answer large enough to outgrow the
// socket buffers without depending on the sizing engine's answer ceiling.

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
