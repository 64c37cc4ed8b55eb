import { HttpErrorResponse } from '@angular/common/http';
import { describe, expect, it } from 'vitest';

import { problemMessage, readProblem } from './problem-details.js';

// A problem+json body with the members RFC 9457 defines plus the API's `code` and `requestId`;
// the values are invented for this test.
const QUOTA_PROBLEM = {
  type: 'https://treadwise.example/problems/quota-exceeded',
  title: 'Quota exceeded',
  status: 429,
  detail: 'This key has used its 500 calculations for today.',
  code: 'quota_exceeded',
  requestId: 'req_81b2',
};

function answer(status: number, body: unknown, statusText = ''): HttpErrorResponse {
  return new HttpErrorResponse({ status, statusText, error: body, url: '/v1/estimates' });
}

describe('readProblem', () => {
  it('reads the problem+json body of a failed API call', () => {
    expect(readProblem(answer(429, QUOTA_PROBLEM))).toEqual(QUOTA_PROBLEM);
  });

  it('finds no problem in a body that is plain text', () => {
    expect(readProblem(answer(502, 'Bad Gateway'))).toBeNull();
  });
});

describe('problemMessage', () => {
  it('uses the detail of a problem+json answer', () => {
    expect(problemMessage(answer(429, QUOTA_PROBLEM))).toBe(QUOTA_PROBLEM.detail);
  });

  it('falls back to the title when the problem has no detail', () => {
    const { detail: _omitted, ...withoutDetail } = QUOTA_PROBLEM;
    expect(problemMessage(answer(429, withoutDetail))).toBe(QUOTA_PROBLEM.title);
  });

  it('says the API could not be reached when no answer came back', () => {
    // HttpClient reports a network failure as status 0 (Angular HttpErrorResponse docs).
    expect(problemMessage(answer(0, new ProgressEvent('error')))).toContain('could not be reached'); // the console's own wording
  });

  it('names the status when the answer was not problem+json', () => {
    expect(problemMessage(answer(502, '<html>proxy error</html>', 'Bad Gateway'))).toBe(
      'The API answered 502 Bad Gateway.', // the console's own wording, status line from RFC 9110 §15.6.3 (from memory)
    );
  });

  it('gives a general message for errors that did not come from the API', () => {
    expect(problemMessage(new TypeError('x is undefined'))).toContain('Something went wrong'); // the console's own wording
  });
});
