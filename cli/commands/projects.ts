import { mkdirSync, writeFileSync } from 'node:fs';
import path from 'node:path';
import { Command } from 'commander';
import type { components } from '../../openapi/api-types.js';
import { createApiClient, everyPage, unwrap, type ApiClient } from '../api-client.js';
import type { CliIo } from '../io.js';
import { apiOptionsSchema, withApiOptions, withExamples } from '../options.js';
import { fields, money, num, table } from '../style.js';
import { requireKey } from '../target.js';

type Project = components['schemas']['Project'];
type Stair = components['schemas']['Stair'];
type StoredEstimateSummary = components['schemas']['StoredEstimateSummary'];

const connection = (raw: Record<string, unknown>) => apiOptionsSchema.parse({ apiUrl: raw.apiUrl, apiKey: raw.apiKey, json: raw.json, color: raw.color });


interface StairWithLatest {
  stair: Stair;
  latest: StoredEstimateSummary | null;
}

/** The project, its stairs and each stair's newest stored estimate (the list is newest first). */
async function projectDocument(api: ApiClient, id: string): Promise<{ project: Project; stairs: StairWithLatest[] }> {
  const project = await unwrap(api.GET('/v1/projects/{id}', { params: { path: { id } } }));
  const stairs = await everyPage((query) => unwrap(api.GET('/v1/projects/{id}/stairs', { params: { path: { id }, query } })));
  const withLatest = await Promise.all(
    stairs.map(async (stair) => {
      const page = await unwrap(api.GET('/v1/projects/{id}/stairs/{stairId}/estimates', { params: { path: { id, stairId: stair.id }, query: { limit: 1 } } }));
      return { stair, latest: page.items[0] ?? null };
    }),
  );
  return { project, stairs: withLatest };
}

function listCommand(io: CliIo): Command {
  const command = new Command('list').description('list the organisation’s projects');
  withExamples(withApiOptions(command), 'treadwise projects list', 'treadwise projects list --json | jq -r ".[].id"');
  return command.action(async (raw: Record<string, unknown>) => {
    const opts = connection(raw);
    const api = createApiClient(io, requireKey(io, opts));
    const projects = await everyPage((query) => unwrap(api.GET('/v1/projects', { params: { query } })));
    if (opts.json) return io.out(JSON.stringify(projects));
    if (!projects.length) return io.out('No projects.');
    io.out(table(['id', 'name', 'client', 'stairs', 'updated'], projects.map((p) => [p.id, p.name, p.clientName ?? '—', String(p.stairCount), p.updatedAt]), [3]));
  });
}

function showCommand(io: CliIo): Command {
  const command = new Command('show').description('a project, its stairs and each stair’s latest stored estimate').argument('<id>', 'project id');
  withExamples(withApiOptions(command), 'treadwise projects show 3b9d2f4e-6a1c-4e8b-9f2d-7c5a1e0b4d63');
  return command.action(async (id: string, raw: Record<string, unknown>) => {
    const opts = connection(raw);
    const doc = await projectDocument(createApiClient(io, requireKey(io, opts)), id);
    if (opts.json) return io.out(JSON.stringify(doc));
    const p = doc.project;
    io.out(
      fields([
        ['Project', `${p.name} (${p.id})`],
        ['Client', p.clientName ?? '—'],
        ['Site', (p.siteAddress ?? '—').replace(/\n/g, ', ')],
        ...(p.notes ? ([['Notes', p.notes.replace(/\n/g, ' ')]] as [string, string][]) : []),
        ['Stairs', String(p.stairCount)],
        ['Updated', p.updatedAt],
      ]),
    );
    if (!doc.stairs.length) return;
    io.out('');
    io.out(
      table(
        ['stair', 'layout', 'treads', 'latest estimate', 'run at', 'checks p/w/f', 'gross'],
        doc.stairs.map(({ stair, latest }) => [
          stair.name,
          stair.input.layout,
          stair.input.staircase ? String(stair.input.staircase.treads) : '—',
          latest ? latest.id : 'not run',
          latest ? `${latest.createdAt.slice(0, 16).replace('T', ' ')} UTC` : '—',
          latest ? `${latest.summary.checks.pass}/${latest.summary.checks.warn}/${latest.summary.checks.fail}` : '—',
          latest ? (latest.gross !== null ? money(latest.gross, latest.currency ?? undefined) : latest.bomTotal !== null ? `${num(latest.bomTotal)} net` : 'unpriced') : '—',
        ]),
        [2],
      ),
    );
  });
}

/** A folder name from a stair's name: letters, digits and dashes, unique within the project. */
const folderNameOf = (name: string, taken: Set<string>) => {
  const base = name.toLowerCase().replace(/[^a-z0-9]+/g, '-').replace(/^-|-$/g, '') || 'stair';
  let candidate = base;
  for (let i = 2; taken.has(candidate); i++) candidate = `${base}-${i}`;
  taken.add(candidate);
  return candidate;
};

/** The stored estimate's documents, as the API renders them (bytes kept: the CSVs carry a BOM). */
const DOCUMENTS = ['bom.csv', 'wiring-schedule.csv', 'document.pdf'] as const;

async function download(api: ApiClient, estimateId: string, document: (typeof DOCUMENTS)[number]): Promise<Buffer> {
  const params = { params: { path: { estimateId } }, parseAs: 'arrayBuffer' as const };
  const call =
    document === 'bom.csv'
      ? api.GET('/v1/estimates/{estimateId}/bom.csv', params)
      : document === 'wiring-schedule.csv'
        ? api.GET('/v1/estimates/{estimateId}/wiring-schedule.csv', params)
        : api.GET('/v1/estimates/{estimateId}/document.pdf', params);
  return Buffer.from((await unwrap(call)) as ArrayBuffer);
}

function exportCommand(io: CliIo): Command {
  const command = new Command('export')
    .description('the project as one JSON document (project, stairs with their requests, latest estimates); with --dir, a folder with each stair’s request and its latest estimate’s BOM, wiring schedule and PDF')
    .argument('<id>', 'project id')
    .option('-o, --output <file>', 'write the JSON document to this file (default stdout)')
    .option('--dir <dir>', 'write project.json and, per stair, <stair>/request.json (for treadwise estimate), bom.csv, wiring-schedule.csv, document.pdf');
  withExamples(
    withApiOptions(command),
    'treadwise projects export 3b9d2f4e-6a1c-4e8b-9f2d-7c5a1e0b4d63 -o alder-row.json',
    'treadwise projects export 3b9d2f4e-6a1c-4e8b-9f2d-7c5a1e0b4d63 --dir alder-row/ && treadwise estimate alder-row/main-stair/request.json',
  );
  return command.action(async (id: string, raw: Record<string, unknown>) => {
    const opts = connection(raw);
    const api = createApiClient(io, requireKey(io, opts));
    const doc = await projectDocument(api, id);
    const text = `${JSON.stringify(doc, null, 2)}\n`;
    const written: string[] = [];
    if (typeof raw.dir === 'string') {
      mkdirSync(raw.dir, { recursive: true });
      writeFileSync(path.join(raw.dir, 'project.json'), text);
      written.push(path.join(raw.dir, 'project.json'));
      const taken = new Set<string>();
      for (const { stair, latest } of doc.stairs) {
        const folder = path.join(raw.dir, folderNameOf(stair.name, taken));
        mkdirSync(folder, { recursive: true });
        writeFileSync(path.join(folder, 'request.json'), `${JSON.stringify(stair.input, null, 2)}\n`);
        written.push(path.join(folder, 'request.json'));
        if (!latest) continue; // never run: no documents yet
        for (const document of DOCUMENTS) {
          writeFileSync(path.join(folder, document), await download(api, latest.id, document));
          written.push(path.join(folder, document));
        }
      }
    }
    if (typeof raw.output === 'string') {
      writeFileSync(raw.output, text);
      written.unshift(raw.output);
    } else if (typeof raw.dir !== 'string') {
      io.out(text);
    }
    if (opts.json && written.length) io.out(JSON.stringify({ files: written }));
    else if (written.length) io.err(`Wrote ${written.length} file(s): ${written.join(', ')}`);
  });
}

export function projectsCommand(io: CliIo): Command {
  const command = new Command('projects').description('projects and their stairs: list | show | export (needs projects:read)');
  withExamples(command, 'treadwise projects list', 'treadwise projects show 3b9d2f4e-…');
  return command.addCommand(listCommand(io)).addCommand(showCommand(io)).addCommand(exportCommand(io));
}
