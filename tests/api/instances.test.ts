import { execFileSync } from 'node:child_process';
import { generateKeyPairSync, randomBytes } from 'node:crypto';
import http from 'node:http';
import { createServer } from 'node:net';
import pg from 'pg';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startServerProcess, type ServerProcess } from '../e2e/server-process.js';

/**
 * Several instances as an operator runs them: built server processes on one PostgreSQL database
 * and one Redis. A key revoked on one instance is refused on the other; the plan's rate limit is
 * one limit across instances; WEB_CONCURRENCY workers answer /metrics for all of them together.
 * Needs DATABASE_URL and REDIS_URL (as .ci/run sets them); the database gets its own for this file.
 */
const baseUrl = process.env.DATABASE_URL;
const redisUrl = process.env.REDIS_URL;

const database = `tw_instances_${process.pid}`;
const scrapeToken = randomBytes(24).toString('hex');
const env = () => ({
  DATABASE_URL: baseUrl!.replace(/\/[^/]*$/, `/${database}`),
  REDIS_URL: redisUrl!,
  KEY_PEPPER: pepper,
  JWT_PRIVATE_KEY: jwtKey,
  METRICS_TOKEN: scrapeToken,
  USAGE_FLUSH_INTERVAL_MS: '200',
});
const pepper = randomBytes(32).toString('hex');
const jwtKey = generateKeyPairSync('ed25519').privateKey.export({ type: 'pkcs8', format: 'pem' }).toString();

async function adminQuery(sql: string): Promise<void> {
  const client = new pg.Client({ connectionString: baseUrl });
  await client.connect();
  try {
    await client.query(sql);
  } finally {
    await client.end();
  }
}

async function freePort(): Promise<number> {
  const server = createServer();
  await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', resolve));
  const { port } = server.address() as { port: number };
  await new Promise((resolve) => server.close(resolve));
  return port;
}

/** One request on its own connection, so node:cluster hands each to the next worker. */
function getOnce(url: string, headers: Record<string, string> = {}): Promise<{ status: number; body: string }> {
  return new Promise((resolve, reject) => {
    http
      .get(url, { agent: false, headers: { connection: 'close', ...headers } }, (res) => {
        let body = '';
        res.setEncoding('utf8');
        res.on('data', (d) => (body += d));
        res.on('end', () => resolve({ status: res.statusCode ?? 0, body }));
      })
      .on('error', reject);
  });
}

const VD = { supplyVoltageV: 24, currentA: 2, lengthM: 10, conductor: { crossSectionMm2: 0.75 } };
const size = (url: string, token: string) =>
  fetch(`${url}/v1/calculations/voltage-drop`, { method: 'POST', headers: { authorization: `Bearer ${token}`, 'content-type': 'application/json' }, body: JSON.stringify(VD) });

describe.runIf(baseUrl && redisUrl)('instances sharing one PostgreSQL and Redis', () => {
  const running: ServerProcess[] = [];
  let a: ServerProcess;
  let b: ServerProcess;
  let admin: string;

  beforeAll(async () => {
    execFileSync('npm', ['run', '--silent', 'build:server'], { stdio: 'ignore' }); // the instances run the built server
    await adminQuery(`DROP DATABASE IF EXISTS ${database}`);
    await adminQuery(`CREATE DATABASE ${database}`);
    // The first instance migrates and seeds; the second finds both done.
    a = await startServerProcess({ ...env(), SEED_DEMO: 'true' });
    running.push(a);
    b = await startServerProcess(env());
    running.push(b);
    // The free plan's organisation (60 calls a minute), through its admin.
    const signIn = await fetch(`${a.url}/v1/auth/sign-in`, {
      method: 'POST',
      headers: { 'content-type': 'application/json' },
      body: JSON.stringify({ email: 'ava@kestrelfinch.test', password: 'treadwise-demo' }),
    });
    expect(signIn.status).toBe(200);
    admin = ((await signIn.json()) as { accessToken: string }).accessToken;
  }, 120_000);

  afterAll(async () => {
    await Promise.all(running.map((p) => p.stop()));
    await adminQuery(`DROP DATABASE IF EXISTS ${database}`);
  }, 60_000);

  const createKey = async (name: string) => {
    const res = await fetch(`${a.url}/v1/keys`, {
      method: 'POST',
      headers: { authorization: `Bearer ${admin}`, 'content-type': 'application/json' },
      body: JSON.stringify({ name, scopes: ['sizing:run'] }),
    });
    expect(res.status).toBe(201);
    return (await res.json()) as { token: string; key: { id: string } };
  };

  it('refuses on one instance a key revoked on the other', async () => {
    const created = await createKey('Revoked across instances');
    expect((await size(b.url, created.token)).status).toBe(200); // B knows (and caches) the key
    const revoked = await fetch(`${a.url}/v1/keys/${created.key.id}/revoke`, { method: 'POST', headers: { authorization: `Bearer ${admin}` } });
    expect(revoked.status).toBe(200);
    await expect.poll(async () => (await size(b.url, created.token)).status, { timeout: 5000, interval: 50 }).toBe(401);
  });

  it('counts calls on both instances against one rate limit', async () => {
    const { token } = await createKey('Shared limit');
    const served = { a: 0, b: 0 };
    let refused = 0;
    // Alternate between the instances. Limits kept per instance would let about twice the plan's
    // 60 calls a minute through (60 on each) before the first 429.
    for (let i = 0; i < 130 && refused === 0; i++) {
      const on = i % 2 === 0 ? 'a' : 'b';
      const res = await size(on === 'a' ? a.url : b.url, token);
      if (res.status === 429) refused++;
      else {
        expect(res.status).toBe(200);
        served[on]++;
      }
    }
    expect(refused).toBe(1);
    expect(served.a + served.b).toBeLessThanOrEqual(60); // free plan, migration 0001
    expect(served.a).toBeGreaterThan(20);
    expect(served.b).toBeGreaterThan(20);
  });

  it('runs WEB_CONCURRENCY workers on one port and answers /metrics for all of them', async () => {
    const port = await freePort();
    const cluster = await startServerProcess({ ...env(), WEB_CONCURRENCY: '2', PORT: String(port) });
    running.push(cluster);
    expect(cluster.stdout()).toContain('2 workers');
    for (let i = 0; i < 20; i++) expect((await getOnce(`${cluster.url}/v1/health`)).status).toBe(200);
    expect((await getOnce(`${cluster.url}/metrics`)).status).toBe(401);
    const scraped = await getOnce(`${cluster.url}/metrics`, { authorization: `Bearer ${scrapeToken}` });
    expect(scraped.status).toBe(200);
    // Each connection went to the next worker: only the primary's sum over both gives all 20.
    expect(scraped.body).toContain('treadwise_http_requests_total{route="GET /v1/health",status="200"} 20\n');
    expect(scraped.body.endsWith('# EOF\n')).toBe(true);
  }, 90_000);
});
