import { createHash } from 'node:crypto';
import type { RequestHandler } from 'express';
import { and, eq } from 'drizzle-orm';
import type { Db } from '../db/client.js';
import { idempotencyRecords } from '../db/schema.js';
import { actorRef, principalOf } from '../auth/principal.js';
import { HttpProblem } from '../problem.js';

const KEY = /^[\x21-\x7e]{1,255}$/;
export const IDEMPOTENCY_WINDOW_MS = 24 * 60 * 60 * 1000;

/**
 * `Idempotency-Key` on a creating POST: the first response is stored per caller for 24 h and
 * replayed (`Idempotent-Replayed: true`); the same key with another body is a 422, and a retry
 * while the first is still running a 409.
 */
export function idempotent({ db, clock }: { db: Db; clock: () => Date }): RequestHandler {
  return async (req, res, next) => {
    const key = req.get('Idempotency-Key');
    if (key === undefined) return next();
    if (!KEY.test(key)) {
      throw new HttpProblem(400, 'invalid_idempotency_key', 'Invalid Idempotency-Key', 'Use 1–255 printable ASCII characters.');
    }
    const principal = principalOf(res);
    const owner = `${actorRef(principal)}@${principal.type === 'anonymous' ? '-' : (principal.organizationId ?? '-')}`;
    const requestHash = createHash('sha256')
      .update(`${req.method} ${req.baseUrl}${req.path}\n${JSON.stringify(req.body ?? null)}`)
      .digest('hex');
    const where = and(eq(idempotencyRecords.owner, owner), eq(idempotencyRecords.key, key));

    let [claimed] = await db.insert(idempotencyRecords).values({ owner, key, requestHash, createdAt: clock() }).onConflictDoNothing().returning();
    if (!claimed) {
      const [existing] = await db.select().from(idempotencyRecords).where(where);
      if (existing && clock().getTime() - existing.createdAt.getTime() > IDEMPOTENCY_WINDOW_MS) {
        await db.delete(idempotencyRecords).where(where);
        [claimed] = await db.insert(idempotencyRecords).values({ owner, key, requestHash, createdAt: clock() }).onConflictDoNothing().returning();
      }
      if (!claimed) {
        if (!existing) throw new HttpProblem(409, 'idempotency_request_in_progress', 'Request in progress', 'A request with this Idempotency-Key is still running.');
        if (existing.requestHash !== requestHash) {
          throw new HttpProblem(422, 'idempotency_key_reused', 'Idempotency-Key reused', 'This Idempotency-Key was used with a different request.');
        }
        if (existing.status === null) {
          throw new HttpProblem(409, 'idempotency_request_in_progress', 'Request in progress', 'A request with this Idempotency-Key is still running.');
        }
        res.setHeader('Idempotent-Replayed', 'true');
        return res.status(existing.status).json(existing.body);
      }
    }

    // Capture the first response, success or problem, to replay it later.
    const json = res.json.bind(res);
    res.json = (body: unknown) => {
      const status = res.statusCode;
      const done =
        status >= 500
          ? db.delete(idempotencyRecords).where(where) // let the client retry a server failure
          : db.update(idempotencyRecords).set({ status, body: body as object }).where(where);
      done.then(
        () => json(body),
        (err) => {
          req.log.error({ err }, 'idempotency record not saved');
          json(body);
        },
      );
      return res;
    };
    next();
  };
}
