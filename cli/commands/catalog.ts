import { readFileSync, writeFileSync } from 'node:fs';
import path from 'node:path';
import { Command } from 'commander';
import type { components } from '../../openapi/api-types.js';
import { createApiClient, unwrap } from '../api-client.js';
import { CliError, EXIT } from '../errors.js';
import type { CliIo } from '../io.js';
import { apiOptionsSchema, withApiOptions, withExamples } from '../options.js';
import { fields, table } from '../style.js';
import { requireKey } from '../target.js';

type ImportReport = components['schemas']['CatalogImportReport'];
const connection = (raw: Record<string, unknown>) => apiOptionsSchema.parse({ apiUrl: raw.apiUrl, apiKey: raw.apiKey, json: raw.json, color: raw.color });

function reportText(r: ImportReport): string {
  const verb = r.dryRun ? 'would be' : r.imported ? 'were' : 'would have been';
  const head = fields([
    ['Rows', String(r.rows)],
    [`Created`, `${r.created} (${verb} new)`],
    ['Updated', String(r.updated)],
    ['Unchanged', String(r.unchanged)],
    ['Version', r.imported ? `now ${r.version}` : `${r.version} after import`],
    ['Result', r.errors.length ? `nothing imported: ${r.errors.length} error(s)` : r.dryRun ? 'dry run: the file is good, nothing written' : 'imported'],
  ]);
  return r.errors.length ? `${head}\n\n${table(['line', 'column', 'error'], r.errors.map((e) => [String(e.row), e.column, e.message]), [0])}` : head;
}

function importCommand(io: CliIo): Command {
  const command = new Command('import')
    .description('upload a catalog CSV (all or nothing); the report lists every bad row and column')
    .argument('<file.csv>', 'the catalog CSV (the columns of GET /v1/catalog/template)')
    .option('--dry-run', 'check the file and report without importing');
  withExamples(withApiOptions(command), 'treadwise catalog import catalog.csv --dry-run', 'treadwise catalog import catalog.csv');
  return command.action(async (file: string, raw: Record<string, unknown>) => {
    const opts = connection(raw);
    const api = createApiClient(io, requireKey(io, opts));
    const form = new FormData();
    form.append('file', new Blob([readFileSync(file)], { type: 'text/csv' }), path.basename(file));
    const report = await unwrap(
      api.POST('/v1/catalog/imports', {
        params: { query: { dryRun: raw.dryRun ? 'true' : 'false' } },
        body: form as never,
        bodySerializer: () => form, // multipart: fetch sets the boundary
      }),
    );
    io.out(opts.json ? JSON.stringify(report) : reportText(report));
    if (report.errors.length) throw new CliError(`${file}: ${report.errors.length} bad row(s) or column(s); nothing was imported`, EXIT.usage);
  });
}

function exportCommand(io: CliIo): Command {
  const command = new Command('export').description('download the catalog as CSV (stdout, or -o file with the UTF-8 BOM spreadsheets want)').option('-o, --output <file>', 'write the CSV to this file');
  withExamples(withApiOptions(command), 'treadwise catalog export -o catalog.csv', 'treadwise catalog export | head -5');
  return command.action(async (raw: Record<string, unknown>) => {
    const opts = connection(raw);
    const api = createApiClient(io, requireKey(io, opts));
    const bytes = Buffer.from((await unwrap(api.GET('/v1/catalog/export', { parseAs: 'arrayBuffer', headers: { accept: 'text/csv' } }))) as ArrayBuffer);
    // The file keeps the API's bytes (with the UTF-8 BOM spreadsheets need); stdout gets plain text for pipes.
    const text = new TextDecoder().decode(bytes);
    if (typeof raw.output === 'string') {
      writeFileSync(raw.output, bytes);
      const rows = text.split(/\r?\n/).filter(Boolean).length - 1;
      const summary = { file: raw.output, rows };
      if (opts.json) io.out(JSON.stringify(summary));
      else io.err(`Wrote ${rows} item(s) to ${raw.output}.`);
    } else {
      io.out(text);
    }
  });
}

export function catalogCommand(io: CliIo): Command {
  const command = new Command('catalog').description('the organisation’s stored catalog: import | export');
  withExamples(command, 'treadwise catalog import catalog.csv --dry-run', 'treadwise catalog export -o catalog.csv');
  return command.addCommand(importCommand(io)).addCommand(exportCommand(io));
}
