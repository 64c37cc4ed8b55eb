import type { AddressInfo } from 'node:net';
import type { Server } from 'node:http';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createApp } from '../../api/app.js';
import { ephemeralSecrets } from '../../api/auth/secrets.js';
import { createLogger } from '../../api/logger.js';
import { API_VERSION } from '../../api/version.js';
import { runCli } from '../support/cli-run.js';
import { createTestApp, type TestApp } from '../support/test-app.js';

let t: TestApp;
let server: Server;
let apiUrl: string;
beforeAll(async () => {
  t = await createTestApp();
  server = t.app.listen(0, '127.0.0.1');
  await new Promise((r) => server.once('listening', r));
  apiUrl = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
});
afterAll(async () => {
  await new Promise((r) => server.close(r));
  await t.close();
});

describe('treadwise', () => {
  it('prints its version', async () => {
    const run = await runCli(['--version']);
    expect(run.code).toBe(0);
    expect(run.stdout.trim()).toBe(API_VERSION);
  });

  it('lists the health command in --help', async () => {
    const run = await runCli(['--help']);
    expect(run.code).toBe(0);
    expect(run.stdout).toMatch(/health \[options\]\s+check that a Treadwise API is up/);
  });
});

describe('treadwise health', () => {
  it('reports a healthy API and a reachable database', async () => {
    const run = await runCli(['health', '--api-url', apiUrl]);
    expect(run.code).toBe(0);
    expect(run.stdout).toContain(`API       ${apiUrl}  healthy`);
    expect(run.stdout).toContain('Database  reachable');
  });

  it('prints one JSON object with --json, for pipes', async () => {
    const run = await runCli(['health', '--api-url', apiUrl, '--json']);
    expect(run.code).toBe(0);
    expect(JSON.parse(run.stdout)).toMatchObject({ status: 'ok', database: 'ok', version: API_VERSION });
  });

  it('exits 3 when the API is up but its database is not', async () => {
    const app = createApp({
      config: t.config,
      database: { ...t.database, ping: () => Promise.reject(new Error('down')) },
      logger: createLogger('silent'),
      secrets: ephemeralSecrets(),
      clock: () => new Date(),
    });
    const broken = app.listen(0, '127.0.0.1');
    await new Promise((r) => broken.once('listening', r));
    try {
      const run = await runCli(['health', '--api-url', `http://127.0.0.1:${(broken.address() as AddressInfo).port}`]);
      expect(run.code).toBe(3);
      expect(run.stdout).toContain('Database  unavailable — Service not ready');
    } finally {
      await new Promise((r) => broken.close(r));
    }
  });

  it('says plainly when nothing answers', async () => {
    const refused: typeof fetch = () => Promise.reject(Object.assign(new TypeError('fetch failed'), { cause: { code: 'ECONNREFUSED' } }));
    const run = await runCli(['health', '--api-url', 'http://127.0.0.1:3998'], refused);
    expect(run.code).toBe(1);
    expect(run.stderr).toBe('treadwise: cannot reach http://127.0.0.1:3998 (ECONNREFUSED)\n');
  });

  it('rejects a URL that is not http(s), naming the option', async () => {
    const run = await runCli(['health', '--api-url', 'ftp://example.test']);
    expect(run.code).toBe(2);
    expect(run.stderr).toContain('--api-url: must be an http(s) URL');
  });
});
