import express, { Router } from 'express';
import { z } from 'zod';
import { billingOverviewSchema, checkoutRequestSchema, checkoutResultSchema, invoiceListSchema, paymentDetailsLinkSchema, webhookReceiptSchema } from '../../shared/schemas/billing.js';
import { organizationOf, principalOf } from '../auth/principal.js';
import { validateBody, validateQuery } from '../middleware/validate.js';
import { problemResponse } from '../openapi/document.js';
import { HttpProblem } from '../problem.js';
import type { BillingService } from '../services/billing.js';
import type { Services } from '../services/container.js';
import type { RouteModule } from './route-module.js';

/** The provider posts here; its body must stay raw (bytes as signed), so app.ts parses it before the JSON parser. */
export const BILLING_WEBHOOK_PATH = '/v1/billing/webhook';
/** Provider events are small; a larger body is not one. */
export const BILLING_WEBHOOK_LIMIT = '256kb';

const invoiceQuerySchema = z.strictObject({ limit: z.coerce.number().int().min(1).max(100).default(24) }).meta({ id: 'InvoiceQuery' });

const billingOf = (services: Services): BillingService => {
  if (!services.billing) throw new HttpProblem(503, 'payments_unavailable', 'Payments unavailable', 'No payment provider is configured on this server.');
  return services.billing;
};

export const billingRoutes: RouteModule = {
  basePath: '/v1/billing',

  router(deps, services) {
    const router = Router();
    const returnUrl = `${deps.config.publicUrl}/billing`;

    router.get('/', async (_req, res) => {
      const organizationId = organizationOf(res);
      const billing = billingOf(services);
      const { planId, account, offers, graceEndsAt, scheduledPlanId } = await billing.overview(organizationId);
      const plan = await services.plans.forOrganization(organizationId);
      const standing = await services.quotas.standing(organizationId);
      const paid = account?.subscriptionId && account.status !== 'canceled';
      const state = paid ? (account.status === 'past_due' ? 'past_due' : account.cancelAtPeriodEnd ? 'ending' : 'active') : planId === 'free' ? 'free' : 'internal';
      res.json({
        plan: { id: plan.id, name: plan.name },
        state,
        subscription: account?.subscriptionId
          ? { status: account.status ?? 'unknown', currentPeriodEnd: account.currentPeriodEnd?.toISOString() ?? null, cancelAtPeriodEnd: account.cancelAtPeriodEnd, scheduledPlanId }
          : null,
        usage: {
          month: standing.month,
          used: standing.used,
          monthlyQuota: standing.plan.monthlyQuota,
          remaining: standing.remaining,
          overage: standing.plan.overage ? Math.max(0, standing.used - standing.plan.monthlyQuota) : 0,
        },
        graceEndsAt: account?.pastDueSince ? (graceEndsAt?.toISOString() ?? null) : null,
        plans: offers.map(({ providerPriceId: _p, ...offer }) => offer),
        simulated: billing.simulated,
      } satisfies z.infer<typeof billingOverviewSchema>);
    });

    router.post('/checkout', validateBody(checkoutRequestSchema), async (_req, res) => {
      const principal = principalOf(res);
      const email = principal.type === 'user' ? principal.email : undefined;
      const { planId } = res.locals.body as z.infer<typeof checkoutRequestSchema>;
      const result = await billingOf(services).checkout(organizationOf(res), planId, email, returnUrl);
      res.json({ outcome: result.kind, url: result.url } satisfies z.infer<typeof checkoutResultSchema>);
    });

    router.post('/cancel', async (_req, res) => {
      await billingOf(services).cancel(organizationOf(res));
      res.status(204).end();
    });

    router.post('/payment-details', async (_req, res) => {
      const url = await billingOf(services).paymentDetails(organizationOf(res), returnUrl);
      res.json({ url } satisfies z.infer<typeof paymentDetailsLinkSchema>);
    });

    router.get('/invoices', validateQuery(invoiceQuerySchema), async (_req, res) => {
      const { limit } = res.locals.query as z.infer<typeof invoiceQuerySchema>;
      const invoices = await billingOf(services).invoices(organizationOf(res), limit);
      res.json({
        items: invoices.map((i) => ({
          id: i.id,
          number: i.number ?? null,
          status: i.status ?? null,
          amountDue: i.amount_due,
          amountPaid: i.amount_paid,
          currency: i.currency,
          createdAt: new Date(i.created * 1000).toISOString(),
          url: i.hosted_invoice_url ?? null,
        })),
      } satisfies z.infer<typeof invoiceListSchema>);
    });

    router.post('/webhook', async (req, res) => {
      if (!Buffer.isBuffer(req.body)) throw new HttpProblem(400, 'bad_signature', 'Bad signature', 'The webhook signature does not verify.');
      const header = req.headers['stripe-signature'];
      const fresh = await billingOf(services).receive(req.body, typeof header === 'string' ? header : undefined);
      res.json({ received: true, duplicate: !fresh } satisfies z.infer<typeof webhookReceiptSchema>);
    });
    return router;
  },

  docs(registry) {
    const security = [{ bearer: [] }];
    registry.registerPath({
      method: 'get',
      path: '/v1/billing',
      tags: ['Billing'],
      operationId: 'getBilling',
      summary: 'Plan, billing state, usage and the plans on offer',
      description:
        'Any member of the organisation acted in. The plans on offer carry their monthly price, overage price and grace days; the internal plan is never listed. ' +
        'After a failed payment (state past_due) the paid plan stays until graceEndsAt, then the organisation falls back to free until the payment succeeds. ' +
        'On a plan with overage, usage.overage counts the units beyond the quota this month: they are reported to the provider once a day and billed with the next invoice.',
      security,
      responses: {
        200: { description: 'The billing overview.', content: { 'application/json': { schema: billingOverviewSchema } } },
        401: problemResponse('No or invalid credentials.'),
        403: problemResponse('Not a member of an organisation.'),
        503: problemResponse('No payment provider is configured.'),
      },
    });
    registry.registerPath({
      method: 'post',
      path: '/v1/billing/checkout',
      tags: ['Billing'],
      operationId: 'startCheckout',
      summary: 'Upgrade or change the paid plan',
      description:
        'Organisation admins. Without a subscription: creates the provider customer (once) and a hosted checkout in subscription mode, and answers its URL; ' +
        'the plan changes when the provider confirms payment (webhook). With a subscription in place, that subscription moves to the plan (never a second one): ' +
        'a dearer plan applies at once and the rest of the period is invoiced now, prorated (outcome changed); ' +
        'a cheaper one is scheduled: the subscription bills it from the next period, the organisation keeps the plan paid for until the period ends (outcome scheduled). ' +
        'Choosing the plan paid for again drops a scheduled downgrade or cancellation.',
      security,
      request: { body: { content: { 'application/json': { schema: checkoutRequestSchema } } } },
      responses: {
        200: { description: 'The checkout URL, or the change made in place.', content: { 'application/json': { schema: checkoutResultSchema } } },
        400: problemResponse('Invalid body.'),
        401: problemResponse('No or invalid credentials.'),
        403: problemResponse('Not an admin.'),
        404: problemResponse('No such plan on offer.'),
        409: problemResponse('The plan needs no payment.'),
        503: problemResponse('No payment provider is configured.'),
      },
    });
    registry.registerPath({
      method: 'post',
      path: '/v1/billing/cancel',
      tags: ['Billing'],
      operationId: 'cancelSubscription',
      summary: 'Cancel the subscription at the end of the period',
      description: 'Organisation admins. The paid plan stays until the period ends, then the organisation returns to the free plan.',
      security,
      responses: {
        204: { description: 'Cancelled at the period end.' },
        401: problemResponse('No or invalid credentials.'),
        403: problemResponse('Not an admin.'),
        409: problemResponse('No subscription to cancel.'),
        503: problemResponse('No payment provider is configured.'),
      },
    });
    registry.registerPath({
      method: 'post',
      path: '/v1/billing/payment-details',
      tags: ['Billing'],
      operationId: 'openPaymentDetails',
      summary: "A link to change the card at the payment provider",
      description:
        "Organisation admins. Answers the provider's hosted page (valid for a short while) where the card is changed; after a failed payment, the unpaid invoice is paid " +
        'with the new card and the plan stays (the webhook confirms it). The page leads back to the console\'s billing page.',
      security,
      responses: {
        200: { description: 'The link.', content: { 'application/json': { schema: paymentDetailsLinkSchema } } },
        401: problemResponse('No or invalid credentials.'),
        403: problemResponse('Not an admin.'),
        409: problemResponse('The organisation has never paid for a plan.'),
        503: problemResponse('No payment provider is configured.'),
      },
    });
    registry.registerPath({
      method: 'get',
      path: '/v1/billing/invoices',
      tags: ['Billing'],
      operationId: 'listInvoices',
      summary: "The organisation's invoices, newest first",
      description: 'Organisation admins. Read from the payment provider.',
      security,
      request: { query: invoiceQuerySchema },
      responses: {
        200: { description: 'Invoices.', content: { 'application/json': { schema: invoiceListSchema } } },
        400: problemResponse('Invalid limit.'),
        401: problemResponse('No or invalid credentials.'),
        403: problemResponse('Not an admin.'),
        503: problemResponse('No payment provider is configured.'),
      },
    });
    registry.registerPath({
      method: 'post',
      path: BILLING_WEBHOOK_PATH,
      tags: ['Billing'],
      operationId: 'receivePaymentEvent',
      summary: "The payment provider's signed events",
      description:
        'No credentials: the body is verified against the Stripe-Signature header (timestamp tolerance 5 minutes). Each event is handled once; ' +
        'the subscription is read afresh, so events may arrive in any order.',
      security: [],
      request: {
        headers: z.object({ 'stripe-signature': z.string().max(2000) }),
        body: { content: { 'application/json': { schema: z.object({ id: z.string().max(255), type: z.string().max(255) }).meta({ id: 'PaymentEvent' }) } } },
      },
      responses: {
        200: { description: 'Received (or a duplicate, acknowledged).', content: { 'application/json': { schema: webhookReceiptSchema } } },
        400: problemResponse('The signature does not verify.'),
        503: problemResponse('No payment provider is configured.'),
      },
    });
  },
};
