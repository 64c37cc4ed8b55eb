import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { runCli } from '../support/cli-run.js';
import { startCliServer, type CliServer } from '../support/cli-server.js';

let s: CliServer;
let dir: string;
let key: string[];
beforeAll(async () => {
  s = await startCliServer();
  dir = mkdtempSync(path.join(tmpdir(), 'treadwise-admin-'));
  key = ['--api-url', s.apiUrl, '--api-key', s.token];
});
afterAll(async () => {
  await s.close();
});

const sizes = (token: string) =>
  fetch(`${s.apiUrl}/v1/calculations/reels`, { method: 'POST', headers: { authorization: `Bearer ${token}`, 'content-type': 'application/json' }, body: JSON.stringify({ piecesMm: [850] }) }).then((r) => r.status);

describe('treadwise keys', () => {
  it('creates a key whose token works, rotates it by key id, and revokes it', async () => {
    const created = await runCli(['keys', 'create', '--name', 'Alder Row batch runner', '--scope', 'sizing:run', '--json', ...key]);
    expect(created.code).toBe(0);
    const { key: made, token } = JSON.parse(created.stdout);
    expect(made).toMatchObject({ name: 'Alder Row batch runner', kind: 'server', scopes: ['sizing:run'], status: 'active' });
    expect(token).toMatch(new RegExp(`^tw_server_${made.keyId}_`));
    expect(await sizes(token)).toBe(200);

    const listed = await runCli(['keys', 'list', ...key]);
    expect(listed.stdout).toMatch(new RegExp(`^${made.keyId} +server +active +Alder Row batch runner +sizing:run +never`, 'm'));

    const rotated = await runCli(['keys', 'rotate', made.keyId, '--overlap-hours', '0', ...key]);
    expect(rotated.code).toBe(0);
    expect(rotated.stderr).toContain('Store the token now');
    const newToken = /^Token +(\S+)$/m.exec(rotated.stdout)?.[1];
    expect(newToken).toMatch(new RegExp(`^tw_server_${made.keyId}_`));
    expect(newToken).not.toBe(token);
    expect(await sizes(newToken!)).toBe(200);
    expect(await sizes(token)).toBe(401); // overlap 0: the old secret stops at once

    const revoked = await runCli(['keys', 'revoke', made.id, ...key]);
    expect(revoked.code).toBe(0);
    expect(revoked.stdout).toBe(`Revoked ${made.keyId} ("Alder Row batch runner"): it no longer works.\n`);
    expect(await sizes(newToken!)).toBe(401);
  });

  it('keeps the old secret for --overlap-hours, and refuses an overlap beyond 72 before calling the API', async () => {
    const { token, key: made } = JSON.parse((await runCli(['keys', 'create', '--name', 'overlap', '--json', ...key])).stdout);
    const rotated = await runCli(['keys', 'rotate', made.keyId, '--overlap-hours', '2', '--json', ...key]);
    expect(rotated.code).toBe(0);
    expect(JSON.parse(rotated.stdout).key.previousSecretValidUntil).not.toBeNull();
    expect(await sizes(token)).toBe(200);

    const tooLong = await runCli(['keys', 'rotate', made.keyId, '--overlap-hours', '100', ...key]);
    expect(tooLong.code).toBe(2);
    expect(tooLong.stderr).toContain('--overlap-hours:');
  });

  it('answers a key id that does not exist plainly', async () => {
    const run = await runCli(['keys', 'revoke', 'aaaaaaaaaaaa', ...key]);
    expect(run.code).toBe(1);
    expect(run.stderr).toBe('treadwise: no key with key id aaaaaaaaaaaa in this organisation (treadwise keys list shows them)\n');
  });
});

describe('treadwise catalog', () => {
  const HEADER = 'sku,kind,description,unitPrice,active,voltageV,ratingW,crossSectionMm2,powerWPerM';

  it('dry-runs an import and lists the bad row and column, importing nothing', async () => {
    const file = path.join(dir, 'bad.csv');
    writeFileSync(file, [HEADER, 'TW-D24-150,driver,Driver 150 W,46,true,24,150,,', 'TW-D24-200,driver,,abc,true,24,200,,'].join('\n'));
    const run = await runCli(['catalog', 'import', file, '--dry-run', ...key]);
    expect(run.code).toBe(2);
    expect(run.stdout).toMatch(/^Rows +2$/m);
    expect(run.stdout).toMatch(/^ +3 +unitPrice +not a number: "abc"$/m); // line 3 of the file (the header is line 1)
    expect(run.stderr).toBe(`treadwise: ${file}: 1 bad row(s) or column(s); nothing was imported\n`);
    const exported = await runCli(['catalog', 'export', ...key]);
    expect(exported.stdout).not.toContain('TW-D24-150');
  });

  it('imports a good file and exports it again, to stdout or a file', async () => {
    const file = path.join(dir, 'good.csv');
    writeFileSync(file, [HEADER, 'TW-D24-150,driver,Driver 150 W,46,true,24,150,,', 'TW-C075,cable,,0.8,true,,,0.75,'].join('\n'));
    const dry = await runCli(['catalog', 'import', file, '--dry-run', '--json', ...key]);
    expect(JSON.parse(dry.stdout)).toMatchObject({ dryRun: true, imported: false, created: 2, errors: [] });
    const real = await runCli(['catalog', 'import', file, ...key]);
    expect(real.code).toBe(0);
    expect(real.stdout).toMatch(/^Result +imported$/m);

    const out = path.join(dir, 'export.csv');
    const exported = await runCli(['catalog', 'export', '-o', out, ...key]);
    expect(exported.code).toBe(0);
    expect(exported.stderr).toBe(`Wrote 2 item(s) to ${out}.\n`);
    const csv = readFileSync(out, 'utf8');
    expect(csv).toMatch(/^\uFEFFsku,kind,/);
    expect(csv).toContain('TW-D24-150,driver,Driver 150 W,46,true,24');
    expect((await runCli(['catalog', 'export', ...key])).stdout).toContain('TW-C075,cable');
  });

  it('makes a real import of a bad file a usage error with every field on one line', async () => {
    const file = path.join(dir, 'bad-real.csv');
    writeFileSync(file, [HEADER, 'TW-D24-240,driver,,71,maybe,24,,,'].join('\n'));
    const run = await runCli(['catalog', 'import', file, ...key]);
    expect(run.code).toBe(2);
    expect(run.stderr).toMatch(/^treadwise: [^\n]*rows\.2\.active: must be true or false[^\n]*\(code catalog_import_invalid, request [0-9a-f-]{36}\)\n$/);
  });
});

describe('treadwise usage', () => {
  it('shows the quota and the calls of the period', async () => {
    expect(await sizes(s.token)).toBe(200);
    await s.t.app.locals.services.usageMeter.flush();
    const run = await runCli(['usage', '--json', '--route', 'POST /v1/calculations/reels', ...key]);
    expect(run.code).toBe(0);
    const usage = JSON.parse(run.stdout);
    // the keys tests above sized with this organisation's keys: 200s, and the 401s of dead secrets are not the organisation's
    expect(usage.totals.requests).toBeGreaterThanOrEqual(4);
    expect(usage.filters.route).toBe('POST /v1/calculations/reels');
    const text = await runCli(['usage', ...key]);
    expect(text.stdout).toMatch(/^Quota +\d+ of \d+ used in \d{4}-\d\d/m);
    expect(text.stdout).toMatch(/^POST \/v1\/calculations\/reels +\d+ +0$/m);
    const badDay = await runCli(['usage', '--from', 'yesterday', ...key]);
    expect(badDay.code).toBe(2);
    expect(badDay.stderr).toContain('--from: must be a date, YYYY-MM-DD');
  });
});
