import { mkdtempSync, readFileSync, statSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createMember, signIn } from '../support/accounts.js';
import { createKey } from '../support/fixtures.js';
import { runCli } from '../support/cli-run.js';
import { startCliServer, type CliServer } from '../support/cli-server.js';

let s: CliServer;
beforeAll(async () => {
  s = await startCliServer();
});
afterAll(async () => {
  await s.close();
});

const freshDir = () => mkdtempSync(path.join(tmpdir(), 'treadwise-login-'));

describe('treadwise login, whoami, logout', () => {
  it('checks the key, stores it with the URL in a file only its owner can read, and whoami then needs no flags', async () => {
    const configDir = freshDir();
    const login = await runCli(['login', '--api-url', s.apiUrl, '--api-key', s.token], { configDir });
    expect(login.stderr).toBe('');
    expect(login.code).toBe(0);
    expect(login.stdout).toContain(`Key           ${s.keyId} (server key)`);

    const file = path.join(configDir, 'login.json');
    expect(statSync(file).mode & 0o777).toBe(0o600);
    expect(JSON.parse(readFileSync(file, 'utf8'))).toEqual({ apiUrl: s.apiUrl, apiKey: s.token });

    const whoami = await runCli(['whoami'], { configDir });
    expect(whoami.code).toBe(0);
    expect(whoami.stdout).toMatch(new RegExp(`Organisation +${s.organization.name} \\(${s.organization.slug}\\)`));
    expect(whoami.stdout).toContain('Name          server test key');
    expect(whoami.stdout).toMatch(/Scopes +sizing:run, usage:read, keys:manage/);

    const logout = await runCli(['logout'], { configDir });
    expect(logout.code).toBe(0);
    expect(logout.stdout).toContain(`removed ${file}`);
    const after = await runCli(['whoami'], { configDir });
    expect(after.code).toBe(2);
    expect(after.stderr).toBe('treadwise: no API key: run treadwise login, or pass --api-key or TREADWISE_API_KEY\n');
  });

  it('reads the key from stdin with --api-key -, keeping it out of the shell history', async () => {
    const configDir = freshDir();
    const login = await runCli(['login', '--api-url', s.apiUrl, '--api-key', '-'], { configDir, stdin: `${s.token}\n` });
    expect(login.code).toBe(0);
    expect(JSON.parse(readFileSync(path.join(configDir, 'login.json'), 'utf8')).apiKey).toBe(s.token);
  });

  it('refuses a key the API does not know and stores nothing', async () => {
    const configDir = freshDir();
    const bogus = `tw_server_abcdefghijkl_${'A'.repeat(32)}`;
    const login = await runCli(['login', '--api-url', s.apiUrl, '--api-key', bogus], { configDir });
    expect(login.code).toBe(1);
    expect(login.stderr.split('\n').filter(Boolean)).toHaveLength(1);
    expect(login.stderr).toMatch(/^treadwise: .*\(code credential_unknown, request [\w-]+\)\n$/);
    expect(() => statSync(path.join(configDir, 'login.json'))).toThrow();
  });

  it('lets TREADWISE_API_URL / TREADWISE_API_KEY override the login, and the flags override both', async () => {
    const configDir = freshDir();
    writeFileSync(path.join(configDir, 'login.json'), JSON.stringify({ apiUrl: 'http://127.0.0.1:9', apiKey: 'tw_server_zzzzzzzzzzzz_' + 'B'.repeat(32) }));
    const viaEnv = await runCli(['whoami', '--json'], { configDir, env: { TREADWISE_API_URL: s.apiUrl, TREADWISE_API_KEY: s.token } });
    expect(viaEnv.code).toBe(0);
    expect(JSON.parse(viaEnv.stdout)).toMatchObject({ apiUrl: s.apiUrl, credential: { kind: 'server', keyId: s.keyId }, organization: { slug: s.organization.slug } });

    const viaFlags = await runCli(['whoami', '--json', '--api-url', s.apiUrl, '--api-key', s.token], { configDir, env: { TREADWISE_API_URL: 'http://127.0.0.1:9' } });
    expect(viaFlags.code).toBe(0);
    expect(JSON.parse(viaFlags.stdout).credential.keyId).toBe(s.keyId);
  });

  it('shows a server key with a single scope its name, scopes and organisation', async () => {
    const { key, token } = await createKey(s.t, s.organization.id, { scopes: ['sizing:run'] });
    const run = await runCli(['whoami', '--api-url', s.apiUrl, '--api-key', token]);
    expect(run.code).toBe(0);
    expect(run.stdout).toMatch(new RegExp(`^Key +${key.keyId} \\(server key\\)$`, 'm'));
    expect(run.stdout).toMatch(/^Scopes +sizing:run$/m);
    expect(run.stdout).toMatch(new RegExp(`^Organisation +${s.organization.name} \\(${s.organization.slug}\\), plan \\w+$`, 'm'));
    expect(run.stdout).not.toContain('Not shown');
  });

  it('says what an embed key cannot see, instead of failing', async () => {
    const { key, token } = await createKey(s.t, s.organization.id, { kind: 'embed', allowedOrigins: ['https://shop.harborlane.test'] });
    const run = await runCli(['whoami', '--api-url', s.apiUrl, '--api-key', token]);
    expect(run.code).toBe(0);
    expect(run.stdout).toMatch(new RegExp(`^Key +${key.keyId} \\(embed key\\)$`, 'm'));
    expect(run.stdout).toMatch(/^Not shown +organisation \(needs usage:read\); name and scopes \(needs keys:manage\)$/m);
  });

  it('tells a signed-in user’s access token apart from a key', async () => {
    const { email } = await createMember(s.t.app, s.organization.id, 'viewer');
    const session = await signIn(s.t.app, email);
    const run = await runCli(['whoami', '--api-url', s.apiUrl, '--api-key', session.accessToken]);
    expect(run.code).toBe(0);
    expect(run.stdout).toMatch(/^Credential +access token of a signed-in user$/m);
    expect(run.stdout).toMatch(new RegExp(`^User +${email}$`, 'm'));
    expect(run.stdout).toMatch(new RegExp(`^Organisation +${s.organization.name} \\(${s.organization.slug}\\), viewer$`, 'm'));
  });

  it('prints a revoked key’s problem as one line with the request id', async () => {
    const { key, token } = await createKey(s.t, s.organization.id, { scopes: ['usage:read'] });
    await s.t.app.locals.services.apiKeys.revoke(s.organization.id, key.id);
    const run = await runCli(['whoami', '--api-url', s.apiUrl, '--api-key', token]);
    expect(run.code).toBe(1);
    expect(run.stdout).toBe('');
    expect(run.stderr).toMatch(/^treadwise: [^\n]+\(code credential_revoked, request [0-9a-f-]{36}\)\n$/);
    expect(run.stderr).not.toMatch(/\bat \S+:\d+/); // no stack trace
  });
});
