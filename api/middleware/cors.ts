import type { RequestHandler } from 'express';
import type { AllowedOrigins } from '../auth/allowed-origins.js';

/** Headers a shop's page must be able to read from our responses. */
export const EXPOSED_HEADERS = ['X-Request-Id', 'RateLimit', 'RateLimit-Policy', 'Retry-After'];
const ALLOWED_HEADERS = ['Authorization', 'Content-Type', 'X-Request-Id', 'Idempotency-Key'];

/**
 * CORS for shops' pages. The preflight is answered from the origin alone (allowed when any active
 * embed key lists it); the real request is then checked against its own key's list by
 * authenticate(). Error responses carry the headers too, so the page can read the problem.
 */
export function cors(allowedOrigins: AllowedOrigins): RequestHandler {
  return async (req, res, next) => {
    const origin = req.headers.origin;
    if (!origin) return next();
    res.vary('Origin');
    const allowed = await allowedOrigins.allows(origin);
    if (req.method === 'OPTIONS') {
      if (allowed) {
        res.setHeader('Access-Control-Allow-Origin', origin);
        res.setHeader('Access-Control-Allow-Methods', 'GET, POST, OPTIONS');
        res.setHeader('Access-Control-Allow-Headers', ALLOWED_HEADERS.join(', '));
        res.setHeader('Access-Control-Max-Age', '600');
      }
      return res.status(204).end();
    }
    if (allowed) {
      res.setHeader('Access-Control-Allow-Origin', origin);
      res.setHeader('Access-Control-Expose-Headers', EXPOSED_HEADERS.join(', '));
    }
    next();
  };
}
