import { createHmac, randomBytes, timingSafeEqual } from 'node:crypto';

/** `server` keys act from a shop's servers; `embed` keys sit in its web pages (sizing only). */
export type KeyKind = 'server' | 'embed';

const PREFIX: Record<KeyKind, string> = { server: 'tw_server_', embed: 'tw_embed_' };
const KEY_PATTERN = /^tw_(server|embed)_([a-z2-7]{12})_([A-Za-z0-9_-]{32})$/;
const BASE32 = 'abcdefghijklmnopqrstuvwxyz234567';

export interface ParsedKey {
  kind: KeyKind;
  keyId: string;
  secret: string;
}

/** A fresh key: 60 bits of public id (shown in logs) and 192 bits of secret (shown once). */
export function generateKey(kind: KeyKind): ParsedKey & { token: string } {
  const idBytes = randomBytes(12);
  let keyId = '';
  for (const b of idBytes) keyId += BASE32[b & 31];
  const secret = randomBytes(24).toString('base64url');
  return { kind, keyId, secret, token: `${PREFIX[kind]}${keyId}_${secret}` };
}

export function newSecret(): string {
  return randomBytes(24).toString('base64url');
}

export function formatKey(kind: KeyKind, keyId: string, secret: string): string {
  return `${PREFIX[kind]}${keyId}_${secret}`;
}

/** Anything that is not exactly our format is not a key (no partial matches, no trimming). */
export function parseKey(token: string): ParsedKey | null {
  const m = KEY_PATTERN.exec(token);
  if (!m) return null;
  return { kind: m[1] as KeyKind, keyId: m[2], secret: m[3] };
}

/** HMAC-SHA256 of the secret, keyed with the server's pepper and bound to the key id. */
export function hashSecret(pepper: Buffer, keyId: string, secret: string): string {
  return createHmac('sha256', pepper).update(`${keyId}.${secret}`).digest('hex');
}

/** Constant-time comparison of two hex digests. */
export function digestsEqual(a: string, b: string): boolean {
  const x = Buffer.from(a, 'hex');
  const y = Buffer.from(b, 'hex');
  return x.length === y.length && x.length > 0 && timingSafeEqual(x, y);
}
