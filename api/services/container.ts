import { createAccessTokens } from '../auth/access-tokens.js';
import { createAllowedOrigins } from '../auth/allowed-origins.js';
import { createKeyEvents } from '../auth/key-events.js';
import { KeyCache } from '../auth/key-cache.js';
import type { AppDeps } from '../deps.js';
import { createApiKeyService } from './api-keys.js';
import { createAuditService } from './audit.js';
import { createCatalogService } from './catalog.js';
import { createEmbedScriptArchive } from '../embed/script-archive.js';
import { createPricedEstimates } from './priced-estimates.js';
import { createProjectService } from './projects.js';
import { createStairService } from './stairs.js';
import { createStoredEstimateService } from './stored-estimates.js';
import { createMailer } from './mailer.js';
import { createEmailTokenService } from './email-tokens.js';
import { createMemberService } from './members.js';
import { createOrganizationService } from './organizations.js';
import { createPasswordResetService } from './password-resets.js';
import { createSessionService } from './sessions.js';
import { createSignInGuard } from './sign-in-guard.js';
import { createUserService } from './users.js';
import { createPlanService } from './plans.js';
import { createQuotaService } from './quotas.js';
import { createRateLimitStores } from './rate-limit-stores.js';
import { createUsageMeter } from './usage-meter.js';
import { createMetrics } from '../metrics/metrics.js';
import { createBatchJobService } from './batch-jobs/runner.js';
import { createBillingService } from './billing.js';
import { adminEmails } from './org-admins.js';
import { createPaymentsClient } from '../payments/client.js';

/** Every service the routes use, built once per app from its dependencies. */
export function createServices(deps: AppDeps) {
  const { db } = deps.database;
  const clock = deps.clock;
  const apiKeys = createApiKeyService({ db, pepper: deps.secrets.pepper, clock });
  const accessTokens = createAccessTokens(deps.secrets.jwtPrivateKey, deps.secrets.jwtPublicKey, clock);
  const mailer = createMailer({ db, smtpUrl: deps.config.smtpUrl, from: deps.config.mailFrom, clock });
  const users = createUserService({ db, clock });
  const emailTokens = createEmailTokenService({ db, pepper: deps.secrets.pepper, clock });
  const signInGuard = createSignInGuard({ db, clock });
  const sessions = createSessionService({ db, pepper: deps.secrets.pepper, clock, accessTokens, users, guard: signInGuard });
  const accountMail = { db, publicUrl: deps.config.publicUrl, users, emailTokens, sessions, mailer };
  // Traffic: plans are cached, the monthly tally syncs after each usage flush.
  const plans = createPlanService({ db, clock });
  const quotas = createQuotaService({ db, plans, mailer, clock, logger: deps.logger, publicUrl: deps.config.publicUrl });
  const usageMeter = createUsageMeter({ db, logger: deps.logger, flushIntervalMs: deps.config.usageFlushIntervalMs, flushAfterCalls: deps.config.usageFlushAfterCalls, observer: quotas.observer });
  const keyCache = new KeyCache((keyId) => apiKeys.byKeyId(keyId), () => clock().getTime());
  const allowedOrigins = createAllowedOrigins({ db, clock });
  // Catalog changes reach the other instances' priced-catalog caches through the key-change channel.
  const catalog = createCatalogService({ db, clock, onChange: (organizationId) => keyEvents.catalogChanged(organizationId) });
  const keyEvents = createKeyEvents({ database: deps.database, keyCache, allowedOrigins, catalog, plans, logger: deps.logger });
  const metrics = createMetrics();
  const pricedEstimates = createPricedEstimates(catalog, metrics.timeEngine);
  const projects = createProjectService({ db, clock });
  const stairs = createStairService({ db, clock, projects });
  // A stair runs as POST /v1/estimates does: priced from the stored catalog unless its input carries one.
  const storedEstimates = createStoredEstimateService({ db, clock, stairs, runner: (organizationId, input) => pricedEstimates.run(organizationId, input) });
  // Background batch jobs: rows metered against the same quota, the creator told by e-mail when one ends.
  const batchJobs = createBatchJobService({
    database: deps.database,
    clock,
    logger: deps.logger,
    quotas,
    usageMeter,
    mailer,
    catalog,
    publicUrl: deps.config.publicUrl,
    retentionDays: deps.config.batchRetentionDays,
  });
  metrics.readBatchesFrom(() => batchJobs.progress());
  // Billing exists only with a payment provider (or the local simulation server.ts starts).
  const billing = deps.payments
    ? createBillingService({
        db,
        sdk: createPaymentsClient(deps.payments),
        connection: deps.payments,
        planChanged: (id) => keyEvents.planChanged(id),
        mailer,
        logger: deps.logger,
        clock,
        publicUrl: deps.config.publicUrl,
        adminEmails: (id) => adminEmails(db, id),
      })
    : undefined;
  const embedScripts = createEmbedScriptArchive({ db, logger: deps.logger });
  return {
    embedScripts,
    apiKeys,
    keyCache,
    keyEvents,
    accessTokens,
    users,
    emailTokens,
    sessions,
    signInGuard,
    passwordResets: createPasswordResetService(accountMail),
    members: createMemberService({ ...accountMail, clock, guard: signInGuard }),
    organizations: createOrganizationService({ db, clock }),
    allowedOrigins,
    audit: createAuditService({ db, clock }),
    catalog,
    pricedEstimates,
    projects,
    stairs,
    storedEstimates,
    mailer,
    plans,
    quotas,
    usageMeter,
    metrics,
    batchJobs,
    billing,
    rateLimitStores: createRateLimitStores(deps.config.redisUrl, deps.logger),
  };
}

export type Services = ReturnType<typeof createServices>;
