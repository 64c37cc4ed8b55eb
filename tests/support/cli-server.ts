import type { Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import type { Scope } from '../../api/auth/scopes.js';
import { createKey, createOrganization } from './fixtures.js';
import { createTestApp, type TestApp } from './test-app.js';

export const ALL_KEY_SCOPES: Scope[] = ['sizing:run', 'usage:read', 'keys:manage', 'catalog:read', 'catalog:write'];

export interface CliServer {
  t: TestApp;
  apiUrl: string;
  organization: { id: string; slug: string; name: string };
  /** A server key of that organisation with every scope the CLI's commands need. */
  token: string;
  keyId: string;
  close(): Promise<void>;
}

/** A real listening app on a free port, an organisation and a key: what the CLI tests talk to. */
export async function startCliServer(env: NodeJS.ProcessEnv = {}): Promise<CliServer> {
  const t = await createTestApp(env);
  const server: Server = t.app.listen(0, '127.0.0.1');
  await new Promise((r) => server.once('listening', r));
  const organization = await createOrganization(t);
  const { key, token } = await createKey(t, organization.id, { scopes: ALL_KEY_SCOPES });
  return {
    t,
    apiUrl: `http://127.0.0.1:${(server.address() as AddressInfo).port}`,
    organization,
    token,
    keyId: key.keyId,
    close: async () => {
      await new Promise((r) => server.close(r));
      await t.close();
    },
  };
}
