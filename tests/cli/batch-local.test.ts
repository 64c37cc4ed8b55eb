import { existsSync, readFileSync, statSync, writeFileSync } from 'node:fs';
import path from 'node:path';
import { eq } from 'drizzle-orm';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { organizations, plans } from '../../api/db/schema.js';
import { catalogCsv } from '../../shared/schemas/catalog-csv.js';
import type { StoredCatalogItem } from '../../shared/schemas/catalog-store.js';
import type { EstimateBatchItemResult } from '../../shared/schemas/estimate-batch.js';
import { harborLaneCatalog } from '../../shared/schemas/estimate-examples.js';
import { BATCH_RESULT_COLUMNS, batchResultRow } from '../../shared/sizing/batch/result-row.js';
import { writeCsv } from '../../shared/tables/csv.js';
import { runCli } from '../support/cli-run.js';
import { ALL_KEY_SCOPES, startCliServer, type CliServer } from '../support/cli-server.js';
import { createKey } from '../support/fixtures.js';
import { batchItems, tempDir, writeNdjson, writeStairCsv, type BatchItem } from './batch-fixtures.js';

/** Worker threads start and warm up slowly on a busy machine: room enough, never a timing assertion. */
const SLOW = 120_000;

let s: CliServer;
/** A key that may run synchronous batches (batches:write) and manage the catalog. */
let token: string;
let dir: string;
const ITEMS = batchItems(300);

/** What POST /v1/estimates/batch answers for the items (in calls of at most 500). */
async function syncBatch(items: readonly BatchItem[], detail: 'summary' | 'full' = 'summary'): Promise<EstimateBatchItemResult[]> {
  const res = await fetch(`${s.apiUrl}/v1/estimates/batch?detail=${detail}`, {
    method: 'POST',
    headers: { authorization: `Bearer ${token}`, 'content-type': 'application/json' },
    body: JSON.stringify({ items }),
  });
  if (res.status !== 200) throw new Error(`batch: ${res.status} ${await res.text()}`);
  return ((await res.json()) as { items: EstimateBatchItemResult[] }).items;
}

const asCsv = (items: readonly EstimateBatchItemResult[]) => writeCsv([[...BATCH_RESULT_COLUMNS], ...items.map(batchResultRow)]);
const asNdjson = (items: readonly EstimateBatchItemResult[]) => items.map((i) => `${JSON.stringify(i)}\n`).join('');

let apiItems: EstimateBatchItemResult[];

beforeAll(async () => {
  s = await startCliServer();
  // A plan whose quota and per-minute cost budget never bind: the comparison sends hundreds of stairs at once.
  await s.t.database.db.insert(plans).values({ id: 'batch-cli-test', name: 'Batch CLI test', monthlyQuota: 10_000_000, ratePerMinute: 100_000, costPerMinute: 100_000_000 });
  await s.t.database.db.update(organizations).set({ planId: 'batch-cli-test' }).where(eq(organizations.id, s.organization.id));
  ({ token } = await createKey(s.t, s.organization.id, { scopes: [...ALL_KEY_SCOPES, 'batches:write'] }));
  dir = tempDir();
  writeStairCsv(path.join(dir, 'stairs.csv'), ITEMS);
  writeNdjson(path.join(dir, 'stairs.ndjson'), ITEMS);
  apiItems = await syncBatch(ITEMS);
});
afterAll(async () => {
  await s.close();
});

describe('treadwise batch --local', () => {
  it('writes, byte for byte, the CSV of what the synchronous batch API answers for the same stairs', async () => {
    // The set holds sized rows, rows with failing checks and refused rows of several kinds.
    expect(apiItems.filter((i) => i.status === 'error').length).toBe(30); // 5 bad rows in every 50
    expect(apiItems.filter((i) => i.status === 'ok').length).toBeGreaterThan(200);
    const out = path.join(dir, 'results.csv');
    const run = await runCli(['batch', path.join(dir, 'stairs.csv'), '-o', out, '--local', '--concurrency', '2', '--chunk-rows', '40']);
    expect(readFileSync(out, 'utf8')).toBe(asCsv(apiItems));
    // exit 1: some rows failed; the summary lists the first 20 by row number, then counts the rest
    expect(run.code).toBe(1);
    const failed = apiItems.filter((i) => i.status === 'error');
    expect(run.stdout).toMatch(new RegExp(`^Rows +300$`, 'm'));
    expect(run.stdout).toMatch(new RegExp(`^Failed +${failed.length}$`, 'm'));
    expect(run.stdout).toContain(`  row 12 (Plot 12)  validation_failed: staircase.treads:`);
    expect(run.stdout).toContain(`  …and ${failed.length - 20} more`);
    expect(run.stderr).toContain(`treadwise: ${failed.length} row(s) could not be sized`);
  }, SLOW);

  it('writes the NDJSON of the same answers, in row order, from an NDJSON input with --detail full', async () => {
    const full = await syncBatch(ITEMS.slice(0, 60), 'full');
    const input = path.join(dir, 'sixty.ndjson');
    writeNdjson(input, ITEMS.slice(0, 60));
    const out = path.join(dir, 'results-full.ndjson');
    const run = await runCli(['batch', input, '-o', out, '--local', '--detail', 'full', '--chunk-rows', '7', '--json']);
    expect(readFileSync(out, 'utf8')).toBe(asNdjson(full));
    const summary = JSON.parse(run.stdout);
    expect(summary).toMatchObject({ output: out, format: 'ndjson', rows: 60, ok: full.filter((i) => i.status === 'ok').length });
    expect(summary.failedRows.map((f: { row: number }) => f.row)).toEqual(full.filter((i) => i.status === 'error').map((i) => i.index + 1));
  }, SLOW);

  it('reads stdin (-) and exits 0 when every row was sized', async () => {
    const good = ITEMS.filter((_, i) => ![11, 23, 31, 40, 47].includes(i % 50)).slice(0, 30);
    const out = path.join(dir, 'good.csv');
    const stdin = readFileSync(path.join(dir, 'stairs.ndjson'), 'utf8').split('\n').filter((_, i) => ![11, 23, 31, 40, 47].includes(i % 50)).slice(0, 30).join('\n');
    const run = await runCli(['batch', '-', '-o', out, '--local'], { stdin });
    expect(run.code).toBe(0);
    expect(readFileSync(out, 'utf8')).toBe(asCsv(await syncBatch(good)));
  }, SLOW);

  it('prices from --catalog exactly as the API prices from the same catalog stored', async () => {
    // The catalog travels as the CSV the catalog upload takes; the API stores it, the CLI reads the file.
    const stored = harborLaneCatalog.items.map((item) => ({ ...item, active: true })) as unknown as StoredCatalogItem[];
    const retired = { ...stored[0]!, sku: 'HL-RETIRED', unitPrice: 1, active: false } as StoredCatalogItem;
    const catalogFile = path.join(dir, 'catalog.csv');
    writeFileSync(catalogFile, catalogCsv([...stored, retired]));
    const form = new FormData();
    form.append('file', new Blob([readFileSync(catalogFile)], { type: 'text/csv' }), 'catalog.csv');
    const imported = await fetch(`${s.apiUrl}/v1/catalog/imports`, { method: 'POST', headers: { authorization: `Bearer ${token}` }, body: form });
    expect(imported.status).toBe(200);
    const patched = await fetch(`${s.apiUrl}/v1/catalog`, {
      method: 'PATCH',
      headers: { authorization: `Bearer ${token}`, 'content-type': 'application/json' },
      body: JSON.stringify({ taxRatePercent: 20 }),
    });
    expect(patched.status).toBe(200);

    const items = ITEMS.slice(0, 100);
    const priced = await syncBatch(items);
    const okPriced = priced.filter((i) => i.status === 'ok' && i.bomTotal !== undefined);
    expect(okPriced.length).toBeGreaterThan(50);

    const input = path.join(dir, 'hundred.csv');
    writeStairCsv(input, items);
    const out = path.join(dir, 'priced.csv');
    await runCli(['batch', input, '-o', out, '--local', '--catalog', catalogFile, '--tax-rate-percent', '20']);
    expect(readFileSync(out, 'utf8')).toBe(asCsv(priced));
    const bomTotals = (text: string) => text.trim().split('\r\n').slice(1).map((line) => line.split(',')[BATCH_RESULT_COLUMNS.indexOf('bomTotal')]);
    expect(bomTotals(readFileSync(out, 'utf8'))).toEqual(priced.map((i) => (i.status === 'ok' && i.bomTotal !== undefined ? String(i.bomTotal) : '')));

    // Without --catalog the same rows stay unpriced: the totals above came from the file.
    const unpriced = path.join(dir, 'unpriced.csv');
    await runCli(['batch', input, '-o', unpriced, '--local']);
    expect(bomTotals(readFileSync(unpriced, 'utf8')).every((cell) => cell === '')).toBe(true);
  }, SLOW);

  it('refuses a catalog file with bad rows, naming line and column (usage error)', async () => {
    const bad = path.join(dir, 'bad-catalog.csv');
    writeFileSync(bad, 'sku,kind,unitPrice\r\nX-1,driver,abc\r\n');
    const run = await runCli(['batch', path.join(dir, 'stairs.csv'), '-o', path.join(dir, 'never.csv'), '--local', '--catalog', bad]);
    expect(run.code).toBe(2);
    expect(run.stderr).toMatch(/bad-catalog\.csv is not a usable catalog: line 2 unitPrice: not a number/);
  }, SLOW);
});

describe('treadwise batch --local --resume', () => {
  let reference: string;
  beforeAll(() => {
    reference = asCsv(apiItems);
  });

  it('continues after the complete rows of a cut output: a half-written row is rewritten, none doubled', async () => {
    const out = path.join(dir, 'cut.csv');
    const cutAt = reference.indexOf('\r\n', Math.floor(reference.length * 0.4)) + 40; // inside the next row
    writeFileSync(out, reference.slice(0, cutAt));
    const run = await runCli(['batch', path.join(dir, 'stairs.csv'), '-o', out, '--local', '--resume', '--chunk-rows', '25']);
    expect(run.code).toBe(1);
    expect(readFileSync(out, 'utf8')).toBe(reference);
    const resumedAfter = reference.slice(0, cutAt).split('\r\n').length - 2;
    expect(run.stdout).toMatch(new RegExp(`^Resumed +after row ${resumedAfter}$`, 'm'));
    // the summary counts the whole file, not only the rows of this run
    expect(run.stdout).toMatch(/^Rows +300$/m);
  }, SLOW);

  it('stops cleanly on Ctrl-C (exit 130, whole rows, the resume command), then --resume finishes the file', async () => {
    const out = path.join(dir, 'interrupted.ndjson');
    const interrupt = new AbortController();
    const headerless = asNdjson(apiItems);
    // Ctrl-C once the first rows are on disk.
    const watch = setInterval(() => {
      if (existsSync(out) && statSync(out).size > 0) interrupt.abort();
    }, 2);
    const stopped = await runCli(['batch', path.join(dir, 'stairs.csv'), '-o', out, '--local', '--concurrency', '1', '--chunk-rows', '10'], { interrupt: interrupt.signal });
    clearInterval(watch);
    expect(stopped.code).toBe(130);
    const partial = readFileSync(out, 'utf8');
    const rows = partial.split('\n').filter(Boolean).length;
    expect(rows).toBeGreaterThan(0);
    expect(rows).toBeLessThan(300);
    expect(headerless.startsWith(partial)).toBe(true); // whole rows only, in order
    expect(stopped.stderr).toContain(`interrupted after ${rows} row(s)`);
    expect(stopped.stderr).toContain(`Continue with: treadwise batch ${path.join(dir, 'stairs.csv')} -o ${out} --local`);
    expect(stopped.stderr).toMatch(/--resume$/m);

    const resumed = await runCli(['batch', path.join(dir, 'stairs.csv'), '-o', out, '--local', '--resume']);
    expect(resumed.code).toBe(1);
    expect(readFileSync(out, 'utf8')).toBe(headerless);
  }, SLOW);

  it('refuses to resume into a file that is not this format’s results', async () => {
    const out = path.join(dir, 'other.csv');
    writeFileSync(out, 'a,b\r\n1,2\r\n');
    const run = await runCli(['batch', path.join(dir, 'stairs.csv'), '-o', out, '--local', '--resume']);
    expect(run.code).toBe(2);
    expect(run.stderr).toContain('cannot be resumed: it does not start with the batch results header');
    expect(readFileSync(out, 'utf8')).toBe('a,b\r\n1,2\r\n');
  }, SLOW);
});
