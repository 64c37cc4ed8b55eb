import { randomBytes } from 'node:crypto';
import request from 'supertest';
import type { Role } from '../../api/auth/scopes.js';
import type { createApp } from '../../api/app.js';
import type { Session } from '../../shared/schemas/accounts.js';

type App = ReturnType<typeof createApp>;

/** A password long enough for the schema; invented for tests. */
export const TEST_PASSWORD = 'stair-glow-test-pass';

/** A user made through the user service and added to an organisation, as the seed does. */
export async function createMember(app: App, organizationId: string, role: Role, email = `${role}-${randomBytes(3).toString('hex')}@members.test`) {
  const { users, members } = app.locals.services;
  const user = await users.createUser({ email, name: `Test ${role}`, password: TEST_PASSWORD });
  const member = await members.addMember({ organizationId, userId: user.id, role });
  return { user, member, email };
}

export async function createOperator(app: App, email = `ops-${randomBytes(3).toString('hex')}@treadwise.test`) {
  const user = await app.locals.services.users.createUser({ email, name: 'Test operator', password: TEST_PASSWORD, operator: true });
  return { user, email };
}

export async function signIn(app: App, email: string, password = TEST_PASSWORD): Promise<Session> {
  const res = await request(app).post('/v1/auth/sign-in').send({ email, password });
  if (res.status !== 200) throw new Error(`sign-in of ${email} failed: ${res.status} ${JSON.stringify(res.body)}`);
  return res.body as Session;
}

export const bearer = (token: string) => ({ Authorization: `Bearer ${token}` });

/** Acts in another organisation: the new access token from POST /v1/auth/switch-organization. */
export async function switchTo(app: App, accessToken: string, organization: string): Promise<string> {
  const res = await request(app).post('/v1/auth/switch-organization').set(bearer(accessToken)).send({ organization });
  if (res.status !== 200) throw new Error(`switch to ${organization} failed: ${res.status} ${JSON.stringify(res.body)}`);
  return res.body.accessToken as string;
}
