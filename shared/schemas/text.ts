import { z } from 'zod';

/** C0 and C1 control characters except tab, line feed and carriage return. */
const CONTROL = /[\u0000-\u0008\u000b\u000c\u000e-\u001f\u007f-\u009f]/;
/** Line breaks, and the bidirectional overrides and isolates that can make a name read as another. */
const NAME_BREAKERS = /[\r\n\u2028\u2029\u202a-\u202e\u2066-\u2069]/;

export function hasControlCharacter(value: string): boolean {
  return CONTROL.test(value);
}

/**
 * A name shown in lists, e-mails and audit entries (a key, an organisation, a person): one line,
 * trimmed, no control characters and no bidirectional overrides.
 */
export function nameText(maxLength: number) {
  return z
    .string()
    .trim()
    .min(1)
    .max(maxLength)
    .refine((v) => !CONTROL.test(v), 'must not contain control characters')
    .refine((v) => !NAME_BREAKERS.test(v), 'must be one line, without bidirectional override characters');
}
