import type { Request, RequestHandler } from 'express';
import type { AllowedOrigins } from '../auth/allowed-origins.js';
import type { KeyCache } from '../auth/key-cache.js';
import { parseKey } from '../auth/key-format.js';
import { originAllowed } from '../auth/origins.js';
import { policyFor } from '../auth/policy.js';

/** Headers a shop's page must be able to read from our responses. */
export const EXPOSED_HEADERS = ['X-Request-Id', 'RateLimit', 'RateLimit-Policy', 'Retry-After'];
const ALLOWED_HEADERS = ['Authorization', 'Content-Type', 'X-Request-Id', 'Idempotency-Key'];

const BEARER_EMBED = /^Bearer (tw_embed_\S+)$/;

/** Only the routes an embed key may call are open to shop pages at all. */
function embedRoute(method: string, req: Request): boolean {
  const path = req.baseUrl + req.path;
  const policy = policyFor(method, path.length > 1 && path.endsWith('/') ? path.slice(0, -1) : path)?.policy;
  return policy !== undefined && !policy.public && policy.embed === true;
}

/**
 * CORS for shops' pages, on the embed routes only (sizing); sign-in, keys, members and the rest
 * never answer a cross-origin caller. A preflight carries no key, so it is answered for origins
 * that some active embed key lists; the real request only for the origins of the embed key it
 * presents (its secret is then checked by authenticate(), whose problem the page can read).
 */
export function cors(allowedOrigins: AllowedOrigins, keyCache: KeyCache): RequestHandler {
  return async (req, res, next) => {
    const origin = req.headers.origin;
    if (!origin) return next();
    res.vary('Origin');
    if (req.method === 'OPTIONS') {
      const wanted = req.headers['access-control-request-method'];
      if (typeof wanted === 'string' && embedRoute(wanted, req) && (await allowedOrigins.allows(origin))) {
        res.setHeader('Access-Control-Allow-Origin', origin);
        res.setHeader('Access-Control-Allow-Methods', 'GET, POST, OPTIONS');
        res.setHeader('Access-Control-Allow-Headers', ALLOWED_HEADERS.join(', '));
        res.setHeader('Access-Control-Max-Age', '600');
      }
      return res.status(204).end();
    }
    if (embedRoute(req.method, req)) {
      const presented = BEARER_EMBED.exec(req.headers.authorization ?? '');
      const parsed = presented ? parseKey(presented[1]) : null;
      const row = parsed ? await keyCache.get(parsed.keyId) : null;
      if (row && row.kind === 'embed' && originAllowed(origin, row.allowedOrigins)) {
        res.setHeader('Access-Control-Allow-Origin', origin);
        res.setHeader('Access-Control-Expose-Headers', EXPOSED_HEADERS.join(', '));
      }
    }
    next();
  };
}
