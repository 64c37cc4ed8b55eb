import { problemSchema } from '../shared/schemas/problem.js';
import { CliError } from './errors.js';
import type { CliIo } from './io.js';

export interface ApiResponse {
  status: number;
  body: unknown;
}

/** GETs a Treadwise URL; a network failure or a problem+json answer becomes a readable CliError. */
export async function apiGet(io: CliIo, apiUrl: string, path: string): Promise<ApiResponse> {
  const url = new URL(path, apiUrl.endsWith('/') ? apiUrl : `${apiUrl}/`);
  let res: Response;
  try {
    res = await io.fetch(url, { headers: { accept: 'application/json' }, signal: AbortSignal.timeout(10_000) });
  } catch (err) {
    const cause = (err as { cause?: { code?: string; errors?: { code?: string }[] } }).cause;
    const code = cause?.code ?? cause?.errors?.[0]?.code ?? (cause as Error | undefined)?.message ?? (err as Error).message;
    throw new CliError(`cannot reach ${url.origin} (${code})`);
  }
  const text = await res.text();
  let body: unknown = text;
  try {
    body = text ? JSON.parse(text) : undefined;
  } catch {
    // not JSON: keep the text for the message below
  }
  return { status: res.status, body };
}

export function problemMessage(body: unknown, status: number): string {
  const problem = problemSchema.safeParse(body);
  return problem.success ? `${problem.data.title}: ${problem.data.detail ?? problem.data.code}` : `HTTP ${status}`;
}
