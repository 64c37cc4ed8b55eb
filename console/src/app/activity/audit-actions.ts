import type { AuditEvent } from '../core/api-types.js';

/** The actions the API records (api/routes/*.ts), grouped for the filter; the filter also takes any other `<resource>.<verb>`. */
export const AUDIT_ACTION_GROUPS: ReadonlyArray<{ label: string; actions: readonly string[] }> = [
  { label: 'Keys', actions: ['api_key.created', 'api_key.rotated', 'api_key.revoked'] },
  { label: 'Team', actions: ['member.invited', 'member.joined', 'member.role_changed', 'member.removed'] },
  {
    label: 'Sign-in',
    actions: ['auth.signed_in', 'auth.sign_in_failed', 'auth.signed_out', 'auth.password_reset_requested', 'auth.password_reset', 'auth.refresh_token_reused', 'auth.organization_switched'],
  },
  { label: 'Catalog', actions: ['catalog.imported', 'catalog.updated', 'catalog_item.created', 'catalog_item.updated', 'catalog_item.retired'] },
  { label: 'Projects', actions: ['project.created', 'project.deleted', 'stair.created', 'stair.deleted', 'estimate.created'] },
  { label: 'Organisation', actions: ['organization.created', 'organization.updated'] },
];

/** The API's own check of the `action` filter (api/routes/audit.ts). */
export const ACTION_PATTERN = /^[a-z_]+\.[a-z_]+$/;

/** `api_key.created` → `api key created`: readable without a table of labels to keep in step. */
export function actionLabel(action: string): string {
  return action.replace(/[._]/g, ' ');
}

/** Who did it, in a few words. */
export function actorLabel(actor: AuditEvent['actor'], names: ReadonlyMap<string, string> = new Map()): string {
  if (actor.type === 'system') return 'the system';
  if (actor.type === 'anonymous') return 'someone signed out';
  const name = actor.type === 'user' && actor.id ? names.get(actor.id) : undefined;
  if (name) return name;
  const kind = actor.type === 'api_key' ? 'key' : 'user';
  return actor.id ? `${kind} ${actor.id}` : kind;
}

/** The event's data as `name: value` pairs; nested values as JSON. Secrets are never recorded, so all of it may show. */
export function dataPairs(data: AuditEvent['data']): Array<{ name: string; value: string }> {
  if (!data) return [];
  return Object.entries(data).map(([name, value]) => ({ name, value: typeof value === 'string' ? value : JSON.stringify(value) }));
}
