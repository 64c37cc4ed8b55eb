import { Command } from 'commander';
import { z } from 'zod';
import type { components } from '../../openapi/api-types.js';
import { createApiClient, everyPage, unwrap, type ApiClient } from '../api-client.js';
import { CliError } from '../errors.js';
import type { CliIo } from '../io.js';
import { apiOptionsSchema, withApiOptions, withExamples } from '../options.js';
import { fields, table } from '../style.js';
import { requireKey } from '../target.js';

type ApiKey = components['schemas']['ApiKey'];
type Scope = components['schemas']['Scope'];

const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;
const connection = (raw: Record<string, unknown>) => apiOptionsSchema.parse({ apiUrl: raw.apiUrl, apiKey: raw.apiKey, json: raw.json, color: raw.color });

const allKeys = (api: ApiClient): Promise<ApiKey[]> => everyPage((query) => unwrap(api.GET('/v1/keys', { params: { query } })));

/** Users know a key by its public key id (the one in logs); the API addresses it by its row id. */
async function rowId(api: ApiClient, idOrKeyId: string): Promise<string> {
  if (UUID.test(idOrKeyId)) return idOrKeyId;
  const key = (await allKeys(api)).find((k) => k.keyId === idOrKeyId);
  if (!key) throw new CliError(`no key with key id ${idOrKeyId} in this organisation (treadwise keys list shows them)`);
  return key.id;
}

function keyFields(k: ApiKey, token?: string): string {
  return fields([
    ['Key id', `${k.keyId} (${k.kind})`],
    ['Id', k.id],
    ['Name', k.name],
    ['Scopes', k.scopes.join(', ')],
    ['Status', k.status],
    ...(k.allowedOrigins.length ? ([['Origins', k.allowedOrigins.join(', ')]] as [string, string][]) : []),
    ...(k.expiresAt ? ([['Expires', k.expiresAt]] as [string, string][]) : []),
    ...(k.previousSecretValidUntil ? ([['Old secret until', k.previousSecretValidUntil]] as [string, string][]) : []),
    ...(token ? ([['Token', token]] as [string, string][]) : []),
  ]);
}

/** The whole key is shown once: on stdout for pipes, with the warning on stderr. */
function showToken(io: CliIo, json: boolean, answer: { key: ApiKey; token: string; requestId?: string }): void {
  if (json) {
    io.out(JSON.stringify(answer));
    return;
  }
  io.out(keyFields(answer.key, answer.token));
  io.err('Store the token now: Treadwise keeps only an HMAC of it and cannot show it again.');
}

function listCommand(io: CliIo): Command {
  const command = new Command('list').description('list the organisation’s keys (never their secrets)');
  withExamples(withApiOptions(command), 'treadwise keys list', 'treadwise keys list --json | jq -r ".[] | select(.status == \\"active\\") | .keyId"');
  return command.action(async (raw: Record<string, unknown>) => {
    const opts = connection(raw);
    const keys = await allKeys(createApiClient(io, requireKey(io, opts)));
    if (opts.json) return io.out(JSON.stringify(keys));
    if (!keys.length) return io.out('No keys.');
    io.out(
      table(
        ['key id', 'kind', 'status', 'name', 'scopes', 'last used', 'expires'],
        keys.map((k) => [k.keyId, k.kind, k.status, k.name, k.scopes.join(','), k.lastUsedAt ?? 'never', k.expiresAt ?? '—']),
      ),
    );
  });
}

const createFlags = z.object({
  name: z.string().min(1, 'must not be empty').max(100),
  kind: z.enum(['server', 'embed']).default('server'),
  scope: z.array(z.string()).optional(),
  origin: z.array(z.string()).optional(),
  expiresAt: z.iso.datetime({ offset: true, error: 'must be an ISO date-time, e.g. 2027-06-30T00:00:00Z' }).optional(),
});

function createCommand(io: CliIo): Command {
  const collect = (value: string, previous: string[] = []) => [...previous, value];
  const command = new Command('create')
    .description('create a key; its whole token is shown once')
    .requiredOption('--name <name>', 'what the key is for')
    .option('--kind <kind>', 'server | embed', 'server')
    .option('--scope <scope>', 'a scope to grant (repeat; default sizing:run)', collect)
    .option('--origin <origin>', 'an allowed page origin for an embed key (repeat)', collect)
    .option('--expires-at <date-time>', 'when the key stops working (ISO 8601)');
  withExamples(
    withApiOptions(command),
    'treadwise keys create --name "Checkout server" --scope sizing:run --scope catalog:read',
    'treadwise keys create --name "Product pages" --kind embed --origin https://shop.example.test --json',
  );
  return command.action(async (raw: Record<string, unknown>) => {
    const opts = connection(raw);
    const flags = createFlags.parse({ name: raw.name, kind: raw.kind, scope: raw.scope, origin: raw.origin, expiresAt: raw.expiresAt });
    const api = createApiClient(io, requireKey(io, opts));
    const body = { name: flags.name, kind: flags.kind, scopes: flags.scope as Scope[] | undefined, allowedOrigins: flags.origin, expiresAt: flags.expiresAt };
    showToken(io, opts.json, await unwrap(api.POST('/v1/keys', { body })));
  });
}

function rotateCommand(io: CliIo): Command {
  const command = new Command('rotate')
    .description('issue a new secret; the old one keeps working for --overlap-hours')
    .argument('<key>', 'key id (as listed) or the key’s row id')
    .option('--overlap-hours <h>', 'hours the old secret keeps working, 0 to 72 (default 24)');
  withExamples(withApiOptions(command), 'treadwise keys rotate q7m2x4kd9fhp --overlap-hours 2');
  return command.action(async (key: string, raw: Record<string, unknown>) => {
    const opts = connection(raw);
    const { overlapHours } = z.object({ overlapHours: z.coerce.number().int('must be a whole number').min(0).max(72).optional() }).parse({ overlapHours: raw.overlapHours });
    const api = createApiClient(io, requireKey(io, opts));
    const id = await rowId(api, key);
    const answer = await unwrap(api.POST('/v1/keys/{id}/rotate', { params: { path: { id } }, body: overlapHours === undefined ? {} : { overlapHours } }));
    showToken(io, opts.json, answer);
  });
}

function revokeCommand(io: CliIo): Command {
  const command = new Command('revoke').description('stop a key at once').argument('<key>', 'key id (as listed) or the key’s row id');
  withExamples(withApiOptions(command), 'treadwise keys revoke q7m2x4kd9fhp');
  return command.action(async (key: string, raw: Record<string, unknown>) => {
    const opts = connection(raw);
    const api = createApiClient(io, requireKey(io, opts));
    const id = await rowId(api, key);
    const revoked = await unwrap(api.POST('/v1/keys/{id}/revoke', { params: { path: { id } } }));
    io.out(opts.json ? JSON.stringify(revoked) : `Revoked ${revoked.keyId} ("${revoked.name}"): it no longer works.`);
  });
}

export function keysCommand(io: CliIo): Command {
  const command = new Command('keys').description('API keys: list | create | rotate | revoke (needs keys:manage)');
  withExamples(command, 'treadwise keys list', 'treadwise keys rotate q7m2x4kd9fhp --overlap-hours 2');
  return command.addCommand(listCommand(io)).addCommand(createCommand(io)).addCommand(rotateCommand(io)).addCommand(revokeCommand(io));
}
