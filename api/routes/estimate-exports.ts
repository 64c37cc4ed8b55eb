import type { Request, Response } from 'express';
import type { Router } from 'express';
import type { OpenAPIRegistry } from '@asteasolutions/zod-to-openapi';
import { z } from 'zod';
import { estimateParams } from '../../shared/schemas/projects.js';
import { organizationOf } from '../auth/principal.js';
import { bomCsv } from '../exports/bom-csv.js';
import type { ExportContext } from '../exports/context.js';
import { estimatePdf } from '../exports/estimate-pdf.js';
import { wiringScheduleCsv } from '../exports/wiring-schedule.js';
import { problemResponse } from '../openapi/document.js';
import type { Services } from '../services/container.js';
import type { CostCharger } from './calculation-route.js';

/**
 * A PDF costs far more than a sizing call (fonts, layout: a few hundred milliseconds), so each
 * download is charged this many work units against the caller's cost budget.
 */
export const PDF_COST = 100;

/** `Saltmarsh Cottage, Main stair` → `saltmarsh-cottage-main-stair`: ASCII, safe in any file system. */
export function fileSlug(...parts: (string | null | undefined)[]): string {
  return parts
    .filter((p): p is string => !!p)
    .join(' ')
    .normalize('NFKD')
    .replace(/[\u0300-\u036f]/g, '')
    .toLowerCase()
    .replace(/[^a-z0-9]+/g, '-')
    .replace(/^-+|-+$/g, '')
    .slice(0, 60)
    .replace(/-+$/, '');
}

/** The hand-over file's name: project, stair, what it is and the day it was run. */
function fileName(context: ExportContext, what: string, extension: string): string {
  const day = typeof context.createdAt === 'string' ? context.createdAt.slice(0, 10) : '';
  const base = fileSlug(context.projectName, context.stairName) || `estimate-${(context.estimateId ?? '').slice(0, 8)}`;
  return `${[base, what, day].filter(Boolean).join('-')}.${extension}`;
}

export function mountExports(router: Router, services: Services, charge: CostCharger): void {
  const estimateId = (req: Request) => String(req.params.estimateId);

  async function load(req: Request, res: Response) {
    const organizationId = organizationOf(res);
    const { estimate, names } = await services.storedEstimates.withContext(organizationId, estimateId(req));
    let ranBy: string;
    if (estimate.ranBy.type === 'user') {
      const user = await services.users.get(estimate.ranBy.id);
      ranBy = user ? (user.name ? `${user.name} <${user.email}>` : user.email) : `user ${estimate.ranBy.id}`;
    } else {
      ranBy = `API key ${estimate.ranBy.id}`;
    }
    const flights = (estimate.input as { staircase?: { flights?: { treads: number }[] } }).staircase?.flights;
    const context: ExportContext = {
      estimateId: estimate.id,
      createdAt: estimate.createdAt,
      projectName: names?.projectName,
      clientName: names?.clientName ?? undefined,
      siteAddress: names?.siteAddress ?? undefined,
      stairName: names?.stairName,
      ranBy,
      ...(flights ? { treadsPerFlight: flights.map((f) => f.treads) } : {}),
    };
    return { result: estimate.result, context };
  }

  const sendCsv = (res: Response, name: string, body: string) => res.type('text/csv; charset=utf-8').attachment(name).send(body);

  router.get('/:estimateId/wiring-schedule.csv', async (req, res) => {
    const { result, context } = await load(req, res);
    sendCsv(res, fileName(context, 'wiring-schedule', 'csv'), wiringScheduleCsv(result, context));
  });

  router.get('/:estimateId/bom.csv', async (req, res) => {
    const { result, context } = await load(req, res);
    sendCsv(res, fileName(context, 'bom', 'csv'), bomCsv(result, context));
  });

  router.get('/:estimateId/document.pdf', charge(() => PDF_COST), async (req, res) => {
    const { result, context } = await load(req, res);
    const pdf = await estimatePdf(result, context);
    res.type('application/pdf').attachment(fileName(context, 'estimate', 'pdf')).send(pdf);
  });
}

export function documentExports(registry: OpenAPIRegistry): void {
  const security = [{ bearer: [] }];
  const tags = ['Projects'];
  const denied = {
    401: problemResponse('No or invalid credentials.'),
    403: problemResponse('Needs the viewer role or the projects:read scope (embed keys: never).'),
    404: problemResponse('No such stored estimate in this organisation (`estimate_not_found`).'),
  };
  const attachment = z.object({ 'Content-Disposition': z.string().meta({ description: 'attachment, with a file name from the project, the stair and the day it was run.', example: 'attachment; filename=saltmarsh-cottage-staircase-main-stair-bom-2026-12-01.csv' }) });
  const csv = { 'text/csv': { schema: z.string().meta({ description: 'UTF-8 with a BOM, RFC 4180, CRLF; text cells starting with = + - @, tab or CR get a leading apostrophe.' }) } };
  registry.registerPath({
    method: 'get',
    path: '/v1/estimates/{estimateId}/wiring-schedule.csv',
    tags,
    operationId: 'getWiringScheduleCsv',
    summary: 'Download the wiring schedule (CSV)',
    description: 'One row per tread — tread, flight, controller, output, strip length, W, A, lead length, conductor size, drop — then blocks for the circuits (driver, feeder, protection), data runs and sensor cable. Headed by client, site, project, stair and when it was run.',
    security,
    request: { params: estimateParams },
    responses: { 200: { description: 'The wiring schedule.', headers: attachment, content: csv }, ...denied },
  });
  registry.registerPath({
    method: 'get',
    path: '/v1/estimates/{estimateId}/bom.csv',
    tags,
    operationId: 'getBomCsv',
    summary: 'Download the bill of materials (CSV)',
    description: 'SKUs, quantities, unit prices and line totals, then net, tax and gross when a catalog priced the estimate; a line the catalog could not fill says what was missing.',
    security,
    request: { params: estimateParams },
    responses: { 200: { description: 'The bill of materials.', headers: attachment, content: csv }, ...denied },
  });
  registry.registerPath({
    method: 'get',
    path: '/v1/estimates/{estimateId}/document.pdf',
    tags,
    operationId: 'getEstimatePdf',
    summary: 'Download the printable estimate (PDF)',
    description: `Client and site, the stair, the per-tread table, drivers, cable, reels and cut plan, the priced bill of materials, every check with its suggestion, and the cautions in full. Charged ${PDF_COST} work units against the cost budget.`,
    security,
    request: { params: estimateParams },
    responses: {
      200: { description: 'The estimate as a PDF.', headers: attachment, content: { 'application/pdf': { schema: z.string().meta({ format: 'binary' }) } } },
      ...denied,
      429: problemResponse('Rate limit, cost budget or monthly quota reached (`rate_limited`, `cost_budget_exceeded`, `quota_exceeded`); see Retry-After.'),
    },
  });
}
