import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { startServerProcess, type ServerProcess } from './server-process.js';

const dataDir = mkdtempSync(path.join(tmpdir(), 'treadwise-meter-crash-'));
afterAll(() => rmSync(dataDir, { recursive: true, force: true }));

// Only the call-count rule writes: the interval is an hour.
const METER = { USAGE_FLUSH_AFTER_CALLS: '5', USAGE_FLUSH_INTERVAL_MS: '3600000' };

const sizeWith = (url: string, key: string) =>
  fetch(`${url}/v1/calculations/voltage-drop`, {
    method: 'POST',
    headers: { 'content-type': 'application/json', authorization: `Bearer ${key}` },
    body: JSON.stringify({ supplyVoltageV: 24, currentA: 2, lengthM: 10, conductor: { crossSectionMm2: 0.75 } }),
  });

/** Resolves once the server has logged a finished usage write (debug level). */
async function usageWritten(server: ServerProcess): Promise<void> {
  while (!server.stdout().includes('"msg":"usage counters written"')) await new Promise((r) => setTimeout(r, 20));
}

describe('metering across a crash', () => {
  it('keeps the calls written before a SIGKILL: a crash costs fewer than USAGE_FLUSH_AFTER_CALLS', async () => {
    const first = await startServerProcess({ DATA_DIR: dataDir, LOG_LEVEL: 'debug', ...METER });
    const key = /harbor-lane\s+server\s+(tw_server_\S+)/.exec(first.stdout())![1];
    for (let i = 0; i < 7; i++) expect((await sizeWith(first.url, key)).status).toBe(200);
    await usageWritten(first); // the write the fifth call started
    expect(await first.kill('SIGKILL')).toBe('SIGKILL');

    const second = await startServerProcess({ DATA_DIR: dataDir, ...METER });
    const usage = await fetch(`${second.url}/v1/usage`, { headers: { authorization: `Bearer ${key}` } });
    const body = await usage.json();
    // 7 answered, 5 written; the 2 since were in memory only.
    expect(body.totals.requests).toBe(5);
    expect(body.quota.usedThisMonth).toBe(5);
    expect(await second.stop()).toBe(0);
  });
});
