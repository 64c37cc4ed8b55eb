import { match, type MatchFunction } from 'path-to-regexp';
import type { Role, Scope } from './scopes.js';

/**
 * What a route needs. Users are checked by role in the organisation they act in; API keys by
 * scope. A route without a scope cannot be called with a key; without a role, any signed-in user
 * may call it (the route still scopes what it returns).
 */
export type Policy =
  | { public: true }
  | {
      public?: false;
      /** Scope an API key needs; absent: keys may not call the route. */
      scope?: Scope;
      /** Any server key, whatever its scopes (the route describes that key itself); signed-in users may not call it. */
      serverKeyItself?: true;
      /** Least role a user needs in the organisation; absent: any signed-in user. */
      role?: Role;
      /** Only the platform operator (users only). */
      operator?: true;
      /** Browser (embed) keys may call it: sizing, and reading active catalog items. */
      embed?: true;
      /** Runs the sizing engine though its scope is another: signed-in users' calls are metered as sizing. */
      sizing?: true;
      /** Uses one quota unit per item of its body (a synchronous batch): the route grows the admitted unit. */
      unitsPerItem?: true;
      /**
       * Counted in usage but never refused by, nor charged to, the monthly quota: following a batch
       * job (polling it, reading its results) must work after the job stopped at the quota, and
       * must not spend units the job's rows need.
       */
      quotaFree?: true;
    };

const sizing: Policy = { scope: 'sizing:run', role: 'estimator', embed: true };
const keysAdmin: Policy = { scope: 'keys:manage', role: 'admin' };
const catalogRead: Policy = { scope: 'catalog:read', role: 'viewer' };
const catalogWrite: Policy = { scope: 'catalog:write', role: 'admin' };
const projectsRead: Policy = { scope: 'projects:read', role: 'viewer' };
const projectsWrite: Policy = { scope: 'projects:write', role: 'estimator' };
/** Deleting throws away stored quotes: an admin's call (keys: projects:write). */
const projectsDelete: Policy = { scope: 'projects:write', role: 'admin' };
/** Running a stored design: a projects write that runs the engine, metered and charged as sizing. */
const projectsRun: Policy = { ...projectsWrite, sizing: true };
/** Batches run the engine item by item: their own scope for keys, estimators for users, metered as sizing. */
const batchesWrite: Policy = { scope: 'batches:write', role: 'estimator', sizing: true, unitsPerItem: true };
const batchesRead: Policy = { scope: 'batches:read', role: 'viewer', quotaFree: true };

/** The one table of who may call what. A mounted route missing here is unreachable (404). */
export const POLICIES: Record<string, Policy> = {
  'GET /v1/health': { public: true },
  'GET /v1/health/ready': { public: true },

  'POST /v1/calculations/voltage-drop': sizing,
  'POST /v1/calculations/cable': sizing,
  'POST /v1/calculations/driver': sizing,
  'POST /v1/calculations/pixels': sizing,
  'POST /v1/calculations/reels': sizing,
  'POST /v1/estimates': sizing,
  // Ranked kits from the catalog: sizing, and the embeddable estimator needs it (embed keys).
  'POST /v1/estimates/options': sizing,
  // Synchronous batches: their own scope (embed keys never get it); estimators run them, metered as sizing.
  'POST /v1/estimates/batch': batchesWrite,
  // The stair-row CSV template: for whoever may run batches; runs nothing, so not metered as sizing for users.
  'GET /v1/batches/template.csv': { scope: 'batches:write', role: 'estimator' },
  // Batch jobs: estimators and batches:write keys start and cancel them (the rows are metered as
  // they are sized); viewers and batches:read keys read them (batches:write implies batches:read).
  'POST /v1/batches': { scope: 'batches:write', role: 'estimator', sizing: true },
  'GET /v1/batches': batchesRead,
  'GET /v1/batches/:id': batchesRead,
  'GET /v1/batches/:id/results': batchesRead,
  'GET /v1/batches/:id/errors': batchesRead,
  'POST /v1/batches/:id/cancel': { scope: 'batches:write', role: 'estimator', quotaFree: true },

  'GET /v1/keys': keysAdmin,
  'POST /v1/keys': keysAdmin,
  // Who am I, for a server key: its own row and organisation (before /:id, which would match "current").
  'GET /v1/keys/current': { serverKeyItself: true, quotaFree: true },
  'GET /v1/keys/:id': keysAdmin,
  'POST /v1/keys/:id/rotate': keysAdmin,
  'POST /v1/keys/:id/revoke': keysAdmin,

  // Accounts: signing in needs no credentials; /me is for console users only (keys have no scope for it).
  'POST /v1/auth/sign-in': { public: true },
  'POST /v1/auth/refresh': { public: true },
  'POST /v1/auth/sign-out': { public: true },
  'POST /v1/auth/password-reset': { public: true },
  'POST /v1/auth/password-reset/confirm': { public: true },
  'POST /v1/auth/invitations/accept': { public: true },
  'GET /v1/auth/me': {},
  'POST /v1/auth/switch-organization': {},
  // Keys cannot manage members: no scope on any member route.
  'GET /v1/members': { role: 'viewer' },
  'POST /v1/members/invitations': { role: 'admin' },
  'PATCH /v1/members/:id': { role: 'admin' },
  'DELETE /v1/members/:id': { role: 'admin' },
  // Reading: any signed-in user (their own), the operator (all), a key with usage:read (its own: the plan sets its quota).
  'GET /v1/organizations': { scope: 'usage:read' },
  'GET /v1/organizations/:id': { scope: 'usage:read' },
  'POST /v1/organizations': { operator: true },
  'PATCH /v1/organizations/:id': { operator: true },
  'GET /v1/dev/outbox': { operator: true },

  // Usage of the organisation acted in; keys with usage:read see their organisation's usage.
  'GET /v1/usage': { scope: 'usage:read', role: 'viewer' },
  'GET /v1/usage/export': { scope: 'usage:read', role: 'viewer' },

  'GET /v1/audit-events': { role: 'admin' },

  // Billing: members see the plan and its price; admins pay, change, cancel and read invoices.
  // Keys have no scope for any of it. The provider's webhook carries a signature, not credentials.
  'GET /v1/billing': { role: 'viewer' },
  'POST /v1/billing/checkout': { role: 'admin' },
  'POST /v1/billing/cancel': { role: 'admin' },
  'POST /v1/billing/payment-details': { role: 'admin' },
  'GET /v1/billing/invoices': { role: 'admin' },
  'POST /v1/billing/webhook': { public: true },

  // The stored catalog: viewers read, admins change it. Embed keys (with catalog:read) may list
  // items, and then see active ones only: the embeddable estimator shows what the shop sells.
  'GET /v1/catalog': catalogRead,
  'PATCH /v1/catalog': catalogWrite,
  'GET /v1/catalog/items': { ...catalogRead, embed: true },
  'POST /v1/catalog/items': catalogWrite,
  'GET /v1/catalog/items/:sku': catalogRead,
  'PUT /v1/catalog/items/:sku': catalogWrite,
  'PATCH /v1/catalog/items/:sku': catalogWrite,
  'DELETE /v1/catalog/items/:sku': catalogWrite,
  'GET /v1/catalog/template': catalogRead,
  'GET /v1/catalog/export': catalogRead,
  'POST /v1/catalog/imports': catalogWrite,

  // Projects, their stairs and stored estimates: viewers read, estimators write and run, admins
  // delete. Embed keys never reach any of it (no `embed`).
  'GET /v1/projects': projectsRead,
  'POST /v1/projects': projectsWrite,
  'GET /v1/projects/:id': projectsRead,
  'PATCH /v1/projects/:id': projectsWrite,
  'DELETE /v1/projects/:id': projectsDelete,
  'GET /v1/projects/:id/stairs': projectsRead,
  'POST /v1/projects/:id/stairs': projectsWrite,
  'GET /v1/projects/:id/stairs/:stairId': projectsRead,
  'PATCH /v1/projects/:id/stairs/:stairId': projectsWrite,
  'DELETE /v1/projects/:id/stairs/:stairId': projectsDelete,
  'GET /v1/projects/:id/stairs/:stairId/estimates': projectsRead,
  'POST /v1/projects/:id/stairs/:stairId/estimates': projectsRun,
  'GET /v1/estimates/:estimateId': projectsRead,
  'POST /v1/estimates/:estimateId/rerun': projectsRun,
  'GET /v1/estimates/:estimateId/wiring-schedule.csv': projectsRead,
  'GET /v1/estimates/:estimateId/bom.csv': projectsRead,
  'GET /v1/estimates/:estimateId/document.pdf': projectsRead,

  // The embeddable estimator's script: shops' pages load it without credentials.
  'GET /embed/v1/treadwise-estimator.js': { public: true },
  'GET /embed/v1/:version/treadwise-estimator.js': { public: true },
  'GET /embed/v1/manifest.json': { public: true },
};

/** A malformed %-escape is just a path that matches nothing (404), not an error. */
function safeDecode(segment: string): string {
  try {
    return decodeURIComponent(segment);
  } catch {
    return '\u0000';
  }
}

interface CompiledPolicy {
  method: string;
  pattern: string;
  matches: MatchFunction<Record<string, string | string[]>>;
  policy: Policy;
}

const compiled: CompiledPolicy[] = Object.entries(POLICIES).map(([route, policy]) => {
  const [method, pattern] = route.split(' ');
  return { method, pattern, matches: match(pattern, { decode: safeDecode }), policy };
});

type Found = { pattern: string; policy: Policy } | undefined;

// Hot paths (sizing) are a handful of fixed URLs: remember recent answers instead of matching
// every pattern on every call. Bounded, since paths with ids are unbounded.
const recent = new Map<string, Found>();
const RECENT_MAX = 2_000;

/** The policy for a request, and the route pattern it matched (for metering). */
export function policyFor(method: string, path: string): Found {
  const m = method === 'HEAD' ? 'GET' : method;
  const cacheKey = `${m} ${path}`;
  const hit = recent.get(cacheKey);
  if (hit !== undefined || recent.has(cacheKey)) return hit;
  let found: Found;
  for (const entry of compiled) {
    if (entry.method === m && entry.matches(path)) {
      found = { pattern: entry.pattern, policy: entry.policy };
      break;
    }
  }
  if (recent.size >= RECENT_MAX) recent.clear();
  recent.set(cacheKey, found);
  return found;
}

/** Whether any policy covers this path with another method (405 rather than 404). */
export function pathKnown(path: string): boolean {
  return compiled.some((entry) => entry.matches(path) !== false);
}
