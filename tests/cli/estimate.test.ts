import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { stringify } from 'yaml';
import { alderRowTownhouse, quaysideCorridor } from '../../shared/schemas/estimate-examples.js';
import { runCli } from '../support/cli-run.js';
import { startCliServer, type CliServer } from '../support/cli-server.js';

let s: CliServer;
let dir: string;
let key: string[];
beforeAll(async () => {
  s = await startCliServer();
  dir = mkdtempSync(path.join(tmpdir(), 'treadwise-estimate-'));
  key = ['--api-url', s.apiUrl, '--api-key', s.token];
});
afterAll(async () => {
  await s.close();
});

/** The Alder Row townhouse with a controller whose outputs carry only 0.1 A: every tread (0.354 A) overloads its output. */
const overloaded = { ...alderRowTownhouse, controller: { profile: { ...alderRowTownhouse.controller.profile, maxCurrentPerOutputA: 0.1 } } };

describe('treadwise estimate', () => {
  it('reads a JSON file and prints the report: treads, drivers, cable, checks, cautions', async () => {
    const file = path.join(dir, 'townhouse.json');
    writeFileSync(file, JSON.stringify(alderRowTownhouse));
    const run = await runCli(['estimate', file, ...key]);
    expect(run.stderr).toBe('');
    expect(run.code).toBe(0);
    // 14 treads of 900 mm: 17 pitches of 50 mm = 850 mm each at 10 W/m = 8.5 W (shared/sizing; the API docs' example answer)
    expect(run.stdout).toMatch(/^Treads +14 lit of 14$/m);
    expect(run.stdout).toMatch(/^Load +119 W on 1 controller, 1 driver$/m);
    expect(run.stdout).toMatch(/^ +1 +850 +8\.5 +0\.354 +1\/1 +tread-lead /m);
    expect(run.stdout).toMatch(/^ +14 +850 +8\.5 +0\.354 +1\/14 /m);
    expect(run.stdout).toContain('circuit 1 (controller 1): 24 V, 119 W, 4.96 A → 150 W driver at 79.3 %');
    expect(run.stdout).toMatch(/^tread leads +0\.5 mm² +2 +14 /m);
    expect(run.stdout).toMatch(/^ {2}PASS {2}output-count: /m);
    expect(run.stdout).not.toContain('FAIL  ');
    expect(run.stdout).toContain('Bill of materials');
    expect(run.stdout).toMatch(/Cautions\n {2}! Treadwise sizes the low-voltage side only/);
    expect(run.stdout).not.toContain('\u001b['); // not a terminal: no colour codes
  });

  it('reads YAML from stdin with -, and exits 3 naming the failing checks with their suggestion', async () => {
    const run = await runCli(['estimate', '-', ...key], { stdin: stringify(overloaded) });
    expect(run.code).toBe(3);
    expect(run.stdout).toMatch(/^ {2}FAIL {2}output-current: .+\n {8}→ .+/m);
    expect(run.stdout.indexOf('FAIL')).toBeLessThan(run.stdout.indexOf('PASS')); // failures first
    expect(run.stderr).toMatch(/^treadwise: \d+ design check\(s\) failed: change the design before buying parts\n$/);
  });

  it('prints the API’s answer as JSON with --json, still exiting 3 on a failing design', async () => {
    const good = await runCli(['estimate', '-', '--json', ...key], { stdin: JSON.stringify(alderRowTownhouse) });
    expect(good.code).toBe(0);
    const estimate = JSON.parse(good.stdout);
    expect(estimate).toMatchObject({ layout: 'tread-strips', summary: { treads: 14, checks: { fail: 0 } } });
    expect(estimate.treads).toHaveLength(14);

    const bad = await runCli(['estimate', '-', '--json', ...key], { stdin: JSON.stringify(overloaded) });
    expect(bad.code).toBe(3);
    expect(JSON.parse(bad.stdout).checks.filter((c: { status: string }) => c.status === 'fail').map((c: { id: string }) => c.id)).toContain('output-current');
  });

  it('builds the request from flags, and flags override a file’s fields', async () => {
    const flags = ['--treads', '12', '--tread-width-mm', '1000', '--riser-mm', '180', '--going-mm', '260', '--voltage', '24', '--watts-per-m', '10', '--cut-pitch-mm', '50'];
    const profile = path.join(dir, 'controller.yaml');
    writeFileSync(profile, stringify({ controller: alderRowTownhouse.controller }));
    const run = await runCli(['estimate', profile, ...flags, '--json', ...key]);
    expect(run.code).toBe(0);
    const estimate = JSON.parse(run.stdout);
    expect(estimate.summary.treads).toBe(12);
    // 1000 mm − 2 × 20 mm clearance = 960 mm → 19 pitches of 50 mm = 950 mm (the engine's cut rule, default clearance)
    expect(estimate.treads[0].stripLengthMm).toBe(950);

    const file = path.join(dir, 'townhouse.yaml');
    writeFileSync(file, stringify(alderRowTownhouse));
    const overridden = await runCli(['estimate', file, '--treads', '10', '--json', ...key]);
    expect(JSON.parse(overridden.stdout).summary.treads).toBe(10);
  });

  it('prices the BOM from the stored catalog with net, tax and gross', async () => {
    const template = await fetch(`${s.apiUrl}/v1/catalog/template`, { headers: { authorization: `Bearer ${s.token}` } });
    const csv = path.join(dir, 'catalog.csv');
    writeFileSync(csv, await template.text());
    expect((await runCli(['catalog', 'import', csv, ...key])).code).toBe(0);
    const run = await runCli(['estimate', '-', ...key], { stdin: JSON.stringify({ ...alderRowTownhouse, controller: { profileId: 'HL-K36' } }) });
    expect(run.code).toBe(0);
    // The template's HL-S24-10 reel at 39.00: three reels for fourteen 850 mm pieces (5 per 5 m reel).
    expect(run.stdout).toMatch(/^ +3 +reel +HL-S24-10 +.+ +39\.00 +117\.00$/m);
    expect(run.stdout).toMatch(/^Net +\d+\.\d\d \w{3}$/m);
    expect(run.stdout).toMatch(/^Tax \d+ % +\d+\.\d\d \w{3}$/m);
    expect(run.stdout).toMatch(/^Gross +\d+\.\d\d \w{3}$/m);
    expect(run.stdout).toMatch(/Priced from the stored catalog v\d+/);
  });

  it('reports a corridor’s rail pixel run (no treads) with its data outputs and refresh rate', async () => {
    const run = await runCli(['estimate', '-', ...key], { stdin: stringify(quaysideCorridor) });
    // The second data output's lead runs 9.5 m to the middle of the rail, past the ~2 m one-wire gap (the API docs' example answer): a failing check.
    expect(run.code).toBe(3);
    expect(run.stdout).toMatch(/^ {2}FAIL {2}data-line-length: /m);
    expect(run.stdout).toMatch(/^Estimate +rail-pixels, engine /m);
    expect(run.stdout).not.toContain('\nTreads\n');
    // 18 m × 60 pixels/m = 1080 pixels (the request); the engine splits them over the HL-K36 profile's 2 data outputs of ≤ 600
    expect(run.stdout).toMatch(/^ {2}rail: 1080 pixels, 2 data output\(s\) of 540, [\d.]+ Hz, /m);
    expect(run.stdout).toContain('Cautions');
  });

  it('turns malformed input into a usage error naming the fields, on one line', async () => {
    const run = await runCli(['estimate', '-', ...key], { stdin: JSON.stringify({ ...alderRowTownhouse, staircase: { ...alderRowTownhouse.staircase, treads: -3 } }) });
    expect(run.code).toBe(2);
    expect(run.stdout).toBe('');
    expect(run.stderr).toMatch(/^treadwise: [^\n]*staircase\.treads: [^\n]*\(code validation_failed, request [0-9a-f-]{36}\)\n$/);

    const notYaml = await runCli(['estimate', '-', ...key], { stdin: 'layout: [tread-strips\n' });
    expect(notYaml.code).toBe(2);
    expect(notYaml.stderr).toMatch(/^treadwise: stdin is not valid JSON or YAML: /);

    const nothing = await runCli(['estimate', ...key]);
    expect(nothing.code).toBe(2);

    const badFlag = await runCli(['estimate', '--treads', 'many', ...key]);
    expect(badFlag.code).toBe(2);
    expect(badFlag.stderr).toContain('--treads: must be a whole number');
  });

  it('colours the checks on a terminal, and not with NO_COLOR or --no-color', async () => {
    const stdin = JSON.stringify(overloaded);
    const coloured = await runCli(['estimate', '-', ...key], { stdin, stdoutIsTTY: true });
    expect(coloured.stdout).toContain('\u001b[31mFAIL\u001b[39m');
    const noColorEnv = await runCli(['estimate', '-', ...key], { stdin, stdoutIsTTY: true, env: { NO_COLOR: '1' } });
    expect(noColorEnv.stdout).not.toContain('\u001b[');
    const noColorFlag = await runCli(['estimate', '-', '--no-color', ...key], { stdin, stdoutIsTTY: true });
    expect(noColorFlag.stdout).not.toContain('\u001b[');
  });
});
