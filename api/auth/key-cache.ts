import type { ApiKeyRow } from '../services/api-keys.js';

interface Entry {
  row: ApiKeyRow | null; // null: known not to exist (stops id-guessing from hitting the database)
  loadedAt: number;
}

/**
 * Key rows cached briefly so the hot path does not query the database on every call. Changes
 * made through this instance invalidate at once; `ttlMs` bounds how long another instance's
 * change can take to be seen.
 */
export class KeyCache {
  private readonly entries = new Map<string, Entry>();

  constructor(
    private readonly load: (keyId: string) => Promise<ApiKeyRow | undefined>,
    private readonly now: () => number,
    private readonly ttlMs = 5_000,
    private readonly maxEntries = 10_000,
  ) {}

  async get(keyId: string): Promise<ApiKeyRow | null> {
    const hit = this.entries.get(keyId);
    if (hit && this.now() - hit.loadedAt < this.ttlMs) return hit.row;
    const row = (await this.load(keyId)) ?? null;
    if (this.entries.size >= this.maxEntries) this.entries.clear();
    this.entries.set(keyId, { row, loadedAt: this.now() });
    return row;
  }

  invalidate(keyId: string): void {
    this.entries.delete(keyId);
  }
}
