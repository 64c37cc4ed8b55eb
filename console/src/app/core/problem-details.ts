import { HttpErrorResponse } from '@angular/common/http';

import type { Problem } from '../../../../shared/schemas/problem.js';

/** RFC 9457 problem details as the API sends them; any member may be missing from a stray body. */
export type ProblemDetails = Partial<Problem>;

/** The problem+json body of a failed API call, or null when the failure carried none. */
export function readProblem(error: unknown): ProblemDetails | null {
  if (!(error instanceof HttpErrorResponse)) return null;
  const body: unknown = error.error;
  if (typeof body !== 'object' || body === null) return null;
  const { title, detail } = body as ProblemDetails;
  return typeof title === 'string' || typeof detail === 'string' ? (body as ProblemDetails) : null;
}

/** One sentence a console user can act on: the problem's `detail` whenever the API sent one. */
export function problemMessage(error: unknown): string {
  const problem = readProblem(error);
  if (problem?.detail) return problem.detail;
  if (problem?.title) return problem.title;
  if (error instanceof HttpErrorResponse) {
    // Status 0 means no HTTP answer at all: network down, proxy target not started, timeout.
    if (error.status === 0) return 'The API could not be reached. Check that it is running.';
    return `The API answered ${error.status}${error.statusText ? ` ${error.statusText}` : ''}.`;
  }
  return 'Something went wrong in the console. The browser console has the details.';
}
