import { generateKeyPairSync } from 'node:crypto';
import { eq } from 'drizzle-orm';
import { SignJWT, UnsecuredJWT, decodeJwt } from 'jose';
import request from 'supertest';
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import type { Database } from '../../api/db/client.js';
import { auditEvents, refreshTokens, signInFailures, users } from '../../api/db/schema.js';
import { meSchema, sessionSchema } from '../../shared/schemas/accounts.js';
import { bearer, createMember, signIn, TEST_PASSWORD } from '../support/accounts.js';
import { createKey, createOrganization } from '../support/fixtures.js';
import { createTestApp, type TestApp } from '../support/test-app.js';

let now = new Date('2026-12-01T09:00:00Z');
const clock = () => now;
const advance = (ms: number) => {
  now = new Date(now.getTime() + ms);
};

let t: TestApp;
let database: Database;
let app: TestApp['app'];
let org: { id: string };

beforeAll(async () => {
  t = await createTestApp({ PUBLIC_URL: 'https://console.treadwise.test' }, clock);
  ({ app, database } = t);
  org = await createOrganization(t, 'harbor-lane');
});
afterAll(() => t.close());

async function auditFor(action: string, targetId?: string) {
  const rows = await database.db.select().from(auditEvents).where(eq(auditEvents.action, action));
  return targetId ? rows.filter((r) => r.targetId === targetId) : rows;
}

describe('POST /v1/auth/sign-in', () => {
  it('answers a session whose access token works and whose memberships name the organisation', async () => {
    const { user, email } = await createMember(app, org.id, 'admin');
    const res = await request(app).post('/v1/auth/sign-in').send({ email: email.toUpperCase(), password: TEST_PASSWORD }).expect(200);
    const session = sessionSchema.parse(res.body);
    expect(session.user).toEqual({ id: user.id, email, name: 'Test admin', operator: false });
    expect(session.memberships).toEqual([{ organization: { id: org.id, slug: 'harbor-lane', name: 'Test harbor-lane' }, role: 'admin' }]);
    // 15 min access, 30 days refresh: issue 4 brief
    expect(session.accessTokenExpiresAt).toBe(new Date(now.getTime() + 15 * 60_000).toISOString());
    expect(session.refreshTokenExpiresAt).toBe(new Date(now.getTime() + 30 * 86_400_000).toISOString());

    const me = await request(app).get('/v1/auth/me').set(bearer(session.accessToken)).expect(200);
    expect(meSchema.parse(me.body)).toEqual({ user: session.user, memberships: session.memberships });
    expect(await auditFor('auth.signed_in', user.id)).toHaveLength(1);
  });

  it('answers a wrong password and an unknown e-mail alike, and audits both without the password', async () => {
    const { user, email } = await createMember(app, org.id, 'viewer');
    const wrong = await request(app).post('/v1/auth/sign-in').send({ email, password: 'not-the-password-1' }).expect(401);
    const unknown = await request(app).post('/v1/auth/sign-in').send({ email: 'nobody@members.test', password: 'not-the-password-2' }).expect(401);
    const shape = (b: Record<string, unknown>) => ({ code: b.code, title: b.title, detail: b.detail, status: b.status, type: b.type });
    expect(shape(wrong.body)).toEqual(shape(unknown.body));
    expect(wrong.body.code).toBe('invalid_credentials');
    expect(wrong.headers['www-authenticate']).toBe(unknown.headers['www-authenticate']);

    const failed = await auditFor('auth.sign_in_failed');
    const mine = failed.find((e) => e.targetId === user.id);
    expect(mine).toMatchObject({ actorType: 'anonymous', targetType: 'user', data: { email, reason: 'bad_password' } });
    const nobody = failed.find((e) => (e.data as { email?: string } | null)?.email === 'nobody@members.test');
    expect(nobody).toMatchObject({ actorType: 'anonymous', targetId: null });
    expect(JSON.stringify(failed)).not.toContain('not-the-password');
  });

  it('refuses an account that has no password yet', async () => {
    const user = await app.locals.services.users.createUser({ email: 'nopass@members.test', name: 'No password' });
    await request(app).post('/v1/auth/sign-in').send({ email: user.email, password: 'anything-at-all' }).expect(401);
  });
});

describe('lockout after repeated failures (injected clock, per account and address)', () => {
  // As behind a reverse proxy on this host, so a test can speak from several addresses (RFC 5737 ranges).
  beforeAll(() => {
    app.set('trust proxy', 'loopback');
  });
  afterAll(() => {
    app.set('trust proxy', false);
  });
  const HOME = '198.51.100.7';
  const STRANGER = '203.0.113.66';
  const signInFrom = (ip: string, email: string, password: string) => request(app).post('/v1/auth/sign-in').set('X-Forwarded-For', ip).send({ email, password });
  const fail = (email: string, ip = HOME) => signInFrom(ip, email, 'wrong-password-x');
  const good = (email: string, ip = HOME) => signInFrom(ip, email, TEST_PASSWORD);
  const lockLeftS = async (userId: string, ip = HOME) => {
    const until = await app.locals.services.signInGuard.lockedUntil(userId, ip);
    return until ? Math.ceil((until.getTime() - now.getTime()) / 1000) : 0;
  };
  /** What a client sees of a refusal: everything but the per-request id. */
  const seen = (res: request.Response) => {
    const { requestId: _id, ...body } = res.body as Record<string, unknown>;
    return { status: res.status, body, wwwAuthenticate: res.headers['www-authenticate'], retryAfter: res.headers['retry-after'] };
  };

  it('locks for 1 minute after 5 failures, answering even the right password exactly as a wrong one, then lets it in', async () => {
    const { user, email } = await createMember(app, org.id, 'estimator');
    // 5 failures → locked 1 min (common practice, no published source)
    for (let i = 0; i < 5; i++) await fail(email).expect(401);
    expect(await lockLeftS(user.id)).toBe(60);
    const locked = await good(email).expect(401);
    const wrong = await fail(email).expect(401);
    const unknown = await signInFrom(HOME, 'nobody-here@members.test', TEST_PASSWORD).expect(401);
    expect(seen(locked)).toEqual(seen(wrong));
    expect(seen(locked)).toEqual(seen(unknown));
    expect(locked.body.code).toBe('invalid_credentials');
    advance(59_000);
    await good(email).expect(401);
    advance(1_000);
    await good(email).expect(200);
    // a success starts the count again: 4 more failures do not lock
    for (let i = 0; i < 4; i++) await fail(email).expect(401);
    await good(email).expect(200);
  });

  it('doubles the lock with each further failure, up to 1 hour', async () => {
    const { user, email } = await createMember(app, org.id, 'estimator');
    for (let i = 0; i < 5; i++) await fail(email).expect(401);
    let lockS = await lockLeftS(user.id);
    // doubling from 1 min, capped at 1 h (common practice, no published source)
    const expectedLocks = [120, 240, 480, 960, 1920, 3600, 3600];
    const locks: number[] = [];
    for (let i = 0; i < expectedLocks.length; i++) {
      advance(lockS * 1000);
      await fail(email).expect(401);
      lockS = await lockLeftS(user.id);
      locks.push(lockS);
    }
    expect(locks).toEqual(expectedLocks);
  });

  it('does not count guesses made while locked', async () => {
    const { user, email } = await createMember(app, org.id, 'estimator');
    for (let i = 0; i < 5; i++) await fail(email).expect(401);
    for (let i = 0; i < 3; i++) await fail(email).expect(401);
    const [row] = await database.db.select().from(signInFailures).where(eq(signInFailures.userId, user.id));
    expect(row.failures).toBe(5);
  });

  it('never lets a stranger lock the owner out: the lock holds for the guessing address only', async () => {
    const { user, email } = await createMember(app, org.id, 'admin');
    for (let i = 0; i < 12; i++) await fail(email, STRANGER).expect(401);
    expect(await lockLeftS(user.id, STRANGER)).toBeGreaterThan(0);
    await good(email, STRANGER).expect(401);
    await good(email, HOME).expect(200);
  });

  it('counts wrong passwords given to accept an invitation towards the same lockout', async () => {
    const other = await createOrganization(t, 'guess-target');
    const { user, email } = await createMember(app, org.id, 'viewer');
    const admin = await createMember(app, other.id, 'admin');
    const adminToken = (await signIn(app, admin.email)).accessToken;
    await request(app).post('/v1/members/invitations').set(bearer(adminToken)).send({ email, role: 'viewer' }).expect(201);
    const page = await app.locals.services.mailer.outbox({ limit: 100 });
    const link = page.items.find((m) => m.to === email && m.subject.toLowerCase().includes('invit'))!;
    const token = decodeURIComponent(/token=([^\s&]+)/.exec(link.text)![1]);
    const accept = (password: string, ip = STRANGER) => request(app).post('/v1/auth/invitations/accept').set('X-Forwarded-For', ip).send({ token, password });
    const first = await accept('wrong-guess-number-0');
    expect(first.body).toMatchObject({ status: 401, code: 'invalid_credentials' });
    for (let i = 1; i < 5; i++) expect((await accept('wrong-guess-number-' + i).expect(401)).body.code).toBe('invalid_credentials');
    expect(await lockLeftS(user.id, STRANGER)).toBe(60);
    // Locked from that address: even the right password is refused there, as a wrong one is.
    await accept(TEST_PASSWORD).expect(401);
    await good(email, STRANGER).expect(401);
    await good(email, HOME).expect(200);
    await accept(TEST_PASSWORD, HOME).expect(200);
  });
});

describe('access tokens (JWT)', () => {
  let valid: string;
  let claims: Record<string, unknown>;

  beforeEach(async () => {
    const { email } = await createMember(app, org.id, 'viewer');
    valid = (await signIn(app, email)).accessToken;
    claims = decodeJwt(valid) as Record<string, unknown>;
  });

  const me = (token: string) => request(app).get('/v1/auth/me').set(bearer(token));

  it('accepts the token as issued (the control for the cases below)', async () => {
    await me(valid).expect(200);
  });

  it('refuses an unsigned token (alg: none) carrying valid claims', async () => {
    const unsigned = new UnsecuredJWT(claims).encode();
    const res = await me(unsigned).expect(401);
    expect(res.body.code).toBe('credential_unknown');
  });

  it('refuses HS256 tokens keyed with the public key (algorithm confusion)', async () => {
    const pem = Buffer.from(t.secrets.jwtPublicKey.export({ type: 'spki', format: 'pem' }));
    const raw = Buffer.from(t.secrets.jwtPublicKey.export({ format: 'jwk' }).x as string, 'base64url');
    for (const secret of [pem, raw]) {
      const forged = await new SignJWT(claims).setProtectedHeader({ alg: 'HS256', typ: 'JWT' }).sign(secret);
      const res = await me(forged).expect(401);
      expect(res.body.code).toBe('credential_unknown');
      // Long expired and forged: the bad signature is what is reported, never the expiry.
      const stale = await new SignJWT(claims).setProtectedHeader({ alg: 'HS256', typ: 'JWT' }).setExpirationTime(1).sign(secret);
      expect((await me(stale).expect(401)).body.code).toBe('credential_unknown');
    }
  });

  it('refuses a token signed with another key', async () => {
    const other = generateKeyPairSync('ed25519').privateKey;
    const forged = await new SignJWT(claims).setProtectedHeader({ alg: 'EdDSA', typ: 'JWT' }).sign(other);
    await me(forged).expect(401);
    const [h, p] = valid.split('.');
    await me(`${h}.${p}.${'A'.repeat(86)}`).expect(401);
  });

  it('refuses the token once it has expired (15 min, moving the clock)', async () => {
    advance(15 * 60_000 - 1000); // 15 min lifetime: issue 4 brief
    await me(valid).expect(200);
    advance(1000);
    const res = await me(valid).expect(401);
    expect(res.body.code).toBe('credential_expired');
  });

  it('keeps API keys out of /v1/auth/me', async () => {
    const { token } = await createKey(t, org.id);
    const res = await me(token).expect(403);
    expect(res.body.code).toBe('keys_not_allowed');
  });
});

describe('refresh tokens', () => {
  const refresh = (refreshToken: string) => request(app).post('/v1/auth/refresh').send({ refreshToken });

  it('rotates: each refresh gives a new pair and uses up the old token', async () => {
    const { email } = await createMember(app, org.id, 'viewer');
    const first = await signIn(app, email);
    advance(1000); // a different iat, so the new access token differs too
    const second = sessionSchema.parse((await refresh(first.refreshToken).expect(200)).body);
    expect(second.refreshToken).not.toBe(first.refreshToken);
    expect(second.accessToken).not.toBe(first.accessToken);
    await request(app).get('/v1/auth/me').set(bearer(second.accessToken)).expect(200);
    const third = (await refresh(second.refreshToken).expect(200)).body;
    expect(third.refreshToken).not.toBe(second.refreshToken);
  });

  it('stores only a hash of the token', async () => {
    const { user, email } = await createMember(app, org.id, 'viewer');
    const session = await signIn(app, email);
    const rows = await database.db.select().from(refreshTokens).where(eq(refreshTokens.userId, user.id));
    expect(rows).toHaveLength(1);
    expect(JSON.stringify(rows)).not.toContain(session.refreshToken);
    expect(Buffer.from(session.refreshToken, 'base64url')).toHaveLength(32); // 32 random bytes: issue 4 brief
  });

  it('treats reuse of a used token as theft: the whole family is revoked', async () => {
    const { user, email } = await createMember(app, org.id, 'viewer');
    const first = await signIn(app, email);
    const other = await signIn(app, email); // another device: a family of its own
    const second = (await refresh(first.refreshToken).expect(200)).body;
    const reuse = await refresh(first.refreshToken).expect(401);
    expect(reuse.body.code).toBe('invalid_token');
    await refresh(second.refreshToken).expect(401); // the thief's or the owner's newer token: both dead
    await refresh(other.refreshToken).expect(200); // the other sign-in is untouched
    expect(await auditFor('auth.refresh_token_reused', user.id)).toHaveLength(1);
  });

  it('expires after 30 days', async () => {
    const { email } = await createMember(app, org.id, 'viewer');
    const session = await signIn(app, email);
    advance(30 * 86_400_000); // 30 days: issue 4 brief
    await refresh(session.refreshToken).expect(401);
  });

  it('refuses an unknown token', async () => {
    await refresh('x'.repeat(43)).expect(401);
  });
});

describe('POST /v1/auth/sign-out', () => {
  it('revokes the refresh token and its family, and is harmless twice', async () => {
    const { user, email } = await createMember(app, org.id, 'viewer');
    const first = await signIn(app, email);
    const rotated = (await request(app).post('/v1/auth/refresh').send({ refreshToken: first.refreshToken }).expect(200)).body;
    await request(app).post('/v1/auth/sign-out').send({ refreshToken: rotated.refreshToken }).expect(204);
    await request(app).post('/v1/auth/refresh').send({ refreshToken: rotated.refreshToken }).expect(401);
    await request(app).post('/v1/auth/sign-out').send({ refreshToken: rotated.refreshToken }).expect(204);
    await request(app).post('/v1/auth/sign-out').send({ refreshToken: 'never-issued' }).expect(204);
    const live = await database.db.select().from(refreshTokens).where(eq(refreshTokens.userId, user.id));
    expect(live.every((r) => r.revokedAt !== null)).toBe(true);
    expect(await auditFor('auth.signed_out', user.id)).toHaveLength(2);
  });
});

describe('password reset', () => {
  async function resetLinkFor(email: string): Promise<string> {
    await app.locals.services.passwordResets.settled(); // the mail goes out after the 202
    const page = await app.locals.services.mailer.outbox({ limit: 100 });
    const message = page.items.find((m) => m.to === email && m.subject.includes('password'));
    expect(message, `a reset e-mail to ${email}`).toBeDefined();
    const link = /https:\/\/console\.treadwise\.test\/reset-password\?token=([A-Za-z0-9_-]+)/.exec(message!.text);
    expect(link, 'the link points at PUBLIC_URL').not.toBeNull();
    return decodeURIComponent(link![1]);
  }

  it('answers 202 for known and unknown addresses, and mails only the known one', async () => {
    const { email } = await createMember(app, org.id, 'viewer');
    const before = (await app.locals.services.mailer.outbox({ limit: 100 })).items.length;
    await request(app).post('/v1/auth/password-reset').send({ email }).expect(202);
    await request(app).post('/v1/auth/password-reset').send({ email: 'ghost@members.test' }).expect(202);
    await app.locals.services.passwordResets.settled(); // the mail goes out after the answer
    const after = (await app.locals.services.mailer.outbox({ limit: 100 })).items;
    expect(after.length - before).toBe(1);
    expect(after.some((m) => m.to === 'ghost@members.test')).toBe(false);
  });

  it('sets the new password once, signs out every session, and lifts a lockout', async () => {
    const { user, email } = await createMember(app, org.id, 'viewer');
    const session = await signIn(app, email);
    for (let i = 0; i < 5; i++) await request(app).post('/v1/auth/sign-in').send({ email, password: 'wrong-password-y' });
    await request(app).post('/v1/auth/password-reset').send({ email }).expect(202);
    const token = await resetLinkFor(email);

    await request(app).post('/v1/auth/password-reset/confirm').send({ token, password: 'a-brand-new-pass' }).expect(204);
    await request(app).post('/v1/auth/sign-in').send({ email, password: 'a-brand-new-pass' }).expect(200);
    await request(app).post('/v1/auth/sign-in').send({ email, password: TEST_PASSWORD }).expect(401);
    await request(app).post('/v1/auth/refresh').send({ refreshToken: session.refreshToken }).expect(401);

    const again = await request(app).post('/v1/auth/password-reset/confirm').send({ token, password: 'another-new-pass' }).expect(400);
    expect(again.body.code).toBe('invalid_token');
    expect(await auditFor('auth.password_reset', user.id)).toHaveLength(1);
  });

  it('refuses a link after one hour, and a password too short', async () => {
    const { email } = await createMember(app, org.id, 'viewer');
    await request(app).post('/v1/auth/password-reset').send({ email }).expect(202);
    const token = await resetLinkFor(email);
    const short = await request(app).post('/v1/auth/password-reset/confirm').send({ token, password: 'short' }).expect(400);
    expect(short.body.code).toBe('validation_failed');
    advance(3_600_000); // 1 h: issue 4 brief
    const res = await request(app).post('/v1/auth/password-reset/confirm').send({ token, password: 'late-but-long-enough' }).expect(400);
    expect(res.body.code).toBe('invalid_token');
  });
});
