/** 128 random bits in hex, for an Idempotency-Key header. getRandomValues, unlike randomUUID, also works on a plain-HTTP address. */
export function randomIdempotencyKey(): string {
  return Array.from(globalThis.crypto.getRandomValues(new Uint8Array(16)), (b) => b.toString(16).padStart(2, '0')).join('');
}
