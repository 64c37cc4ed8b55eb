import type { Request, RequestHandler, Response } from 'express';
import type { Policy } from '../auth/policy.js';
import { principalOf } from '../auth/principal.js';
import type { AppDeps } from '../deps.js';
import { HttpProblem } from '../problem.js';
import { whenAnswered } from './answered.js';
import type { Services } from '../services/container.js';
import type { QuotaDecision, QuotaTicket } from '../services/quotas.js';

/** What the traffic middleware keeps on res.locals for one request. */
interface TrafficLocals {
  trafficAt?: Date;
  /** Set by a limiter that refused the call: metered, not billed. */
  limitedBy?: 'rate_limited' | 'quota_exceeded' | 'cost_budget_exceeded';
  quotaTicket?: QuotaTicket;
  metered?: boolean;
}

const locals = (res: Response) => res.locals as TrafficLocals & { routePattern?: string; routePolicy?: Policy };

/** `POST /v1/estimates`: the policy pattern with its method, whichever form authorize() stored. */
export function routeOf(req: Request, res: Response): string {
  const pattern = locals(res).routePattern;
  const method = req.method === 'HEAD' ? 'GET' : req.method;
  if (!pattern) return `${method} (unmatched)`;
  return /^[A-Z]+ /.test(pattern) ? pattern : `${method} ${pattern}`;
}

/** A call the monthly quota neither refuses nor charges (see Policy.quotaFree). */
function quotaFree(res: Response): boolean {
  const policy = locals(res).routePolicy;
  return policy !== undefined && !policy.public && policy.quotaFree === true;
}

/** Usage rows of signed-in users' sizing (the console's bench) carry this in place of a key id. */
export const CONSOLE_KEY_ID = 'console';

/**
 * Who a call is metered and billed to: every call made with an API key, and sizing run by a
 * signed-in user (the same engine work, so the same quota). Other console calls are not metered.
 */
function meteredAs(res: Response): { organizationId: string; keyId: string; apiKeyId: string | null } | null {
  const p = principalOf(res);
  if (p.type === 'api_key') return { organizationId: p.organizationId, keyId: p.keyId, apiKeyId: p.apiKeyId };
  const policy = locals(res).routePolicy;
  if (p.type === 'user' && p.organizationId && policy && !policy.public && (policy.scope === 'sizing:run' || policy.sizing)) return { organizationId: p.organizationId, keyId: CONSOLE_KEY_ID, apiKeyId: null };
  return null;
}

/**
 * Counts every metered call once it has been answered (or the client went away): organisation,
 * key, UTC day, route pattern, status class and latency. Recording is in memory; the usage meter
 * writes in batches.
 */
export function meterRequests(deps: AppDeps, services: Services): RequestHandler {
  return (req, res, next) => {
    const principal = meteredAs(res);
    if (!principal) return next();
    const at = deps.clock();
    const started = performance.now();
    locals(res).trafficAt = at;
    const done = () => {
      const l = locals(res);
      if (l.metered) return;
      l.metered = true;
      // A call refused after admission (cost budget, a batch too large for what is left) gives its units back.
      if (l.limitedBy) l.quotaTicket?.release();
      else l.quotaTicket?.settle();
      services.usageMeter.record({
        organizationId: principal.organizationId,
        keyId: principal.keyId,
        apiKeyId: principal.apiKeyId,
        at,
        route: routeOf(req, res),
        status: res.statusCode,
        latencyMs: performance.now() - started,
        limited: l.limitedBy !== undefined,
        units: l.quotaTicket?.units ?? (quotaFree(res) ? 0 : 1),
      });
    };
    whenAnswered(res, done);
    next();
  };
}

/**
 * Refuses calls with a key once the organisation has used its plan's monthly quota (429
 * quota_exceeded, Retry-After until the next month starts, UTC) and advertises the quota as a
 * draft-8 `monthly-quota` policy beside the per-minute ones.
 */
export function enforceQuota(deps: AppDeps, services: Services): RequestHandler {
  return async (_req, res, next) => {
    const principal = meteredAs(res);
    if (!principal) return next();
    const l = locals(res);
    const at = l.trafficAt ?? deps.clock();
    const policy = l.routePolicy;
    if (policy !== undefined && !policy.public && policy.quotaFree) return next();
    const growing = policy !== undefined && !policy.public && policy.unitsPerItem === true;
    const decision = await services.quotas.admit(principal.organizationId, at, 1, { growing });
    const retryAfterS = advertiseQuota(res, decision, at);
    if (!decision.admitted) {
      l.limitedBy = 'quota_exceeded';
      throw new HttpProblem(
        429,
        'quota_exceeded',
        'Monthly quota used up',
        `This organisation has used the ${decision.plan.monthlyQuota} calls its ${decision.plan.name} plan includes for ${decision.month}; ` +
          `the quota starts again at ${decision.resetsAt.toISOString()}.`,
        { headers: { 'Retry-After': String(retryAfterS) } },
      );
    }
    // The client may already have gone while the quota was looked up.
    if (l.metered) decision.ticket.settle();
    else l.quotaTicket = decision.ticket;
    next();
  };
}

/** Sets the draft-8 `monthly-quota` entries (replacing earlier ones of this call); returns Retry-After in s. */
function advertiseQuota(res: Response, decision: QuotaDecision, at: Date, remaining = decision.remaining): number {
  const retryAfterS = Math.max(1, Math.ceil((decision.resetsAt.getTime() - at.getTime()) / 1000));
  const monthStart = Date.UTC(decision.resetsAt.getUTCFullYear(), decision.resetsAt.getUTCMonth() - 1, 1);
  const windowS = Math.round((decision.resetsAt.getTime() - monthStart) / 1000);
  const without = (name: string) => {
    const current = res.getHeader(name);
    const entries = (Array.isArray(current) ? current : current === undefined ? [] : [String(current)]).filter((e) => !e.startsWith('"monthly-quota"'));
    if (entries.length) res.setHeader(name, entries);
    else res.removeHeader(name);
  };
  without('RateLimit-Policy');
  without('RateLimit');
  res.append('RateLimit-Policy', `"monthly-quota"; q=${decision.plan.monthlyQuota}; w=${windowS}`);
  res.append('RateLimit', `"monthly-quota"; r=${remaining}; t=${retryAfterS}`);
  return retryAfterS;
}

/**
 * For a call that uses more than one quota unit (a synchronous batch: one per item), after its
 * body is validated: takes the units beyond the one the call was admitted with, all or none.
 * If they do not fit in what is left the whole call is refused (429 quota_exceeded) before any
 * work, and uses no units at all.
 */
export function enforceQuotaUnits(deps: AppDeps): (unitsOf: (body: never) => number) => RequestHandler {
  return (unitsOf) => async (_req, res, next) => {
    const l = locals(res);
    const ticket = l.quotaTicket;
    if (!ticket) return next(); // not metered (or the client has gone)
    // Grown even by 0 (a batch of one): the quota notices of a growing call are sent here.
    const extra = Math.max(0, unitsOf(res.locals.body as never) - ticket.units);
    const at = l.trafficAt ?? deps.clock();
    const decision = await ticket.grow(extra);
    // Refused, the call gives back the unit it was admitted with: that one is left too.
    const left = decision.admitted ? decision.remaining : decision.remaining + ticket.units;
    const retryAfterS = advertiseQuota(res, decision, at, left);
    if (!decision.admitted) {
      l.limitedBy = 'quota_exceeded';
      throw new HttpProblem(
        429,
        'quota_exceeded',
        'Monthly quota too small for this batch',
        `This batch needs ${extra + ticket.units} quota units (one per item); ${left} of the ${decision.plan.monthlyQuota} ` +
          `its ${decision.plan.name} plan includes for ${decision.month} are left. Nothing was run. Send fewer items, or wait until ${decision.resetsAt.toISOString()}.`,
        { headers: { 'Retry-After': String(retryAfterS) } },
      );
    }
    next();
  };
}
