import { Router, type Request, type RequestHandler, type Response } from 'express';
import { z } from 'zod';
import {
  createProjectSchema,
  createStairSchema,
  patchProjectSchema,
  patchStairSchema,
  projectPageSchema,
  projectParams,
  projectSchema,
  runStairSchema,
  stairPageSchema,
  stairParams,
  stairSchema,
  storedEstimatePageSchema,
  storedEstimateSchema,
  type CreateProject,
  type CreateStair,
  type PatchProject,
  type PatchStair,
} from '../../shared/schemas/projects.js';
import { organizationOf, principalOf } from '../auth/principal.js';
import { costBudget } from '../middleware/cost-budget.js';
import { idempotent } from '../middleware/idempotency.js';
import { validateBody, validateQuery } from '../middleware/validate.js';
import { problemResponse } from '../openapi/document.js';
import { auditContext } from '../services/audit.js';
import type { Services } from '../services/container.js';
import { pageQuerySchema, type PageQuery } from '../services/pagination.js';
import { actorOf } from '../services/projects.js';
import type { PreparedRun } from '../services/stored-estimates.js';
import type { AppDeps } from '../deps.js';
import type { RouteModule } from './route-module.js';
import { estimateCost } from './sizing-costs.js';

const projectId = (req: Request) => String(req.params.id);
const stairId = (req: Request) => String(req.params.stairId);

/** The raw body's `input`: stored as the client sent it (validateBody has checked it), parsed again at each run. */
const rawInput = (req: Request) => (req.body as { input: Record<string, unknown> }).input;

/**
 * Runs a prepared design and answers the stored estimate (201). Shared by a stair's run and a
 * re-run: before it, `prepare` put the design in `res.locals.body`, which the cost budget weighs
 * as it weighs a POST /v1/estimates body.
 */
export function runStored(deps: AppDeps, services: Services, prepare: (req: Request, res: Response) => Promise<PreparedRun>): RequestHandler[] {
  const load: RequestHandler = async (req, res, next) => {
    const prepared = await prepare(req, res);
    res.locals.prepared = prepared;
    res.locals.body = prepared.input;
    next();
  };
  const run: RequestHandler = async (req, res) => {
    const prepared = res.locals.prepared as PreparedRun;
    const { estimate, changes } = await services.storedEstimates.run(prepared, actorOf(principalOf(res)));
    await services.audit.record(auditContext(req, res), {
      action: 'estimate.created',
      organizationId: prepared.organizationId,
      targetType: 'estimate',
      targetId: estimate.id,
      data: { projectId: estimate.projectId, stairId: estimate.stairId, rerunOf: estimate.rerunOf, engineVersion: estimate.engineVersion, catalogVersion: estimate.catalogVersion },
    });
    res
      .status(201)
      .location(`/v1/estimates/${estimate.id}`)
      .json({ ...estimate, ...(changes ? { changes } : {}), requestId: String(req.id) });
  };
  // The design is loaded (404s first) and charged before the idempotency record is claimed, so a
  // refusal by the cost budget is never stored and replayed as the answer.
  return [load, costBudget(services, deps.logger)(estimateCost), idempotent({ db: deps.database.db, clock: deps.clock, pepper: deps.secrets.pepper }), run];
}

export const projectRoutes: RouteModule = {
  basePath: '/v1/projects',

  router(deps, services) {
    const router = Router();
    const { projects, stairs, storedEstimates, audit } = services;
    const once = () => idempotent({ db: deps.database.db, clock: deps.clock, pepper: deps.secrets.pepper });

    // ---- projects ----
    router.get('/', validateQuery(pageQuerySchema), async (_req, res) => {
      res.json(await projects.list(organizationOf(res), res.locals.query as PageQuery));
    });

    router.post('/', validateBody(createProjectSchema), once(), async (req, res) => {
      const organizationId = organizationOf(res);
      const project = await projects.create(organizationId, actorOf(principalOf(res)), res.locals.body as CreateProject);
      await audit.record(auditContext(req, res), { action: 'project.created', organizationId, targetType: 'project', targetId: project.id, data: { name: project.name } });
      res.status(201).location(`/v1/projects/${project.id}`).json({ ...project, requestId: String(req.id) });
    });

    router.get('/:id', async (req, res) => {
      res.json(await projects.get(organizationOf(res), projectId(req)));
    });

    router.patch('/:id', validateBody(patchProjectSchema), async (req, res) => {
      const { project } = await projects.update(organizationOf(res), projectId(req), res.locals.body as PatchProject);
      res.json(project);
    });

    router.delete('/:id', async (req, res) => {
      const organizationId = organizationOf(res);
      const project = await projects.remove(organizationId, projectId(req));
      await audit.record(auditContext(req, res), { action: 'project.deleted', organizationId, targetType: 'project', targetId: project.id, data: { name: project.name, stairs: project.stairCount } });
      res.status(204).end();
    });

    // ---- stairs ----
    router.get('/:id/stairs', validateQuery(pageQuerySchema), async (req, res) => {
      res.json(await stairs.list(organizationOf(res), projectId(req), res.locals.query as PageQuery));
    });

    router.post('/:id/stairs', validateBody(createStairSchema), once(), async (req, res) => {
      const organizationId = organizationOf(res);
      const body = res.locals.body as CreateStair;
      const stair = await stairs.create(organizationId, projectId(req), { name: body.name, notes: body.notes, input: rawInput(req) });
      await audit.record(auditContext(req, res), { action: 'stair.created', organizationId, targetType: 'stair', targetId: stair.id, data: { projectId: stair.projectId, name: stair.name } });
      res.status(201).location(`/v1/projects/${stair.projectId}/stairs/${stair.id}`).json({ ...stair, requestId: String(req.id) });
    });

    router.get('/:id/stairs/:stairId', async (req, res) => {
      res.json(await stairs.get(organizationOf(res), projectId(req), stairId(req)));
    });

    router.patch('/:id/stairs/:stairId', validateBody(patchStairSchema), async (req, res) => {
      const body = res.locals.body as PatchStair;
      const { stair } = await stairs.update(organizationOf(res), projectId(req), stairId(req), {
        name: body.name,
        notes: body.notes,
        input: body.input === undefined ? undefined : rawInput(req),
      });
      res.json(stair);
    });

    router.delete('/:id/stairs/:stairId', async (req, res) => {
      const organizationId = organizationOf(res);
      const stair = await stairs.remove(organizationId, projectId(req), stairId(req));
      await audit.record(auditContext(req, res), { action: 'stair.deleted', organizationId, targetType: 'stair', targetId: stair.id, data: { projectId: stair.projectId, name: stair.name } });
      res.status(204).end();
    });

    // ---- a stair's stored estimates ----
    router.get('/:id/stairs/:stairId/estimates', validateQuery(pageQuerySchema), async (req, res) => {
      res.json(await storedEstimates.list(organizationOf(res), projectId(req), stairId(req), res.locals.query as PageQuery));
    });

    router.post(
      '/:id/stairs/:stairId/estimates',
      validateBody(runStairSchema),
      ...runStored(deps, services, (req, res) => storedEstimates.prepareRun(organizationOf(res), projectId(req), stairId(req))),
    );

    return router;
  },

  docs(registry) {
    const security = [{ bearer: [] }];
    const tags = ['Projects'];
    const read = { 401: problemResponse('No or invalid credentials.'), 403: problemResponse('Needs the viewer role or the projects:read scope (embed keys: never).') };
    const write = { 401: problemResponse('No or invalid credentials.'), 403: problemResponse('Needs the estimator role or the projects:write scope (embed keys: never).') };
    const remove = { 401: problemResponse('No or invalid credentials.'), 403: problemResponse('Needs the admin role or the projects:write scope (embed keys: never).') };
    const noProject = { 404: problemResponse('No such project in this organisation (`project_not_found`).') };
    const noStair = { 404: problemResponse('No such project (`project_not_found`) or stair (`stair_not_found`) in this organisation.') };
    const idempotencyHeader = z.object({ 'Idempotency-Key': z.string().max(255).optional().meta({ description: 'Retry safely: the first answer is replayed for 24 h.' }) });
    const replay = {
      409: problemResponse('A request with this Idempotency-Key is still running.'),
      422: problemResponse('Idempotency-Key reused with another body (`idempotency_key_reused`).'),
    };
    const json = <T extends z.ZodType>(schema: T) => ({ 'application/json': { schema } });
    const pageBad = problemResponse('A malformed or unknown query parameter (`validation_failed`) or cursor (`invalid_cursor`).');

    registry.registerPath({
      method: 'get',
      path: '/v1/projects',
      tags,
      operationId: 'listProjects',
      summary: 'List projects',
      description: 'The organisation’s projects, newest first, with cursor pagination.',
      security,
      request: { query: pageQuerySchema },
      responses: { 200: { description: 'A page of projects.', content: json(projectPageSchema) }, 400: pageBad, ...read },
    });
    registry.registerPath({
      method: 'post',
      path: '/v1/projects',
      tags,
      operationId: 'createProject',
      summary: 'Create a project',
      description: 'A new project (name; client, site address and notes optional). Send `Idempotency-Key` to retry safely.',
      security,
      request: { headers: idempotencyHeader, body: { required: true, content: json(createProjectSchema) } },
      responses: {
        201: { description: 'The project, with the `requestId` that created it.', content: json(projectSchema) },
        400: problemResponse('The body does not match the schema (`validation_failed`).'),
        ...write,
        ...replay,
      },
    });
    registry.registerPath({
      method: 'get',
      path: '/v1/projects/{id}',
      tags,
      operationId: 'getProject',
      summary: 'Get a project',
      description: 'One project of the organisation, with how many stairs it holds.',
      security,
      request: { params: projectParams },
      responses: { 200: { description: 'The project.', content: json(projectSchema) }, ...read, ...noProject },
    });
    registry.registerPath({
      method: 'patch',
      path: '/v1/projects/{id}',
      tags,
      operationId: 'updateProject',
      summary: 'Change a project',
      description: 'Changes the fields named; `null` removes the client, site address or notes.',
      security,
      request: { params: projectParams, body: { required: true, content: json(patchProjectSchema) } },
      responses: {
        200: { description: 'The project after the change.', content: json(projectSchema) },
        400: problemResponse('The body does not match the schema (`validation_failed`).'),
        ...write,
        ...noProject,
      },
    });
    registry.registerPath({
      method: 'delete',
      path: '/v1/projects/{id}',
      tags,
      operationId: 'deleteProject',
      summary: 'Delete a project',
      description: 'Deletes the project with its stairs and their stored estimates, for good. Needs an admin (or a key with projects:write); the audit trail records it.',
      security,
      request: { params: projectParams },
      responses: { 204: { description: 'Deleted.' }, ...remove, ...noProject },
    });

    registry.registerPath({
      method: 'get',
      path: '/v1/projects/{id}/stairs',
      tags,
      operationId: 'listStairs',
      summary: 'List a project’s stairs',
      description: 'Newest first, with cursor pagination; each with its stored estimate request.',
      security,
      request: { params: projectParams, query: pageQuerySchema },
      responses: { 200: { description: 'A page of stairs.', content: json(stairPageSchema) }, 400: pageBad, ...read, ...noProject },
    });
    registry.registerPath({
      method: 'post',
      path: '/v1/projects/{id}/stairs',
      tags,
      operationId: 'createStair',
      summary: 'Add a stair to a project',
      description: 'A named stair and the estimate request it runs (`input`, exactly as POST /v1/estimates takes it; checked now and again at every run). Send `Idempotency-Key` to retry safely.',
      security,
      request: { params: projectParams, headers: idempotencyHeader, body: { required: true, content: json(createStairSchema) } },
      responses: {
        201: { description: 'The stair, with the `requestId` that created it.', content: json(stairSchema) },
        400: problemResponse('The body, or its estimate request, does not match the schema (`validation_failed`, paths under `input.`).'),
        ...write,
        ...noProject,
        ...replay,
      },
    });
    registry.registerPath({
      method: 'get',
      path: '/v1/projects/{id}/stairs/{stairId}',
      tags,
      operationId: 'getStair',
      summary: 'Get a stair',
      description: 'One stair with its stored estimate request.',
      security,
      request: { params: stairParams },
      responses: { 200: { description: 'The stair.', content: json(stairSchema) }, ...read, ...noStair },
    });
    registry.registerPath({
      method: 'patch',
      path: '/v1/projects/{id}/stairs/{stairId}',
      tags,
      operationId: 'updateStair',
      summary: 'Change a stair',
      description: 'Changes the name, the notes or the whole estimate request (`input`). Estimates already stored keep the input they ran.',
      security,
      request: { params: stairParams, body: { required: true, content: json(patchStairSchema) } },
      responses: {
        200: { description: 'The stair after the change.', content: json(stairSchema) },
        400: problemResponse('The body does not match the schema (`validation_failed`).'),
        ...write,
        ...noStair,
      },
    });
    registry.registerPath({
      method: 'delete',
      path: '/v1/projects/{id}/stairs/{stairId}',
      tags,
      operationId: 'deleteStair',
      summary: 'Delete a stair',
      description: 'Deletes the stair and its stored estimates, for good. Needs an admin (or a key with projects:write).',
      security,
      request: { params: stairParams },
      responses: { 204: { description: 'Deleted.' }, ...remove, ...noStair },
    });

    registry.registerPath({
      method: 'get',
      path: '/v1/projects/{id}/stairs/{stairId}/estimates',
      tags,
      operationId: 'listStairEstimates',
      summary: 'List a stair’s stored estimates',
      description: 'Newest first, with cursor pagination: each with its headline figures, versions, who ran it and when. GET /v1/estimates/{estimateId} answers the whole result.',
      security,
      request: { params: stairParams, query: pageQuerySchema },
      responses: { 200: { description: 'A page of stored estimates.', content: json(storedEstimatePageSchema) }, 400: pageBad, ...read, ...noStair },
    });
    registry.registerPath({
      method: 'post',
      path: '/v1/projects/{id}/stairs/{stairId}/estimates',
      tags,
      operationId: 'runStair',
      summary: 'Run a stair and store the estimate',
      description:
        'Runs the stair’s stored request with the current engine, priced from the organisation’s stored catalog unless the request carries an inline one, and stores the estimate: input, result, engine and catalog versions, who ran it and when. ' +
        'Metered and charged against the cost budget as POST /v1/estimates is. Send `Idempotency-Key` to retry safely.',
      security,
      request: { params: stairParams, headers: idempotencyHeader, body: { required: false, content: json(runStairSchema) } },
      responses: {
        201: { description: 'The stored estimate, with the `requestId` that ran it; `Location` names it.', content: json(storedEstimateSchema) },
        400: problemResponse('A body other than `{}` (`validation_failed`).'),
        ...write,
        ...noStair,
        ...replay,
        422: problemResponse(
          'The stored request no longer passes today’s rules (`stored_input_invalid`, paths under `input.`), the answer would pass the size ceiling (`answer_too_large`), or the Idempotency-Key was reused with another body.',
        ),
        429: problemResponse('Rate limit, cost budget or monthly quota reached (`rate_limited`, `cost_budget_exceeded`, `quota_exceeded`); see Retry-After.'),
      },
    });
  },
};
