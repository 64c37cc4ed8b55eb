import { FormControl, FormGroup } from '@angular/forms';
import { describe, expect, it } from 'vitest';

import { createRequest, futureDate, offeredScopes, originProblem, originsFitKind, parseOrigins } from './key-form.js';

function keyForm(kind: 'server' | 'embed', origins: string): FormGroup {
  return new FormGroup({ kind: new FormControl(kind), origins: new FormControl(origins) }, { validators: originsFitKind });
}

describe('the new-key form rules', () => {
  it('needs at least one origin for an embed key', () => {
    expect(keyForm('embed', '  \n ').getError('origins')).toContain('at least one allowed origin');
    expect(keyForm('embed', 'https://shop.harborlane.test').valid).toBe(true);
  });

  it('ignores the origins box for a server key', () => {
    expect(keyForm('server', '').valid).toBe(true);
  });

  it('names the first origin the API would refuse', () => {
    const error = keyForm('embed', 'https://shop.harborlane.test\nshop.harborlane.test').getError('origins') as string;
    expect(error).toContain('shop.harborlane.test is not an origin');
  });

  // Cases of the API's own origin rule (shared/schemas/api-keys.ts).
  it.each([
    ['https://*.harborlane.test', null],
    ['http://localhost:4200', null],
    ['https://*.test', 'a wildcard needs two labels'],
    ['https://shop.harborlane.test:70000', 'the port must be 1 to 65535'],
    ['https://shop.harborlane.test/path', 'is not an origin'],
  ])('judges %s', (origin, problem) => {
    const found = originProblem(origin);
    if (problem === null) expect(found).toBeNull();
    else expect(found).toContain(problem);
  });

  it('refuses more than 20 origins, as the API does', () => {
    const many = Array.from({ length: 21 }, (_, i) => `https://shop${i}.harborlane.test`).join('\n');
    expect(keyForm('embed', many).getError('origins')).toContain('At most 20');
  });

  it('reads one origin a line, lower-cased, skipping blanks', () => {
    expect(parseOrigins(' HTTPS://Shop.HarborLane.test \n\nhttps://b.harborlane.test')).toEqual(['https://shop.harborlane.test', 'https://b.harborlane.test']);
  });

  it('accepts only an expiry day after today', () => {
    const noon = new Date(2026, 11, 2, 12, 0, 0); // 2 December 2026, local time
    const rule = futureDate(() => noon);
    expect(rule(new FormControl('2026-12-02'))).toEqual({ past: true });
    expect(rule(new FormControl('2026-11-30'))).toEqual({ past: true });
    expect(rule(new FormControl('2026-12-03'))).toBeNull();
    expect(rule(new FormControl(''))).toBeNull(); // no expiry
  });

  it('offers an embed key only sizing:run and catalog:read', () => {
    expect(offeredScopes('embed', 'admin')).toEqual(['sizing:run', 'catalog:read']);
    expect(offeredScopes('server', 'admin')).toContain('keys:manage');
  });

  it('sends origins only for embed keys, and the expiry at the end of the chosen day', () => {
    const embed = createRequest({ kind: 'embed', name: ' Product pages ', scopes: ['sizing:run'], origins: 'https://shop.harborlane.test', expiresOn: '2027-01-31' });
    expect(embed).toEqual({
      kind: 'embed',
      name: 'Product pages',
      scopes: ['sizing:run'],
      allowedOrigins: ['https://shop.harborlane.test'],
      expiresAt: new Date(2027, 0, 31, 23, 59, 59).toISOString(),
    });
    const server = createRequest({ kind: 'server', name: 'Checkout', scopes: ['sizing:run'], origins: 'https://left.over.test', expiresOn: '' });
    expect(server).toEqual({ kind: 'server', name: 'Checkout', scopes: ['sizing:run'] });
  });
});
