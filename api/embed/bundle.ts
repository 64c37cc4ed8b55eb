import { existsSync, readFileSync } from 'node:fs';
import path from 'node:path';

/** Where shops load the element from (api-contract.md, "Embed"). */
export const EMBED_BASE_PATH = '/embed/v1';
export const EMBED_SCRIPT_FILE = 'treadwise-estimator.js';
export const EMBED_MANIFEST_FILE = 'manifest.json';
/** The element's budget: at most 120 kB gzipped (Angular's kB: 1000 bytes). */
export const EMBED_BUDGET_GZIP_BYTES = 120_000;

/** What `npm run build:embed` writes beside the script, and what the API publishes. */
export interface EmbedManifest {
  /** Release and content hash: a new build is a new immutable URL. */
  version: string;
  /** Subresource integrity of the script (`sha384-…`). */
  integrity: string;
  /** The immutable copy's path, below the API origin. */
  url: string;
  gzipBytes: number;
  bytes: number;
}

export const versionedScriptPath = (version: string) => `${EMBED_BASE_PATH}/${version}/${EMBED_SCRIPT_FILE}`;

export interface EmbedBundle {
  manifest: EmbedManifest;
  script: Buffer;
}

/** The built script and its manifest, or undefined when the element has not been built. */
export function readEmbedBundle(dir: string): EmbedBundle | undefined {
  const scriptFile = path.join(dir, EMBED_SCRIPT_FILE);
  const manifestFile = path.join(dir, EMBED_MANIFEST_FILE);
  if (!existsSync(scriptFile) || !existsSync(manifestFile)) return undefined;
  return { manifest: JSON.parse(readFileSync(manifestFile, 'utf8')) as EmbedManifest, script: readFileSync(scriptFile) };
}
