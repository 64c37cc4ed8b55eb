// `npm run bench:batch [-- --rows 100000]`: rows/s of `treadwise batch --local` (the built CLI, as a
// user runs it) on generated stair rows, with one worker thread and with one per core. A benchmark
// that prints figures, never part of `npm test`.
import { spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { availableParallelism, tmpdir } from 'node:os';
import path from 'node:path';
import { performance } from 'node:perf_hooks';
import { alderRowCornerUnit, alderRowTownhouse, alderRowTreadPixels, alderRowWithRail, quaysideCorridor } from '../../shared/schemas/estimate-examples.js';
import { requestToRow, stairRowColumns } from '../../shared/schemas/stair-row.js';
import { writeCsv } from '../../shared/tables/csv.js';

const rowsArg = process.argv.indexOf('--rows');
const ROWS = rowsArg > 0 ? Number(process.argv[rowsArg + 1]) : 10_000;
const EXAMPLES: readonly object[] = [alderRowTownhouse, alderRowCornerUnit, quaysideCorridor, alderRowWithRail, alderRowTreadPixels];

/** Stairs from the documented examples, varied in tread width so rows differ. */
function stairsCsv(rows: number): string {
  const requests = Array.from({ length: rows }, (_, i) => {
    const request = structuredClone(EXAMPLES[i % EXAMPLES.length]) as { staircase?: { treadWidthMm?: number } };
    if (request.staircase?.treadWidthMm) request.staircase.treadWidthMm = 700 + (i % 9) * 50;
    return request;
  });
  const columns = stairRowColumns(requests);
  return writeCsv([columns, ...requests.map((r, i) => {
    const row = requestToRow(r, `Plot ${i + 1}`);
    return columns.map((c) => row[c]);
  })]);
}

const build = spawnSync('npm', ['run', '--silent', 'build:cli'], { stdio: 'ignore' });
if (build.status !== 0) throw new Error('CLI build failed');

const dir = mkdtempSync(path.join(tmpdir(), 'treadwise-bench-batch-'));
const input = path.join(dir, 'stairs.csv');
writeFileSync(input, stairsCsv(ROWS));
const cores = availableParallelism();

console.log(`treadwise batch --local, ${ROWS.toLocaleString('en')} generated stair rows (CSV in, CSV out), built CLI, ${cores} core(s):`);
let reference: string | undefined;
for (const threads of [...new Set([1, cores])]) {
  const out = path.join(dir, `results-${threads}.csv`);
  const started = performance.now();
  const run = spawnSync(process.execPath, ['dist/cli/main.js', 'batch', input, '-o', out, '--local', '--concurrency', String(threads), '--no-progress', '--json'], { encoding: 'utf8' });
  const seconds = (performance.now() - started) / 1000;
  if (run.status !== 0) throw new Error(`batch exited ${run.status}: ${run.stderr}`);
  const summary = JSON.parse(run.stdout) as { rows: number; ok: number };
  const text = readFileSync(out, 'utf8');
  reference ??= text;
  const same = text === reference ? 'same bytes' : 'DIFFERENT BYTES';
  console.log(`  ${String(threads).padStart(2)} worker thread(s)  ${Math.round(summary.rows / seconds).toLocaleString('en').padStart(7)} rows/s  (${seconds.toFixed(2)} s with process start-up, ${summary.ok} rows sized, ${same})`);
}
rmSync(dir, { recursive: true, force: true });
