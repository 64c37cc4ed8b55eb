import { existsSync, mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import path from 'node:path';

/**
 * The demo shop's page key, kept in DATA_DIR so later starts can still fill the page (the seed
 * prints keys only once). An embed key is public by design — every shop page shows it — and is
 * bound to its allowed origins; only the demo's own key is kept, never a server key.
 */
const FILE = 'demo-shop-key.json';

export function saveShopKey(dataDir: string, token: string): void {
  mkdirSync(dataDir, { recursive: true });
  writeFileSync(path.join(dataDir, FILE), JSON.stringify({ embedKey: token }), { mode: 0o600 });
}

export function loadShopKey(dataDir: string): string | undefined {
  const file = path.join(dataDir, FILE);
  if (!existsSync(file)) return undefined;
  try {
    const { embedKey } = JSON.parse(readFileSync(file, 'utf8')) as { embedKey?: unknown };
    return typeof embedKey === 'string' && embedKey.startsWith('tw_embed_') ? embedKey : undefined;
  } catch {
    return undefined;
  }
}
