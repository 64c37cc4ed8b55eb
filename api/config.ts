import { z } from 'zod';

const booleanFlag = z
  .enum(['true', 'false', '1', '0', 'yes', 'no', 'on', 'off'])
  .transform((v) => ['true', '1', 'yes', 'on'].includes(v));

const configSchema = z
  .object({
    NODE_ENV: z.enum(['development', 'production', 'test']).default('production'),
    PORT: z.coerce.number({ error: 'must be a port number (0-65535)' }).int().min(0).max(65535).default(3000),
    HOST: z.string().min(1).default('0.0.0.0'),
    DATA_DIR: z.string().min(1).default('./data'),
    DATABASE_URL: z
      .string()
      .regex(/^postgres(ql)?:\/\//, 'must be a postgres:// or postgresql:// URL')
      .optional(),
    LOG_LEVEL: z.enum(['fatal', 'error', 'warn', 'info', 'debug', 'trace', 'silent']).default('info'),
    SEED_DEMO: booleanFlag.optional(),
    JSON_BODY_LIMIT: z.string().regex(/^\d+(b|kb|mb)$/i, 'like 100kb or 1mb').default('256kb'),
    CONSOLE_DIR: z.string().min(1).default('./dist/console/browser'),
    EMBED_DIR: z.string().min(1).default('./dist/embed'),
    DEMO_SHOP_DIR: z.string().min(1).default('./demo-shop'),
    DEMO_SHOP_PORT: z.coerce.number({ error: 'must be a port number (0-65535)' }).int().min(0).max(65535).optional(),
    KEY_PEPPER: z.string().min(32, 'must be at least 32 characters').optional(),
    JWT_PRIVATE_KEY: z.string().includes('PRIVATE KEY', { message: 'must be a PEM private key' }).optional(),
    REDIS_URL: z.string().regex(/^rediss?:\/\//, 'must be a redis:// or rediss:// URL').optional(),
    SMTP_URL: z.string().regex(/^smtps?:\/\//, 'must be an smtp:// or smtps:// URL').optional(),
    MAIL_FROM: z.string().min(3).default('Treadwise <no-reply@treadwise.test>'),
    TRUST_PROXY: z
      .string()
      .regex(/^(false|true|loopback|linklocal|uniquelocal|\d{1,2}|[0-9a-f.:/, ]+)$/i, 'false, loopback, a hop count or addresses')
      .default('false'),
    PUBLIC_URL: z.url({ protocol: /^https?$/, error: 'must be an http(s) URL' }).optional(),
    HTTP_HEADERS_TIMEOUT_MS: z.coerce.number({ error: 'must be a number of milliseconds' }).int().min(100).max(300_000).default(10_000),
    HTTP_REQUEST_TIMEOUT_MS: z.coerce.number({ error: 'must be a number of milliseconds' }).int().min(100).max(600_000).default(30_000),
    HTTP_KEEP_ALIVE_TIMEOUT_MS: z.coerce.number({ error: 'must be a number of milliseconds' }).int().min(0).max(600_000).default(5_000),
    HTTP_MAX_CONNECTIONS: z.coerce.number({ error: 'must be a whole number' }).int().min(1).max(1_000_000).default(1_000),
    SHUTDOWN_DRAIN_MS: z.coerce.number({ error: 'must be a number of milliseconds' }).int().min(0).max(600_000).default(10_000),
    USAGE_FLUSH_INTERVAL_MS: z.coerce.number({ error: 'must be a number of milliseconds' }).int().min(100).max(3_600_000).default(1_000),
    METRICS_TOKEN: z.string().min(24, 'must be at least 24 characters (a random secret)').optional(),
    WEB_CONCURRENCY: z.coerce.number({ error: 'must be a whole number of worker processes' }).int().min(1).max(64).default(1),
    USAGE_FLUSH_AFTER_CALLS: z.coerce.number({ error: 'must be a whole number of calls' }).int().min(1).max(1_000_000).default(100),
    BATCH_RETENTION_DAYS: z.coerce.number({ error: 'must be a whole number of days' }).int().min(1).max(366).default(7),
    PAYMENTS_SECRET_KEY: z.string().regex(/^(sk|rk)_(test|live)_[A-Za-z0-9_]{8,}$/, 'must be a secret or restricted key (sk_… or rk_…)').optional(),
    PAYMENTS_WEBHOOK_SECRET: z.string().regex(/^whsec_[A-Za-z0-9_]{8,}$/, 'must be a webhook signing secret (whsec_…)').optional(),
    PAYMENTS_API_URL: z.url({ protocol: /^https?$/, error: 'must be an http(s) URL' }).optional(),
  })
  .refine((env) => env.HTTP_REQUEST_TIMEOUT_MS >= env.HTTP_HEADERS_TIMEOUT_MS, {
    path: ['HTTP_REQUEST_TIMEOUT_MS'],
    message: 'must not be shorter than HTTP_HEADERS_TIMEOUT_MS (the headers are part of the request)',
  })
  .refine((env) => env.WEB_CONCURRENCY === 1 || env.DATABASE_URL === undefined || env.REDIS_URL !== undefined, {
    path: ['WEB_CONCURRENCY'],
    message: 'more than one worker needs REDIS_URL, so that every worker counts against the same rate limits',
  })
  .refine((env) => (env.PAYMENTS_SECRET_KEY === undefined) === (env.PAYMENTS_WEBHOOK_SECRET === undefined), {
    path: ['PAYMENTS_WEBHOOK_SECRET'],
    message: 'set PAYMENTS_SECRET_KEY and PAYMENTS_WEBHOOK_SECRET together (neither: payments are simulated locally)',
  })
  .transform((env) => ({
    nodeEnv: env.NODE_ENV,
    port: env.PORT,
    host: env.HOST,
    dataDir: env.DATA_DIR,
    databaseUrl: env.DATABASE_URL,
    logLevel: env.LOG_LEVEL,
    // Demo accounts must never reach a production database: on by default only for the
    // embedded database, off when a real server is configured unless asked for.
    seedDemo: env.SEED_DEMO ?? env.DATABASE_URL === undefined,
    jsonBodyLimit: env.JSON_BODY_LIMIT,
    consoleDir: env.CONSOLE_DIR,
    embedDir: env.EMBED_DIR,
    demoShopDir: env.DEMO_SHOP_DIR,
    // The demo shop is a second origin beside the API: by default the next port (0: any free one).
    demoShopPort: env.DEMO_SHOP_PORT ?? (env.PORT === 0 ? 0 : Math.min(env.PORT + 1, 65535)),
    keyPepper: env.KEY_PEPPER,
    jwtPrivateKeyPem: env.JWT_PRIVATE_KEY,
    redisUrl: env.REDIS_URL,
    smtpUrl: env.SMTP_URL,
    mailFrom: env.MAIL_FROM,
    // Behind a reverse proxy, per-IP limits need the client address from X-Forwarded-For.
    trustProxy: env.TRUST_PROXY === 'false' ? false : env.TRUST_PROXY === 'true' ? true : /^\d+$/.test(env.TRUST_PROXY) ? Number(env.TRUST_PROXY) : env.TRUST_PROXY,
    // Links in e-mails point here; the default suits the local demo.
    publicUrl: (env.PUBLIC_URL ?? `http://localhost:${env.PORT}`).replace(/\/$/, ''),
    // Slow clients may not hold connections for long; see api/http-server.ts.
    httpHeadersTimeoutMs: env.HTTP_HEADERS_TIMEOUT_MS,
    httpRequestTimeoutMs: env.HTTP_REQUEST_TIMEOUT_MS,
    httpKeepAliveTimeoutMs: env.HTTP_KEEP_ALIVE_TIMEOUT_MS,
    httpMaxConnections: env.HTTP_MAX_CONNECTIONS,
    // On SIGTERM, how long answers under way may take to reach slow clients before they are cut.
    shutdownDrainMs: env.SHUTDOWN_DRAIN_MS,
    // Buffered usage counters are written this often and as soon as this many calls wait (a
    // graceful shutdown also writes them): together they bound what a crash can lose.
    usageFlushIntervalMs: env.USAGE_FLUSH_INTERVAL_MS,
    usageFlushAfterCalls: env.USAGE_FLUSH_AFTER_CALLS,
    // GET /metrics for a scraper holding this token (the operator may always read it).
    metricsToken: env.METRICS_TOKEN,
    // Worker processes on one port (node:cluster); only with DATABASE_URL, see api/cluster.ts.
    webConcurrency: env.WEB_CONCURRENCY,
    // Batch jobs and their results are deleted this many days after they finish (or were created, if they never do).
    batchRetentionDays: env.BATCH_RETENTION_DAYS,
    // The payment provider; absent, the server starts a local simulation of it (api/payments/fake-provider.ts).
    payments: env.PAYMENTS_SECRET_KEY && env.PAYMENTS_WEBHOOK_SECRET ? { secretKey: env.PAYMENTS_SECRET_KEY, webhookSecret: env.PAYMENTS_WEBHOOK_SECRET, apiUrl: env.PAYMENTS_API_URL } : undefined,
  }));

export type Config = z.output<typeof configSchema>;

export class ConfigError extends Error {}

/** Parses the environment; a bad value is one clear line, never a stack trace. */
export function loadConfig(env: NodeJS.ProcessEnv = process.env): Config {
  const parsed = configSchema.safeParse(env);
  if (!parsed.success) {
    const issues = parsed.error.issues.map((i) => `${i.path.join('.') || '(env)'}: ${i.message}`);
    throw new ConfigError(`Invalid configuration: ${issues.join('; ')}`);
  }
  return parsed.data;
}
