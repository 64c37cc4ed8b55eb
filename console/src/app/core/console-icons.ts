import { type EnvironmentProviders, inject, provideAppInitializer } from '@angular/core';
import { MatIconRegistry } from '@angular/material/icon';
import { DomSanitizer } from '@angular/platform-browser';

// Our own line icons, drawn on a 24-unit grid and shipped in the bundle so nothing loads from a
// font CDN. Use them as <mat-icon svgIcon="tw:name" />.
const stroke = 'fill="none" stroke="currentColor" stroke-width="2" stroke-linecap="round" stroke-linejoin="round"';

const CONSOLE_ICONS: Readonly<Record<string, string>> = {
  // Three bars shortening like steps seen from the side.
  menu: `<svg viewBox="0 0 24 24"><path ${stroke} d="M4 6.5h16M4 12h12M4 17.5h8"/></svg>`,
  status: `<svg viewBox="0 0 24 24"><path ${stroke} d="M3 12.5h4l2.5-6 4 11 2.5-5H21"/></svg>`,
  healthy: `<svg viewBox="0 0 24 24"><circle ${stroke} cx="12" cy="12" r="9"/><path ${stroke} d="m8 12.5 2.8 2.8L16.2 9.6"/></svg>`,
  unavailable: `<svg viewBox="0 0 24 24"><circle ${stroke} cx="12" cy="12" r="9"/><path ${stroke} d="M12 7.5v5.5"/><circle cx="12" cy="16.4" r="1.2" fill="currentColor"/></svg>`,
  refresh: `<svg viewBox="0 0 24 24"><path ${stroke} d="M19.5 12a7.5 7.5 0 1 1-2.2-5.3"/><path ${stroke} d="M19.5 4v4h-4"/></svg>`,
};

export function provideConsoleIcons(): EnvironmentProviders {
  return provideAppInitializer(() => {
    const registry = inject(MatIconRegistry);
    const sanitizer = inject(DomSanitizer);
    for (const [name, svg] of Object.entries(CONSOLE_ICONS)) {
      // Trusted: the markup is the constant above, never user or server input.
      registry.addSvgIconLiteralInNamespace('tw', name, sanitizer.bypassSecurityTrustHtml(svg));
    }
  });
}
