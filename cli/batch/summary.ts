import type { EstimateBatchItemResult, EstimateBatchSummary } from '../../shared/schemas/estimate-batch.js';
import { BatchTally } from '../../shared/sizing/batch/items.js';
import { fields, type Paint } from '../style.js';
import type { RowBrief } from './results-file.js';

/** Failed rows the summary lists by number; the rest are counted. */
export const LISTED_FAILURES = 20;

/** The end-of-run summary: counts over every row of the results file, and the first failed rows. */
export class RunSummary {
  private readonly tally = new BatchTally();
  private readonly failures: RowBrief[] = [];

  add(brief: RowBrief): void {
    // BatchTally counts by status and failing check ids, which a brief keeps (read back from a file or not).
    this.tally.add({ status: brief.status, failingChecks: brief.failingChecks } as EstimateBatchItemResult);
    if (brief.status === 'error' && this.failures.length < LISTED_FAILURES) this.failures.push(brief);
  }

  counts(): EstimateBatchSummary {
    return this.tally.summary();
  }

  json(extra: Record<string, unknown>): Record<string, unknown> {
    const counts = this.counts();
    return {
      ...extra,
      rows: counts.items,
      ok: counts.ok,
      failed: counts.failed,
      withFailingChecks: counts.withFailingChecks,
      failingChecks: counts.failingChecks,
      failedRows: this.failures.map((f) => ({ row: f.row, ref: f.ref, code: f.problem?.code, detail: f.problem?.detail, errors: f.problem?.errors ?? null })),
    };
  }

  text(paint: Paint, head: [string, string][]): string {
    const c = this.counts();
    const checks = c.failingChecks.map((f) => `${f.id} ${f.items}`).join(', ');
    const lines = [
      fields([
        ...head,
        ['Rows', String(c.items)],
        ['Sized', paint.pass(String(c.ok))],
        ['Failed', c.failed ? paint.fail(String(c.failed)) : '0'],
        ['Failing checks', c.withFailingChecks ? paint.warn(`${c.withFailingChecks} row(s)${checks ? `: ${checks}` : ''}`) : '0'],
      ]),
    ];
    if (c.failed) {
      lines.push('', paint.bold('Failed rows:'));
      for (const f of this.failures) {
        const why = [f.problem?.code, f.problem?.errors ?? f.problem?.detail].filter(Boolean).join(': ');
        lines.push(`  row ${f.row}${f.ref ? ` (${f.ref})` : ''}  ${why}`);
      }
      if (c.failed > this.failures.length) lines.push(`  …and ${c.failed - this.failures.length} more`);
    }
    return lines.join('\n');
  }
}
