import type { Response } from 'express';
import type { KeyKind } from './key-format.js';
import type { Role, Scope } from './scopes.js';

/** Who is calling, as established by the authenticate middleware. */
export type Principal =
  | { type: 'anonymous' }
  | {
      type: 'user';
      userId: string;
      email: string;
      operator: boolean;
      /** The sign-in session (refresh-token family) the access token belongs to. */
      sessionId: string;
      /** The organisation acted in, as named by the access token (see POST /v1/auth/switch-organization). */
      organizationId: string | null;
      /** Role there; an operator acting in an organisation counts as its admin. */
      role: Role | null;
    }
  | {
      type: 'api_key';
      apiKeyId: string;
      keyId: string;
      kind: KeyKind;
      organizationId: string;
      scopes: readonly Scope[];
    };

export type AuthenticatedPrincipal = Exclude<Principal, { type: 'anonymous' }>;

export function principalOf(res: Response): Principal {
  return (res.locals.principal as Principal | undefined) ?? { type: 'anonymous' };
}

/** The organisation a request acts in; routes call it after authorize() has passed. */
export function organizationOf(res: Response): string {
  const p = principalOf(res);
  if (p.type === 'anonymous' || !p.organizationId) throw new Error('authorize() must run before organizationOf()');
  return p.organizationId;
}

/** Stable actor id for audit and idempotency: `user:<uuid>` or `key:<keyId>`. */
export function actorRef(p: Principal): string {
  return p.type === 'user' ? `user:${p.userId}` : p.type === 'api_key' ? `key:${p.keyId}` : 'anonymous';
}
