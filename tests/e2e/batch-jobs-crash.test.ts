import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { PGlite } from '@electric-sql/pglite';
import { afterAll, describe, expect, it } from 'vitest';
import { alderRowCornerUnit, alderRowTownhouse, quaysideCorridor } from '../../shared/schemas/estimate-examples.js';
import { requestToRow, stairRowColumns } from '../../shared/schemas/stair-row.js';
import { writeCsv } from '../../shared/tables/csv.js';
import { startServerProcess, type ServerProcess } from './server-process.js';

const dataDir = mkdtempSync(path.join(tmpdir(), 'treadwise-batch-crash-'));
afterAll(() => rmSync(dataDir, { recursive: true, force: true }));

const ROWS = 2000;
const designs = [alderRowTownhouse, alderRowCornerUnit, quaysideCorridor, { layout: 'tread-strips' }];
const stairs = Array.from({ length: ROWS }, (_, i) => ({ ref: `Plot ${i + 1}`, request: designs[i % designs.length]! }));
const columns = stairRowColumns(stairs.map((s) => s.request));
const csv = writeCsv([columns, ...stairs.map((s) => columns.map((c) => requestToRow(s.request, s.ref)[c]))]);

const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

async function job(server: ServerProcess, key: string, id: string) {
  const res = await fetch(`${server.url}/v1/batches/${id}`, { headers: { authorization: `Bearer ${key}` } });
  expect(res.status).toBe(200);
  return (await res.json()) as { status: string; rows: { total: number; done: number; ok: number; failed: number } };
}

async function resultLines(server: ServerProcess, key: string, id: string): Promise<{ index: number; status: string }[]> {
  const res = await fetch(`${server.url}/v1/batches/${id}/results`, { headers: { authorization: `Bearer ${key}` } });
  const text = await res.text();
  return text
    .split('\n')
    .filter((l) => l !== '')
    .map((l) => JSON.parse(l));
}

describe('a batch job across a crash', () => {
  it('resumes after SIGKILL on the same DATA_DIR and answers every row exactly once', async () => {
    const first = await startServerProcess({ DATA_DIR: dataDir });
    const key = /harbor-lane\s+server\s+(tw_server_\S+)/.exec(first.stdout())![1];
    const form = new FormData();
    form.append('name', 'Crash test');
    form.append('file', new Blob([csv], { type: 'text/csv' }), 'plots.csv');
    const created = await fetch(`${first.url}/v1/batches`, { method: 'POST', headers: { authorization: `Bearer ${key}` }, body: form });
    expect(created.status).toBe(202);
    const { id } = (await created.json()) as { id: string };

    // Kill it mid-job: some rows answered, not all.
    let before = await job(first, key, id);
    while (before.rows.done < 200) {
      await sleep(20);
      before = await job(first, key, id);
    }
    const answeredBefore = await resultLines(first, key, id);
    expect(await first.kill('SIGKILL')).toBe('SIGKILL');
    expect(before.rows.done).toBeLessThan(ROWS);
    const second = await startServerProcess({ DATA_DIR: dataDir });
    let after = await job(second, key, id);
    while (after.status === 'queued' || after.status === 'running') {
      await sleep(100);
      after = await job(second, key, id);
    }
    expect(after.status).toBe('succeeded');
    expect(after.rows).toMatchObject({ total: ROWS, done: ROWS });
    expect(after.rows.ok + after.rows.failed).toBe(ROWS);
    expect(after.rows.failed).toBe(ROWS / designs.length); // every fourth design misses its blocks

    const lines = await resultLines(second, key, id);
    expect(lines.map((l) => l.index)).toEqual(stairs.map((_, i) => i));
    // Rows answered before the crash kept their answers.
    expect(lines.slice(0, answeredBefore.length)).toEqual(answeredBefore);
    expect(await second.stop()).toBe(0);

    // The stored rows: one per index, each answered once, counters equal to the rows.
    const db = new PGlite(path.join(dataDir, 'pglite'));
    try {
      const { rows } = await db.query<{ rows: number; distinct: number; answered: number; ok: number; done: number; rows_ok: number; rows_total: number }>(
        `select count(*)::int as rows, count(distinct r.idx)::int as distinct, count(r.answer)::int as answered,
                count(*) filter (where r.status = 'ok')::int as ok, j.rows_done as done, j.rows_ok, j.rows_total
           from batch_job_rows r join batch_jobs j on j.id = r.job_id where j.id = $1 group by j.id`,
        [id],
      );
      expect(rows[0]).toEqual({ rows: ROWS, distinct: ROWS, answered: ROWS, ok: after.rows.ok, done: ROWS, rows_ok: after.rows.ok, rows_total: ROWS });
    } finally {
      await db.close();
    }
  });
});
