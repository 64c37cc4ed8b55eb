import { HttpErrorResponse } from '@angular/common/http';
import { describe, expect, it } from 'vitest';

import { CreationKey, randomIdempotencyKey } from './idempotency.js';

describe('CreationKey', () => {
  it('keeps the key for a retry of the same body after a lost answer', () => {
    const keys = new CreationKey();
    const first = keys.for({ name: 'Saltmarsh Cottage staircase' });
    keys.failed(new HttpErrorResponse({ status: 0 }));
    expect(keys.for({ name: 'Saltmarsh Cottage staircase' })).toBe(first);
  });

  it('takes a new key after a refusal or for another body', () => {
    const keys = new CreationKey();
    const first = keys.for({ name: 'A' });
    expect(keys.for({ name: 'B' })).not.toBe(first);
    const second = keys.for({ name: 'B' });
    keys.failed(new HttpErrorResponse({ status: 400 }));
    expect(keys.for({ name: 'B' })).not.toBe(second);
  });

  it('makes 128-bit hex keys', () => {
    expect(randomIdempotencyKey()).toMatch(/^[0-9a-f]{32}$/);
  });
});
