import { provideZonelessChangeDetection, signal } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import { type ActivatedRouteSnapshot, type RouterStateSnapshot, UrlTree, provideRouter } from '@angular/router';
import { describe, expect, it } from 'vitest';

import { Auth } from './auth.js';
import { requireOperator } from './operator-guard.js';

function run(operator: boolean | null): unknown {
  TestBed.configureTestingModule({
    providers: [
      provideZonelessChangeDetection(),
      provideRouter([]),
      { provide: Auth, useValue: { user: signal(operator === null ? null : { id: 'u', email: 'ops@treadwise.test', name: null, operator }) } },
    ],
  });
  return TestBed.runInInjectionContext(() => requireOperator({} as ActivatedRouteSnapshot, {} as RouterStateSnapshot));
}

describe('requireOperator', () => {
  it('lets the operator through', () => {
    expect(run(true)).toBe(true);
  });

  it.each([false, null])('sends anyone else (operator: %s) to the not-allowed page', (operator) => {
    const result = run(operator);
    expect(result).toBeInstanceOf(UrlTree);
    expect(String(result)).toBe('/not-allowed');
  });
});
