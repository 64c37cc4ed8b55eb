import { existsSync, readFileSync, writeFileSync } from 'node:fs';
import type { Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import path from 'node:path';
import { parse } from 'csv-parse/sync';
import express from 'express';
import multer from 'multer';
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import type { EstimateBatchItemResult } from '../../shared/schemas/estimate-batch.js';
import { csvRecordItem, ndjsonLineItem } from '../../shared/sizing/batch/input-items.js';
import { internalErrorItem, sizeBatchItem } from '../../shared/sizing/batch/items.js';
import { BATCH_RESULT_COLUMNS, batchResultRow } from '../../shared/sizing/batch/result-row.js';
import { estimate } from '../../shared/sizing/estimate/estimate.js';
import { writeCsv } from '../../shared/tables/csv.js';
import { runCli } from '../support/cli-run.js';
import { batchItems, tempDir, writeStairCsv } from './batch-fixtures.js';

/**
 * A small fake of the batch job routes of the batch contract (POST /v1/batches, GET
 * /v1/batches/{id}, GET …/results, POST …/cancel), sizing with the shared batch functions. The
 * real routes live with the API; this checks the CLI's side of the contract: upload, polling
 * through a 429 with Retry-After and a 503, the results streamed to the file, resume and cancel.
 */
/** Worker threads start and warm up slowly on a busy machine: room enough, never a timing assertion. */
const SLOW = 120_000;
const KEY = 'tw_server_fakekey0001_secret';

interface FakeJob {
  id: string;
  items: EstimateBatchItemResult[];
  status: 'queued' | 'running' | 'succeeded' | 'stopped' | 'cancelled';
  /** A job named "stop at quota" stops at half its rows, as one that reaches the monthly quota does. */
  stopsAtQuota: boolean;
  polls: number;
  detail: string;
}

interface Upload {
  detail: unknown;
  idempotencyKey: string | undefined;
  contentType: string;
  fileName: string;
  name: unknown;
}

const fake = {
  jobs: new Map<string, FakeJob>(),
  uploads: [] as Upload[],
  cancels: [] as string[],
  resultCalls: [] as string[],
  /** While true, jobs stay `running` at half their rows. */
  hold: false,
  /** Called at each answered poll (after the forced 429 and 503). */
  onPoll: (_job: FakeJob) => {},
};

function sizeFile(kind: 'csv' | 'ndjson', data: Buffer): EstimateBatchItemResult[] {
  const size = (checked: ReturnType<typeof csvRecordItem>) => {
    try {
      return sizeBatchItem(checked, 'summary', estimate);
    } catch {
      return internalErrorItem(checked.index, checked.ref);
    }
  };
  if (kind === 'ndjson') {
    return data.toString('utf8').split('\n').filter((l) => l.trim()).map((line, i) => size(ndjsonLineItem(i, line)));
  }
  const [header, ...records] = parse(data, { bom: true, skip_empty_lines: true, relax_column_count: true }) as string[][];
  return records.map((cells, i) => size(csvRecordItem(i, header!.map((h) => h.trim()), cells)));
}

function view(job: FakeJob) {
  const done = job.status === 'succeeded' ? job.items.length : Math.floor(job.items.length / 2);
  const answered = job.items.slice(0, done);
  return {
    id: job.id,
    name: null,
    status: job.status,
    stopReason: job.status === 'cancelled' ? 'cancelled' : job.status === 'stopped' ? 'quota_exceeded' : null,
    source: 'csv',
    detail: job.detail,
    rows: {
      total: job.items.length,
      done,
      ok: answered.filter((i) => i.status === 'ok').length,
      failed: answered.filter((i) => i.status === 'error').length,
      withFailingChecks: answered.filter((i) => i.status === 'ok' && i.failingChecks.length).length,
    },
    progress: done / job.items.length,
    rowsPerSecond: 850.2,
    etaSeconds: job.status === 'succeeded' ? 0 : 1,
    engineVersion: 'test',
    catalogVersion: null,
    links: { self: `/v1/batches/${job.id}`, results: `/v1/batches/${job.id}/results`, errors: `/v1/batches/${job.id}/errors` },
  };
}

const problem = (res: express.Response, status: number, code: string, title: string) =>
  res.status(status).type('application/problem+json').send(JSON.stringify({ type: `https://treadwise.test/problems/${code}`, title, status, code, requestId: `req-${code}` }));

function fakeApi(): express.Express {
  const app = express();
  const upload = multer({ storage: multer.memoryStorage() });
  app.use((req, res, next) => {
    if (req.headers.authorization === `Bearer ${KEY}`) next();
    else problem(res, 401, 'unauthorized', 'Unauthorized');
  });
  app.post('/v1/batches', upload.single('file'), (req, res) => {
    const file = req.file!;
    fake.uploads.push({ detail: req.query.detail, idempotencyKey: req.header('idempotency-key'), contentType: file.mimetype, fileName: file.originalname, name: req.body?.name });
    if (file.originalname === 'refused.csv') {
      problem(res, 400, 'not_csv', 'Not CSV');
      return;
    }
    const kind = file.mimetype === 'text/csv' ? 'csv' : 'ndjson';
    const job: FakeJob = { id: `00000000-0000-4000-8000-${String(fake.jobs.size + 1).padStart(12, '0')}`, items: sizeFile(kind, file.buffer), status: 'queued', polls: 0, detail: String(req.query.detail), stopsAtQuota: req.body?.name === 'stop at quota' };
    fake.jobs.set(job.id, job);
    res.status(202).location(`/v1/batches/${job.id}`).json(view(job));
  });
  app.get('/v1/batches/:id', (req, res) => {
    const job = fake.jobs.get(req.params.id);
    if (!job) {
      problem(res, 404, 'not_found', 'Not found');
      return;
    }
    job.polls++;
    if (job.polls === 1 || job.polls === 2) {
      if (job.polls === 1) problem(res.set('retry-after', '1'), 429, 'rate_limited', 'Too many requests');
      else problem(res, 503, 'unavailable', 'Service unavailable');
      return;
    }
    if (job.status !== 'cancelled') job.status = fake.hold ? 'running' : job.stopsAtQuota ? 'stopped' : 'succeeded';
    res.json(view(job));
    fake.onPoll(job);
  });
  app.post('/v1/batches/:id/cancel', (req, res) => {
    const job = fake.jobs.get(req.params.id);
    if (!job) {
      problem(res, 404, 'not_found', 'Not found');
      return;
    }
    fake.cancels.push(job.id);
    job.status = 'cancelled';
    res.json(view(job));
  });
  app.get('/v1/batches/:id/results', (req, res) => {
    const job = fake.jobs.get(req.params.id);
    if (!job) {
      problem(res, 404, 'not_found', 'Not found');
      return;
    }
    const format = req.query.format === 'csv' ? 'csv' : 'ndjson';
    fake.resultCalls.push(`${job.id} ${format}`);
    const done = view(job).rows.done;
    res.type(format === 'csv' ? 'text/csv' : 'application/x-ndjson');
    if (format === 'csv') res.write(writeCsv([[...BATCH_RESULT_COLUMNS]]));
    // Streamed page by page, as the real route reads pages from the database.
    for (let i = 0; i < done; i += 100) {
      const page = job.items.slice(i, Math.min(done, i + 100));
      res.write(format === 'csv' ? writeCsv(page.map(batchResultRow), { byteOrderMark: false }) : page.map((p) => `${JSON.stringify(p)}\n`).join(''));
    }
    res.end();
  });
  return app;
}

let server: Server;
let apiUrl: string;
let dir: string;
let stairs: string;
const key = () => ['--api-url', apiUrl, '--api-key', KEY];

beforeAll(async () => {
  server = fakeApi().listen(0, '127.0.0.1');
  await new Promise((r) => server.once('listening', r));
  apiUrl = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
  dir = tempDir();
  stairs = path.join(dir, 'stairs.csv');
  writeStairCsv(stairs, batchItems(1000));
});
afterAll(async () => {
  await new Promise((r) => server.close(r));
});
beforeEach(() => {
  fake.hold = false;
  fake.onPoll = () => {};
});

describe('treadwise batch through batch jobs on the API', () => {
  it('uploads 1000 rows, polls through a 429 (Retry-After: 1) and a 503, and writes the results the --local run writes', async () => {
    const uploadsBefore = fake.uploads.length;
    const out = path.join(dir, 'results.csv');
    const run = await runCli(['batch', stairs, '-o', out, '--name', 'Alder Row phase 2', ...key()]);

    expect(fake.uploads.slice(uploadsBefore)).toEqual([
      { detail: 'summary', idempotencyKey: expect.stringMatching(/^[0-9a-f-]{36}$/), contentType: 'text/csv', fileName: 'stairs.csv', name: 'Alder Row phase 2' },
    ]);
    expect(run.stderr).toContain('batch: HTTP 429, trying again in 1.0 s');
    expect(run.stderr).toMatch(/batch: HTTP 503, trying again in \d\.\d s/);
    const job = [...fake.jobs.values()].at(-1)!;
    expect(fake.resultCalls.at(-1)).toBe(`${job.id} csv`);

    const local = path.join(dir, 'local.csv');
    await runCli(['batch', stairs, '-o', local, '--local']);
    expect(readFileSync(out, 'utf8')).toBe(readFileSync(local, 'utf8'));
    expect(readFileSync(out, 'utf8').split('\r\n').length).toBe(1000 + 2); // header, rows, the empty tail

    // 100 of the 1000 rows are refused (5 in every 50): exit 1, the summary lists them by row
    expect(run.code).toBe(1);
    expect(run.stdout).toMatch(new RegExp(`^Job +${job.id} \\(succeeded\\)$`, 'm'));
    expect(run.stdout).toMatch(/^Failed +100$/m);
    expect(run.stdout).toContain('  row 12 (Plot 12)  validation_failed: staircase.treads:');
    expect(run.stdout).toContain('  …and 80 more');
    expect(existsSync(`${out}.treadwise-batch.json`)).toBe(false);
  }, SLOW);

  it('leaves the job running on Ctrl-C with a state file, and --resume re-attaches to it instead of uploading again', async () => {
    const out = path.join(dir, 'resumed.ndjson');
    const interrupt = new AbortController();
    fake.hold = true;
    fake.onPoll = () => interrupt.abort();
    const stopped = await runCli(['batch', stairs, '-o', out, ...key()], { interrupt: interrupt.signal });
    expect(stopped.code).toBe(130);
    const job = [...fake.jobs.values()].at(-1)!;
    expect(stopped.stderr).toContain(`the job ${job.id} keeps running on the server. Re-attach with: treadwise batch ${stairs} -o ${out} --api-url ${apiUrl} --resume`);
    expect(stopped.stderr).not.toContain(KEY); // the key is never printed
    const state = JSON.parse(readFileSync(`${out}.treadwise-batch.json`, 'utf8'));
    expect(state).toMatchObject({ jobId: job.id, apiUrl, format: 'ndjson', detail: 'summary' });
    expect(fake.cancels).not.toContain(job.id);

    const uploads = fake.uploads.length;
    fake.hold = false;
    fake.onPoll = () => {};
    const resumed = await runCli(['batch', stairs, '-o', out, '--resume', '--json', ...key()]);
    expect(fake.uploads.length).toBe(uploads); // re-attached: nothing uploaded again
    expect(resumed.stderr).toContain(`batch: re-attached to job ${job.id}`);
    const lines = readFileSync(out, 'utf8').trimEnd().split('\n');
    expect(lines.map((l) => JSON.parse(l).index)).toEqual(Array.from({ length: 1000 }, (_, i) => i));
    expect(lines.join('\n') + '\n').toBe(job.items.map((i) => `${JSON.stringify(i)}\n`).join(''));
    expect(JSON.parse(resumed.stdout)).toMatchObject({ jobId: job.id, status: 'succeeded', rows: 1000, failed: 100 });
    expect(existsSync(`${out}.treadwise-batch.json`)).toBe(false);
  }, SLOW);

  it('cancels the job on Ctrl-C with --cancel-on-interrupt', async () => {
    const out = path.join(dir, 'cancelled.csv');
    const interrupt = new AbortController();
    fake.hold = true;
    fake.onPoll = () => interrupt.abort();
    const run = await runCli(['batch', stairs, '-o', out, '--cancel-on-interrupt', ...key()], { interrupt: interrupt.signal });
    const job = [...fake.jobs.values()].at(-1)!;
    expect(run.code).toBe(130);
    expect(fake.cancels).toContain(job.id);
    expect(run.stderr).toContain(`interrupted: job ${job.id} cancelled (500 rows done)`);
    expect(existsSync(`${out}.treadwise-batch.json`)).toBe(false);
  }, SLOW);

  it('writes the rows done of a job stopped at the quota, and exits 1 saying so', async () => {
    const out = path.join(dir, 'stopped.csv');
    const run = await runCli(['batch', stairs, '-o', out, '--name', 'stop at quota', ...key()]);
    expect(run.code).toBe(1);
    expect(run.stderr).toContain(`treadwise: the job stopped (quota_exceeded) after 500 of 1000 rows; the rows done are in ${out}`);
    const rows = readFileSync(out, 'utf8').trimEnd().split('\r\n').slice(1);
    expect(rows.map((r) => Number(r.split(',')[0]))).toEqual(Array.from({ length: 500 }, (_, i) => i + 1));
    expect(run.stdout).toMatch(/^Rows +500$/m);
  }, SLOW);

  it('refuses to start a second job for an output a job already writes, and to resume without one', async () => {
    const out = path.join(dir, 'busy.csv');
    writeFileSync(`${out}.treadwise-batch.json`, JSON.stringify({ jobId: 'j-1', apiUrl, format: 'csv', detail: 'summary', input: stairs, createdAt: new Date().toISOString() }));
    const uploads = fake.uploads.length;
    const twice = await runCli(['batch', stairs, '-o', out, ...key()]);
    expect(twice.code).toBe(2);
    expect(twice.stderr).toContain('the batch job j-1 already writes');
    const none = await runCli(['batch', stairs, '-o', path.join(dir, 'never.csv'), '--resume', ...key()]);
    expect(none.code).toBe(2);
    expect(none.stderr).toContain('nothing to resume');
    expect(fake.uploads.length).toBe(uploads);
  }, SLOW);

  it('shows a refused upload as one line with its code and request id (usage error)', async () => {
    const refused = path.join(dir, 'refused.csv');
    writeFileSync(refused, readFileSync(stairs));
    const run = await runCli(['batch', refused, '-o', path.join(dir, 'refused-out.csv'), ...key()]);
    expect(run.code).toBe(2);
    expect(run.stderr.trim()).toBe('treadwise: Not CSV (code not_csv, request req-not_csv)');
  }, SLOW);
});
