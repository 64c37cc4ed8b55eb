import { hash } from 'node:crypto';
import type { ApiKeyRow } from '../services/api-keys.js';

interface Entry {
  row: ApiKeyRow | null; // null: known not to exist (stops id-guessing from hitting the database)
  loadedAt: number;
}

/** A presented secret found valid for a key row, until `until` (ms on the cache's clock). */
interface Verified {
  keyId: string;
  row: ApiKeyRow;
  until: number;
}

/** Map key of a verified token: its SHA-256, so the secret itself is never kept. */
const digestOf = (token: string) => hash('sha256', token, 'base64');

/**
 * Key rows cached briefly so the hot path does not query the database on every call. Changes
 * made through this instance invalidate at once; `ttlMs` bounds how long another instance's
 * change can take to be seen.
 *
 * Beside the rows, the secrets already verified against them (for `ttlMs` as well), so a key
 * calling again skips the HMAC. A verification holds only for the very row object it was made
 * against: a reloaded or invalidated row (rotation, revocation, on any instance through the key
 * events) is verified afresh, and invalidate() drops the key's verified secrets at once.
 */
export class KeyCache {
  private readonly entries = new Map<string, Entry>();
  private readonly verified = new Map<string, Verified>();

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

  /**
   * Whether `token` is a valid secret of `row`: from the verified secrets when this row was
   * verified with it lately, otherwise by `verify`, which answers how long the secret stays valid
   * (ms on this cache's clock; an overlapping old secret ends at its own time), or null.
   */
  secretValid(row: ApiKeyRow, token: string, verify: () => { validUntil: number } | null): boolean {
    const digest = digestOf(token);
    const now = this.now();
    const hit = this.verified.get(digest);
    if (hit && hit.row === row && now < hit.until) return true;
    const result = verify();
    if (!result) return false;
    if (this.verified.size >= this.maxEntries) this.verified.clear();
    this.verified.set(digest, { keyId: row.keyId, row, until: Math.min(now + this.ttlMs, result.validUntil) });
    return true;
  }

  invalidate(keyId: string): void {
    this.entries.delete(keyId);
    for (const [digest, v] of this.verified) if (v.keyId === keyId) this.verified.delete(digest);
  }
}
