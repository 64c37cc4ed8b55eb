import { createHash } from 'node:crypto';
import { readFileSync } from 'node:fs';
import { Script } from 'node:vm';
import { gzipSync } from 'node:zlib';
import { describe, expect, it } from 'vitest';
import { EMBED_BUDGET_GZIP_BYTES, type EmbedManifest } from '../../api/embed/bundle.js';

// Built by `npm run build` (build:embed) before this suite.
const script = readFileSync('dist/embed/treadwise-estimator.js');
const manifest = JSON.parse(readFileSync('dist/embed/manifest.json', 'utf8')) as EmbedManifest;

describe('the estimator script as built', () => {
  it(`stays within its budget of ${EMBED_BUDGET_GZIP_BYTES / 1000} kB gzipped`, () => {
    const gzipped = gzipSync(script, { level: 9 }).length;
    console.log(`treadwise-estimator.js: ${(script.length / 1000).toFixed(1)} kB, ${(gzipped / 1000).toFixed(1)} kB gzipped`);
    expect(gzipped).toBeLessThanOrEqual(EMBED_BUDGET_GZIP_BYTES);
  });

  it('is one classic script (no imports or exports) that a plain <script> tag runs', () => {
    expect(() => new Script(script.toString('utf8'), { filename: 'treadwise-estimator.js' })).not.toThrow();
  });

  it('matches the SRI hash its manifest publishes', () => {
    expect(manifest.integrity).toBe(`sha384-${createHash('sha384').update(script).digest('base64')}`);
    expect(manifest.url).toBe(`/embed/v1/${manifest.version}/treadwise-estimator.js`);
  });
});
