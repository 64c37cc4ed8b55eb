import { mkdtempSync, readFileSync, readdirSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { alderRowCornerUnit, alderRowTownhouse } from '../../shared/schemas/estimate-examples.js';
import { createKey, createOrganization } from '../support/fixtures.js';
import { runCli } from '../support/cli-run.js';
import { startCliServer, type CliServer } from '../support/cli-server.js';

let s: CliServer;
let key: string[];
let token: string;
let projectId: string;

async function call(method: string, url: string, body?: unknown) {
  const res = await fetch(`${s.apiUrl}${url}`, {
    method,
    headers: { authorization: `Bearer ${token}`, 'content-type': 'application/json' },
    body: body === undefined ? undefined : JSON.stringify(body),
  });
  if (!res.ok) throw new Error(`${method} ${url}: ${res.status} ${await res.text()}`);
  return res.json();
}

beforeAll(async () => {
  s = await startCliServer();
  ({ token } = await createKey(s.t, s.organization.id, { scopes: ['sizing:run', 'projects:read', 'projects:write'] }));
  key = ['--api-url', s.apiUrl, '--api-key', token];
  const project = await call('POST', '/v1/projects', { name: 'Alder Row, house 7', clientName: 'Kestrel & Finch Builders', siteAddress: '7 Alder Row\nMillbrook' });
  projectId = project.id;
  const main = await call('POST', `/v1/projects/${projectId}/stairs`, { name: 'Main stair', input: alderRowTownhouse });
  await call('POST', `/v1/projects/${projectId}/stairs`, { name: 'Corner unit stair', input: alderRowCornerUnit });
  await call('POST', `/v1/projects/${projectId}/stairs/${main.id}/estimates`, {});
});
afterAll(async () => {
  await s.close();
});

describe('treadwise projects', () => {
  it('lists the projects', async () => {
    const run = await runCli(['projects', 'list', ...key]);
    expect(run.code).toBe(0);
    expect(run.stdout).toMatch(new RegExp(`^${projectId} +Alder Row, house 7 +Kestrel & Finch Builders +2 `, 'm'));
    const json = await runCli(['projects', 'list', '--json', ...key]);
    expect(JSON.parse(json.stdout).map((p: { id: string }) => p.id)).toEqual([projectId]);
  });

  it('shows a project with its stairs and each one’s latest estimate', async () => {
    const run = await runCli(['projects', 'show', projectId, ...key]);
    expect(run.code).toBe(0);
    expect(run.stdout).toMatch(/^Site +7 Alder Row, Millbrook$/m);
    // the main stair ran once: 14 treads; the corner unit (7 + 8 = 15 treads) never ran
    expect(run.stdout).toMatch(/^Main stair +tread-strips +14 +[0-9a-f-]{36} +\d{4}-\d\d-\d\d \d\d:\d\d UTC +\d+\/\d+\/0 +unpriced$/m);
    expect(run.stdout).toMatch(/^Corner unit stair +tread-strips +15 +not run +— +— +—$/m);
  });

  it('exports the project as JSON, to stdout or a file', async () => {
    const run = await runCli(['projects', 'export', projectId, ...key]);
    expect(run.code).toBe(0);
    const doc = JSON.parse(run.stdout);
    expect(doc.project).toMatchObject({ id: projectId, name: 'Alder Row, house 7', stairCount: 2 });
    expect(doc.stairs.map((x: { stair: { name: string } }) => x.stair.name).sort()).toEqual(['Corner unit stair', 'Main stair']);
    const main = doc.stairs.find((x: { stair: { name: string } }) => x.stair.name === 'Main stair');
    expect(main.stair.input).toEqual(alderRowTownhouse);
    expect(main.latest.summary.treads).toBe(14);

    const out = path.join(mkdtempSync(path.join(tmpdir(), 'treadwise-projects-')), 'alder-row.json');
    const toFile = await runCli(['projects', 'export', projectId, '-o', out, ...key]);
    expect(toFile.stdout).toBe('');
    expect(JSON.parse(readFileSync(out, 'utf8'))).toEqual(doc);
  });

  it('exports a folder: each stair’s request for treadwise estimate, and its latest estimate’s BOM, schedule and PDF', async () => {
    const dir = mkdtempSync(path.join(tmpdir(), 'treadwise-projects-'));
    const run = await runCli(['projects', 'export', projectId, '--dir', dir, ...key]);
    expect(run.code).toBe(0);
    expect(readdirSync(dir).sort()).toEqual(['corner-unit-stair', 'main-stair', 'project.json']);
    expect(readdirSync(path.join(dir, 'main-stair')).sort()).toEqual(['bom.csv', 'document.pdf', 'request.json', 'wiring-schedule.csv']);
    expect(readdirSync(path.join(dir, 'corner-unit-stair'))).toEqual(['request.json']); // never run: no documents
    expect(readFileSync(path.join(dir, 'main-stair', 'document.pdf')).subarray(0, 5).toString('latin1')).toBe('%PDF-');
    expect(readFileSync(path.join(dir, 'main-stair', 'bom.csv'), 'utf8')).toMatch(/^\uFEFF/); // the API's bytes, BOM kept
    const again = await runCli(['estimate', path.join(dir, 'main-stair', 'request.json'), '--json', ...key]);
    expect(again.code).toBe(0);
    expect(JSON.parse(again.stdout).summary.treads).toBe(14);
  });

  it('answers another organisation’s project as not found, in one line', async () => {
    const other = await createOrganization(s.t);
    const { token: otherToken } = await createKey(s.t, other.id, { scopes: ['projects:write'] });
    const res = await fetch(`${s.apiUrl}/v1/projects`, { method: 'POST', headers: { authorization: `Bearer ${otherToken}`, 'content-type': 'application/json' }, body: JSON.stringify({ name: 'Quayside Studio corridor' }) });
    const theirs = (await res.json()).id as string;
    const run = await runCli(['projects', 'show', theirs, ...key]);
    expect(run.code).toBe(1);
    expect(run.stdout).toBe('');
    expect(run.stderr).toMatch(/^treadwise: Not found: [^\n]+\(code project_not_found, request [0-9a-f-]{36}\)\n$/);
  });
});
