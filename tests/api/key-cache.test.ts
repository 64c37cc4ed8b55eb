import { describe, expect, it } from 'vitest';
import { KeyCache } from '../../api/auth/key-cache.js';
import type { ApiKeyRow } from '../../api/services/api-keys.js';

const row = (keyId: string) => ({ keyId }) as unknown as ApiKeyRow;

describe('KeyCache: verified secrets', () => {
  it('verifies a secret once per row and TTL, and never from another token or another row', () => {
    let now = 0;
    const cache = new KeyCache(async () => undefined, () => now, 5_000);
    const a = row('aaaaaaaaaaaa');
    let checks = 0;
    const verify = () => (checks++, { validUntil: Number.POSITIVE_INFINITY });
    expect(cache.secretValid(a, 'tw_server_aaaaaaaaaaaa_one', verify)).toBe(true);
    expect(cache.secretValid(a, 'tw_server_aaaaaaaaaaaa_one', verify)).toBe(true);
    expect(checks).toBe(1);
    expect(cache.secretValid(a, 'tw_server_aaaaaaaaaaaa_two', () => null)).toBe(false); // another secret: checked, refused
    expect(cache.secretValid(row('aaaaaaaaaaaa'), 'tw_server_aaaaaaaaaaaa_one', verify)).toBe(true); // a reloaded row: verified afresh
    expect(checks).toBe(2);
    now = 5_000;
    cache.secretValid(a, 'tw_server_aaaaaaaaaaaa_one', verify);
    expect(checks).toBe(3);
  });

  it('forgets a key’s verified secrets on invalidate, and an overlapping secret at its own end', () => {
    let now = 0;
    const cache = new KeyCache(async () => undefined, () => now, 5_000);
    const a = row('aaaaaaaaaaaa');
    let checks = 0;
    cache.secretValid(a, 't1', () => (checks++, { validUntil: Number.POSITIVE_INFINITY }));
    cache.invalidate('aaaaaaaaaaaa');
    expect(cache.secretValid(a, 't1', () => (checks++, null))).toBe(false);
    cache.secretValid(a, 't2', () => (checks++, { validUntil: 1_000 }));
    now = 1_000;
    expect(cache.secretValid(a, 't2', () => (checks++, null))).toBe(false);
    expect(checks).toBe(4);
  });
});
