import { SignJWT, jwtVerify, errors } from 'jose';
import type { KeyObject } from 'node:crypto';

const ISSUER = 'treadwise';
const AUDIENCE = 'treadwise-console';
export const ACCESS_TOKEN_TTL_S = 15 * 60;

export interface AccessClaims {
  sub: string; // user id
  email: string;
}

/** Short-lived EdDSA access tokens; the algorithm is pinned when verifying. */
export function createAccessTokens(privateKey: KeyObject, publicKey: KeyObject, clock: () => Date) {
  const nowS = () => Math.floor(clock().getTime() / 1000);
  return {
    async sign(claims: AccessClaims): Promise<{ token: string; expiresAt: Date }> {
      const iat = nowS();
      const token = await new SignJWT({ email: claims.email })
        .setProtectedHeader({ alg: 'EdDSA', typ: 'JWT' })
        .setSubject(claims.sub)
        .setIssuer(ISSUER)
        .setAudience(AUDIENCE)
        .setIssuedAt(iat)
        .setExpirationTime(iat + ACCESS_TOKEN_TTL_S)
        .sign(privateKey);
      return { token, expiresAt: new Date((iat + ACCESS_TOKEN_TTL_S) * 1000) };
    },

    /** The claims, or null for any token that is malformed, forged, of another algorithm, or expired. */
    async verify(token: string): Promise<AccessClaims | null> {
      try {
        const { payload } = await jwtVerify(token, publicKey, {
          algorithms: ['EdDSA'],
          issuer: ISSUER,
          audience: AUDIENCE,
          currentDate: clock(),
          requiredClaims: ['sub', 'exp', 'iat'],
        });
        if (typeof payload.sub !== 'string' || typeof payload.email !== 'string') return null;
        return { sub: payload.sub, email: payload.email };
      } catch (err) {
        if (err instanceof errors.JOSEError || err instanceof TypeError) return null;
        throw err;
      }
    },
  };
}

export type AccessTokens = ReturnType<typeof createAccessTokens>;
