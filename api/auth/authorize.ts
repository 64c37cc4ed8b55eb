import type { RequestHandler } from 'express';
import { HttpProblem, problems } from '../problem.js';
import { policyFor, pathKnown } from './policy.js';
import { principalOf } from './principal.js';
import { roleAtLeast } from './scopes.js';
import { scopeGranted } from '../../shared/tables/access.js';

/**
 * The one place access is decided, from the POLICIES table. A route missing from the table is
 * not reachable at all (deny by default), which the authorisation-matrix test relies on.
 */
export const authorize: RequestHandler = (req, res, next) => {
  const path = req.baseUrl + req.path;
  const found = policyFor(req.method, path.length > 1 && path.endsWith('/') ? path.slice(0, -1) : path);
  if (!found) {
    if (pathKnown(path)) throw new HttpProblem(405, 'method_not_allowed', 'Method not allowed', `${req.method} is not supported on ${path}.`);
    throw new HttpProblem(404, 'not_found', 'Not found', `No route for ${req.method} ${path}.`);
  }
  res.locals.routePattern = found.pattern;
  res.locals.routePolicy = found.policy;
  const { policy } = found;
  if (policy.public) return next();

  const p = principalOf(res);
  switch (p.type) {
    case 'anonymous':
      throw problems.unauthenticated(undefined, 'credential_missing');
    case 'api_key':
      if (policy.serverKeyItself) {
        if (p.kind === 'embed') throw problems.forbidden('Embed keys may only run sizing.', 'embed_key_not_allowed');
        return next();
      }
      if (!policy.scope) throw problems.forbidden('This route is for signed-in users, not API keys.', 'keys_not_allowed');
      if (p.kind === 'embed' && !policy.embed) throw problems.forbidden('Embed keys may only run sizing.', 'embed_key_not_allowed');
      if (!scopeGranted(p.scopes, policy.scope)) throw problems.forbidden(`This key lacks the scope ${policy.scope}.`, 'insufficient_scope');
      return next();
    case 'user':
      if (policy.serverKeyItself) throw problems.forbidden('This route describes the API key that calls it; signed-in users have GET /v1/auth/me.', 'keys_only');
      if (policy.operator && !p.operator) throw problems.forbidden('Only the platform operator may do this.', 'operator_only');
      if (policy.role) {
        if (!p.organizationId || !p.role) {
          throw problems.forbidden('Choose an organisation first: POST /v1/auth/switch-organization.', 'organization_required');
        }
        if (!roleAtLeast(p.role, policy.role)) throw problems.forbidden(`This needs the ${policy.role} role.`, 'insufficient_role');
      }
      return next();
  }
};
