import { mkdtempSync, rmSync, statSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { loadShopKey, saveShopKey } from '../../api/demo-shop/shop-key.js';
import { renderShopPage, shopPagePolicy } from '../../api/demo-shop/shop-page.js';

const template = '<script src="%SCRIPT_URL%" integrity="%INTEGRITY%"></script>%NOTICE%<treadwise-estimator embed-key="%EMBED_KEY%" api-url="%API_ORIGIN%" nonce="%NONCE%"></treadwise-estimator>';
const manifest = { version: '0.1.0-abc', integrity: 'sha384-xyz', url: '/embed/v1/0.1.0-abc/treadwise-estimator.js', bytes: 1, gzipBytes: 1 };
const dir = mkdtempSync(path.join(tmpdir(), 'treadwise-shop-key-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

describe('the demo shop page', () => {
  it('fills the two tags: the versioned script with its SRI hash, the element with key, API and nonce', () => {
    const html = renderShopPage(template, { apiOrigin: 'http://localhost:3000', embedKey: 'tw_embed_k_s', manifest }, 'n0nce');
    expect(html).toBe(
      '<script src="http://localhost:3000/embed/v1/0.1.0-abc/treadwise-estimator.js" integrity="sha384-xyz"></script><treadwise-estimator embed-key="tw_embed_k_s" api-url="http://localhost:3000" nonce="n0nce"></treadwise-estimator>',
    );
  });

  it('escapes what it writes into attributes, and says why the estimator cannot work yet', () => {
    const html = renderShopPage(template, { apiOrigin: 'http://x"><script>', embedKey: undefined, manifest: undefined }, 'n');
    expect(html).not.toContain('"><script>');
    expect(html).toContain('api-url="http://x&#34;&#62;&#60;script&#62;"');
    expect(html).toContain('start once with a fresh DATA_DIR');
    expect(html).toContain('npm run build');
  });

  it('serves under a CSP that allows scripts only from the shop and the API, styles by nonce', () => {
    const csp = shopPagePolicy('http://localhost:3000', 'abc');
    expect(csp).toContain("script-src 'self' http://localhost:3000");
    expect(csp).toContain("style-src 'self' 'nonce-abc'");
    expect(csp).toContain("default-src 'none'");
    expect(csp).not.toContain('unsafe-inline');
  });

  it('keeps the demo page key across starts, readable by the owner only', () => {
    expect(loadShopKey(dir)).toBeUndefined();
    saveShopKey(dir, 'tw_embed_abc_secret');
    expect(loadShopKey(dir)).toBe('tw_embed_abc_secret');
    expect(statSync(path.join(dir, 'demo-shop-key.json')).mode & 0o077).toBe(0);
  });
});
