import { describe, expect, it } from 'vitest';

import { safeNext } from './sign-in-page.js';

describe('safeNext', () => {
  it('returns to a page inside the console', () => {
    expect(safeNext('/keys')).toBe('/keys');
  });

  it.each(['https://elsewhere.test/', '//elsewhere.test/x', 'keys', null])('refuses %s and goes home', (next) => {
    expect(safeNext(next)).toBe('/');
  });
});
