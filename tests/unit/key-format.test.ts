import { describe, expect, it, vi } from 'vitest';

// Wrap the real timingSafeEqual so the test can see that secrets are compared through it.
vi.mock('node:crypto', async (importOriginal) => {
  const real = await importOriginal<typeof import('node:crypto')>();
  return { ...real, timingSafeEqual: vi.fn(real.timingSafeEqual) };
});

const crypto = await import('node:crypto');
const { digestsEqual, generateKey, hashSecret, parseKey } = await import('../../api/auth/key-format.js');
const { originAllowed } = await import('../../api/auth/origins.js');

describe('API key format', () => {
  it('generates keys that parse back to their parts', () => {
    for (const kind of ['server', 'embed'] as const) {
      const key = generateKey(kind);
      expect(parseKey(key.token)).toEqual({ kind, keyId: key.keyId, secret: key.secret });
    }
  });

  it('rejects anything not exactly in the format', () => {
    const { token } = generateKey('server');
    for (const bad of ['', 'tw_server_', token.slice(1), `${token}x`, token.replace('_', '-'), token.replace(/^tw_server/, 'tw_key')]) {
      expect(parseKey(bad), bad).toBeNull();
    }
  });

  it('compares digests with crypto.timingSafeEqual', () => {
    const spy = vi.mocked(crypto.timingSafeEqual);
    spy.mockClear();
    const pepper = Buffer.from('a pepper of at least thirty-two characters');
    const h = hashSecret(pepper, 'abcdefghijkl', 'secret');
    expect(digestsEqual(h, hashSecret(pepper, 'abcdefghijkl', 'secret'))).toBe(true);
    expect(digestsEqual(h, hashSecret(pepper, 'abcdefghijkl', 'other'))).toBe(false);
    expect(spy).toHaveBeenCalledTimes(2);
    // A digest of another length never reaches the comparison (it would throw).
    expect(digestsEqual(h, 'abcd')).toBe(false);
  });

  it('binds the digest to the key id and the pepper', () => {
    const pepper = Buffer.from('p'.repeat(32));
    expect(hashSecret(pepper, 'aaaaaaaaaaaa', 's')).not.toBe(hashSecret(pepper, 'bbbbbbbbbbbb', 's'));
    expect(hashSecret(pepper, 'aaaaaaaaaaaa', 's')).not.toBe(hashSecret(Buffer.from('q'.repeat(32)), 'aaaaaaaaaaaa', 's'));
  });
});

describe('allowed origins', () => {
  const list = ['https://shop.example.test', 'https://*.example.test'];
  it.each([
    ['https://shop.example.test', true],
    ['https://a.b.example.test', true],
    ['https://example.test', false], // a wildcard matches sub-domains, not the apex
    ['http://shop.example.test', false],
    ['https://shop.example.test.evil.test', false],
    ['https://evilexample.test', false],
  ])('%s → %s', (origin, allowed) => {
    expect(originAllowed(origin, list)).toBe(allowed);
  });
});
