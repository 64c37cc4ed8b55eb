import { provideZonelessChangeDetection } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import { beforeEach, describe, expect, it } from 'vitest';

import { provideConsoleIcons } from '../core/console-icons.js';
import type { CheckState } from './check.js';
import { StatusBadge } from './status-badge.js';

describe('StatusBadge', () => {
  beforeEach(() => {
    TestBed.configureTestingModule({
      providers: [provideZonelessChangeDetection(), provideConsoleIcons()],
    });
  });

  async function render(state: CheckState): Promise<HTMLElement> {
    const fixture = TestBed.createComponent(StatusBadge);
    fixture.componentRef.setInput('state', state);
    await fixture.whenStable();
    return fixture.nativeElement as HTMLElement;
  }

  // The words are the console's own labels; the browser test looks for "Healthy".
  it.each([
    ['checking', 'Checking…'],
    ['healthy', 'Healthy'],
    ['unavailable', 'Unavailable'],
  ] as const)('puts a %s check into words', async (state, label) => {
    const badge = await render(state);
    expect(badge.textContent?.trim()).toBe(label);
    expect(badge.getAttribute('data-state')).toBe(state);
  });

  it('announces changes to assistive technology as a status region', async () => {
    const badge = await render('healthy');
    expect(badge.getAttribute('role')).toBe('status'); // WAI-ARIA 1.2, role "status": a polite live region (from memory)
  });
});
