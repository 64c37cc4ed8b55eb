import type { RequestHandler, Response } from 'express';
import type { Logger } from 'pino';
import { principalOf } from '../auth/principal.js';
import { HttpProblem } from '../problem.js';
import type { Services } from '../services/container.js';

const MINUTE_MS = 60_000;
/** Policy name in the draft-8 RateLimit headers, and the counters' key prefix in the store. */
export const COST_POLICY = 'cost';

/** Who pays: an API key, or a signed-in user in the organisation whose plan applies. */
function payerOf(res: Response): { key: string; organizationId: string } | null {
  const p = principalOf(res);
  if (p.type === 'api_key') return { key: `${COST_POLICY}:${p.keyId}`, organizationId: p.organizationId };
  if (p.type === 'user' && p.organizationId) return { key: `${COST_POLICY}:user:${p.userId}`, organizationId: p.organizationId };
  return null;
}

/**
 * The per-key cost budget beside the request rate: express-rate-limit counts requests, so one
 * key could otherwise buy minutes of CPU a minute with large designs. Each call is charged its
 * cost (from the validated body, before the engine runs) in the limiters' own store, against the
 * plan's costPerMinute; a call that does not fit is a 429 `cost_budget_exceeded` with Retry-After.
 * Answers carry the budget as a draft-8 `RateLimit` / `RateLimit-Policy` entry named "cost".
 */
export function costBudget(services: Services, logger: Logger): (costOf: (body: never) => number) => RequestHandler {
  return (costOf) => async (_req, res, next) => {
    const payer = payerOf(res);
    if (!payer) return next();
    const cost = costOf(res.locals.body as never);
    const limit = (await services.plans.forOrganization(payer.organizationId)).costPerMinute;
    let spent;
    try {
      spent = await services.rateLimitStores.costs.spend(payer.key, cost, limit, MINUTE_MS);
    } catch (err) {
      // As with the request limiters: if Redis is away, serve rather than fail every call.
      logger.warn({ err }, 'cost budget store unavailable');
      return next();
    }
    const resetS = Math.max(1, Math.ceil(spent.resetMs / 1000));
    res.append('RateLimit', `"${COST_POLICY}"; r=${Math.max(0, limit - spent.used)}; t=${resetS}`);
    res.append('RateLimit-Policy', `"${COST_POLICY}"; q=${limit}; w=${MINUTE_MS / 1000}`);
    if (!spent.allowed) {
      (res.locals as { limitedBy?: string }).limitedBy = 'cost_budget_exceeded';
      throw new HttpProblem(
        429,
        'cost_budget_exceeded',
        'Cost budget used up',
        `This call costs ${cost} work units; ${Math.max(0, limit - spent.used)} of the ${limit} a minute are left. Retry after ${resetS} s, or size smaller parts.`,
        { headers: { 'Retry-After': String(resetS) } },
      );
    }
    next();
  };
}
