import { Router, type Request, type RequestHandler, type Response } from 'express';
import multer from 'multer';
import { z } from 'zod';
import {
  catalogImportQuerySchema,
  catalogImportReportSchema,
  catalogItemPageSchema,
  catalogItemQuerySchema,
  patchCatalogItemSchema,
  patchCatalogSchema,
  storedCatalogItemSchema,
  storedCatalogSchema,
  type CatalogImportQuery,
  type CatalogImportReport,
  type CatalogItemQuery,
  type PatchCatalog,
  type PatchCatalogItem,
  type StoredCatalogItem,
} from '../../shared/schemas/catalog-store.js';
import { organizationOf, principalOf } from '../auth/principal.js';
import { idempotent } from '../middleware/idempotency.js';
import { validateBody, validateQuery } from '../middleware/validate.js';
import { problemResponse } from '../openapi/document.js';
import { HttpProblem } from '../problem.js';
import { auditContext } from '../services/audit.js';
import { CATALOG_CSV_COLUMNS, catalogCsv, catalogTemplateCsv, CsvNotReadable, readCatalogCsv } from '../../shared/schemas/catalog-csv.js';
import type { RouteModule } from './route-module.js';

const skuOf = (req: Request) => String(req.params.sku);

/** Largest catalog CSV accepted: 5 MB holds far more rows than any shop's catalog. */
export const MAX_CATALOG_CSV_BYTES = 5 * 1024 * 1024;
const CSV_TYPES = new Set(['text/csv', 'application/csv', 'text/plain', 'application/vnd.ms-excel', 'application/octet-stream']);

/** One file in the form field `file`, held in memory; multer's refusals become problems. */
const receiveCsv: RequestHandler = (req, res, next) => {
  const upload = multer({ storage: multer.memoryStorage(), limits: { fileSize: MAX_CATALOG_CSV_BYTES, files: 1, fields: 5, parts: 6 } }).single('file');
  upload(req, res, (err: unknown) => {
    if (!err) return next();
    if (err instanceof multer.MulterError) {
      if (err.code === 'LIMIT_FILE_SIZE') {
        return next(new HttpProblem(413, 'file_too_large', 'File too large', `A catalog CSV may be at most ${MAX_CATALOG_CSV_BYTES / 1024 / 1024} MB.`));
      }
      return next(new HttpProblem(400, 'invalid_upload', 'Invalid upload', `${err.message}: send one CSV file in the form field "file".`, { errors: [{ path: err.field ?? 'file', message: err.message }] }));
    }
    next(new HttpProblem(400, 'invalid_upload', 'Invalid upload', 'The multipart body could not be read.'));
  });
};

function sendCsv(res: Response, filename: string, body: string): void {
  res.type('text/csv; charset=utf-8').attachment(filename).send(body);
}

/** Embed keys (shop pages) see what the shop sells now: active items only. */
function isEmbed(res: Response): boolean {
  const p = principalOf(res);
  return p.type === 'api_key' && p.kind === 'embed';
}

export const catalogRoutes: RouteModule = {
  basePath: '/v1/catalog',

  router(deps, services) {
    const router = Router();
    const { catalog, audit } = services;

    router.get('/', async (_req, res) => {
      res.json(await catalog.get(organizationOf(res)));
    });

    router.patch('/', validateBody(patchCatalogSchema), async (req, res) => {
      const organizationId = organizationOf(res);
      const body = res.locals.body as PatchCatalog;
      const { changed } = await catalog.update(organizationId, body);
      const view = await catalog.get(organizationId);
      if (changed) await audit.record(auditContext(req, res), { action: 'catalog.updated', organizationId, targetType: 'catalog', targetId: organizationId, data: { ...body, version: view.version } });
      res.json(view);
    });

    router.get('/template', (_req, res) => {
      sendCsv(res, 'catalog-template.csv', catalogTemplateCsv());
    });

    router.get('/export', async (_req, res) => {
      const { items } = await catalog.allItems(organizationOf(res));
      sendCsv(res, 'catalog.csv', catalogCsv(items));
    });

    router.post('/imports', validateQuery(catalogImportQuerySchema), receiveCsv, async (req, res) => {
      const organizationId = organizationOf(res);
      const { dryRun = false } = res.locals.query as CatalogImportQuery;
      const file = req.file;
      if (!file) {
        throw new HttpProblem(400, 'file_missing', 'No file', 'Send the CSV as multipart/form-data in the form field "file".', { errors: [{ path: 'file', message: 'required' }] });
      }
      if (!CSV_TYPES.has(file.mimetype.split(';')[0].trim().toLowerCase()) && !/\.csv$/i.test(file.originalname)) {
        throw new HttpProblem(400, 'not_csv', 'Not a CSV file', `The file is ${file.mimetype}; send a CSV file (text/csv).`, { errors: [{ path: 'file', message: 'not a CSV file' }] });
      }
      let parsed: ReturnType<typeof readCatalogCsv>;
      try {
        parsed = readCatalogCsv(file.buffer, await catalog.currencyOf(organizationId));
      } catch (err) {
        if (err instanceof CsvNotReadable) throw new HttpProblem(400, 'not_csv', 'Not a CSV file', err.message, { errors: [{ path: 'file', message: err.message }] });
        throw err;
      }
      const { items, errors, rows } = parsed;
      if (errors.length > 0) {
        if (!dryRun) {
          throw new HttpProblem(400, 'catalog_import_invalid', 'Invalid catalog file', `${errors.length} problem(s) in the file; nothing was imported.`, {
            errors: errors.map((e) => ({ path: `rows.${e.row}.${e.column}`, message: e.message })),
          });
        }
        const version = (await catalog.get(organizationId)).version;
        const report: CatalogImportReport = { dryRun, imported: false, rows, created: 0, updated: 0, unchanged: 0, version, errors };
        res.json(report);
        return;
      }
      const counts = await catalog.importItems(organizationId, items, { dryRun });
      const report: CatalogImportReport = { dryRun, imported: !dryRun, rows, ...counts, errors: [] };
      if (!dryRun && counts.created + counts.updated > 0) {
        await audit.record(auditContext(req, res), { action: 'catalog.imported', organizationId, targetType: 'catalog', targetId: organizationId, data: { rows, ...counts } });
      }
      res.json(report);
    });

    router.get('/items', validateQuery(catalogItemQuerySchema), async (_req, res) => {
      const query = res.locals.query as CatalogItemQuery;
      res.json(await catalog.list(organizationOf(res), isEmbed(res) ? { ...query, active: true } : query));
    });

    router.post('/items', validateBody(storedCatalogItemSchema), idempotent({ db: deps.database.db, clock: deps.clock, pepper: deps.secrets.pepper }), async (req, res) => {
      const organizationId = organizationOf(res);
      const { item, version } = await catalog.create(organizationId, res.locals.body as StoredCatalogItem);
      await audit.record(auditContext(req, res), { action: 'catalog_item.created', organizationId, targetType: 'catalog_item', targetId: item.sku, data: { version } });
      res.status(201).location(`/v1/catalog/items/${encodeURIComponent(item.sku)}`).json(item);
    });

    router.get('/items/:sku', async (req, res) => {
      res.json(await catalog.getItem(organizationOf(res), skuOf(req)));
    });

    router.put('/items/:sku', validateBody(storedCatalogItemSchema), async (req, res) => {
      const organizationId = organizationOf(res);
      const body = res.locals.body as StoredCatalogItem;
      if (body.sku !== skuOf(req)) {
        throw new HttpProblem(400, 'validation_failed', 'Invalid request', 'The body’s SKU differs from the one in the path.', { errors: [{ path: 'sku', message: `must be ${skuOf(req)}, as in the path` }] });
      }
      const { item, created, changed } = await catalog.replace(organizationId, body);
      if (changed) await audit.record(auditContext(req, res), { action: created ? 'catalog_item.created' : 'catalog_item.replaced', organizationId, targetType: 'catalog_item', targetId: item.sku });
      res.status(created ? 201 : 200).json(item);
    });

    router.patch('/items/:sku', validateBody(patchCatalogItemSchema), async (req, res) => {
      const organizationId = organizationOf(res);
      const body = res.locals.body as PatchCatalogItem;
      const { item, changed } = await catalog.patch(organizationId, skuOf(req), body);
      if (changed) await audit.record(auditContext(req, res), { action: 'catalog_item.updated', organizationId, targetType: 'catalog_item', targetId: item.sku, data: body });
      res.json(item);
    });

    router.delete('/items/:sku', async (req, res) => {
      const organizationId = organizationOf(res);
      const { item, changed } = await catalog.retire(organizationId, skuOf(req));
      if (changed) await audit.record(auditContext(req, res), { action: 'catalog_item.retired', organizationId, targetType: 'catalog_item', targetId: item.sku });
      res.json(item);
    });

    return router;
  },

  docs(registry) {
    const security = [{ bearer: [] }];
    const tags = ['Catalog'];
    const skuParams = z.object({ sku: z.string().min(1).max(64).meta({ description: 'The item’s SKU.', example: 'HL-D24-100' }) });
    const read = { 401: problemResponse('No or invalid credentials.'), 403: problemResponse('Needs the viewer role or the catalog:read scope.') };
    const write = { 401: problemResponse('No or invalid credentials.'), 403: problemResponse('Needs the admin role or the catalog:write scope.') };
    const itemJson = { 'application/json': { schema: storedCatalogItemSchema } };

    registry.registerPath({
      method: 'get',
      path: '/v1/catalog',
      tags,
      operationId: 'getCatalog',
      summary: 'Get the stored catalog',
      description: 'The organisation’s catalog: currency, tax rate, version (bumped by every change) and how many items it holds.',
      security,
      responses: { 200: { description: 'The catalog.', content: { 'application/json': { schema: storedCatalogSchema } } }, ...read },
    });
    registry.registerPath({
      method: 'patch',
      path: '/v1/catalog',
      tags,
      operationId: 'updateCatalog',
      summary: 'Change the catalog’s currency or tax rate',
      description:
        'Changes the currency (refused with 409 `currency_decimals_differ` when priced items exist and the new currency has other decimals) or the tax rate. A change bumps the version.',
      security,
      request: { body: { required: true, content: { 'application/json': { schema: patchCatalogSchema } } } },
      responses: {
        200: { description: 'The catalog after the change.', content: { 'application/json': { schema: storedCatalogSchema } } },
        400: problemResponse('The body does not match the schema (`validation_failed`).'),
        ...write,
        409: problemResponse('The new currency has other decimals than the stored prices (`currency_decimals_differ`).'),
      },
    });
    const csvColumns = CATALOG_CSV_COLUMNS.map((c) => `\`${c.name}\` (${c.type})`).join(', ');
    const csvFormat =
      `Columns: ${csvColumns}. One row per item; a cell of a field the item's kind lacks stays empty; nested fields are dotted (\`profile.outputs\`); \`unitPrice\` in major units; \`active\` true or false (empty: true). ` +
      'UTF-8 with a BOM, RFC 4180 quoting, CRLF. A text cell starting with = + - @, tab or CR (or with an apostrophe before one) gets a leading apostrophe so a spreadsheet does not run it as a formula; numbers are never changed. An import removes that apostrophe again.';
    const csvBody = { 'text/csv': { schema: z.string().meta({ description: 'The catalog CSV.' }) } };
    registry.registerPath({
      method: 'get',
      path: '/v1/catalog/template',
      tags,
      operationId: 'getCatalogTemplate',
      summary: 'Download the catalog CSV template',
      description: `The header and one example row per kind, to fill in and import. ${csvFormat}`,
      security,
      responses: { 200: { description: 'The template CSV.', content: csvBody }, ...read },
    });
    registry.registerPath({
      method: 'get',
      path: '/v1/catalog/export',
      tags,
      operationId: 'exportCatalog',
      summary: 'Export the catalog as CSV',
      description: `Every item, active and retired, by SKU. Importing the file unchanged changes nothing. ${csvFormat}`,
      security,
      responses: { 200: { description: 'The catalog CSV.', content: csvBody }, ...read },
    });
    registry.registerPath({
      method: 'post',
      path: '/v1/catalog/imports',
      tags,
      operationId: 'importCatalog',
      summary: 'Import a catalog CSV',
      description:
        `Upload a CSV (multipart/form-data, field \`file\`, at most 5 MB). Every row is checked by its kind's schema and the answer lists every bad row and column. ` +
        'The import is all-or-nothing in one transaction: a new SKU is created, an existing one replaced by its row, SKUs not in the file stay as they are. With `?dryRun=true` the answer is the report and nothing is written. ' +
        `A change bumps the catalog version once. ${csvFormat}`,
      security,
      request: {
        query: catalogImportQuerySchema,
        body: {
          required: true,
          content: { 'multipart/form-data': { schema: z.strictObject({ file: z.string().meta({ format: 'binary', description: 'The CSV file.' }) }) } },
        },
      },
      responses: {
        200: { description: 'The import report (or, on a dry run, what the import would do, with every bad row).', content: { 'application/json': { schema: catalogImportReportSchema } } },
        400: problemResponse(
          'No file (`file_missing`), a file that is not CSV text (`not_csv`), a bad query (`validation_failed`) or, on a real import, bad rows (`catalog_import_invalid`, each in `errors` as `rows.<line>.<column>`).',
        ),
        ...write,
        413: problemResponse('The file is over 5 MB (`file_too_large`).'),
        415: problemResponse('The body is not multipart/form-data.'),
      },
    });
    registry.registerPath({
      method: 'get',
      path: '/v1/catalog/items',
      tags,
      operationId: 'listCatalogItems',
      summary: 'List catalog items',
      description: 'Items sorted by SKU with cursor pagination, optionally of one kind or only active or retired ones. Embed keys (with catalog:read) see active items only.',
      security,
      request: { query: catalogItemQuerySchema },
      responses: {
        200: { description: 'A page of items.', content: { 'application/json': { schema: catalogItemPageSchema } } },
        400: problemResponse('A malformed or unknown query parameter (`validation_failed`) or cursor (`invalid_cursor`).'),
        ...read,
      },
    });
    registry.registerPath({
      method: 'post',
      path: '/v1/catalog/items',
      tags,
      operationId: 'createCatalogItem',
      summary: 'Add a catalog item',
      description: 'Adds one item, validated by its kind’s schema. 409 when the SKU exists (PUT replaces an item). Send `Idempotency-Key` to retry safely. Bumps the version.',
      security,
      request: {
        headers: z.object({ 'Idempotency-Key': z.string().max(255).optional() }),
        body: { required: true, content: itemJson },
      },
      responses: {
        201: { description: 'The item.', content: itemJson },
        400: problemResponse('The item does not match its kind’s schema, or its price is not a whole number of minor units (`validation_failed`).'),
        ...write,
        409: problemResponse('The SKU exists (`sku_exists`), or a request with this Idempotency-Key is still running.'),
        422: problemResponse('Idempotency-Key reused with another body.'),
      },
    });
    registry.registerPath({
      method: 'get',
      path: '/v1/catalog/items/{sku}',
      tags,
      operationId: 'getCatalogItem',
      summary: 'Get a catalog item',
      description: 'One item, active or retired.',
      security,
      request: { params: skuParams },
      responses: { 200: { description: 'The item.', content: itemJson }, ...read, 404: problemResponse('No such SKU in this organisation’s catalog.') },
    });
    registry.registerPath({
      method: 'put',
      path: '/v1/catalog/items/{sku}',
      tags,
      operationId: 'replaceCatalogItem',
      summary: 'Create or replace a catalog item',
      description: 'Replaces the item’s kind, fields, price and active flag (201 when the SKU is new). The body’s `sku` must equal the path’s. A real change bumps the version.',
      security,
      request: { params: skuParams, body: { required: true, content: itemJson } },
      responses: {
        200: { description: 'The replaced item.', content: itemJson },
        201: { description: 'The new item.', content: itemJson },
        400: problemResponse('The item does not match its kind’s schema, or its SKU differs from the path (`validation_failed`).'),
        ...write,
      },
    });
    registry.registerPath({
      method: 'patch',
      path: '/v1/catalog/items/{sku}',
      tags,
      operationId: 'updateCatalogItem',
      summary: 'Change an item’s price, name or active flag',
      description: 'Changes `unitPrice`, `description` or `active` (null removes a price or name). The kind’s fields change with PUT. A real change bumps the version.',
      security,
      request: { params: skuParams, body: { required: true, content: { 'application/json': { schema: patchCatalogItemSchema } } } },
      responses: {
        200: { description: 'The item after the change.', content: itemJson },
        400: problemResponse('The body does not match the schema (`validation_failed`).'),
        ...write,
        404: problemResponse('No such SKU in this organisation’s catalog.'),
      },
    });
    registry.registerPath({
      method: 'delete',
      path: '/v1/catalog/items/{sku}',
      tags,
      operationId: 'retireCatalogItem',
      summary: 'Retire a catalog item',
      description:
        'Retires the item (`active: false`) rather than erasing it: an estimate priced with it must still be able to name it. A retired SKU is never picked; PATCH `{ "active": true }` brings it back. Retiring twice is harmless.',
      security,
      request: { params: skuParams },
      responses: { 200: { description: 'The retired item.', content: itemJson }, ...write, 404: problemResponse('No such SKU in this organisation’s catalog.') },
    });
  },
};
