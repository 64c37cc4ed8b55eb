import type { Request, RequestHandler, Response } from 'express';
import { rateLimit, type AugmentedRequest, type ValueDeterminingMiddleware } from 'express-rate-limit';
import type { Logger } from 'pino';
import { principalOf } from '../auth/principal.js';
import { clientAddress } from './client-address.js';
import type { AppDeps } from '../deps.js';
import { HttpProblem } from '../problem.js';
import type { Services } from '../services/container.js';
import { enforceQuota, meterRequests, routeOf } from './metering.js';
import { runInOrder } from './chain.js';

const MINUTE_MS = 60_000;
const QUARTER_HOUR_MS = 15 * MINUTE_MS;

/** Signed-in console users, per user: generous, since one page makes several calls. */
export const USER_RATE_PER_MINUTE = 300;
/**
 * Failed sign-ins per client IP in 15 minutes (successful ones do not count). Guessing at one
 * account is stopped by its lockout; this stops one address spraying guesses over many accounts,
 * while leaving room for an office of people behind one address mistyping.
 */
export const SIGN_IN_FAILURES_PER_IP = 100;
/** Password-reset requests and confirmations per client IP in 15 minutes. */
export const PASSWORD_RESETS_PER_IP = 20;

/**
 * Per client IP and embed key: a tenth of the key's per-minute rate, at least 10, so no
 * single visitor (or a script with a forged Origin) can use up a shop's limit.
 */
export function embedRatePerIp(ratePerMinute: number): number {
  return Math.max(10, Math.ceil(ratePerMinute / 10));
}

// Every route that checks an existing account's password: guesses there count the same.
const KEY_CREATION_ROUTES = new Set(['POST /v1/keys']);
const SIGN_IN_ROUTES = new Set(['POST /v1/auth/sign-in', 'POST /v1/auth/invitations/accept']);
const PASSWORD_RESET_ROUTES = new Set(['POST /v1/auth/password-reset', 'POST /v1/auth/password-reset/confirm']);

const apiKeyOf = (res: Response) => {
  const p = principalOf(res);
  return p.type === 'api_key' ? p : undefined;
};
const clientIp = clientAddress;

interface LimiterSpec {
  /** Policy name in the draft-8 headers, and the limiter's Redis key prefix. */
  name: string;
  windowMs: number;
  limit: number | ValueDeterminingMiddleware<number>;
  keyGenerator: ValueDeterminingMiddleware<string>;
  skip: ValueDeterminingMiddleware<boolean>;
  /** Count only failed calls (sign-in: brute force is what we stop). */
  failuresOnly?: boolean;
  /** Count only calls that succeeded (key creation: refused attempts made nothing). */
  successesOnly?: boolean;
  /** Who went over the limit, for the problem's detail. */
  who: string;
}

function limiter(services: Services, logger: Logger, spec: LimiterSpec): RequestHandler {
  const stores = services.rateLimitStores;
  return rateLimit({
    windowMs: spec.windowMs,
    limit: spec.limit,
    keyGenerator: spec.keyGenerator,
    skip: spec.skip,
    skipSuccessfulRequests: spec.failuresOnly ?? false,
    skipFailedRequests: spec.successesOnly ?? false,
    standardHeaders: 'draft-8',
    legacyHeaders: false,
    identifier: spec.name,
    store: stores.store(spec.name),
    // If Redis is away, serve rather than fail every call; the error is logged.
    passOnStoreError: stores.kind === 'redis',
    logger: {
      warn: (err, msg) => logger.warn({ err }, msg ?? 'rate limiter warning'),
      error: (err, msg) => logger.error({ err }, msg ?? 'rate limiter error'),
    },
    handler: (req, res, next) => {
      const info = (req as AugmentedRequest).rateLimit;
      const retryAfter = String(res.getHeader('Retry-After') ?? Math.ceil(spec.windowMs / 1000));
      (res.locals as { limitedBy?: string }).limitedBy = 'rate_limited';
      next(
        new HttpProblem(
          429,
          'rate_limited',
          'Too many requests',
          `${spec.who} made more than ${info?.limit ?? 'the allowed number of'} requests in ${spec.windowMs / MINUTE_MS} min; retry after ${retryAfter} s.`,
          { headers: { 'Retry-After': retryAfter } },
        ),
      );
    },
  });
}

/**
 * Everything that limits and counts traffic, in order, to mount on `/v1` right after
 * authenticate() and authorize (it needs the principal and the matched route pattern):
 * metering, the per-IP sign-in limits, the per-user limit, the per-IP limit of embed keys,
 * the per-key limit from the plan, and the monthly quota.
 */
export function trafficMiddleware(deps: AppDeps, services: Services): RequestHandler[] {
  const { plans } = services;
  const logger = deps.logger;
  const ratePerMinute = async (res: Response) => (await plans.forOrganization(apiKeyOf(res)!.organizationId)).ratePerMinute;

  const organizationOfCaller = (res: Response) => {
    const p = principalOf(res);
    return p.type === 'anonymous' ? '' : (p.organizationId ?? '');
  };
  const orgRate = async (res: Response) => (await plans.forOrganization(organizationOfCaller(res))).ratePerMinute;

  const [signInIp, passwordResetIp, perUser, embedIp, perKey, perOrganization, keyCreations] = [
    limiter(services, logger, {
      name: 'sign-in-failures-ip',
      windowMs: QUARTER_HOUR_MS,
      limit: SIGN_IN_FAILURES_PER_IP,
      failuresOnly: true,
      keyGenerator: (req) => clientIp(req),
      skip: (req, res) => !SIGN_IN_ROUTES.has(routeOf(req, res)),
      who: 'This address',
    }),
    limiter(services, logger, {
      name: 'password-reset-ip',
      windowMs: QUARTER_HOUR_MS,
      limit: PASSWORD_RESETS_PER_IP,
      keyGenerator: (req) => clientIp(req),
      skip: (req, res) => !PASSWORD_RESET_ROUTES.has(routeOf(req, res)),
      who: 'This address',
    }),
    limiter(services, logger, {
      name: 'user',
      windowMs: MINUTE_MS,
      limit: USER_RATE_PER_MINUTE,
      keyGenerator: (_req, res) => {
        const p = principalOf(res);
        return p.type === 'user' ? p.userId : '';
      },
      skip: (_req, res) => principalOf(res).type !== 'user',
      who: 'This user',
    }),
    limiter(services, logger, {
      name: 'api-key-client-ip',
      windowMs: MINUTE_MS,
      limit: async (_req, res) => embedRatePerIp(await ratePerMinute(res)),
      keyGenerator: (req, res) => `${apiKeyOf(res)!.keyId}:${clientIp(req)}`,
      skip: (_req, res) => apiKeyOf(res)?.kind !== 'embed',
      who: 'This embed key, from this address,',
    }),
    limiter(services, logger, {
      name: 'api-key',
      windowMs: MINUTE_MS,
      limit: (_req, res) => ratePerMinute(res),
      keyGenerator: (_req, res) => apiKeyOf(res)!.keyId,
      skip: (_req, res) => apiKeyOf(res) === undefined,
      who: 'This API key',
    }),
    // The plan's rate is the organisation's: several keys share it rather than each having its own.
    limiter(services, logger, {
      name: 'organization',
      windowMs: MINUTE_MS,
      limit: (_req, res) => orgRate(res),
      keyGenerator: (_req, res) => organizationOfCaller(res),
      skip: (_req, res) => organizationOfCaller(res) === '',
      who: 'This organisation',
    }),
    // Keys created per organisation in an hour, whoever creates them: no more than the plan lets
    // it hold. Each new key is a fresh rate bucket and e-mails the admins, so bursts are bounded.
    limiter(services, logger, {
      name: 'key-creations',
      windowMs: 60 * MINUTE_MS,
      successesOnly: true,
      limit: async (_req, res) => (await plans.forOrganization(organizationOfCaller(res))).maxApiKeys,
      keyGenerator: (_req, res) => organizationOfCaller(res),
      skip: (req, res) => organizationOfCaller(res) === '' || !KEY_CREATION_ROUTES.has(routeOf(req, res)),
      who: 'This organisation',
    }),
  ];

  // Only the limiters that apply to this caller and route run: each one costs a store round
  // trip, and the hot path (a key calling sizing) needs just one or two.
  const applicable = (req: Request, res: Response): RequestHandler[] => {
    const principal = principalOf(res);
    const route = routeOf(req, res);
    const creating = KEY_CREATION_ROUTES.has(route) ? [keyCreations] : [];
    if (principal.type === 'api_key') return [...(principal.kind === 'embed' ? [embedIp] : []), perKey, perOrganization, ...creating];
    if (principal.type === 'user') return [perUser, ...creating];
    if (SIGN_IN_ROUTES.has(route)) return [signInIp];
    if (PASSWORD_RESET_ROUTES.has(route)) return [passwordResetIp];
    return [];
  };

  return [meterRequests(deps, services), runApplicable(applicable), enforceQuota(deps, services)];
}

/** Runs the chosen handlers in order, as if each were mounted, stopping at the first error. */
function runApplicable(choose: (req: Request, res: Response) => RequestHandler[]): RequestHandler {
  return (req, res, next) => runInOrder(choose(req, res), req, res, next);
}
