import { HttpErrorResponse } from '@angular/common/http';

/** 128 random bits in hex. getRandomValues, unlike randomUUID, also works on a plain-HTTP address. */
export function randomIdempotencyKey(): string {
  return Array.from(globalThis.crypto.getRandomValues(new Uint8Array(16)), (b) => b.toString(16).padStart(2, '0')).join('');
}

/**
 * The Idempotency-Key of one creation: a retry of the same body after a lost answer reuses it, so
 * the API replays the first creation rather than making a second; after a refusal (the API stores
 * 4xx answers too) or for another body, a fresh key lets the corrected request through.
 */
export class CreationKey {
  private unanswered: { body: string; key: string } | null = null;

  for(request: unknown): string {
    const body = JSON.stringify(request);
    if (this.unanswered?.body !== body) this.unanswered = { body, key: randomIdempotencyKey() };
    return this.unanswered.key;
  }

  failed(error: unknown): void {
    if (error instanceof HttpErrorResponse && error.status >= 400 && error.status < 500) this.unanswered = null;
  }
}
