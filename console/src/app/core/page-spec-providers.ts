import { provideHttpClient } from '@angular/common/http';
import { provideHttpClientTesting } from '@angular/common/http/testing';
import { type EnvironmentProviders, type Provider, provideZonelessChangeDetection, signal } from '@angular/core';
import { MATERIAL_ANIMATIONS } from '@angular/material/core';
import { provideRouter } from '@angular/router';

import type { Role } from './api-types.js';
import { Auth } from './auth.js';
import { provideConsoleIcons } from './console-icons.js';

/**
 * Test support: what a page's spec needs to render it for a role — zoneless change detection, a
 * router, HttpClient against HttpTestingController, the icons, dialogs without animation (they
 * close at once) and a signed-in user of that role.
 */
export function pageSpecProviders(role: Role | null): (Provider | EnvironmentProviders)[] {
  return [
    provideZonelessChangeDetection(),
    provideRouter([]),
    provideHttpClient(),
    provideHttpClientTesting(),
    provideConsoleIcons(),
    { provide: MATERIAL_ANIMATIONS, useValue: { animationsDisabled: true } },
    { provide: Auth, useValue: { role: signal<Role | null>(role) } },
  ];
}
