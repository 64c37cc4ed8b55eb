import { Command } from 'commander';
import { identify, type Identity } from '../identity.js';
import type { CliIo } from '../io.js';
import { apiOptionsSchema, withApiOptions, withExamples } from '../options.js';
import { fields } from '../style.js';
import { requireKey } from '../target.js';

/** The identity as label/value lines, shared with `login`. */
export function describeIdentity(identity: Identity): string {
  const pairs: [string, string][] = [['API', identity.apiUrl]];
  const c = identity.credential;
  if (c.kind === 'access-token') {
    const user = identity.user;
    pairs.push(['Credential', 'access token of a signed-in user']);
    if (user) {
      pairs.push(['User', `${user.user.email}${user.user.operator ? ' (operator)' : ''}`]);
      for (const m of user.memberships) pairs.push(['Organisation', `${m.organization.name} (${m.organization.slug}), ${m.role}`]);
    }
    return fields(pairs);
  }
  pairs.push(['Key', `${c.keyId} (${c.kind} key)`]);
  if (identity.key) {
    const k = identity.key;
    pairs.push(['Name', k.name], ['Scopes', k.scopes.join(', ')], ['Status', k.status]);
    if (k.expiresAt) pairs.push(['Expires', k.expiresAt]);
    if (k.previousSecretValidUntil) pairs.push(['Old secret until', k.previousSecretValidUntil]);
  }
  if (identity.organization) pairs.push(['Organisation', `${identity.organization.name} (${identity.organization.slug}), plan ${identity.organization.planId}`]);
  if (identity.hidden.length) pairs.push(['Not shown', `${identity.hidden.join('; ')}`]);
  return fields(pairs);
}

export function whoamiCommand(io: CliIo): Command {
  const command = new Command('whoami').description('show which key and organisation the CLI acts as');
  withExamples(withApiOptions(command), 'treadwise whoami', 'treadwise whoami --json | jq .organization.slug');
  return command.action(async (raw: Record<string, unknown>) => {
    const opts = apiOptionsSchema.parse(raw);
    const identity = await identify(io, requireKey(io, opts));
    io.out(opts.json ? JSON.stringify(identity) : describeIdentity(identity));
  });
}
