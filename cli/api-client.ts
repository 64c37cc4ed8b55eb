import createClient from 'openapi-fetch';
import type { paths } from '../openapi/api-types.js';
import { API_VERSION } from '../api/version.js';
import { problemSchema } from '../shared/schemas/problem.js';
import { CliError, EXIT } from './errors.js';
import type { CliIo } from './io.js';
import type { ApiTarget } from './target.js';

export interface ApiResponse {
  status: number;
  body: unknown;
}

const TIMEOUT_MS = 60_000;

/** A network failure as one line: which origin, and the system's reason. */
export function unreachable(url: URL | string, err: unknown): CliError {
  const cause = (err as { cause?: { code?: string; errors?: { code?: string }[] } }).cause;
  const code = cause?.code ?? cause?.errors?.[0]?.code ?? (cause as Error | undefined)?.message ?? (err as Error).message;
  return new CliError(`cannot reach ${new URL(url).origin} (${code})`);
}

/** GETs a Treadwise URL without credentials; a network failure becomes a readable CliError. */
export async function apiGet(io: CliIo, apiUrl: string, path: string): Promise<ApiResponse> {
  const url = new URL(path, apiUrl.endsWith('/') ? apiUrl : `${apiUrl}/`);
  let res: Response;
  try {
    res = await io.fetch(url, { headers: { accept: 'application/json' }, signal: AbortSignal.timeout(10_000) });
  } catch (err) {
    throw unreachable(url, err);
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

/**
 * A problem+json answer as one readable line: what went wrong, each field at fault, and the
 * request id to quote to the operator.
 */
export function problemLine(body: unknown, response: Response): string {
  const problem = problemSchema.safeParse(body);
  const requestId = (problem.success ? problem.data.requestId : undefined) ?? response.headers.get('x-request-id') ?? undefined;
  const parts: string[] = [];
  if (problem.success) {
    const p = problem.data;
    parts.push(p.detail ? `${p.title}: ${p.detail}` : p.title);
    if (p.errors?.length) parts.push(p.errors.map((e) => `${e.path || '(body)'}: ${e.message}`).join('; '));
    const retryAfter = response.headers.get('retry-after');
    if (response.status === 429 && retryAfter) parts.push(`retry after ${retryAfter} s`);
    parts.push(`(${[`code ${p.code}`, requestId && `request ${requestId}`].filter(Boolean).join(', ')})`);
  } else {
    parts.push(`HTTP ${response.status} ${response.statusText}`.trim());
    if (requestId) parts.push(`(request ${requestId})`);
  }
  return parts.join(' ').replace(/[\r\n]+/g, ' ');
}

export type ApiClient = ReturnType<typeof createClient<paths>>;

/** The typed client (types generated from openapi/openapi.json) for one API and key. */
export function createApiClient(io: CliIo, target: ApiTarget): ApiClient {
  return createClient<paths>({
    baseUrl: target.apiUrl.replace(/\/+$/, ''),
    headers: {
      accept: 'application/json',
      'user-agent': `treadwise-cli/${API_VERSION}`,
      ...(target.apiKey ? { authorization: `Bearer ${target.apiKey}` } : {}),
    },
    fetch: async (request: Request) => {
      try {
        return await io.fetch(new Request(request, { signal: AbortSignal.timeout(TIMEOUT_MS) }));
      } catch (err) {
        throw unreachable(request.url, err);
      }
    },
  });
}

/** A call's data, or its problem as a CliError (bad input: usage error; anything else: failure). */
export async function unwrap<T>(call: Promise<{ data?: T; error?: unknown; response: Response }>): Promise<T> {
  const { data, error, response } = await call;
  if (response.ok && error === undefined) return data as T;
  throw new CliError(problemLine(error, response), response.status === 400 ? EXIT.usage : EXIT.failure);
}

/** Every item of a cursor-paginated list (`{ items, nextCursor }`), page by page. */
export async function everyPage<T>(page: (query: { limit: number; cursor?: string }) => Promise<{ items: T[]; nextCursor: string | null }>): Promise<T[]> {
  const items: T[] = [];
  let cursor: string | undefined;
  do {
    const answer = await page({ limit: 200, ...(cursor ? { cursor } : {}) });
    items.push(...answer.items);
    cursor = answer.nextCursor ?? undefined;
  } while (cursor);
  return items;
}
