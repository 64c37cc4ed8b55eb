import { Router } from 'express';
import { z } from 'zod';
import {
  alderRowCornerUnit,
  alderRowTownhouse,
  alderRowTreadPixels,
  alderRowWithRail,
  quaysideCorridor,
} from '../../shared/schemas/estimate-examples.js';
import { requestToRow, stairRowColumns } from '../../shared/schemas/stair-row.js';
import { writeCsv } from '../../shared/tables/csv.js';
import { problemResponse } from '../openapi/document.js';
import type { RouteModule } from './route-module.js';

const PATH = '/v1/batches/template.csv';

/** One example stair per layout (and one with flights), under invented references. */
export const TEMPLATE_EXAMPLES: readonly { ref: string; request: object }[] = [
  { ref: 'Alder Row 7, main stair', request: alderRowTownhouse },
  { ref: 'Alder Row 9, corner stair', request: alderRowCornerUnit },
  { ref: 'Quayside corridor', request: quaysideCorridor },
  { ref: 'Alder Row 11, stair and rail', request: alderRowWithRail },
  { ref: 'Alder Row 13, pixel treads', request: alderRowTreadPixels },
];

/**
 * The stair-row template: every column the schema has (two indexed columns per array; more are
 * allowed), then one example row per layout. Rows are priced from the stored catalog, so the
 * `catalog` columns are left out (a row may still carry them).
 */
export function batchTemplateCsv(): string {
  const columns = stairRowColumns([], { omit: ['catalog'] });
  const rows = TEMPLATE_EXAMPLES.map(({ ref, request }) => {
    const row = requestToRow(request, ref);
    return columns.map((c) => row[c]);
  });
  return writeCsv([columns, ...rows]);
}

export const batchTemplateRoutes: RouteModule = {
  basePath: PATH,
  router() {
    const router = Router();
    router.get('/', (_req, res) => {
      res.type('text/csv; charset=utf-8').attachment('treadwise-stairs-template.csv').send(batchTemplateCsv());
    });
    return router;
  },
  docs(registry) {
    registry.registerPath({
      method: 'get',
      path: PATH,
      tags: ['Batches'],
      operationId: 'getBatchTemplate',
      security: [{ bearer: [] }],
      summary: 'Download the stair-row CSV template',
      description:
        'The flat CSV row format of a stair, for files of many stairs: a `ref` column (your reference), then one column per field ' +
        'of the estimate request named by its dotted path (`staircase.treads`, `treadStrip.voltageV`, `controller.profileId`), arrays ' +
        'as indexed columns (`staircase.flights.0.treads`; the template shows two of each, a file may use more). Empty cells are ' +
        'left out, so defaults apply. One example row per layout follows the header. `catalog.*` columns are not listed: rows are ' +
        'priced from the stored catalog. UTF-8 with a byte-order mark, CRLF, RFC 4180 quoting; text that a spreadsheet would run as ' +
        'a formula starts with an apostrophe. The columns are documented in docs/batch-rows.md.',
      responses: {
        200: { description: 'The template CSV.', content: { 'text/csv': { schema: z.string().meta({ description: 'The stair-row template CSV.' }) } } },
        401: problemResponse('No or invalid credentials.'),
        403: problemResponse('Needs the batches:write scope (embed keys never have it) or the estimator role.'),
        429: problemResponse('Rate limit or monthly quota reached (`rate_limited`, `quota_exceeded`); see Retry-After.'),
      },
    });
  },
};
