import { execFile } from 'node:child_process';
import { createServer, type AddressInfo } from 'node:net';
import { mkdtempSync, readFileSync, statSync, symlinkSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { promisify } from 'node:util';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { API_VERSION } from '../../api/version.js';
import { alderRowTownhouse } from '../../shared/schemas/estimate-examples.js';
import { startCliServer, type CliServer } from '../support/cli-server.js';

const run = promisify(execFile);
const root = path.resolve(import.meta.dirname, '../..');

let s: CliServer;
let unpacked: string;
let packedFiles: string[];
beforeAll(async () => {
  s = await startCliServer();
  // npm pack runs prepare (npm run build:cli), as a publish would.
  const dest = mkdtempSync(path.join(tmpdir(), 'treadwise-pack-'));
  const { stdout } = await run('npm', ['pack', '--json', '--pack-destination', dest], { cwd: root });
  const [pack] = JSON.parse(stdout.slice(stdout.indexOf('[')));
  packedFiles = pack.files.map((f: { path: string }) => f.path);
  await run('tar', ['-xzf', path.join(dest, pack.filename), '-C', dest]);
  unpacked = path.join(dest, 'package');
  // What `npm install treadwise-x.tgz` adds beside the package: its dependencies.
  symlinkSync(path.join(root, 'node_modules'), path.join(unpacked, 'node_modules'));
}, 120_000);
afterAll(async () => {
  await s.close();
});

/** The packed CLI as a user's shell runs it (a process, not in-process). */
const treadwise = (args: string[], env: NodeJS.ProcessEnv = {}) =>
  run(process.execPath, [path.join(unpacked, 'dist/cli/main.js'), ...args], { env: { PATH: process.env.PATH, HOME: tmpdir(), ...env } }).then(
    (r) => ({ code: 0, ...r }),
    (err: { code: number; stdout: string; stderr: string }) => ({ code: err.code, stdout: err.stdout, stderr: err.stderr }),
  );

describe('the npm package', () => {
  it('packs the built CLI, the README and package.json with its bin', () => {
    expect(packedFiles.sort()).toEqual(['README.md', 'dist/cli/batch-worker.js', 'dist/cli/main.js', 'package.json']);
    const manifest = JSON.parse(readFileSync(path.join(unpacked, 'package.json'), 'utf8'));
    expect(manifest.bin).toEqual({ treadwise: 'dist/cli/main.js' });
    for (const dep of ['commander', 'zod', 'yaml', 'env-paths', 'openapi-fetch', 'piscina', 'cli-progress', 'csv-parse', 'csv-stringify']) expect(manifest.dependencies[dep], dep).toBeDefined();
    const main = path.join(unpacked, 'dist/cli/main.js');
    expect(readFileSync(main, 'utf8').startsWith('#!/usr/bin/env node\n')).toBe(true);
    expect(statSync(main).mode & 0o111).not.toBe(0);
  });

  it('runs as a process: version, login into the XDG config directory (mode 0600), whoami', async () => {
    expect((await treadwise(['--version'])).stdout.trim()).toBe(API_VERSION);
    const xdg = mkdtempSync(path.join(tmpdir(), 'treadwise-xdg-'));
    const login = await treadwise(['login', '--api-url', s.apiUrl, '--api-key', s.token], { XDG_CONFIG_HOME: xdg });
    expect(login.stderr).toBe('');
    expect(login.code).toBe(0);
    const file = path.join(xdg, 'treadwise', 'login.json'); // env-paths: $XDG_CONFIG_HOME/treadwise on Linux
    expect(statSync(file).mode & 0o777).toBe(0o600);
    const whoami = await treadwise(['whoami', '--json'], { XDG_CONFIG_HOME: xdg });
    expect(JSON.parse(whoami.stdout).credential.keyId).toBe(s.keyId);
  });

  it('sizes a batch offline on the packed worker thread (batch --local)', async () => {
    const dir = mkdtempSync(path.join(tmpdir(), 'treadwise-pack-batch-'));
    const input = path.join(dir, 'stairs.ndjson');
    writeFileSync(input, [{ ref: 'Plot 1', request: alderRowTownhouse }, { ref: 'Plot 2', request: { layout: 'tread-strips' } }].map((l) => JSON.stringify(l)).join('\n'));
    const out = path.join(dir, 'results.ndjson');
    const batch = await treadwise(['batch', input, '-o', out, '--local', '--json']);
    expect(batch.code).toBe(1); // Plot 2 has no stair: refused
    expect(JSON.parse(batch.stdout)).toMatchObject({ rows: 2, ok: 1, failed: 1, failedRows: [{ row: 2, ref: 'Plot 2', code: 'validation_failed' }] });
    const [first] = readFileSync(out, 'utf8').split('\n').map((l) => l && JSON.parse(l));
    expect(first).toMatchObject({ index: 0, ref: 'Plot 1', status: 'ok', summary: { treads: 14 } });
  });

  it('fails in one line with exit 1 when nothing answers, and exit 2 on a bad flag', async () => {
    const probe = createServer().listen(0, '127.0.0.1');
    await new Promise((r) => probe.once('listening', r));
    const closedPort = (probe.address() as AddressInfo).port;
    await new Promise((r) => probe.close(r));
    const down = await treadwise(['health', '--api-url', `http://127.0.0.1:${closedPort}`]);
    expect(down.code).toBe(1);
    expect(down.stderr).toBe(`treadwise: cannot reach http://127.0.0.1:${closedPort} (ECONNREFUSED)\n`);
    const bad = await treadwise(['estimate', '--treads']);
    expect(bad.code).toBe(2);
  });
});
