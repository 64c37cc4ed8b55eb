import { CSP_NONCE, provideZonelessChangeDetection } from '@angular/core';
import { createCustomElement } from '@angular/elements';
import { createApplication } from '@angular/platform-browser';
import { Estimator } from './app/estimator.js';

/** The tag a shop's page uses (api-contract.md, "Embed"). */
const TAG = 'treadwise-estimator';

/**
 * A shop with a strict style-src gives the element a `nonce` attribute; our shadow-root styles
 * carry it. Browsers hide the attribute once read, so the property is asked first.
 */
function styleNonce(): string | null {
  const el = document.querySelector<HTMLElement>(`${TAG}[nonce]`);
  return el ? el.nonce || el.getAttribute('nonce') || null : null;
}

// Loaded twice (two tags, or a versioned and a moving copy): the first definition stays.
if (!customElements.get(TAG)) {
  createApplication({ providers: [provideZonelessChangeDetection(), { provide: CSP_NONCE, useFactory: styleNonce }] })
    .then((app) => {
      if (!customElements.get(TAG)) customElements.define(TAG, createCustomElement(Estimator, { injector: app.injector }));
    })
    .catch((err: unknown) => console.error('treadwise-estimator failed to start', err));
}
