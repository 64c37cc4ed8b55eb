import { describe, expect, it } from 'vitest';
import { problemFromAnswer, retryAfterSeconds } from './shopper-problem.js';

describe('problemFromAnswer', () => {
  it('tells the shopper the estimator is not enabled for this website on an origin refusal', () => {
    const p = problemFromAnswer(403, { code: 'origin_not_allowed', detail: 'Origin https://elsewhere.test is not allowed for this key.' }, null);
    expect(p.kind).toBe('origin');
    expect(p.message).toContain('not enabled for this website');
  });

  it('gives the retry time of a rate limit in seconds', () => {
    const p = problemFromAnswer(429, { code: 'rate_limited' }, '17');
    expect(p).toMatchObject({ kind: 'rate-limit', retryAfterS: 17 });
    expect(p.message).toContain('try again in 17 seconds');
  });

  it('keeps the field errors of a refused stair', () => {
    const p = problemFromAnswer(400, { code: 'validation_failed', errors: [{ path: 'staircase.riserHeightMm', message: 'Too big: expected number to be <=400' }] }, null);
    expect(p.kind).toBe('input');
    expect(p.fields).toEqual([{ path: 'staircase.riserHeightMm', message: 'Too big: expected number to be <=400' }]);
  });

  it('never shows a server failure as the shopper’s fault', () => {
    expect(problemFromAnswer(500, null, null).kind).toBe('service');
    expect(problemFromAnswer(401, { code: 'key_revoked' }, null).kind).toBe('key');
  });
});

describe('retryAfterSeconds', () => {
  it('reads delta-seconds and HTTP dates (RFC 9110 §10.2.3)', () => {
    expect(retryAfterSeconds('30')).toBe(30);
    expect(retryAfterSeconds('Wed, 02 Dec 2026 10:00:30 GMT', new Date('2026-12-02T10:00:00Z'))).toBe(30);
    expect(retryAfterSeconds('soon')).toBeUndefined();
    expect(retryAfterSeconds(null)).toBeUndefined();
  });
});
