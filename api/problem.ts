import type { FieldError } from '../shared/schemas/check-input.js';

export type { FieldError };

/** A failure the API reports as RFC 9457 problem+json; thrown anywhere, rendered in one place. */
export class HttpProblem extends Error {
  constructor(
    readonly status: number,
    readonly code: string,
    readonly title: string,
    readonly detail?: string,
    readonly extra: { errors?: FieldError[]; headers?: Record<string, string> } = {},
  ) {
    super(detail ?? title);
  }
}

export const problems = {
  validation: (errors: FieldError[], detail = 'The request does not match the schema.') =>
    new HttpProblem(400, 'validation_failed', 'Invalid request', detail, { errors }),
  badRequest: (code: string, detail: string) => new HttpProblem(400, code, 'Bad request', detail),
  notFound: (detail = 'No such resource.') => new HttpProblem(404, 'not_found', 'Not found', detail),
  conflict: (code: string, detail: string) => new HttpProblem(409, code, 'Conflict', detail),
  unauthenticated: (detail = 'Send a valid API key or access token as `Authorization: Bearer …`.', code = 'credential_missing') =>
    new HttpProblem(401, code, 'Unauthenticated', detail, { headers: { 'WWW-Authenticate': 'Bearer realm="treadwise"' } }),
  forbidden: (detail: string, code = 'forbidden') => new HttpProblem(403, code, 'Forbidden', detail),
  notReady: (detail: string) => new HttpProblem(503, 'not_ready', 'Service not ready', detail),
};

/** The `type` URI of a problem: documented per code on the docs page. */
export function problemType(code: string): string {
  return `https://treadwise.test/problems/${code.replace(/_/g, '-')}`;
}
