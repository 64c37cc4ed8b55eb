import { provideZonelessChangeDetection } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import { provideRouter } from '@angular/router';
import { beforeEach, describe, expect, it } from 'vitest';

import { App } from './app.js';
import { routes } from './app.routes.js';
import { provideConsoleIcons } from './core/console-icons.js';

describe('App', () => {
  beforeEach(() => {
    TestBed.configureTestingModule({
      providers: [provideZonelessChangeDetection(), provideRouter(routes), provideConsoleIcons()],
    });
  });

  async function render(): Promise<HTMLElement> {
    const fixture = TestBed.createComponent(App);
    await fixture.whenStable();
    return fixture.nativeElement as HTMLElement;
  }

  it('shows the product name in the toolbar', async () => {
    const shell = await render();
    expect(shell.querySelector('mat-toolbar [data-testid="product-name"]')?.textContent?.trim()).toBe('Treadwise'); // the product's name
  });

  it('links to the status page from the navigation', async () => {
    const shell = await render();
    const links = [...shell.querySelectorAll<HTMLAnchorElement>('mat-nav-list a')];
    expect(links.map((link) => link.textContent?.trim())).toEqual(['Status']); // DESTINATIONS in navigation.ts: the only section so far
    expect(links[0]?.getAttribute('href')).toBe('/status'); // the status route in app.routes.ts
  });
});
