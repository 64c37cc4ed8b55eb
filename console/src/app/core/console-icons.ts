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
  // A key whose bit is a short flight of steps.
  key: `<svg viewBox="0 0 24 24"><circle ${stroke} cx="7.5" cy="12" r="4"/><path ${stroke} d="M11.5 12H21v3h-2.5v2.5H16V15h-2.5"/></svg>`,
  person: `<svg viewBox="0 0 24 24"><circle ${stroke} cx="12" cy="8.5" r="4"/><path ${stroke} d="M4.5 20.5c1.2-3.8 4-5.5 7.5-5.5s6.3 1.7 7.5 5.5"/></svg>`,
  add: `<svg viewBox="0 0 24 24"><path ${stroke} d="M12 5v14M5 12h14"/></svg>`,
  copy: `<svg viewBox="0 0 24 24"><rect ${stroke} x="8.5" y="8.5" width="11" height="12" rx="2"/><path ${stroke} d="M15.5 8.5V5.5a2 2 0 0 0-2-2h-7a2 2 0 0 0-2 2v10a2 2 0 0 0 2 2h2"/></svg>`,
  rotate: `<svg viewBox="0 0 24 24"><path ${stroke} d="M4.5 12a7.5 7.5 0 0 1 12.8-5.3L20 9.5M20 4.5v5h-5M19.5 12a7.5 7.5 0 0 1-12.8 5.3L4 14.5M4 19.5v-5h5"/></svg>`,
  revoke: `<svg viewBox="0 0 24 24"><circle ${stroke} cx="12" cy="12" r="8.5"/><path ${stroke} d="M6 6l12 12"/></svg>`,
  code: `<svg viewBox="0 0 24 24"><path ${stroke} d="m8.5 7-5 5 5 5M15.5 7l5 5-5 5"/></svg>`,
  // A stair in side view: three treads and their risers.
  stair: `<svg viewBox="0 0 24 24"><path ${stroke} d="M3 20h5v-5h5v-5h5V5h3"/></svg>`,
  // A price tag.
  catalog: `<svg viewBox="0 0 24 24"><path ${stroke} d="M3.5 12.5V4.5a1 1 0 0 1 1-1h8l8 8-9 9z"/><circle cx="8.5" cy="8.5" r="1.5" fill="currentColor"/></svg>`,
  upload: `<svg viewBox="0 0 24 24"><path ${stroke} d="M12 16V4M7 9l5-5 5 5M4.5 16v3.5h15V16"/></svg>`,
  download: `<svg viewBox="0 0 24 24"><path ${stroke} d="M12 4v12M7 11l5 5 5-5M4.5 16v3.5h15V16"/></svg>`,
  edit: `<svg viewBox="0 0 24 24"><path ${stroke} d="M4 20h4L19.5 8.5l-4-4L4 16z"/></svg>`,
  run: `<svg viewBox="0 0 24 24"><path ${stroke} d="M7 4.5v15l12-7.5z"/></svg>`,
  back: `<svg viewBox="0 0 24 24"><path ${stroke} d="M19 12H5M11 6l-6 6 6 6"/></svg>`,
  refresh: `<svg viewBox="0 0 24 24"><path ${stroke} d="M19.5 12a7.5 7.5 0 1 1-2.2-5.3"/><path ${stroke} d="M19.5 4v4h-4"/></svg>`,
  // Rising columns like treads seen from the front: calls over days.
  traffic: `<svg viewBox="0 0 24 24"><path ${stroke} d="M4 20h16M6.5 20v-5M11 20v-9M15.5 20v-7M20 20V6"/></svg>`,
  team: `<svg viewBox="0 0 24 24"><circle ${stroke} cx="9" cy="8.5" r="3.5"/><path ${stroke} d="M3 19.5c.9-3.2 3.2-4.8 6-4.8s5.1 1.6 6 4.8"/><path ${stroke} d="M15.5 5.2a3.5 3.5 0 0 1 0 6.6M17.5 14.9c1.6.6 2.8 2.1 3.5 4.6"/></svg>`,
  activity: `<svg viewBox="0 0 24 24"><path ${stroke} d="M8 6h12M8 12h12M8 18h12"/><circle cx="4" cy="6" r="1.2" fill="currentColor"/><circle cx="4" cy="12" r="1.2" fill="currentColor"/><circle cx="4" cy="18" r="1.2" fill="currentColor"/></svg>`,
  // A set square over a short flight: quick calculations.
  bench: `<svg viewBox="0 0 24 24"><path ${stroke} d="M4 20V6l14 14z"/><path ${stroke} d="M8 16v-2h2v2zM4 20h16"/></svg>`,
  organizations: `<svg viewBox="0 0 24 24"><path ${stroke} d="M4 20V8l6-3v15M10 20V10l10 2v8M3 20h18M13 15h4"/></svg>`,
  mail: `<svg viewBox="0 0 24 24"><rect ${stroke} x="3" y="5.5" width="18" height="13" rx="2"/><path ${stroke} d="m3.5 7 8.5 6.5L20.5 7"/></svg>`,
  // Sheets stacked like treads: many stairs sized in one job.
  batch: `<svg viewBox="0 0 24 24"><path ${stroke} d="M7 4.5h12v11M4.5 7.5h12v12h-12z"/><path ${stroke} d="M7.5 12h6M7.5 15.5h4"/></svg>`,
  // A bill with a corner folded over and two lines of figures.
  billing: `<svg viewBox="0 0 24 24"><path ${stroke} d="M6 3.5h8.5l4 4v13H6z"/><path ${stroke} d="M14.5 3.5v4h4M9 12h7M9 16h4.5"/></svg>`,
  open: `<svg viewBox="0 0 24 24"><path ${stroke} d="M14 4.5h5.5V10M19 5l-8 8M17 14v4.5a1.5 1.5 0 0 1-1.5 1.5h-10A1.5 1.5 0 0 1 4 18.5v-10A1.5 1.5 0 0 1 5.5 7H10"/></svg>`,
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
