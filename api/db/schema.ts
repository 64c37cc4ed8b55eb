import { sql } from 'drizzle-orm';
import {
  bigint,
  bigserial,
  boolean,
  date,
  index,
  integer,
  jsonb,
  pgTable,
  primaryKey,
  text,
  timestamp,
  uniqueIndex,
  uuid,
  type AnyPgColumn,
} from 'drizzle-orm/pg-core';

/** An older secret of a rotated key, valid until `validUntil` (ISO time). */
export interface OverlappingSecret {
  hash: string;
  validUntil: string;
}

const createdAt = () => timestamp('created_at', { withTimezone: true }).notNull().defaultNow();
const at = (name: string) => timestamp(name, { withTimezone: true });

/** Plans are data: quota and rate per organisation, changed without a deploy. */
export const plans = pgTable('plans', {
  id: text('id').primaryKey(),
  name: text('name').notNull(),
  monthlyQuota: integer('monthly_quota').notNull(),
  ratePerMinute: integer('rate_per_minute').notNull(),
  /** Active (not revoked, not expired) API keys an organisation on this plan may hold. */
  maxApiKeys: integer('max_api_keys').notNull().default(5),
  /**
   * Sizing work units one key may spend per minute (the cost budget beside ratePerMinute): a call
   * costs 1 plus the treads, landings, reel pieces and tenths of pixels it sizes (api/middleware/cost-budget.ts).
   */
  costPerMinute: integer('cost_per_minute').notNull().default(5000),
  /** Monthly price in minor units (cents) of `currency`; null: no payment (free, internal plans). */
  monthlyPriceMinor: integer('monthly_price_minor'),
  /** ISO 4217, lower-case as the payment provider writes it; set with the price. */
  currency: text('currency'),
  /** The payment provider's price this plan is sold as; checkouts and webhooks map through it. */
  providerPriceId: text('provider_price_id').unique(),
  /** Shown to organisations on the billing page; the internal plan never is. */
  offered: boolean('offered').notNull().default(false),
  /** Days a paid plan stays in force after a payment first failed, before the organisation falls back to free. */
  graceDays: integer('grace_days').notNull().default(0),
  /**
   * Price of each 1 000 units beyond the monthly quota (minor units of `currency`). Set: the plan
   * never refuses for the quota, the units beyond it are reported to the provider once a day.
   * Null: calls beyond the quota are refused.
   */
  overagePer1000Minor: integer('overage_per_1000_minor'),
  /** The provider meter (its event name) the overage units are reported to; set with the overage price. */
  overageMeter: text('overage_meter'),
  createdAt: createdAt(),
});

/** Partner organisations (shops, builders, studios) that use Treadwise under their own keys. */
export const organizations = pgTable('organizations', {
  id: uuid('id').primaryKey().defaultRandom(),
  slug: text('slug').notNull().unique(),
  name: text('name').notNull(),
  planId: text('plan_id')
    .notNull()
    .default('free')
    .references(() => plans.id),
  createdAt: createdAt(),
  updatedAt: timestamp('updated_at', { withTimezone: true }).notNull().defaultNow(),
});

/** People who sign in to the console. `operator` is the Treadwise team, able to act in any organisation. */
export const users = pgTable('users', {
  id: uuid('id').primaryKey().defaultRandom(),
  email: text('email').notNull().unique(), // stored lower-cased
  name: text('name'),
  passwordHash: text('password_hash'), // null until an invitation is accepted
  operator: boolean('operator').notNull().default(false),
  createdAt: createdAt(),
});

/**
 * Failed password checks per account *and* source address: the lock a run of wrong passwords
 * earns applies to the address that made them, so a stranger cannot lock the owner out.
 */
export const signInFailures = pgTable(
  'sign_in_failures',
  {
    userId: uuid('user_id')
      .notNull()
      .references(() => users.id, { onDelete: 'cascade' }),
    source: text('source').notNull(),
    failures: integer('failures').notNull().default(0),
    lockedUntil: at('locked_until'),
    updatedAt: at('updated_at').notNull(),
  },
  (t) => [primaryKey({ columns: [t.userId, t.source] })],
);

export const memberships = pgTable(
  'memberships',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    organizationId: uuid('organization_id')
      .notNull()
      .references(() => organizations.id, { onDelete: 'cascade' }),
    userId: uuid('user_id')
      .notNull()
      .references(() => users.id, { onDelete: 'cascade' }),
    role: text('role', { enum: ['admin', 'estimator', 'viewer'] }).notNull(),
    createdAt: createdAt(),
  },
  (t) => [uniqueIndex('memberships_org_user').on(t.organizationId, t.userId)],
);

/** Refresh tokens rotate on every use; a reused (already rotated) token revokes its family. */
export const refreshTokens = pgTable(
  'refresh_tokens',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    userId: uuid('user_id')
      .notNull()
      .references(() => users.id, { onDelete: 'cascade' }),
    familyId: uuid('family_id').notNull(),
    /** The organisation the session acts in: a refresh keeps the one the user last switched to. */
    organizationId: uuid('organization_id').references(() => organizations.id, { onDelete: 'set null' }),
    tokenHash: text('token_hash').notNull().unique(),
    expiresAt: at('expires_at').notNull(),
    usedAt: at('used_at'),
    revokedAt: at('revoked_at'),
    createdAt: createdAt(),
  },
  (t) => [index('refresh_tokens_family').on(t.familyId)],
);

/** Single-use, expiring links sent by e-mail: member invitations and password resets. */
export const emailTokens = pgTable('email_tokens', {
  id: uuid('id').primaryKey().defaultRandom(),
  purpose: text('purpose', { enum: ['invitation', 'password_reset'] }).notNull(),
  tokenHash: text('token_hash').notNull().unique(),
  email: text('email').notNull(),
  userId: uuid('user_id').references(() => users.id, { onDelete: 'cascade' }),
  organizationId: uuid('organization_id').references(() => organizations.id, { onDelete: 'cascade' }),
  role: text('role', { enum: ['admin', 'estimator', 'viewer'] }),
  expiresAt: at('expires_at').notNull(),
  usedAt: at('used_at'),
  createdAt: createdAt(),
});

/**
 * API keys. `keyId` is the public part shown in logs and charts; only an HMAC-SHA256 of the
 * secret is stored. After a rotation the older secrets keep working until the end of the overlap each was granted
 * (`overlappingSecrets`).
 */
export const apiKeys = pgTable(
  'api_keys',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    keyId: text('key_id').notNull().unique(),
    organizationId: uuid('organization_id')
      .notNull()
      .references(() => organizations.id, { onDelete: 'cascade' }),
    kind: text('kind', { enum: ['server', 'embed'] }).notNull(),
    name: text('name').notNull(),
    scopes: text('scopes').array().notNull(),
    allowedOrigins: text('allowed_origins').array().notNull().default(sql`'{}'::text[]`),
    secretHash: text('secret_hash').notNull(),
    /** Hashes of older secrets still in their overlap, each with its end (ISO time). */
    overlappingSecrets: jsonb('overlapping_secrets').$type<OverlappingSecret[]>().notNull().default([]),

    expiresAt: at('expires_at'),
    lastUsedAt: at('last_used_at'),
    revokedAt: at('revoked_at'),
    createdByUserId: uuid('created_by_user_id').references(() => users.id, { onDelete: 'set null' }),
    createdByKeyId: text('created_by_key_id'),
    createdAt: createdAt(),
  },
  (t) => [index('api_keys_org').on(t.organizationId)],
);

/** Requests made with a key, counted per day, route and status class; latency buckets give p50/p95. */
export const usageCounters = pgTable(
  'usage_counters',
  {
    organizationId: uuid('organization_id')
      .notNull()
      .references(() => organizations.id, { onDelete: 'cascade' }),
    keyId: text('key_id').notNull(),
    day: date('day').notNull(),
    route: text('route').notNull(),
    statusClass: text('status_class').notNull(), // 2xx, 4xx, 5xx
    count: bigint('count', { mode: 'number' }).notNull(),
    // Of `count`, those refused by a rate limit or the monthly quota: metered, never billed.
    limited: bigint('limited', { mode: 'number' }).notNull().default(0),
    // Quota units the admitted calls used (1 a call, one per item for a synchronous batch); refused calls use none.
    units: bigint('units', { mode: 'number' }).notNull().default(0),
    latencyMsTotal: bigint('latency_ms_total', { mode: 'number' }).notNull(),
    latencyBuckets: integer('latency_buckets').array().notNull(),
  },
  (t) => [primaryKey({ columns: [t.organizationId, t.keyId, t.day, t.route, t.statusClass] })],
);

/** Quota warnings (80 %, 100 %) already sent, so each goes out once per organisation and month. */
export const quotaNotices = pgTable(
  'quota_notices',
  {
    organizationId: uuid('organization_id')
      .notNull()
      .references(() => organizations.id, { onDelete: 'cascade' }),
    month: text('month').notNull(), // YYYY-MM
    thresholdPercent: integer('threshold_percent').notNull(),
    sentAt: createdAt(),
  },
  (t) => [primaryKey({ columns: [t.organizationId, t.month, t.thresholdPercent] })],
);

/** The local mail sink: every message the server would have sent, readable by the operator. */
export const outboxMessages = pgTable('outbox_messages', {
  id: uuid('id').primaryKey().defaultRandom(),
  to: text('to').notNull(),
  subject: text('subject').notNull(),
  text: text('text').notNull(),
  html: text('html'),
  createdAt: createdAt(),
});

export const auditEvents = pgTable(
  'audit_events',
  {
    id: bigserial('id', { mode: 'number' }).primaryKey(),
    organizationId: uuid('organization_id').references(() => organizations.id, { onDelete: 'cascade' }),
    action: text('action').notNull(), // <resource>.<verb>
    actorType: text('actor_type', { enum: ['user', 'api_key', 'system', 'anonymous'] }).notNull(),
    actorId: text('actor_id'),
    targetType: text('target_type'),
    targetId: text('target_id'),
    requestId: text('request_id'),
    ip: text('ip'),
    data: jsonb('data').$type<Record<string, unknown>>(),
    createdAt: createdAt(),
  },
  (t) => [index('audit_events_org_id').on(t.organizationId, t.id)],
);

/** First response to a POST with an Idempotency-Key, replayed for 24 h to the same owner. */
export const idempotencyRecords = pgTable(
  'idempotency_records',
  {
    owner: text('owner').notNull(),
    key: text('key').notNull(),
    requestHash: text('request_hash').notNull(),
    status: integer('status'), // null while the first request is still running
    body: jsonb('body'),
    createdAt: createdAt(),
  },
  (t) => [primaryKey({ columns: [t.owner, t.key] })],
);

/**
 * One stored catalog per organisation: its currency, tax rate and a version every change to it or
 * its items bumps (an estimate can then say which version priced it).
 */
export const catalogs = pgTable('catalogs', {
  organizationId: uuid('organization_id')
    .primaryKey()
    .references(() => organizations.id, { onDelete: 'cascade' }),
  currency: text('currency').notNull().default('EUR'),
  /** Tax rate in hundredths of a percent (2000 = 20 %), so it stays exact. */
  taxRateBasisPoints: integer('tax_rate_basis_points').notNull().default(0),
  version: integer('version').notNull().default(1),
  createdAt: createdAt(),
  updatedAt: timestamp('updated_at', { withTimezone: true }).notNull().defaultNow(),
});

/**
 * A catalog's items. The fields of the item's kind live in `fields` (validated by that kind's
 * schema before they get here); the price is kept in integer minor units so sums are exact. A
 * retired item (`active` false) stays for old estimates but is never picked.
 */
export const catalogItems = pgTable(
  'catalog_items',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    organizationId: uuid('organization_id')
      .notNull()
      .references(() => catalogs.organizationId, { onDelete: 'cascade' }),
    sku: text('sku').notNull(),
    kind: text('kind').notNull(),
    description: text('description'),
    fields: jsonb('fields').$type<Record<string, unknown>>().notNull(),
    unitPriceMinor: bigint('unit_price_minor', { mode: 'number' }),
    active: boolean('active').notNull().default(true),
    createdAt: createdAt(),
    updatedAt: timestamp('updated_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [uniqueIndex('catalog_items_org_sku').on(t.organizationId, t.sku), index('catalog_items_org_kind').on(t.organizationId, t.kind, t.sku)],
);

/** Who created or ran something: a user (id) or an API key (its public key id). */
type ActorType = 'user' | 'api_key';

/**
 * An installer's job: client, site and notes. Deleting a project (an admin's call) deletes its
 * stairs and their stored estimates with it; the audit trail keeps that it happened.
 */
export const projects = pgTable(
  'projects',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    organizationId: uuid('organization_id')
      .notNull()
      .references(() => organizations.id, { onDelete: 'cascade' }),
    name: text('name').notNull(),
    clientName: text('client_name'),
    siteAddress: text('site_address'),
    notes: text('notes'),
    createdByType: text('created_by_type').$type<ActorType>().notNull(),
    createdById: text('created_by_id').notNull(),
    createdAt: createdAt(),
    updatedAt: timestamp('updated_at', { withTimezone: true }).notNull().defaultNow(),
  },
  // The list: an organisation's projects, newest first.
  (t) => [index('projects_org_created').on(t.organizationId, t.createdAt, t.id)],
);

/** A named stair of a project: the estimate request it runs (validated by estimateRequestSchema). */
export const projectStairs = pgTable(
  'project_stairs',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    projectId: uuid('project_id')
      .notNull()
      .references(() => projects.id, { onDelete: 'cascade' }),
    organizationId: uuid('organization_id')
      .notNull()
      .references(() => organizations.id, { onDelete: 'cascade' }),
    name: text('name').notNull(),
    notes: text('notes'),
    input: jsonb('input').$type<Record<string, unknown>>().notNull(),
    createdAt: createdAt(),
    updatedAt: timestamp('updated_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [index('project_stairs_project_created').on(t.projectId, t.createdAt, t.id)],
);

/**
 * A stair's estimate as it was run: the input, the whole result, the engine and catalog versions
 * that made it and who ran it, so it can be shown, exported and re-run later. A re-run names the
 * estimate it re-ran (`rerunOf`).
 */
export const storedEstimates = pgTable(
  'estimates',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    organizationId: uuid('organization_id')
      .notNull()
      .references(() => organizations.id, { onDelete: 'cascade' }),
    projectId: uuid('project_id')
      .notNull()
      .references(() => projects.id, { onDelete: 'cascade' }),
    stairId: uuid('stair_id')
      .notNull()
      .references(() => projectStairs.id, { onDelete: 'cascade' }),
    input: jsonb('input').$type<Record<string, unknown>>().notNull(),
    result: jsonb('result').$type<Record<string, unknown>>().notNull(),
    engineVersion: text('engine_version').notNull(),
    catalogVersion: integer('catalog_version'),
    pricingSource: text('pricing_source').$type<'inline' | 'stored'>(),
    ranByType: text('ran_by_type').$type<ActorType>().notNull(),
    ranById: text('ran_by_id').notNull(),
    rerunOf: uuid('rerun_of').references((): AnyPgColumn => storedEstimates.id, { onDelete: 'set null' }),
    createdAt: createdAt(),
  },
  // The list: a stair's estimates, newest first.
  (t) => [index('estimates_stair_created').on(t.stairId, t.createdAt, t.id), index('estimates_org').on(t.organizationId)],
);

/** Where a batch job stands; `receiving` is internal (the upload is still being read) and never listed. */
export type BatchJobStatus = 'receiving' | 'queued' | 'running' | 'succeeded' | 'stopped' | 'cancelled' | 'failed';

/**
 * A background batch job: its rows live in batch_job_rows, its counters here. The counters change
 * only in the transaction that writes a chunk's answers, so they always equal what the rows hold.
 */
export const batchJobs = pgTable(
  'batch_jobs',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    organizationId: uuid('organization_id')
      .notNull()
      .references(() => organizations.id, { onDelete: 'cascade' }),
    name: text('name'),
    status: text('status').$type<BatchJobStatus>().notNull(),
    stopReason: text('stop_reason').$type<'quota_exceeded' | 'cancelled' | 'error'>(),
    source: text('source').$type<'csv' | 'ndjson' | 'json'>().notNull(),
    detail: text('detail').$type<'summary' | 'full'>().notNull(),
    /** The creator: a user id, or an API key's public key id. */
    createdByType: text('created_by_type').$type<'user' | 'key'>().notNull(),
    createdById: text('created_by_id').notNull(),
    /** Usage rows of the job's units carry this key id (`console` for a user), as the creating call's did. */
    meteredKeyId: text('metered_key_id').notNull(),
    rowsTotal: integer('rows_total').notNull().default(0),
    rowsDone: integer('rows_done').notNull().default(0),
    rowsOk: integer('rows_ok').notNull().default(0),
    rowsFailed: integer('rows_failed').notNull().default(0),
    rowsWithFailingChecks: integer('rows_with_failing_checks').notNull().default(0),
    engineVersion: text('engine_version').notNull(),
    catalogVersion: integer('catalog_version'),
    /** The stored catalog as it was when the job was created: one version prices every row. */
    pricingCatalog: jsonb('pricing_catalog').$type<Record<string, unknown>>(),
    /** Chunks in a row that broke on a fault of ours; the job fails after a few. */
    faults: integer('faults').notNull().default(0),
    leaseOwner: text('lease_owner'),
    leaseUntil: at('lease_until'),
    heartbeatAt: at('heartbeat_at'),
    notifiedAt: at('notified_at'),
    createdAt: createdAt(),
    startedAt: at('started_at'),
    finishedAt: at('finished_at'),
    expiresAt: at('expires_at').notNull(),
  },
  (t) => [
    index('batch_jobs_org_created').on(t.organizationId, t.createdAt, t.id),
    index('batch_jobs_status').on(t.status),
    index('batch_jobs_expires').on(t.expiresAt),
  ],
);

/**
 * One row of a batch job: its input (the validated request, or the problem that refused it) and,
 * once sized, its answer (an EstimateBatchItemResult). An answer is written only where none is
 * (`WHERE answer IS NULL`), so every row is answered exactly once whoever sizes it.
 */
export const batchJobRows = pgTable(
  'batch_job_rows',
  {
    jobId: uuid('job_id')
      .notNull()
      .references(() => batchJobs.id, { onDelete: 'cascade' }),
    idx: integer('idx').notNull(),
    ref: text('ref'),
    request: jsonb('request').$type<Record<string, unknown>>(),
    problem: jsonb('problem').$type<Record<string, unknown>>(),
    answer: jsonb('answer').$type<Record<string, unknown>>(),
    status: text('status').$type<'ok' | 'error'>(),
    answeredAt: at('answered_at'),
  },
  (t) => [
    primaryKey({ columns: [t.jobId, t.idx] }),
    // The runner's next chunk: unanswered rows in order, without walking the answered ones.
    index('batch_job_rows_open').on(t.jobId, t.idx).where(sql`answer is null`),
  ],
);

/**
 * Each organisation's link to the payment provider: its customer (made once, at the first
 * checkout) and its subscription as the provider last described it.
 */
export const billingAccounts = pgTable('billing_accounts', {
  organizationId: uuid('organization_id')
    .primaryKey()
    .references(() => organizations.id, { onDelete: 'cascade' }),
  customerId: text('customer_id').notNull().unique(),
  subscriptionId: text('subscription_id').unique(),
  /** The provider's subscription status (active, past_due, canceled, …). */
  status: text('status'),
  providerPriceId: text('provider_price_id'),
  currentPeriodEnd: timestamp('current_period_end', { withTimezone: true }),
  cancelAtPeriodEnd: boolean('cancel_at_period_end').notNull().default(false),
  /** When a payment first failed (kept through the provider's retries); null once paid. The grace runs from here. */
  pastDueSince: timestamp('past_due_since', { withTimezone: true }),
  updatedAt: timestamp('updated_at', { withTimezone: true }).notNull().defaultNow(),
});

/** Provider events already handled: a redelivered event id is acknowledged and skipped. */
export const billingEvents = pgTable('billing_events', {
  eventId: text('event_id').primaryKey(),
  type: text('type').notNull(),
  receivedAt: timestamp('received_at', { withTimezone: true }).notNull().defaultNow(),
});

/**
 * Overage units reported to the provider, one row per organisation and finished UTC day. The row
 * is written before the provider call and `identifier` is sent with it, so a retry after a crash
 * in between is deduplicated by the provider: each day is billed exactly once.
 */
export const overageReports = pgTable(
  'overage_reports',
  {
    organizationId: uuid('organization_id')
      .notNull()
      .references(() => organizations.id, { onDelete: 'cascade' }),
    day: date('day').notNull(),
    units: integer('units').notNull(),
    /** `<organizationId>:<YYYY-MM-DD>`: the provider's idempotent identifier of the meter event. */
    identifier: text('identifier').notNull().unique(),
    reportedAt: timestamp('reported_at', { withTimezone: true }),
    createdAt: createdAt(),
  },
  (t) => [primaryKey({ columns: [t.organizationId, t.day] })],
);

/**
 * Every estimator script this deployment has served, by version: a shop that pinned a versioned
 * URL with its SRI hash keeps working after the next release (one instance publishes, all serve).
 */
export const embedScripts = pgTable('embed_scripts', {
  version: text('version').primaryKey(),
  /** The script as built (UTF-8 JavaScript; stored as text, sent back byte for byte). */
  script: text('script').notNull(),
  integrity: text('integrity').notNull(),
  createdAt: createdAt(),
});
