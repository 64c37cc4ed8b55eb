import { describe, expect, it } from 'vitest';

import { EMBED_LATEST_PATH, KEY_PLACEHOLDER, embedTags, keySnippets } from './key-snippets.js';

describe('keySnippets', () => {
  it('puts the key and the API address into both calls', () => {
    const token = 'tw_server_q7m2x4kd9fhp_secret';
    const { curl, fetch } = keySnippets('http://localhost:3000/', 'server', token);
    expect(curl).toContain('curl -s http://localhost:3000/v1/calculations/voltage-drop');
    expect(curl).toContain(`Authorization: Bearer ${token}`);
    expect(fetch).toContain(`Authorization: 'Bearer ${token}'`);
    expect(curl).not.toContain('Origin:');
  });

  it('sends an embed key from one of its origins', () => {
    const { curl } = keySnippets('http://localhost:3000', 'embed', 'tw_embed_x_y', 'https://shop.harborlane.test');
    expect(curl).toContain("-H 'Origin: https://shop.harborlane.test'");
  });

  it('uses a shell variable when the key is no longer known', () => {
    const { curl } = keySnippets('http://localhost:3000', 'server');
    expect(curl).toContain(`"Authorization: Bearer ${KEY_PLACEHOLDER}"`); // double quotes: the shell expands it
  });

  it('gives a body the voltage-drop route accepts', () => {
    const { curl } = keySnippets('http://localhost:3000', 'server');
    const body = JSON.parse(/-d '(.*)'$/m.exec(curl)![1]!) as Record<string, unknown>;
    // Field names of POST /v1/calculations/voltage-drop (../shared/handbook/api-contract.md).
    expect(Object.keys(body).sort()).toEqual(['conductor', 'currentA', 'lengthM', 'supplyVoltageV']);
  });
});

describe('embedTags', () => {
  // The shape GET /embed/v1/manifest.json answers (api/routes/embed-script.ts).
  const manifest = {
    version: '0.1.0-28e3e4ccde33',
    integrity: 'sha384-B5dgiQRTbVn2yAinlJpz2THXWPKmops6VfXGUy2MYYtchPzRfCwRJ1R7bGGcbmXI',
    url: '/embed/v1/0.1.0-28e3e4ccde33/treadwise-estimator.js',
    bytes: 90_000,
    gzipBytes: 30_000,
  };

  it('pins the versioned script with its integrity and names the key and API in the element', () => {
    const tags = embedTags('https://api.treadwise.test/', manifest, { token: 'tw_embed_n3wk3y000001_secret', keyId: 'n3wk3y000001' });
    const doc = new DOMParser().parseFromString(tags, 'text/html');
    const script = doc.querySelector('script')!;
    expect(script.getAttribute('src')).toBe('https://api.treadwise.test/embed/v1/0.1.0-28e3e4ccde33/treadwise-estimator.js');
    expect(script.getAttribute('integrity')).toBe(manifest.integrity);
    expect(script.getAttribute('crossorigin')).toBe('anonymous'); // SRI needs a CORS fetch
    const element = doc.querySelector('treadwise-estimator')!;
    expect(element.getAttribute('embed-key')).toBe('tw_embed_n3wk3y000001_secret');
    expect(element.getAttribute('api-url')).toBe('https://api.treadwise.test');
  });

  it('writes the key id with a gap for the secret when the key is no longer known', () => {
    const tags = embedTags('https://api.treadwise.test', manifest, { keyId: 'n3wk3y000001' });
    expect(tags).toContain('embed-key="tw_embed_n3wk3y000001_…"');
  });

  it('falls back to the moving script without integrity when there is no manifest', () => {
    const tags = embedTags('https://api.treadwise.test', null, { keyId: 'n3wk3y000001' });
    expect(tags).toContain(`<script src="https://api.treadwise.test${EMBED_LATEST_PATH}" defer></script>`);
    expect(tags).not.toContain('integrity');
  });

  it('keeps a value with a quote inside its attribute', () => {
    const tags = embedTags('https://api.treadwise.test/a"b', manifest, { keyId: 'x' });
    const element = new DOMParser().parseFromString(tags, 'text/html').querySelector('treadwise-estimator')!;
    expect(element.getAttribute('api-url')).toBe('https://api.treadwise.test/a"b');
  });
});
