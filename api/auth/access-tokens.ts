import { SignJWT, jwtVerify, errors } from 'jose';
import type { KeyObject } from 'node:crypto';

const ISSUER = 'treadwise';
const AUDIENCE = 'treadwise-console';
export const ACCESS_TOKEN_TTL_S = 15 * 60;

export interface AccessClaims {
  sub: string; // user id
  email: string;
  /** The session (refresh-token family) the token belongs to: switching organisation updates it. */
  sid: string;
  /** The organisation the user acts in; absent for an operator acting platform-wide, or a user with none. */
  org: string | null;
}

export type VerifiedAccess = { ok: true; claims: AccessClaims } | { ok: false; reason: 'expired' | 'unknown' };

/** Short-lived EdDSA access tokens; the algorithm is pinned when verifying. */
export function createAccessTokens(privateKey: KeyObject, publicKey: KeyObject, clock: () => Date) {
  const nowS = () => Math.floor(clock().getTime() / 1000);
  return {
    async sign(claims: AccessClaims): Promise<{ token: string; expiresAt: Date }> {
      const iat = nowS();
      const payload: Record<string, string> = { email: claims.email, sid: claims.sid };
      if (claims.org) payload.org = claims.org;
      const token = await new SignJWT(payload)
        .setProtectedHeader({ alg: 'EdDSA', typ: 'JWT' })
        .setSubject(claims.sub)
        .setIssuer(ISSUER)
        .setAudience(AUDIENCE)
        .setIssuedAt(iat)
        .setExpirationTime(iat + ACCESS_TOKEN_TTL_S)
        .sign(privateKey);
      return { token, expiresAt: new Date((iat + ACCESS_TOKEN_TTL_S) * 1000) };
    },

    /**
     * The claims, or why not: `expired` for a genuine token past its time (only once its signature
     * checked out), `unknown` for anything malformed, forged or of another algorithm.
     */
    async verify(token: string): Promise<VerifiedAccess> {
      try {
        const { payload } = await jwtVerify(token, publicKey, {
          algorithms: ['EdDSA'],
          issuer: ISSUER,
          audience: AUDIENCE,
          currentDate: clock(),
          requiredClaims: ['sub', 'exp', 'iat'],
        });
        if (typeof payload.sub !== 'string' || typeof payload.email !== 'string' || typeof payload.sid !== 'string') return { ok: false, reason: 'unknown' };
        const org = typeof payload.org === 'string' ? payload.org : null;
        return { ok: true, claims: { sub: payload.sub, email: payload.email, sid: payload.sid, org } };
      } catch (err) {
        // jose checks the signature before the time claims, so an expired error means a real token.
        if (err instanceof errors.JWTExpired) return { ok: false, reason: 'expired' };
        if (err instanceof errors.JOSEError || err instanceof TypeError) return { ok: false, reason: 'unknown' };
        throw err;
      }
    },
  };
}

export type AccessTokens = ReturnType<typeof createAccessTokens>;
