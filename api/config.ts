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
