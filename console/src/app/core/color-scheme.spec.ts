import { provideZonelessChangeDetection } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import { afterEach, describe, expect, it } from 'vitest';

import { ColorScheme } from './color-scheme.js';

describe('ColorScheme', () => {
  afterEach(() => {
    localStorage.clear();
    document.documentElement.style.colorScheme = '';
  });

  function start(): ColorScheme {
    TestBed.configureTestingModule({ providers: [provideZonelessChangeDetection()] });
    return TestBed.inject(ColorScheme);
  }

  it('follows the system until the user picks, then keeps the pick across page loads', () => {
    const scheme = start();
    TestBed.tick();
    expect(document.documentElement.style.colorScheme).toBe('');
    scheme.next(); // light
    scheme.next(); // dark
    TestBed.tick();
    expect(document.documentElement.style.colorScheme).toBe('dark');
    expect(localStorage.getItem('treadwise.color-scheme')).toBe('dark');

    TestBed.resetTestingModule();
    expect(start().choice()).toBe('dark');
  });
});
