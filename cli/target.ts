import { CliError, EXIT } from './errors.js';
import type { CliIo } from './io.js';
import { readLogin } from './login-store.js';
import { apiUrlSchema, DEFAULT_API_URL, type ApiOptions } from './options.js';

/** Which API to call and with which key: flags, then TREADWISE_API_URL / TREADWISE_API_KEY, then the login. */
export interface ApiTarget {
  apiUrl: string;
  apiKey?: string;
}

export function resolveTarget(io: CliIo, opts: Pick<ApiOptions, 'apiUrl' | 'apiKey'>): ApiTarget {
  const stored = readLogin(io);
  const envUrl = io.env.TREADWISE_API_URL || undefined;
  if (envUrl && !apiUrlSchema.safeParse(envUrl).success) throw new CliError(`TREADWISE_API_URL must be an http(s) URL`, EXIT.usage);
  const apiUrl = opts.apiUrl ?? envUrl ?? stored?.apiUrl ?? DEFAULT_API_URL;
  const apiKey = opts.apiKey ?? (io.env.TREADWISE_API_KEY || undefined) ?? stored?.apiKey;
  return { apiUrl, apiKey };
}

/** As resolveTarget, for commands that cannot run without a key. */
export function requireKey(io: CliIo, opts: Pick<ApiOptions, 'apiUrl' | 'apiKey'>): Required<ApiTarget> {
  const target = resolveTarget(io, opts);
  if (!target.apiKey) throw new CliError('no API key: run treadwise login, or pass --api-key or TREADWISE_API_KEY', EXIT.usage);
  return { apiUrl: target.apiUrl, apiKey: target.apiKey };
}
