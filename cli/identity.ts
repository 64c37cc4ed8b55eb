import type { components } from '../openapi/api-types.js';
import { parseKey } from '../api/auth/key-format.js';
import { createApiClient, problemLine } from './api-client.js';
import { CliError } from './errors.js';
import type { CliIo } from './io.js';
import type { ApiTarget } from './target.js';

type ApiKey = components['schemas']['ApiKey'];
type Organization = components['schemas']['Organization'];
type Me = components['schemas']['Me'];

/** Who a credential is, as far as the API will tell that credential. */
export interface Identity {
  apiUrl: string;
  credential: { kind: 'server' | 'embed'; keyId: string } | { kind: 'access-token' };
  /** The key's own row: needs keys:manage. */
  key: ApiKey | null;
  /** The key's organisation: needs usage:read. */
  organization: Organization | null;
  /** For a signed-in user's access token. */
  user: Me | null;
  /** What the credential may not see, said plainly. */
  hidden: string[];
}

/**
 * A server key asks GET /v1/keys/current (its row, organisation and plan, whatever its scopes).
 * An embed key, or a server older than that route, falls back to what it may read:
 * GET /v1/organizations (needs usage:read) and GET /v1/keys (needs keys:manage). A 403 still
 * proves the key valid; a 401 is the one failure.
 */
export async function identify(io: CliIo, target: Required<ApiTarget>): Promise<Identity> {
  const api = createApiClient(io, target);
  const parsed = parseKey(target.apiKey);
  const identity: Identity = {
    apiUrl: target.apiUrl,
    credential: parsed ? { kind: parsed.kind, keyId: parsed.keyId } : { kind: 'access-token' },
    key: null,
    organization: null,
    user: null,
    hidden: [],
  };
  const refuse = (error: unknown, response: Response) => {
    if (response.status !== 403) throw new CliError(problemLine(error, response));
  };

  if (!parsed) {
    const me = await api.GET('/v1/auth/me');
    if (me.error !== undefined) throw new CliError(problemLine(me.error, me.response));
    identity.user = me.data;
    return identity;
  }

  if (parsed.kind === 'server') {
    const current = await api.GET('/v1/keys/current');
    if (current.data) {
      identity.key = current.data.key;
      identity.organization = current.data.organization;
      return identity;
    }
    if (current.response.status !== 404) throw new CliError(problemLine(current.error, current.response));
  }

  const orgs = await api.GET('/v1/organizations', { params: { query: { limit: 1 } } });
  if (orgs.data) identity.organization = orgs.data.items[0] ?? null;
  else {
    refuse(orgs.error, orgs.response);
    identity.hidden.push('organisation (needs usage:read)');
  }

  let cursor: string | undefined;
  for (;;) {
    const page = await api.GET('/v1/keys', { params: { query: { limit: 200, ...(cursor ? { cursor } : {}) } } });
    if (!page.data) {
      refuse(page.error, page.response);
      identity.hidden.push('name and scopes (needs keys:manage)');
      break;
    }
    identity.key = page.data.items.find((k) => k.keyId === parsed.keyId) ?? null;
    if (identity.key || !page.data.nextCursor) break;
    cursor = page.data.nextCursor;
  }
  return identity;
}
