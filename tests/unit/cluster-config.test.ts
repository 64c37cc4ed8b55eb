import { describe, expect, it } from 'vitest';
import { singleProcessReason } from '../../api/cluster.js';
import { ConfigError, loadConfig } from '../../api/config.js';

const PG = 'postgres://u@127.0.0.1:5432/db';

describe('WEB_CONCURRENCY', () => {
  it('runs one process by default', () => {
    const config = loadConfig({});
    expect(config.webConcurrency).toBe(1);
    expect(singleProcessReason(config)).toBeNull();
  });

  it('stays one process on the embedded database and says why', () => {
    const reason = singleProcessReason(loadConfig({ WEB_CONCURRENCY: '4' }));
    expect(reason).toContain('WEB_CONCURRENCY=4 ignored');
    expect(reason).toContain('PGlite');
  });

  it('runs workers with DATABASE_URL and REDIS_URL', () => {
    const config = loadConfig({ WEB_CONCURRENCY: '3', DATABASE_URL: PG, REDIS_URL: 'redis://127.0.0.1:6379' });
    expect(config.webConcurrency).toBe(3);
    expect(singleProcessReason(config)).toBeNull();
  });

  it('refuses workers on PostgreSQL without Redis: each worker would keep its own rate limits', () => {
    expect(() => loadConfig({ WEB_CONCURRENCY: '2', DATABASE_URL: PG })).toThrow(ConfigError);
    expect(() => loadConfig({ WEB_CONCURRENCY: '2', DATABASE_URL: PG })).toThrow(/REDIS_URL/);
  });

  it('takes a scrape token only when it is long enough to be a secret', () => {
    expect(() => loadConfig({ METRICS_TOKEN: 'short' })).toThrow(/METRICS_TOKEN/);
    expect(loadConfig({ METRICS_TOKEN: 'x'.repeat(24) }).metricsToken).toBe('x'.repeat(24));
  });
});
