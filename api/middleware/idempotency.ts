import { createCipheriv, createDecipheriv, createHash, createHmac, randomBytes } from 'node:crypto';
import type { Request, RequestHandler } from 'express';
import { and, eq, lt } from 'drizzle-orm';
import type { Db } from '../db/client.js';
import { idempotencyRecords } from '../db/schema.js';
import { actorRef, principalOf } from '../auth/principal.js';
import { HttpProblem } from '../problem.js';

const KEY = /^[\x21-\x7e]{1,255}$/;
export const IDEMPOTENCY_WINDOW_MS = 24 * 60 * 60 * 1000;
/** A first request still "running" after this long died with its process: let a retry take over. */
const ABANDONED_AFTER_MS = 60 * 1000;

interface Sealed {
  iv: string;
  tag: string;
  data: string;
}

/**
 * Stored responses can hold secrets shown once (a new key's token), so they are kept only
 * encrypted (AES-256-GCM under a key derived from the server's pepper).
 */
function sealer(pepper: Buffer) {
  const key = createHmac('sha256', pepper).update('treadwise idempotency v1').digest();
  return {
    seal(body: unknown): Sealed {
      const iv = randomBytes(12);
      const cipher = createCipheriv('aes-256-gcm', key, iv);
      const data = Buffer.concat([cipher.update(JSON.stringify(body ?? null), 'utf8'), cipher.final()]);
      return { iv: iv.toString('base64'), tag: cipher.getAuthTag().toString('base64'), data: data.toString('base64') };
    },
    open(sealed: Sealed): unknown {
      const decipher = createDecipheriv('aes-256-gcm', key, Buffer.from(sealed.iv, 'base64'));
      decipher.setAuthTag(Buffer.from(sealed.tag, 'base64'));
      return JSON.parse(Buffer.concat([decipher.update(Buffer.from(sealed.data, 'base64')), decipher.final()]).toString('utf8'));
    },
  };
}

/** A response that shows a secret once is replayed for this long only (and only to the same credential). */
export const SECRET_REPLAY_WINDOW_MS = 10 * 60 * 1000;

interface IdempotencyOptions {
  db: Db;
  clock: () => Date;
  pepper: Buffer;
  /** Set on routes whose answer carries a secret: replays end after this long instead of 24 h. */
  secretReplayMs?: number;
  /**
   * What the request carries beyond its parsed body (an uploaded file, read from disk), so the
   * same key with another file is a 422 and not a replay of the first file's answer.
   */
  fingerprint?: (req: Request) => Promise<string | undefined>;
}

const inProgress = () => new HttpProblem(409, 'idempotency_request_in_progress', 'Request in progress', 'A request with this Idempotency-Key is still running.');

/**
 * `Idempotency-Key` on a creating POST: the first response is stored per caller for 24 h and
 * replayed byte for byte — a replay is recognisable by its body's original `requestId`, so no
 * header marks it; the same key with another body is a 422, and a retry while the first is
 * still running a 409.
 */
export function idempotent({ db, clock, pepper, secretReplayMs, fingerprint }: IdempotencyOptions): RequestHandler {
  const { seal, open } = sealer(pepper);
  return async (req, res, next) => {
    const key = req.get('Idempotency-Key');
    if (key === undefined) return next();
    if (!KEY.test(key)) {
      throw new HttpProblem(400, 'invalid_idempotency_key', 'Invalid Idempotency-Key', 'Use 1–255 printable ASCII characters.');
    }
    const principal = principalOf(res);
    // The owner is the credential itself: a user's replay stays within the sign-in session that
    // made the first call, a key's within that key.
    const credential = principal.type === 'user' ? `${actorRef(principal)}/${principal.sessionId}` : actorRef(principal);
    const owner = `${credential}@${principal.type === 'anonymous' ? '-' : (principal.organizationId ?? '-')}`;
    const extra = fingerprint ? await fingerprint(req) : undefined;
    const requestHash = createHash('sha256')
      .update(`${req.method} ${req.baseUrl}${req.path}\n${JSON.stringify(req.body ?? null)}${extra === undefined ? '' : `\n${extra}`}`)
      .digest('hex');
    const where = and(eq(idempotencyRecords.owner, owner), eq(idempotencyRecords.key, key));
    const now = clock();

    // Expired records of this caller go first, so the table does not grow without bound.
    await db.delete(idempotencyRecords).where(and(eq(idempotencyRecords.owner, owner), lt(idempotencyRecords.createdAt, new Date(now.getTime() - IDEMPOTENCY_WINDOW_MS))));
    const claim = () => db.insert(idempotencyRecords).values({ owner, key, requestHash, createdAt: now }).onConflictDoNothing().returning();
    let [claimed] = await claim();
    if (!claimed) {
      const [existing] = await db.select().from(idempotencyRecords).where(where);
      if (!existing) throw inProgress();
      if (existing.requestHash !== requestHash) {
        throw new HttpProblem(422, 'idempotency_key_reused', 'Idempotency-Key reused', 'This Idempotency-Key was used with a different request.');
      }
      if (existing.status === null) {
        if (now.getTime() - existing.createdAt.getTime() < ABANDONED_AFTER_MS) throw inProgress();
        await db.delete(idempotencyRecords).where(and(where, eq(idempotencyRecords.createdAt, existing.createdAt)));
        [claimed] = await claim();
        if (!claimed) throw inProgress();
      } else {
        if (secretReplayMs !== undefined && now.getTime() - existing.createdAt.getTime() > secretReplayMs) {
          throw new HttpProblem(
            409,
            'idempotency_replay_expired',
            'Replay window ended',
            `The first answer to this Idempotency-Key showed a secret, which is replayed for ${secretReplayMs / 60_000} minutes only. The thing it created exists: list it instead.`,
          );
        }
        return res.status(existing.status).json(open(existing.body as Sealed));
      }
    }

    // Capture the first response, success or problem, to replay it later.
    const json = res.json.bind(res);
    res.json = (body: unknown) => {
      const status = res.statusCode;
      const done =
        status >= 500
          ? db.delete(idempotencyRecords).where(where) // let the client retry a server failure
          : db.update(idempotencyRecords).set({ status, body: seal(body) }).where(where);
      done.then(
        () => json(body),
        (err) => {
          req.log.error({ err: { message: 'idempotency record not saved', code: (err as { cause?: { code?: string } }).cause?.code } }, 'idempotency record not saved');
          json(body);
        },
      );
      return res;
    };
    next();
  };
}
