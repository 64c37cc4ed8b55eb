import { accessSync, constants, readFileSync } from 'node:fs';
import { availableParallelism } from 'node:os';
import path from 'node:path';
import { Command, Option } from 'commander';
import { z } from 'zod';
import { CsvNotReadable, readCatalogCsv } from '../../shared/schemas/catalog-csv.js';
import { inlineCatalogOf } from '../../shared/schemas/catalog-store.js';
import { currencySchema, taxRateSchema, type Catalog } from '../../shared/schemas/catalog.js';
import { BATCH_DETAILS } from '../../shared/schemas/estimate-batch.js';
import { approximateRows, openBatchInput } from '../batch/input.js';
import { runLocal } from '../batch/local.js';
import { createProgress } from '../batch/progress.js';
import { runRemote } from '../batch/remote.js';
import type { BatchFormat } from '../batch/size-chunk.js';
import { RunSummary } from '../batch/summary.js';
import { CliError, EXIT } from '../errors.js';
import type { CliIo } from '../io.js';
import { apiOptionsSchema, withApiOptions, withExamples } from '../options.js';
import { painter } from '../style.js';
import { requireKey } from '../target.js';

/** Exit code after Ctrl-C (128 + SIGINT), as shells report it. */
export const EXIT_INTERRUPTED = 130;

const defaultConcurrency = () => Math.max(1, availableParallelism() - 1);

const batchFlagsSchema = z.object({
  output: z.string().min(1, 'must name a file'),
  format: z.enum(['csv', 'ndjson']).optional(),
  detail: z.enum(BATCH_DETAILS).default('summary'),
  local: z.boolean().default(false),
  catalog: z.string().min(1).optional(),
  currency: currencySchema.default('EUR'),
  taxRatePercent: z.coerce.number({ error: 'must be a number' }).pipe(taxRateSchema).default(0),
  concurrency: z.coerce.number({ error: 'must be a whole number' }).int('must be a whole number').min(1, 'at least 1').max(256).optional(),
  chunkRows: z.coerce.number().int().min(1).max(10_000).optional(),
  resume: z.boolean().default(false),
  cancelOnInterrupt: z.boolean().default(false),
  name: z.string().min(1).max(120, 'at most 120 characters').optional(),
  progress: z.boolean().default(true),
});

/** The output format: --format, else the output's extension. */
function formatOf(output: string, flag: BatchFormat | undefined): BatchFormat {
  if (flag) return flag;
  const ext = path.extname(output).toLowerCase();
  if (ext === '.csv') return 'csv';
  if (ext === '.ndjson' || ext === '.jsonl') return 'ndjson';
  throw new CliError(`cannot tell the output format from ${output}: name it .csv or .ndjson, or add --format csv|ndjson`, EXIT.usage);
}

/** The catalog CSV (the upload's format) as the inline catalog the API would make of it once stored. */
function catalogFrom(io: CliIo, file: string, settings: { currency: string; taxRatePercent: number }): Catalog | null {
  let parsed: ReturnType<typeof readCatalogCsv>;
  try {
    parsed = readCatalogCsv(readFileSync(file), settings.currency);
  } catch (err) {
    if (err instanceof CsvNotReadable) throw new CliError(`${file}: ${err.message}`, EXIT.usage);
    throw err;
  }
  if (parsed.errors.length) {
    const first = parsed.errors.slice(0, 5).map((e) => `line ${e.row} ${e.column}: ${e.message}`).join('; ');
    const more = parsed.errors.length > 5 ? ` (and ${parsed.errors.length - 5} more)` : '';
    throw new CliError(`${file} is not a usable catalog: ${first}${more}`, EXIT.usage);
  }
  const catalog = inlineCatalogOf(parsed.items, settings);
  if (!catalog) io.err(`batch: ${file} has no active item; rows without a catalog of their own stay unpriced`);
  return catalog;
}

/** The words to type again for --resume: the same command, the options typed (not defaults) kept, --resume added. */
function resumeCommand(file: string, output: string, raw: Record<string, unknown>, typed: (option: string) => boolean): string {
  const quote = (s: string) => (/^[\w./@:+,=-]+$/.test(s) ? s : `'${s.replace(/'/g, `'\\''`)}'`);
  const parts = ['treadwise', 'batch', quote(file), '-o', quote(output)];
  const valued: [string, string][] = [
    ['format', '--format'],
    ['detail', '--detail'],
    ['catalog', '--catalog'],
    ['currency', '--currency'],
    ['taxRatePercent', '--tax-rate-percent'],
    ['concurrency', '--concurrency'],
    ['apiUrl', '--api-url'],
  ];
  if (raw.local) parts.push('--local');
  for (const [key, flag] of valued) if (typed(key) && raw[key] !== undefined) parts.push(flag, quote(String(raw[key])));
  if (raw.cancelOnInterrupt) parts.push('--cancel-on-interrupt');
  parts.push('--resume');
  return parts.join(' ');
}

export function batchCommand(io: CliIo): Command {
  const command = new Command('batch')
    .description(
      'size every stair of a CSV (stair rows) or NDJSON file: as a batch job on the API, or --local offline. ' +
        'Exit code 0 when every row was sized, 1 when some rows failed (listed), 130 after Ctrl-C',
    )
    .argument('<file>', 'stair-row CSV (see GET /v1/batches/template.csv) or NDJSON of {"ref"?, "request"} lines; - reads stdin')
    .requiredOption('-o, --output <file>', 'results file (.csv or .ndjson); a state file <file>.treadwise-batch.json sits beside it while a job runs')
    .option('--format <format>', 'results format csv | ndjson (default: from the output’s extension)')
    .option('--detail <detail>', 'summary (headline figures, failing checks, bomTotal) | full (adds the whole estimate, NDJSON)', 'summary')
    .option('--local', 'size offline on this machine (worker threads), not through the API')
    .option('--catalog <file.csv>', '--local: price from this catalog CSV (the format of treadwise catalog import/export)')
    .option('--currency <code>', '--local: currency of the catalog’s prices', 'EUR')
    .option('--tax-rate-percent <n>', '--local: tax rate of the catalog, percent', '0')
    .option('--concurrency <n>', `--local: worker threads (default: cores - 1, at least 1; here ${defaultConcurrency()})`)
    .option('--resume', 'continue: re-attach to the job writing the output (API), or size only the rows not yet in it (--local)')
    .option('--cancel-on-interrupt', 'on Ctrl-C cancel the job on the API (default: it keeps running; --resume re-attaches)')
    .option('--name <text>', 'a name for the job on the API (at most 120 characters)')
    .option('--no-progress', 'no progress bar or progress lines on stderr');
  command.addOption(new Option('--chunk-rows <n>', 'rows per worker task (tests, benchmarks)').hideHelp());
  withExamples(
    withApiOptions(command),
    'treadwise batch stairs.csv -o results.csv',
    'treadwise batch stairs.csv -o results.csv --resume             # after Ctrl-C: re-attach to the job',
    'treadwise batch stairs.ndjson -o results.ndjson --local --catalog catalog.csv --detail full',
    'treadwise catalog export -o catalog.csv && treadwise batch stairs.csv -o results.csv --local --catalog catalog.csv',
  );
  return command.action(async (file: string, raw: Record<string, unknown>) => {
    const opts = apiOptionsSchema.parse({ apiUrl: raw.apiUrl, apiKey: raw.apiKey, json: raw.json, color: raw.color });
    const flags = batchFlagsSchema.parse({ ...raw, apiUrl: undefined, apiKey: undefined, json: undefined, color: undefined });
    const format = formatOf(flags.output, flags.format);
    // The results must have somewhere to go before a job is started or a row sized.
    accessSync(path.dirname(path.resolve(flags.output)), constants.W_OK);
    if (!flags.local && (flags.catalog || raw.concurrency !== undefined)) throw new CliError('--catalog and --concurrency go with --local (the API prices from the stored catalog)', EXIT.usage);
    if (flags.local && (flags.cancelOnInterrupt || flags.name)) throw new CliError('--cancel-on-interrupt and --name are for batch jobs on the API, not --local', EXIT.usage);
    if (flags.detail === 'full' && format === 'csv') io.err('batch: --detail full adds the whole estimate to NDJSON results only; the CSV holds the same columns');
    const paint = painter(io, opts);
    const summary = new RunSummary();
    const quiet = !flags.progress || opts.json;

    // Ctrl-C: stop handing out work (local) or polling (API), finish cleanly, exit 130 with the resume hint.
    const interrupt = new AbortController();
    const release = io.onInterrupt?.(() => {
      io.err('batch: stopping (Ctrl-C again to quit at once)…');
      interrupt.abort();
    });
    const input = await openBatchInput(io, file);
    try {
      const resume = resumeCommand(file, flags.output, raw, (option) => command.getOptionValueSource(option) === 'cli');
      if (flags.local) {
        const catalog = flags.catalog ? catalogFrom(io, flags.catalog, { currency: flags.currency, taxRatePercent: flags.taxRatePercent }) : null;
        const concurrency = flags.concurrency ?? defaultConcurrency();
        const total = input.name === 'stdin' || quiet ? null : await approximateRows(input);
        const progress = createProgress(io, { label: 'batch', quiet });
        let outcome;
        try {
          outcome = await runLocal({
            input,
            output: flags.output,
            format,
            detail: flags.detail,
            catalog,
            concurrency,
            resume: flags.resume,
            chunkRows: flags.chunkRows,
            summary,
            progress,
            total,
            interrupted: () => interrupt.signal.aborted,
          });
        } finally {
          progress.stop();
        }
        if (outcome.interrupted) {
          const rows = outcome.skipped + outcome.sized;
          throw new CliError(`interrupted after ${rows} row(s), all written to ${flags.output}. Continue with: ${resume}`, EXIT_INTERRUPTED);
        }
        report(io, opts.json, paint, summary, flags.output, format, [['Mode', `local, ${concurrency} thread(s)${catalog ? `, priced from ${flags.catalog}` : ''}`], ...(outcome.skipped ? [['Resumed', `after row ${outcome.skipped}`] as [string, string]] : [])], {});
      } else {
        const progress = createProgress(io, { label: 'batch', quiet });
        const { job } = await runRemote({
          io,
          target: requireKey(io, opts),
          input,
          output: flags.output,
          format,
          detail: flags.detail,
          name: flags.name,
          resume: flags.resume,
          cancelOnInterrupt: flags.cancelOnInterrupt,
          signal: interrupt.signal,
          progress,
          summary,
          resumeCommand: resume,
        });
        report(io, opts.json, paint, summary, flags.output, format, [['Job', `${job.id} (${job.status})`]], { jobId: job.id, status: job.status, stopReason: job.stopReason ?? null });
        if (job.status !== 'succeeded') {
          const why = job.status === 'stopped' ? `stopped${job.stopReason ? ` (${job.stopReason})` : ''}` : job.status;
          throw new CliError(`the job ${why} after ${job.rows.done} of ${job.rows.total ?? '?'} rows; the rows done are in ${flags.output}`, EXIT.failure);
        }
      }
      const failed = summary.counts().failed;
      if (failed) throw new CliError(`${failed} row(s) could not be sized; their problems are in ${flags.output}`, EXIT.failure);
    } finally {
      release?.();
      input.cleanup();
    }
  });
}

function report(io: CliIo, json: boolean, paint: ReturnType<typeof painter>, summary: RunSummary, output: string, format: BatchFormat, head: [string, string][], extra: Record<string, unknown>): void {
  if (json) io.out(JSON.stringify(summary.json({ output, format, ...extra })));
  else io.out(summary.text(paint, [['Results', `${output} (${format})`], ...head]));
}
