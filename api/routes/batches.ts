import { createHash } from 'node:crypto';
import { createReadStream } from 'node:fs';
import { unlink } from 'node:fs/promises';
import { pipeline } from 'node:stream/promises';
import { tmpdir } from 'node:os';
import { Router, type Request, type RequestHandler, type Response } from 'express';
import multer from 'multer';
import { z } from 'zod';
import {
  batchJobPageSchema,
  batchJobParams,
  batchJobSchema,
  batchResultsQuerySchema,
  createBatchJobQuerySchema,
  createBatchJobSchema,
  MAX_JOB_FILE_BYTES,
  MAX_JOB_NAME_LENGTH,
  MAX_JOB_ROWS,
  batchJobNameSchema,
  TERMINAL_BATCH_STATUSES,
  type CreateBatchJob,
} from '../../shared/schemas/batch-jobs.js';
import { checkInput } from '../../shared/schemas/check-input.js';
import type { BatchDetail, EstimateBatchItemResult } from '../../shared/schemas/estimate-batch.js';
import { BATCH_RESULT_COLUMNS, batchResultRow } from '../../shared/sizing/batch/result-row.js';
import { writeCsv } from '../../shared/tables/csv.js';
import { organizationOf, principalOf } from '../auth/principal.js';
import { idempotent } from '../middleware/idempotency.js';
import { CONSOLE_KEY_ID } from '../middleware/metering.js';
import { validateBody, validateQuery } from '../middleware/validate.js';
import { problemResponse } from '../openapi/document.js';
import { HttpProblem } from '../problem.js';
import { csvRows, FileNotReadable, jsonRows, ndjsonRows, type IntakeRow } from '../services/batch-jobs/intake.js';
import type { NewJob } from '../services/batch-jobs/store.js';
import { batchLink } from '../services/batch-jobs/view.js';
import { pageQuerySchema, type PageQuery } from '../services/pagination.js';
import type { RouteModule } from './route-module.js';

export const BATCHES_PATH = '/v1/batches';
/** Body cap of a job posted as JSON; larger inputs are uploaded as a file. */
export const BATCH_JOB_JSON_LIMIT = '4mb';
/** How soon a client polling a running job should ask again. */
const POLL_AFTER_S = 2;

const CSV_TYPES = new Set(['text/csv', 'application/csv', 'application/vnd.ms-excel']);
const NDJSON_TYPES = new Set(['application/x-ndjson', 'application/jsonl', 'application/x-jsonlines', 'application/jsonlines']);

const jobId = (req: Request) => String(req.params.id);

/** The kind of an uploaded file: by its part's content type, else by its extension. */
function fileKind(file: Express.Multer.File): 'csv' | 'ndjson' | null {
  const type = file.mimetype.split(';')[0].trim().toLowerCase();
  if (CSV_TYPES.has(type)) return 'csv';
  if (NDJSON_TYPES.has(type)) return 'ndjson';
  if (/\.csv$/i.test(file.originalname)) return 'csv';
  if (/\.(ndjson|jsonl)$/i.test(file.originalname)) return 'ndjson';
  return null;
}

/** One file in the form field `file`, written to a temporary file as it arrives (never held in memory). */
const receiveFile: RequestHandler = (req, res, next) => {
  const upload = multer({
    storage: multer.diskStorage({ destination: tmpdir() }),
    limits: { fileSize: MAX_JOB_FILE_BYTES, files: 1, fields: 2, parts: 3, fieldSize: MAX_JOB_NAME_LENGTH * 4 },
  }).single('file');
  upload(req, res, (err: unknown) => {
    if (!err) return next();
    if (err instanceof multer.MulterError) {
      if (err.code === 'LIMIT_FILE_SIZE') return next(new HttpProblem(413, 'file_too_large', 'File too large', `A batch file may be at most ${MAX_JOB_FILE_BYTES / 1024 / 1024} MB.`));
      return next(new HttpProblem(400, 'invalid_upload', 'Invalid upload', `${err.message}: send one file in the form field "file" and at most a "name".`, { errors: [{ path: err.field ?? 'file', message: err.message }] }));
    }
    next(new HttpProblem(400, 'invalid_upload', 'Invalid upload', 'The multipart body could not be read.'));
  });
};

const validateJobJson = validateBody(createBatchJobSchema);

/** Multipart (a file) or JSON (items): each read its own way. */
const receiveInput: RequestHandler = (req, res, next) => (req.is('multipart/form-data') ? receiveFile(req, res, next) : validateJobJson(req, res, next));

/** The uploaded file is removed once the answer is out, whether a job was made or a replay answered. */
const removeUploadWhenDone: RequestHandler = (req, res, next) => {
  const file = req.file;
  if (file) res.once('close', () => void unlink(file.path).catch(() => undefined));
  next();
};

/** An upload's bytes, name and type, so an Idempotency-Key reused with another file is told apart. */
async function uploadFingerprint(req: Request): Promise<string | undefined> {
  const file = req.file;
  if (!file) return undefined;
  const hash = createHash('sha256');
  await pipeline(createReadStream(file.path), hash);
  return `${file.originalname}\n${file.mimetype}\n${hash.digest('hex')}`;
}

/** Who created the job, and the key id its rows' usage is counted under (as the creating call's was). */
function creatorOf(res: Response): Pick<NewJob, 'createdBy' | 'meteredKeyId'> {
  const p = principalOf(res);
  if (p.type === 'api_key') return { createdBy: { type: 'key', id: p.keyId }, meteredKeyId: p.keyId };
  if (p.type === 'user') return { createdBy: { type: 'user', id: p.userId }, meteredKeyId: CONSOLE_KEY_ID };
  throw new Error('an anonymous caller cannot create a batch job');
}

/** Writes a chunk and waits for the socket to take it when its buffer is full (backpressure). */
async function writeChunk(res: Response, text: string): Promise<boolean> {
  if (res.destroyed) return false;
  if (res.write(text)) return true;
  await new Promise<void>((resolve) => {
    const done = () => {
      res.off('drain', done);
      res.off('close', done);
      resolve();
    };
    res.on('drain', done);
    res.on('close', done);
  });
  return !res.destroyed;
}

/** Streams a job's answers (all, or only errors) as NDJSON or CSV, page by page from the database. */
async function streamAnswers(res: Response, pages: AsyncIterable<EstimateBatchItemResult[]>, format: 'ndjson' | 'csv', filename: string): Promise<void> {
  if (format === 'csv') res.type('text/csv; charset=utf-8').attachment(`${filename}.csv`);
  else res.type('application/x-ndjson; charset=utf-8');
  res.status(200);
  if (format === 'csv' && !(await writeChunk(res, writeCsv([BATCH_RESULT_COLUMNS])))) return;
  for await (const page of pages) {
    const text = format === 'csv' ? writeCsv(page.map(batchResultRow), { byteOrderMark: false }) : page.map((a) => `${JSON.stringify(a)}\n`).join('');
    if (!(await writeChunk(res, text))) return;
  }
  res.end();
}

export const batchRoutes: RouteModule = {
  basePath: BATCHES_PATH,
  router(deps, services) {
    const router = Router();
    const jobs = services.batchJobs;

    router.post(
      '/',
      validateQuery(createBatchJobQuerySchema),
      // After the upload is read, so the file's bytes are part of what the key stands for.
      receiveInput,
      removeUploadWhenDone,
      idempotent({ db: deps.database.db, clock: deps.clock, pepper: deps.secrets.pepper, fingerprint: uploadFingerprint }),
      async (req, res) => {
        const { detail } = res.locals.query as { detail: BatchDetail };
        const base = { organizationId: organizationOf(res), detail, ...creatorOf(res) };
        let created;
        if (req.is('multipart/form-data')) {
          const file = req.file;
          try {
            const rawName = (req.body as Record<string, unknown> | undefined)?.name;
            const name = rawName === undefined || rawName === '' ? null : checkInput(batchJobNameSchema, rawName);
            if (name && !name.ok) throw new HttpProblem(400, 'validation_failed', 'Invalid name', 'The name is not valid.', { errors: name.errors.map((e) => ({ path: 'name', message: e.message })) });
            if (!file) throw new HttpProblem(400, 'file_missing', 'No file', 'Send the stairs as multipart/form-data in the form field "file".', { errors: [{ path: 'file', message: 'required' }] });
            const kind = fileKind(file);
            if (!kind) {
              throw new HttpProblem(400, 'not_csv', 'Not a CSV or NDJSON file', `The file is ${file.mimetype}; send CSV (text/csv, .csv) or NDJSON (application/x-ndjson, .ndjson, .jsonl).`, {
                errors: [{ path: 'file', message: 'not CSV or NDJSON' }],
              });
            }
            const rows: AsyncIterable<IntakeRow> = kind === 'csv' ? csvRows(file.path) : ndjsonRows(file.path);
            created = await jobs.create({ ...base, name: name?.ok ? name.data : null, source: kind }, rows);
          } catch (err) {
            if (err instanceof FileNotReadable) throw new HttpProblem(400, 'not_csv', 'File not readable', err.message, { errors: [{ path: 'file', message: err.message }] });
            throw err;
          } finally {
            if (file) await unlink(file.path).catch(() => undefined);
          }
        } else {
          const body = res.locals.body as CreateBatchJob;
          created = await jobs.create({ ...base, name: body.name ?? null, source: 'json' }, jsonRows(body.items));
        }
        res.status(202).location(batchLink(created.id)).json(created);
      },
    );

    router.get('/', validateQuery(pageQuerySchema), async (_req, res) => {
      res.json(await jobs.list(organizationOf(res), res.locals.query as PageQuery));
    });

    router.get('/:id', async (req, res) => {
      const job = await jobs.get(organizationOf(res), jobId(req));
      if (!TERMINAL_BATCH_STATUSES.includes(job.status)) res.setHeader('Retry-After', String(POLL_AFTER_S));
      res.json(job);
    });

    const answers = (onlyErrors: boolean): RequestHandler[] => [
      validateQuery(batchResultsQuerySchema),
      async (req, res) => {
        const job = await jobs.row(organizationOf(res), jobId(req));
        const { format } = res.locals.query as { format: 'ndjson' | 'csv' };
        await streamAnswers(res, jobs.answers(job.id, onlyErrors), format, `batch-${job.id}-${onlyErrors ? 'errors' : 'results'}`);
      },
    ];
    router.get('/:id/results', ...answers(false));
    router.get('/:id/errors', ...answers(true));

    router.post('/:id/cancel', async (req, res) => {
      res.json(await jobs.cancel(organizationOf(res), jobId(req)));
    });
    return router;
  },

  docs(registry) {
    const tags = ['Batches'];
    const security = [{ bearer: [] }];
    const read = {
      401: problemResponse('No or invalid credentials.'),
      403: problemResponse('Needs batches:read (or batches:write) for keys — embed keys never have it — or the viewer role.'),
      404: problemResponse('No such job in this organisation (`batch_not_found`).'),
      429: problemResponse('Rate limit reached (`rate_limited`); see Retry-After.'),
    };
    const results = {
      'application/x-ndjson': { schema: z.string().meta({ description: 'One `EstimateBatchItemResult` (see `EstimateBatchOkItem`, `EstimateBatchErrorItem`) per line, in row order.' }) },
      'text/csv': {
        schema: z.string().meta({
          description:
            `Header \`${BATCH_RESULT_COLUMNS.join(',')}\`, then one row per stair (\`row\` = index + 1). UTF-8 with a BOM, RFC 4180, CRLF; ` +
            'text cells starting with = + - @, tab or CR get a leading apostrophe.',
        }),
      },
    };
    const batchBody = { 'application/json': { schema: batchJobSchema } };

    registry.registerPath({
      method: 'post',
      path: BATCHES_PATH,
      tags,
      operationId: 'createBatch',
      security,
      summary: `Start a batch job of up to ${MAX_JOB_ROWS} stairs`,
      description:
        `Upload a file (multipart/form-data, field \`file\`, at most ${MAX_JOB_FILE_BYTES / 1024 / 1024} MB, optional field \`name\`) or post JSON ` +
        `(\`{ name?, items: [{ ref?, request }] }\`, at most ${BATCH_JOB_JSON_LIMIT}). A file is CSV in the stair-row format (a header row, then ` +
        'one stair per row: see `GET /v1/batches/template.csv` and docs/batch-rows.md) or NDJSON (one `{ "ref"?, "request" }` per line), ' +
        'told apart by the part’s content type (`text/csv`, `application/x-ndjson`, `application/jsonl`) or the extension (.csv, .ndjson, .jsonl). ' +
        'The file is streamed to the database, never held whole.\n\n' +
        'Each row is checked on its own with the schema `POST /v1/estimates` uses and later answered on its own: a bad row is that row’s ' +
        'error in the results, never a 400 for the job. Only a file that cannot be read at all is refused (`not_csv`). The job runs in the ' +
        'background: poll `GET /v1/batches/{id}` (honour Retry-After), then read `…/results`. Every row uses one unit of the monthly ' +
        'quota as it is sized; when the quota runs out the job stops (`stopped`, `quota_exceeded`) with the rows done kept. Rows are priced ' +
        'as `POST /v1/estimates` prices (inline catalog, else the stored catalog as it was when the job was created). Send ' +
        '`Idempotency-Key` to retry safely (for an upload the key alone identifies the request: use a new key for another file).',
      request: {
        query: createBatchJobQuerySchema,
        body: {
          required: true,
          content: {
            'application/json': { schema: createBatchJobSchema },
            'multipart/form-data': {
              schema: z.strictObject({
                file: z.string().meta({ format: 'binary', description: 'The CSV or NDJSON file.' }),
                name: z.string().max(MAX_JOB_NAME_LENGTH).optional().meta({ description: 'A name for the job.' }),
              }),
            },
          },
        },
      },
      responses: {
        202: {
          description: 'The job, queued. `Location` names it.',
          headers: { Location: { description: 'The job’s URL, `/v1/batches/{id}`.', schema: { type: 'string' } } },
          content: batchBody,
        },
        400: problemResponse(
          'No file (`file_missing`), a file that is not readable CSV or NDJSON or has a broken header (`not_csv`), no rows or a malformed JSON body (`validation_failed`), or a bad upload (`invalid_upload`).',
        ),
        401: problemResponse('No or invalid credentials.'),
        403: problemResponse('Needs batches:write (embed keys never have it) or the estimator role.'),
        409: problemResponse('A retry while the first request with this Idempotency-Key is still running.'),
        413: problemResponse(`A file over ${MAX_JOB_FILE_BYTES / 1024 / 1024} MB (\`file_too_large\`), more than ${MAX_JOB_ROWS} rows (\`too_many_rows\`), or a JSON body over ${BATCH_JOB_JSON_LIMIT} (\`body_too_large\`).`),
        415: problemResponse('A body that is neither multipart/form-data nor JSON.'),
        422: problemResponse('The Idempotency-Key was used with another request (`idempotency_key_reused`).'),
        429: problemResponse('Rate limit or monthly quota reached (`rate_limited`, `quota_exceeded` when nothing is left); see Retry-After.'),
      },
    });
    registry.registerPath({
      method: 'get',
      path: BATCHES_PATH,
      tags,
      operationId: 'listBatches',
      security,
      summary: 'List batch jobs',
      description: 'The organisation’s jobs, newest first, with cursor pagination. Jobs are deleted with their results when they expire (`expiresAt`).',
      request: { query: pageQuerySchema },
      responses: {
        200: { description: 'A page of jobs.', content: { 'application/json': { schema: batchJobPageSchema } } },
        400: problemResponse('A malformed query (`validation_failed`) or cursor (`invalid_cursor`).'),
        ...read,
      },
    });
    registry.registerPath({
      method: 'get',
      path: `${BATCHES_PATH}/{id}`,
      tags,
      operationId: 'getBatch',
      security,
      summary: 'A batch job and its progress',
      description: 'Status, row counts, progress, the rate since the job started and the time left at that rate. While the job runs the answer carries `Retry-After` (seconds): poll no faster.',
      request: { params: batchJobParams },
      responses: {
        200: {
          description: 'The job.',
          headers: { 'Retry-After': { description: 'While the job is queued or running: seconds before asking again.', schema: { type: 'string' } } },
          content: batchBody,
        },
        ...read,
      },
    });
    registry.registerPath({
      method: 'get',
      path: `${BATCHES_PATH}/{id}/results`,
      tags,
      operationId: 'getBatchResults',
      security,
      summary: 'Results of a batch job',
      description:
        'Every row answered so far, in row order, streamed: NDJSON (default), each line exactly what `POST /v1/estimates/batch` answers for that item ' +
        '(with `detail=full` jobs, sized rows carry `result`), or CSV (`?format=csv`) with one flat row per stair, the same columns `treadwise batch` writes.',
      request: { params: batchJobParams, query: batchResultsQuerySchema },
      responses: { 200: { description: 'The answers so far.', content: results }, 400: problemResponse('A malformed query (`validation_failed`).'), ...read },
    });
    registry.registerPath({
      method: 'get',
      path: `${BATCHES_PATH}/{id}/errors`,
      tags,
      operationId: 'getBatchErrors',
      security,
      summary: 'Rows of a batch job answered with a problem',
      description: 'As `…/results`, only the rows with `status: error`: each with its problem `code`, `detail` and field `errors` (paths are the request’s, so the CSV column names).',
      request: { params: batchJobParams, query: batchResultsQuerySchema },
      responses: { 200: { description: 'The rows with problems so far.', content: results }, 400: problemResponse('A malformed query (`validation_failed`).'), ...read },
    });
    registry.registerPath({
      method: 'post',
      path: `${BATCHES_PATH}/{id}/cancel`,
      tags,
      operationId: 'cancelBatch',
      security,
      summary: 'Cancel a batch job',
      description: 'Stops a queued or running job: no row is answered after it, the rows done are kept and can be read. A job that has ended is a 409.',
      request: { params: batchJobParams },
      responses: {
        200: { description: 'The cancelled job.', content: batchBody },
        401: problemResponse('No or invalid credentials.'),
        403: problemResponse('Needs batches:write (embed keys never have it) or the estimator role.'),
        404: problemResponse('No such job in this organisation (`batch_not_found`).'),
        409: problemResponse('The job has ended already (`batch_finished`).'),
        429: problemResponse('Rate limit or monthly quota reached (`rate_limited`, `quota_exceeded`); see Retry-After.'),
      },
    });
  },
};
