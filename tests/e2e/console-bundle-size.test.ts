import { readFileSync } from 'node:fs';
import path from 'node:path';
import { gzipSync } from 'node:zlib';
import { describe, expect, it } from 'vitest';

const BROWSER_DIR = path.resolve('dist/console/browser'); // built by `npm run build` before this suite
// Issue 12's bound on what a first visit downloads before any lazy route loads.
const INITIAL_GZIP_LIMIT_BYTES = 150 * 1024;

describe('the console build', () => {
  it('keeps the files index.html loads at or under 150 kB gzipped', () => {
    const html = readFileSync(path.join(BROWSER_DIR, 'index.html'), 'utf8');
    const files = [...html.matchAll(/(?:src|href)="([^"]+\.(?:js|css))"/g)].map((m) => m[1]!);
    expect(files.some((f) => f.startsWith('main'))).toBe(true);
    const gzipped = files.reduce((sum, file) => sum + gzipSync(readFileSync(path.join(BROWSER_DIR, file)), { level: 9 }).length, 0);
    console.log(`initial console files: ${files.length}, ${(gzipped / 1024).toFixed(1)} kB gzipped`);
    expect(gzipped).toBeLessThanOrEqual(INITIAL_GZIP_LIMIT_BYTES);
  });
});
