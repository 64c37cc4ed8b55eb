import { provideHttpClient } from '@angular/common/http';
import { provideHttpClientTesting } from '@angular/common/http/testing';
import { provideZonelessChangeDetection } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import { Router, provideRouter } from '@angular/router';
import { RouterTestingHarness } from '@angular/router/testing';
import { beforeEach, describe, expect, it } from 'vitest';

import { routes } from './app.routes.js';
import { provideConsoleIcons } from './core/console-icons.js';
import { StatusPage } from './status/status-page.js';

describe('console routes', () => {
  beforeEach(() => {
    TestBed.configureTestingModule({
      providers: [
        provideZonelessChangeDetection(),
        provideRouter(routes),
        provideHttpClient(),
        provideHttpClientTesting(),
        provideConsoleIcons(),
      ],
    });
  });

  it.each(['/', '/no-such-page'])('opens the status page for %s', async (url) => {
    const harness = await RouterTestingHarness.create();
    const page = await harness.navigateByUrl(url, StatusPage);
    expect(page).toBeInstanceOf(StatusPage);
    expect(TestBed.inject(Router).url).toBe('/status'); // redirects declared in app.routes.ts
  });
});
