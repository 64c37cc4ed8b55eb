import { z } from 'zod';
import { SCOPE_VALUES } from '../tables/access.js';
import { organizationSchema } from './accounts.js';
import { createdByRequestIdSchema } from './common.js';
import { pageOf } from './page.js';
import { nameText } from './text.js';

export { SCOPE_VALUES };

export const keyKindSchema = z.enum(['server', 'embed']).meta({ id: 'KeyKind', description: '`server` keys for servers, `embed` keys for shop web pages.' });

export const scopeSchema = z.enum(SCOPE_VALUES).meta({ id: 'Scope', description: 'What a key may do.' });

const originPattern = z
  .string()
  .max(253)
  .regex(/^https?:\/\/(\*\.)?[a-z0-9-]+(\.[a-z0-9-]+)*(:\d{1,5})?$/, 'an origin like https://shop.example.test or https://*.example.test')
  // A wildcard needs a registrable domain under it: https://*.test would open the key to a whole TLD.
  .refine((o) => !o.includes('*.') || /^https?:\/\/\*\.[a-z0-9-]+\.[a-z0-9-]+/.test(o), 'a wildcard needs at least two labels after "*." (https://*.example.test)')
  .refine((o) => {
    const port = /:(\d+)$/.exec(o);
    return !port || (Number(port[1]) >= 1 && Number(port[1]) <= 65535);
  }, 'a port from 1 to 65535')
  .meta({ example: 'https://shop.harborlane.test' });

export const createApiKeyRequestSchema = z
  .strictObject({
    name: nameText(100).meta({ description: 'What the key is for.', example: 'Product pages' }),
    kind: keyKindSchema.default('server').meta({
      description: '`server` (tw_server_…) for servers; `embed` (tw_embed_…) for shop web pages: sizing and active catalog items only, from its allowed origins.',
    }),
    scopes: z.array(scopeSchema).min(1).max(8).optional().meta({
      description: 'Defaults to ["sizing:run"]. Never more than the creator holds; embed keys get only sizing:run and catalog:read (reading active catalog items).',
    }),
    allowedOrigins: z.array(originPattern).max(20).optional().meta({
      description: 'Embed keys only (required there): page origins allowed to use the key; one leading `*.` label matches sub-domains.',
    }),
    expiresAt: z.iso.datetime({ offset: true }).nullable().optional().meta({ description: 'When the key stops working; none by default.' }),
  })
  .superRefine((v, ctx) => {
    if (v.kind === 'embed') {
      if (!v.allowedOrigins?.length) ctx.addIssue({ code: 'custom', path: ['allowedOrigins'], message: 'an embed key needs at least one allowed origin' });
      if (v.scopes && v.scopes.some((s) => s !== 'sizing:run' && s !== 'catalog:read')) {
        ctx.addIssue({ code: 'custom', path: ['scopes'], message: 'embed keys may only have sizing:run and catalog:read' });
      }
    } else if (v.allowedOrigins?.length) {
      ctx.addIssue({ code: 'custom', path: ['allowedOrigins'], message: 'only embed keys have allowed origins' });
    }
  })
  .meta({
    id: 'CreateApiKeyRequest',
    example: { name: 'Product pages', kind: 'embed', allowedOrigins: ['https://shop.harborlane.test'] },
  });

/** Longest overlap of an old secret after a rotation: three days, enough for a weekend deploy. */
export const MAX_OVERLAP_HOURS = 72;

export const rotateApiKeyRequestSchema = z
  .strictObject({
    overlapHours: z
      .int()
      .min(0)
      .max(MAX_OVERLAP_HOURS)
      .default(24)
      .meta({ description: `Hours the old secret keeps working beside the new one (0 to ${MAX_OVERLAP_HOURS}; default 24; 0 stops it at once).`, example: 2 }),
  })
  .meta({ id: 'RotateApiKeyRequest' });

export const apiKeySchema = z
  .object({
    id: z.uuid(),
    keyId: z.string().meta({ description: 'Public part of the key, shown in logs and usage.', example: 'q7m2x4kd9fhp' }),
    kind: keyKindSchema,
    name: z.string(),
    scopes: z.array(z.string()),
    allowedOrigins: z.array(z.string()),
    expiresAt: z.string().nullable(),
    lastUsedAt: z.string().nullable(),
    revokedAt: z.string().nullable(),
    previousSecretValidUntil: z.string().nullable().meta({ description: 'After a rotation: until when the old secret still works.' }),
    createdAt: z.string(),
    status: z.enum(['active', 'expired', 'revoked']),
  })
  .meta({ id: 'ApiKey', description: 'An API key as listed; the secret is never shown again after creation or rotation.' });

export const apiKeyWithTokenSchema = z
  .object({
    key: apiKeySchema,
    requestId: createdByRequestIdSchema,
    token: z.string().meta({
      description: 'The whole key — shown only in this response. Store it now.',
      example: 'tw_embed_q7m2x4kd9fhp_3d7Kc0yZ1rT9bQw2aXv8nLm4pE6sH5uJ',
    }),
  })
  .meta({ id: 'ApiKeyWithToken' });

export const apiKeyPageSchema = pageOf(apiKeySchema, 'ApiKeyPage');

export const currentKeySchema = z
  .object({
    key: apiKeySchema,
    organization: organizationSchema,
    plan: z.object({ id: z.string(), name: z.string() }).meta({ description: 'The plan whose limits the key runs under.' }),
  })
  .meta({ id: 'CurrentKey', description: 'The server key that made the call: its own row (never its secret), its organisation and plan.' });

export type CreateApiKeyRequest = z.output<typeof createApiKeyRequestSchema>;
