import { HttpTestingController } from '@angular/common/http/testing';
import { type ComponentFixture, TestBed } from '@angular/core/testing';
import { afterEach, describe, expect, it } from 'vitest';

import type { EmbedManifest, KeyKind } from '../core/api-types.js';
import { pageSpecProviders } from '../core/page-spec-providers.js';
import { KeySnippetsView } from './key-snippets-view.js';

const MANIFEST: EmbedManifest = {
  version: '0.1.0-28e3e4ccde33',
  integrity: 'sha384-B5dgiQRTbVn2yAinlJpz2THXWPKmops6VfXGUy2MYYtchPzRfCwRJ1R7bGGcbmXI',
  url: '/embed/v1/0.1.0-28e3e4ccde33/treadwise-estimator.js',
  bytes: 90_000,
  gzipBytes: 30_000,
};

describe('KeySnippetsView', () => {
  let fixture: ComponentFixture<KeySnippetsView>;
  let http: HttpTestingController;

  async function render(kind: KeyKind, token?: string): Promise<void> {
    TestBed.configureTestingModule({ providers: pageSpecProviders('admin') });
    http = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(KeySnippetsView);
    fixture.componentRef.setInput('kind', kind);
    fixture.componentRef.setInput('keyId', 'n3wk3y000001');
    if (token) fixture.componentRef.setInput('token', token);
    await fixture.whenStable();
  }

  afterEach(() => http.verify());
  const page = () => fixture.nativeElement as HTMLElement;
  const tabs = () => [...page().querySelectorAll('[role="tab"]')].map((t) => t.textContent?.trim());

  it('gives an embed key the page tags with the script’s integrity from the manifest', async () => {
    await render('embed', 'tw_embed_n3wk3y000001_Zq8Lr2Vt6Yx0Bc4Nm7Pw1Ks5Hd9Gf3Jt');
    http.expectOne('/embed/v1/manifest.json').flush(MANIFEST);
    await fixture.whenStable();
    expect(tabs()).toEqual(['HTML', 'curl', 'fetch']);
    const html = page().querySelector('[data-testid="snippet-HTML"]')?.textContent ?? '';
    expect(html).toContain(`integrity="${MANIFEST.integrity}"`);
    expect(html).toContain(`${MANIFEST.url}"`);
    expect(html).toContain('embed-key="tw_embed_n3wk3y000001_Zq8Lr2Vt6Yx0Bc4Nm7Pw1Ks5Hd9Gf3Jt"');
  });

  it('loads the latest script without integrity when the server has no built script', async () => {
    await render('embed');
    http.expectOne('/embed/v1/manifest.json').flush({ title: 'Not found', status: 404, detail: 'The estimator script is not built on this server.' }, { status: 404, statusText: 'Not Found' });
    await fixture.whenStable();
    expect(page().querySelector('[data-testid="embed-manifest-missing"]')).not.toBeNull();
    const html = page().querySelector('[data-testid="snippet-HTML"]')?.textContent ?? '';
    expect(html).toContain('/embed/v1/treadwise-estimator.js');
    expect(html).not.toContain('integrity');
    expect(html).toContain('embed-key="tw_embed_n3wk3y000001_…"'); // the secret is not known here
  });

  it('gives a server key no page tags and does not ask for the manifest', async () => {
    await render('server');
    http.expectNone('/embed/v1/manifest.json');
    expect(tabs()).toEqual(['curl', 'fetch']);
  });
});
