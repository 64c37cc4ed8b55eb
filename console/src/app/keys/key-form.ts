import { type AbstractControl, type ValidationErrors, type ValidatorFn } from '@angular/forms';

import { EMBED_SCOPE_VALUES, ROLE_GRANTS, SCOPE_VALUES } from '../../../../shared/tables/access.js';
import type { CreateApiKeyRequest, KeyKind, Role, Scope } from '../core/api-types.js';

/** Every scope, what an embed key may hold and what each role may grant: the API's own table. */
export const ALL_SCOPES: readonly Scope[] = SCOPE_VALUES;
export const EMBED_SCOPES: readonly Scope[] = EMBED_SCOPE_VALUES;

export function offeredScopes(kind: KeyKind, role: Role | null): Scope[] {
  const grantable = role ? ROLE_GRANTS[role] : [];
  return (kind === 'embed' ? EMBED_SCOPES : ALL_SCOPES).filter((s) => grantable.includes(s));
}

// The API's origin pattern (shared/schemas/api-keys.ts), repeated so the check runs before sending
// without shipping zod to the browser; the API checks again and its problem names any origin it refuses.
const ORIGIN = /^https?:\/\/(\*\.)?[a-z0-9-]+(\.[a-z0-9-]+)*(:\d{1,5})?$/;
const WILDCARD_NEEDS_DOMAIN = /^https?:\/\/\*\.[a-z0-9-]+\.[a-z0-9-]+/;
const MAX_ORIGINS = 20;

/** One origin a line; blank lines are ignored. Lower-cased as the API stores them. */
export function parseOrigins(text: string): string[] {
  return text
    .split(/\r?\n/)
    .map((line) => line.trim().toLowerCase())
    .filter((line) => line.length > 0);
}

export function originProblem(origin: string): string | null {
  if (origin.length > 253 || !ORIGIN.test(origin)) return `${origin} is not an origin like https://shop.example.test`;
  if (origin.includes('*.') && !WILDCARD_NEEDS_DOMAIN.test(origin)) return `${origin}: a wildcard needs two labels after "*."`;
  const port = /:(\d+)$/.exec(origin);
  if (port && (Number(port[1]) < 1 || Number(port[1]) > 65535)) return `${origin}: the port must be 1 to 65535`;
  return null;
}

/** Group validator: an embed key needs 1–20 valid origins; a server key has none. */
export const originsFitKind: ValidatorFn = (group: AbstractControl): ValidationErrors | null => {
  const kind = group.get('kind')?.value as KeyKind;
  const origins = parseOrigins((group.get('origins')?.value as string) ?? '');
  if (kind !== 'embed') return null;
  if (origins.length === 0) return { origins: 'An embed key needs at least one allowed origin.' };
  if (origins.length > MAX_ORIGINS) return { origins: `At most ${MAX_ORIGINS} origins.` };
  const bad = origins.map(originProblem).find((p) => p !== null);
  return bad ? { origins: bad } : null;
};

/** A date input's value (yyyy-mm-dd) must be a later day than today, in the user's time zone. */
export function futureDate(now: () => Date): ValidatorFn {
  return (control) => {
    const value = control.value as string;
    return !value || value > localDay(now()) ? null : { past: true };
  };
}

/** yyyy-mm-dd of a moment in the user's time zone, as a date input shows it. */
export function localDay(moment: Date): string {
  return new Date(moment.getTime() - moment.getTimezoneOffset() * 60_000).toISOString().slice(0, 10);
}

/** The key stops working at the end of the chosen day, local time. */
export function endOfDay(value: string): Date {
  return new Date(`${value}T23:59:59`);
}

export interface KeyFormValue {
  kind: KeyKind;
  name: string;
  scopes: Scope[];
  origins: string;
  expiresOn: string;
}

export function createRequest(value: KeyFormValue): CreateApiKeyRequest {
  const request: CreateApiKeyRequest = { kind: value.kind, name: value.name.trim(), scopes: value.scopes };
  if (value.kind === 'embed') request.allowedOrigins = parseOrigins(value.origins);
  if (value.expiresOn) request.expiresAt = endOfDay(value.expiresOn).toISOString();
  return request;
}
