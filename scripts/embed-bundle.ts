// Turns the Angular build of the element (dist/embed-build/browser/main.js) into the one script a
// shop loads: wrapped as a classic script (no globals leak into the shop's page), versioned by
// content, with its SRI hash in a manifest. Prints the gzipped size and fails above the budget.
import { createHash } from 'node:crypto';
import { mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import path from 'node:path';
import { gzipSync } from 'node:zlib';
import { transform } from 'esbuild';
import { EMBED_BUDGET_GZIP_BYTES, EMBED_MANIFEST_FILE, EMBED_SCRIPT_FILE, versionedScriptPath, type EmbedManifest } from '../api/embed/bundle.js';
import { API_VERSION } from '../api/version.js';

const built = readFileSync('dist/embed-build/browser/main.js', 'utf8');
const outDir = 'dist/embed';

// The application builder emits an ES module; as an IIFE it also runs from a plain <script>.
const { code } = await transform(built, { format: 'iife', target: 'es2022', minifyWhitespace: true, legalComments: 'none' });
const contentHash = createHash('sha256').update(code).digest('hex').slice(0, 12);
const version = `${API_VERSION}-${contentHash}`;
const script = Buffer.from(`/*! treadwise-estimator ${version} */\n${code}`);
const gzipBytes = gzipSync(script, { level: 9 }).length;
const manifest: EmbedManifest = {
  version,
  integrity: `sha384-${createHash('sha384').update(script).digest('base64')}`,
  url: versionedScriptPath(version),
  gzipBytes,
  bytes: script.length,
};

mkdirSync(outDir, { recursive: true });
writeFileSync(path.join(outDir, EMBED_SCRIPT_FILE), script);
writeFileSync(path.join(outDir, EMBED_MANIFEST_FILE), `${JSON.stringify(manifest, null, 2)}\n`);

const kB = (n: number) => `${(n / 1000).toFixed(1)} kB`;
console.log(`treadwise-estimator ${version}: ${kB(script.length)} raw, ${kB(gzipBytes)} gzipped (budget ${kB(EMBED_BUDGET_GZIP_BYTES)})`);
console.log(`  ${path.join(outDir, EMBED_SCRIPT_FILE)}  integrity ${manifest.integrity}`);
if (gzipBytes > EMBED_BUDGET_GZIP_BYTES) {
  console.error(`treadwise-estimator is over its budget by ${kB(gzipBytes - EMBED_BUDGET_GZIP_BYTES)} gzipped`);
  process.exit(1);
}
