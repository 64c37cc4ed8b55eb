import { execFile } from 'node:child_process';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { promisify } from 'node:util';
import { afterAll, describe, expect, it } from 'vitest';
import { policyFor } from '../../api/auth/policy.js';
import { openApiDocument } from '../../api/openapi/spec.js';

const run = promisify(execFile);
const REDOCLY = path.resolve('node_modules/@redocly/cli/bin/cli.js');

// The document as the generator builds it now (the committed copy is checked against it in
// openapi.test.ts), written where the linter can read it.
const dir = mkdtempSync(path.join(tmpdir(), 'treadwise-openapi-'));
const file = path.join(dir, 'openapi.json');
writeFileSync(file, JSON.stringify(openApiDocument(), null, 2));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

interface Operation {
  operationId?: string;
  security?: unknown[];
  responses: Record<string, unknown>;
}
const operations = Object.entries(openApiDocument().paths ?? {}).flatMap(([p, item]) =>
  Object.entries(item as Record<string, Operation>).map(([method, op]) => ({ method: method.toUpperCase(), path: p, op })),
);

describe('the OpenAPI document under a linter', () => {
  it("passes @redocly/cli lint with its recommended rules: no error and no warning", async () => {
    const { stdout } = await run(process.execPath, [REDOCLY, 'lint', file, '--extends=recommended', '--format=json'], {
      // No telemetry or update check: the suite runs offline.
      env: { ...process.env, REDOCLY_TELEMETRY: 'off', REDOCLY_SUPPRESS_UPDATE_NOTICE: 'true', NO_COLOR: '1' },
      maxBuffer: 16 * 1024 * 1024,
    }).catch((err: { stdout?: string }) => ({ stdout: err.stdout ?? '' })); // exit code 1 on errors: show them
    const report = JSON.parse(stdout) as { totals: Record<string, number>; problems: { ruleId: string; message: string; location: { pointer: string }[] }[] };
    expect(report.problems.map((p) => `${p.ruleId} at ${p.location[0]?.pointer}: ${p.message}`)).toEqual([]);
    expect(report.totals).toMatchObject({ errors: 0, warnings: 0 });
  }, 60_000);

  it('gives every operation a unique camelCase operationId', () => {
    const ids = operations.map((o) => o.op.operationId);
    for (const o of operations) expect(o.op.operationId, `${o.method} ${o.path}`).toMatch(/^[a-z][a-zA-Z0-9]*$/);
    expect(new Set(ids).size).toBe(ids.length);
  });

  it('declares security: [] exactly on the operations the policy table makes public', () => {
    for (const { method, path: p, op } of operations) {
      const isPublic = policyFor(method, p)?.policy.public === true;
      if (isPublic) expect(op.security, `${method} ${p}`).toEqual([]);
      else expect(op.security, `${method} ${p}`).toEqual([{ bearer: [] }]);
    }
  });

  it('documents at least one 4xx answer on every operation', () => {
    for (const { method, path: p, op } of operations) expect(Object.keys(op.responses).some((s) => /^4\d\d$/.test(s)), `${method} ${p}`).toBe(true);
  });
});
