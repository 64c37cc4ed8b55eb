import { existsSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { startServerProcess } from './server-process.js';

const dataDir = mkdtempSync(path.join(tmpdir(), 'treadwise-lock-'));
afterAll(() => rmSync(dataDir, { recursive: true, force: true }));

describe('one server per data directory', () => {
  it('refuses a second server on the same DATA_DIR, starts at once after a crash, and releases the lock on shutdown', async () => {
    const first = await startServerProcess({ DATA_DIR: dataDir });

    // The second start fails with one line naming the directory and the holder, and exit code 1.
    const refused = await startServerProcess({ DATA_DIR: dataDir }).then(
      () => 'started',
      (err: Error) => err.message,
    );
    expect(refused).toMatch(/^server exited with 1:\n\n/);
    const lines = refused.replace(/^server exited with 1:\n/, '').split('\n').filter(Boolean);
    expect(lines).toEqual([`Treadwise failed to start: the data directory ${path.resolve(dataDir)} is in use by another Treadwise server (pid ${first.pid}); stop it first or set another DATA_DIR`]);
    // The refused start did not disturb the first one.
    expect((await fetch(`${first.url}/v1/health/ready`)).status).toBe(200);

    // A crash leaves the lock behind (fresh mtime, so a staleness rule alone would refuse);
    // the holder's pid is gone, so the next start takes over at once.
    expect(await first.kill('SIGKILL')).toBe('SIGKILL');
    expect(existsSync(path.join(dataDir, 'server.lock'))).toBe(true);
    const second = await startServerProcess({ DATA_DIR: dataDir });
    expect((await fetch(`${second.url}/v1/health/ready`)).status).toBe(200);

    expect(await second.stop()).toBe(0);
    expect(existsSync(path.join(dataDir, 'server.lock'))).toBe(false);
    expect(existsSync(path.join(dataDir, 'server.pid'))).toBe(false);
  });

  it('takes no lock with a real database server (DATABASE_URL): there is no data directory', async () => {
    // Config only: with DATABASE_URL and no secrets the start stops before any file is touched.
    const unused = path.join(dataDir, 'never-created');
    await expect(startServerProcess({ DATA_DIR: unused, DATABASE_URL: 'postgres://127.0.0.1:1/none' })).rejects.toThrow(/exited with 1/);
    expect(existsSync(unused)).toBe(false);
  });
});
