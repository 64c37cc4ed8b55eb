import { readFileSync } from 'node:fs';
import path from 'node:path';
import { eq } from 'drizzle-orm';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { organizations, plans } from '../../api/db/schema.js';
import { runCli } from '../support/cli-run.js';
import { ALL_KEY_SCOPES, startCliServer, type CliServer } from '../support/cli-server.js';
import { createKey } from '../support/fixtures.js';
import { batchItems, tempDir, writeStairCsv } from './batch-fixtures.js';

/**
 * `treadwise batch` through the real batch job routes (the other batch tests use a fake of them):
 * the file uploaded to POST /v1/batches, the job run by the server's own runner, the results
 * streamed back — and byte for byte what `--local` writes for the same file.
 */
const SLOW = 180_000;
let s: CliServer;
let token: string;
let dir: string;

beforeAll(async () => {
  s = await startCliServer();
  await s.t.database.db.insert(plans).values({ id: 'batch-api-cli-test', name: 'Batch API CLI test', monthlyQuota: 10_000_000, ratePerMinute: 100_000, costPerMinute: 100_000_000 });
  await s.t.database.db.update(organizations).set({ planId: 'batch-api-cli-test' }).where(eq(organizations.id, s.organization.id));
  ({ token } = await createKey(s.t, s.organization.id, { scopes: [...ALL_KEY_SCOPES, 'batches:write'] }));
  await s.t.app.locals.services.batchJobs.start(); // as the server starts it after listening
  dir = tempDir();
  writeStairCsv(path.join(dir, 'stairs.csv'), batchItems(120));
}, SLOW);
afterAll(async () => {
  await s.t.app.locals.services.batchJobs.close();
  await s.close();
});

describe('treadwise batch through the batch job API', () => {
  it('uploads the file, waits for the job and writes what --local writes for the same rows', async () => {
    const env = { TREADWISE_API_URL: s.apiUrl, TREADWISE_API_KEY: token };
    const viaApi = path.join(dir, 'api.csv');
    const local = path.join(dir, 'local.csv');
    const remote = await runCli(['batch', path.join(dir, 'stairs.csv'), '-o', viaApi, '--no-progress'], { env });
    const offline = await runCli(['batch', path.join(dir, 'stairs.csv'), '-o', local, '--local', '--concurrency', '1', '--no-progress']);
    expect(remote.stderr).not.toContain('could not reach');
    // Both exit 1: the fixture holds refused rows (5 in every 50), listed the same way.
    expect(remote.code).toBe(1);
    expect(offline.code).toBe(1);
    expect(readFileSync(viaApi, 'utf8')).toBe(readFileSync(local, 'utf8'));
    expect(readFileSync(viaApi, 'utf8').split('\r\n').filter(Boolean)).toHaveLength(121); // header + 120 rows
    const jobs = await fetch(`${s.apiUrl}/v1/batches`, { headers: { authorization: `Bearer ${token}` } });
    const [job] = ((await jobs.json()) as { items: { status: string; rows: { total: number; done: number } }[] }).items;
    expect(job).toMatchObject({ status: 'succeeded', rows: { total: 120, done: 120 } });
  }, SLOW);
});
