import { pino } from 'pino';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createApp } from '../../api/app.js';
import { loadConfig } from '../../api/config.js';
import { ephemeralSecrets } from '../../api/auth/secrets.js';
import { REDACTED_PATHS } from '../../api/logger.js';
import { createKey, createOrganization } from '../support/fixtures.js';
import { QUIET_METER, type TestApp } from '../support/test-app.js';
import { createTestDatabase } from '../support/test-database.js';

const VD = { supplyVoltageV: 24, currentA: 2, lengthM: 10, conductor: { crossSectionMm2: 0.75 } };

/** The access log as the server writes it (info level), into memory. */
const lines: Record<string, unknown>[] = [];
let t: TestApp;
let key: string;
beforeAll(async () => {
  const config = loadConfig({ NODE_ENV: 'test', LOG_LEVEL: 'info', CONSOLE_DIR: '/nonexistent', ...QUIET_METER });
  const database = await createTestDatabase();
  const secrets = ephemeralSecrets();
  const logger = pino({ level: 'info', redact: { paths: REDACTED_PATHS, censor: '[redacted]' } }, { write: (line: string) => void lines.push(JSON.parse(line)) });
  const app = createApp({ config, database, logger, secrets, clock: () => new Date() });
  t = { app, database, config, secrets, close: () => database.close() };
  key = (await createKey(t, (await createOrganization(t)).id)).token;
});
afterAll(() => t.close());

const lineOf = (requestId: string) => lines.filter((l) => (l.req as { id?: string } | undefined)?.id === requestId && String(l.msg).startsWith('request '));

describe('access log', () => {
  it('writes one line per answered call: id, method, path without the query, status and time; never the credential', async () => {
    const res = await request(t.app).post('/v1/calculations/voltage-drop?trace=false').set('Authorization', `Bearer ${key}`).send(VD).expect(200);
    const id = res.headers['x-request-id']!;
    const [line, ...more] = lineOf(id);
    expect(more).toHaveLength(0);
    expect(line).toMatchObject({ level: 30, msg: 'request completed', req: { id, method: 'POST', url: '/v1/calculations/voltage-drop' }, res: { statusCode: 200 } });
    expect(typeof line.responseTime).toBe('number');
    expect(JSON.stringify(lines)).not.toContain(key.slice(-32)); // the key's secret part
  });

  it('logs a client error at warn, with the id the client sent', async () => {
    await request(t.app).get('/v1/no-such-route').set('X-Request-Id', 'checkout-77').expect(404);
    expect(lineOf('checkout-77')).toEqual([expect.objectContaining({ level: 40, msg: 'request completed', res: { statusCode: 404 } })]);
  });
});
