import { OverlayContainer } from '@angular/cdk/overlay';
import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { provideZonelessChangeDetection, signal } from '@angular/core';
import { type ComponentFixture, TestBed } from '@angular/core/testing';
import { MATERIAL_ANIMATIONS } from '@angular/material/core';
import { afterEach, describe, expect, it } from 'vitest';

import type { ApiKey, ApiKeyWithToken, Role } from '../core/api-types.js';
import { Auth } from '../core/auth.js';
import { provideConsoleIcons } from '../core/console-icons.js';
import { KeyList } from './key-list.js';

// Keys in the API's ApiKey shape; names and ids are invented.
const ACTIVE: ApiKey = {
  id: '2f9a7c1e-3b4d-4e5f-8a6b-7c8d9e0f1a2b',
  keyId: 'k4p9s2m7q1xz',
  kind: 'server',
  name: 'Checkout server',
  scopes: ['sizing:run', 'catalog:read'],
  allowedOrigins: [],
  expiresAt: null,
  lastUsedAt: '2026-12-01T17:20:00.000Z',
  revokedAt: null,
  previousSecretValidUntil: null,
  createdAt: '2026-11-20T08:00:00.000Z',
  status: 'active',
};
const REVOKED: ApiKey = { ...ACTIVE, id: '9d8c7b6a-5f4e-4d3c-8b2a-1f0e9d8c7b6a', keyId: 'r3v0k3dk3y00', name: 'Old test key', status: 'revoked', revokedAt: '2026-11-25T08:00:00.000Z' };
const TOKEN = 'tw_embed_n3wk3y000001_Zq8Lr2Vt6Yx0Bc4Nm7Pw1Ks5Hd9Gf3Jt';
const CREATED: ApiKeyWithToken = {
  key: { ...ACTIVE, id: '4a5b6c7d-8e9f-4a0b-9c1d-2e3f4a5b6c7d', keyId: 'n3wk3y000001', kind: 'embed', name: 'Product pages', scopes: ['sizing:run'], allowedOrigins: ['https://shop.harborlane.test'], lastUsedAt: null },
  requestId: '7e6d5c4b-3a29-4180-9f7e-6d5c4b3a2918',
  token: TOKEN,
};

// What GET /embed/v1/manifest.json answers; the new embed key's snippets ask for it.
const MANIFEST = { version: '0.1.0-28e3e4ccde33', integrity: 'sha384-test', url: '/embed/v1/0.1.0-28e3e4ccde33/treadwise-estimator.js', bytes: 1, gzipBytes: 1 };

describe('KeyList', () => {
  let fixture: ComponentFixture<KeyList>;
  let http: HttpTestingController;

  async function render(role: Role): Promise<void> {
    TestBed.configureTestingModule({
      providers: [
        provideZonelessChangeDetection(),
        provideHttpClient(),
        provideHttpClientTesting(),
        provideConsoleIcons(),
        { provide: MATERIAL_ANIMATIONS, useValue: { animationsDisabled: true } }, // dialogs close at once
        { provide: Auth, useValue: { role: signal<Role | null>(role) } },
      ],
    });
    http = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(KeyList);
    await fixture.whenStable();
  }

  afterEach(() => http.verify());

  const page = () => fixture.nativeElement as HTMLElement;
  const overlay = () => TestBed.inject(OverlayContainer).getContainerElement();
  const settle = async () => {
    await new Promise((resolve) => setTimeout(resolve, 0));
    await fixture.whenStable();
  };

  async function listed(keys: ApiKey[]): Promise<void> {
    http.expectOne((req) => req.url === '/v1/keys').flush({ items: keys, nextCursor: null });
    await fixture.whenStable();
  }

  it('lets an admin create, rotate and revoke, but not rotate or revoke a revoked key', async () => {
    await render('admin');
    await listed([ACTIVE, REVOKED]);
    expect(page().querySelector('[data-testid="create-key"]')).not.toBeNull();
    const rows = [...page().querySelectorAll('tr[data-key-id]')];
    expect(rows.map((r) => r.getAttribute('data-key-id'))).toEqual([ACTIVE.keyId, REVOKED.keyId]);
    expect(rows[0]!.querySelector('[data-testid="rotate-key"]')).not.toBeNull();
    expect(rows[0]!.querySelector('[data-testid="revoke-key"]')).not.toBeNull();
    expect(rows[1]!.querySelector('[data-testid="rotate-key"]')).toBeNull();
    expect(rows[1]!.querySelector('[data-testid="revoke-key"]')).toBeNull();
  });

  it.each<Role>(['viewer', 'estimator'])('shows a %s no create button and does not ask the API for keys', async (role) => {
    await render(role);
    http.expectNone('/v1/keys'); // the API would refuse it: GET /v1/keys needs the admin role
    expect(page().querySelector('[data-testid="create-key"]')).toBeNull();
    expect(page().querySelector('[data-testid="keys-not-allowed"]')).not.toBeNull();
  });

  it('says so when there are no keys yet', async () => {
    await render('admin');
    await listed([]);
    expect(page().querySelector('[data-testid="keys-empty"]')).not.toBeNull();
  });

  it('shows the problem detail when the keys cannot be loaded', async () => {
    await render('admin');
    http
      .expectOne((req) => req.url === '/v1/keys')
      .flush({ title: 'Forbidden', status: 403, detail: 'Needs the admin role.', code: 'forbidden' }, { status: 403, statusText: 'Forbidden' });
    await fixture.whenStable();
    expect(page().querySelector('[data-testid="keys-failed"]')?.textContent).toContain('Needs the admin role.');
  });

  it('shows a new key once, with a warning, and nowhere after the dialog closes', async () => {
    await render('admin');
    await listed([ACTIVE]);

    (page().querySelector('[data-testid="create-key"]') as HTMLButtonElement).click();
    await settle();
    const name = overlay().querySelector<HTMLInputElement>('[data-testid="key-name"]')!;
    name.value = 'Product pages';
    name.dispatchEvent(new Event('input'));
    (overlay().querySelector('[data-testid="create-key-submit"]') as HTMLButtonElement).click();
    await settle();
    const create = http.expectOne((req) => req.method === 'POST' && req.url === '/v1/keys');
    expect(create.request.headers.get('Idempotency-Key')).toMatch(/^[0-9a-f]{32}$/);
    create.flush(CREATED, { status: 201, statusText: 'Created' });
    await settle();
    // An embed key's snippets include the page tags, pinned by the script's manifest.
    http.expectOne('/embed/v1/manifest.json').flush(MANIFEST);
    await settle();
    expect(overlay().querySelector('[data-testid="snippet-HTML"]')?.textContent).toContain(`embed-key="${TOKEN}"`);

    expect(overlay().querySelector('[data-testid="new-token"]')?.textContent?.trim()).toBe(TOKEN);
    expect(overlay().querySelector('[data-testid="once-warning"]')?.textContent).toContain('shown only this once');
    expect(page().querySelector(`tr[data-key-id="${CREATED.key.keyId}"]`)).not.toBeNull(); // listed at the top

    (overlay().querySelector('[data-testid="secret-done"]') as HTMLButtonElement).click();
    await settle();
    expect(overlay().textContent).not.toContain(TOKEN);
    expect(page().textContent).not.toContain(TOKEN);
    expect(page().innerHTML).not.toContain(TOKEN.split('_').at(-1)!); // not even the secret part, anywhere
  });

  it('names the key in the revoke confirmation and marks it revoked afterwards', async () => {
    await render('admin');
    await listed([ACTIVE]);
    (page().querySelector('[data-testid="revoke-key"]') as HTMLButtonElement).click();
    await settle();
    expect(overlay().querySelector('[data-testid="revoke-title"]')?.textContent).toContain(ACTIVE.name);
    (overlay().querySelector('[data-testid="revoke-confirm"]') as HTMLButtonElement).click();
    await settle();
    http.expectOne(`/v1/keys/${ACTIVE.id}/revoke`).flush({ ...ACTIVE, status: 'revoked', revokedAt: '2026-12-02T09:00:00.000Z' });
    await settle();
    expect(page().querySelector('[data-testid="key-status"]')?.textContent?.trim()).toBe('revoked');
  });

  async function openCreateDialog(keyName: string): Promise<HTMLButtonElement> {
    (page().querySelector('[data-testid="create-key"]') as HTMLButtonElement).click();
    await settle();
    const name = overlay().querySelector<HTMLInputElement>('[data-testid="key-name"]')!;
    name.value = keyName;
    name.dispatchEvent(new Event('input'));
    return overlay().querySelector('[data-testid="create-key-submit"]') as HTMLButtonElement;
  }

  const createCall = () => http.expectOne((req) => req.method === 'POST' && req.url === '/v1/keys');

  it('retries a creation whose answer was lost with the same Idempotency-Key, so no second key is made', async () => {
    await render('admin');
    await listed([]);
    const submit = await openCreateDialog('Checkout server');
    submit.click();
    await settle();
    const first = createCall();
    first.error(new ProgressEvent('error')); // no answer reached the browser
    await settle();
    expect(overlay().querySelector('[data-testid="create-failure"]')?.textContent).toContain('could not be reached');

    submit.click();
    await settle();
    const second = createCall();
    expect(second.request.headers.get('Idempotency-Key')).toBe(first.request.headers.get('Idempotency-Key'));
    second.flush(CREATED, { status: 201, statusText: 'Created' });
    await settle();
    http.expectOne('/embed/v1/manifest.json').flush(MANIFEST);
    expect(overlay().querySelector('[data-testid="new-token"]')).not.toBeNull();
  });

  it('shows a refusal beside the form and tries again under a new Idempotency-Key (the API replays stored refusals)', async () => {
    await render('admin');
    await listed([]);
    const submit = await openCreateDialog('Checkout server');
    submit.click();
    await settle();
    const first = createCall();
    first.flush(
      { title: 'Key limit reached', status: 409, detail: 'The shop plan allows 10 active keys per organisation.', code: 'key_limit_reached' },
      { status: 409, statusText: 'Conflict' },
    );
    await settle();
    expect(overlay().querySelector('[data-testid="create-failure"]')?.textContent).toContain('allows 10 active keys');

    submit.click();
    await settle();
    const second = createCall();
    expect(second.request.headers.get('Idempotency-Key')).not.toBe(first.request.headers.get('Idempotency-Key'));
    second.flush(CREATED, { status: 201, statusText: 'Created' });
    await settle();
    http.expectOne('/embed/v1/manifest.json').flush(MANIFEST);
  });
});
