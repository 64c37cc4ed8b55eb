import { once } from 'node:events';
import type { Server } from 'node:http';
import { connect, type AddressInfo, type Socket } from 'node:net';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ConfigError, loadConfig } from '../../api/config.js';
import { createHttpServer } from '../../api/http-server.js';
import { closeTraffic } from '../support/app-instance.js';
import { createTestApp, type TestApp } from '../support/test-app.js';

let t: TestApp;
let server: Server;
let port: number;
const accepted: Socket[] = [];

beforeAll(async () => {
  t = await createTestApp({ HTTP_HEADERS_TIMEOUT_MS: '300', HTTP_REQUEST_TIMEOUT_MS: '600', HTTP_MAX_CONNECTIONS: '3' });
  server = createHttpServer(t.app, t.config);
  server.on('connection', (s: Socket) => accepted.push(s));
  server.listen(0, '127.0.0.1');
  await once(server, 'listening');
  port = (server.address() as AddressInfo).port;
});
afterAll(async () => {
  server.closeAllConnections();
  server.close();
  await closeTraffic(t.app);
  await t.close();
});

/** Opens a connection, writes `text`, and resolves with all the server sends until it closes. */
function trickle(text: string): { socket: Socket; answer: Promise<string> } {
  const socket = connect(port, '127.0.0.1');
  let out = '';
  socket.on('data', (c) => (out += c));
  socket.on('error', () => undefined);
  socket.write(text);
  return { socket, answer: once(socket, 'close').then(() => out) };
}

describe('slow clients', () => {
  it('answers 408 and closes when the headers do not arrive within HTTP_HEADERS_TIMEOUT_MS', async () => {
    const { answer } = trickle('GET /v1/health HTTP/1.1\r\nHost: test\r\n'); // the blank line never comes
    expect(await answer).toMatch(/^HTTP\/1.1 408/);
  });

  it('answers 408 and closes when the body does not arrive within HTTP_REQUEST_TIMEOUT_MS', async () => {
    const { answer } = trickle('POST /v1/auth/sign-in HTTP/1.1\r\nHost: test\r\nContent-Type: application/json\r\nContent-Length: 100\r\n\r\n{"email":');
    expect(await answer).toMatch(/^HTTP\/1.1 408/);
  });
});

describe('the connection cap', () => {
  it('drops connections beyond HTTP_MAX_CONNECTIONS and serves the ones it holds', async () => {
    accepted.length = 0;
    const held = [0, 1, 2].map(() => connect(port, '127.0.0.1'));
    while (accepted.length < 3) await once(server, 'connection');
    const extra = trickle('GET /v1/health HTTP/1.1\r\nHost: test\r\n\r\n');
    expect(await extra.answer).toBe(''); // closed without a word
    const first = held[0];
    let out = '';
    first.on('data', (c) => (out += c));
    first.write('GET /v1/health HTTP/1.1\r\nHost: test\r\nConnection: close\r\n\r\n');
    await once(first, 'close');
    expect(out).toMatch(/^HTTP\/1.1 200/);
    for (const s of held) s.destroy();
  });
});

describe('the settings', () => {
  it('default to 10 s for headers, 30 s for the request, 5 s keep-alive and 1 000 connections', () => {
    const config = loadConfig({});
    expect([config.httpHeadersTimeoutMs, config.httpRequestTimeoutMs, config.httpKeepAliveTimeoutMs, config.httpMaxConnections]).toEqual([10_000, 30_000, 5_000, 1_000]);
  });

  it('refuse a request timeout shorter than the headers timeout', () => {
    expect(() => loadConfig({ HTTP_HEADERS_TIMEOUT_MS: '20000', HTTP_REQUEST_TIMEOUT_MS: '10000' })).toThrow(ConfigError);
    expect(() => loadConfig({ HTTP_HEADERS_TIMEOUT_MS: '20000', HTTP_REQUEST_TIMEOUT_MS: '10000' })).toThrow(/HTTP_REQUEST_TIMEOUT_MS: must not be shorter/);
  });
});
