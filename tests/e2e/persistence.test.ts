import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { PGlite } from '@electric-sql/pglite';
import { afterAll, describe, expect, it } from 'vitest';
import { startServerProcess } from './server-process.js';

const dataDir = mkdtempSync(path.join(tmpdir(), 'treadwise-persist-'));
afterAll(() => rmSync(dataDir, { recursive: true, force: true }));

async function organizationSlugs(): Promise<string[]> {
  const db = new PGlite(path.join(dataDir, 'pglite'));
  try {
    const { rows } = await db.query<{ slug: string }>('select slug from organizations order by slug');
    return rows.map((r) => r.slug);
  } finally {
    await db.close();
  }
}

const sizeWith = (url: string, key: string) =>
  fetch(`${url}/v1/calculations/voltage-drop`, {
    method: 'POST',
    headers: { 'content-type': 'application/json', authorization: `Bearer ${key}` },
    body: JSON.stringify({ supplyVoltageV: 24, currentA: 2, lengthM: 10, conductor: { crossSectionMm2: 0.75 } }),
  });

describe('the embedded database across restarts', () => {
  it('seeds the demo once, shuts down cleanly, and finds the same data after a restart', async () => {
    const first = await startServerProcess({ DATA_DIR: dataDir });
    expect(first.stdout()).toContain('Demo data seeded');
    expect((await fetch(`${first.url}/v1/health/ready`)).status).toBe(200);
    const key = /harbor-lane\s+server\s+(tw_server_\S+)/.exec(first.stdout())![1];
    for (let i = 0; i < 3; i++) expect((await sizeWith(first.url, key)).status).toBe(200);
    expect(await first.stop()).toBe(0);

    // demo-scenario.md: the three invented organisations
    expect(await organizationSlugs()).toEqual(['harbor-lane', 'kestrel-finch', 'quayside-studio']);

    const second = await startServerProcess({ DATA_DIR: dataDir });
    expect(second.stdout()).toContain('Demo data already present');
    expect((await fetch(`${second.url}/v1/health/ready`)).status).toBe(200);
    // The key from the first start still works (the pepper was kept, not regenerated), and the
    // three calls made before the restart were flushed by the graceful shutdown.
    expect((await sizeWith(second.url, key)).status).toBe(200);
    const usage = await fetch(`${second.url}/v1/usage`, { headers: { authorization: `Bearer ${key}` } });
    expect(usage.status).toBe(200);
    expect((await usage.json()).totals.requests).toBeGreaterThanOrEqual(3);
    expect(await second.stop()).toBe(0);

    expect(await organizationSlugs()).toEqual(['harbor-lane', 'kestrel-finch', 'quayside-studio']);
  });

  it('does not seed the demo when SEED_DEMO is off', async () => {
    const emptyDir = mkdtempSync(path.join(tmpdir(), 'treadwise-noseed-'));
    try {
      const server = await startServerProcess({ DATA_DIR: emptyDir, SEED_DEMO: 'false' });
      expect(server.stdout()).not.toContain('Demo data');
      expect(await server.stop()).toBe(0);
      const db = new PGlite(path.join(emptyDir, 'pglite'));
      const { rows } = await db.query<{ n: number }>('select count(*)::int as n from organizations');
      await db.close();
      expect(rows[0].n).toBe(0);
    } finally {
      rmSync(emptyDir, { recursive: true, force: true });
    }
  });

  it('refuses a bad configuration with one clear line and exit code 1', async () => {
    await expect(startServerProcess({ PORT: 'seventy' })).rejects.toThrow(/exited with 1:\s+Invalid configuration: PORT: must be a port number/);
  });
});
