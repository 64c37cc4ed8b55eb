import { eq } from 'drizzle-orm';
import type { Logger } from 'pino';
import type Stripe from 'stripe';
import type { Db } from '../db/client.js';
import { billingAccounts, billingEvents, organizations, plans } from '../db/schema.js';
import { WEBHOOK_TOLERANCE_SECONDS, type PaymentsConnection } from '../payments/client.js';
import { HttpProblem } from '../problem.js';
import type { Mailer } from './mailer.js';
import { offeredPlans, type PlanService } from './plans.js';

/** Subscription states in which the paid plan applies (past_due: the provider is still retrying). */
const PAID_STATES = new Set(['active', 'trialing', 'past_due']);

export interface BillingDeps {
  db: Db;
  sdk: Stripe;
  connection: PaymentsConnection;
  plans: PlanService;
  mailer: Mailer;
  logger: Logger;
  clock: () => Date;
  publicUrl: string;
  /** E-mail addresses of an organisation's admins (for the failed-payment notice). */
  adminEmails: (organizationId: string) => Promise<string[]>;
}

export function createBillingService(deps: BillingDeps) {
  const { db, sdk } = deps;

  const account = async (organizationId: string) => (await db.select().from(billingAccounts).where(eq(billingAccounts.organizationId, organizationId)))[0];

  /** Sets the organisation's plan from the subscription as the provider describes it now. */
  const applySubscription = async (subscription: Stripe.Subscription) => {
    const customerId = typeof subscription.customer === 'string' ? subscription.customer : subscription.customer.id;
    const [acc] = await db.select().from(billingAccounts).where(eq(billingAccounts.customerId, customerId));
    if (!acc) return void deps.logger.warn({ customer: customerId }, 'billing: subscription of an unknown customer ignored');
    // A stale event about a subscription this organisation has since replaced changes nothing.
    if (acc.subscriptionId && acc.subscriptionId !== subscription.id && subscription.status === 'canceled') return;
    const item = subscription.items.data[0];
    const priceId = item?.price.id ?? null;
    const [plan] = priceId ? await db.select({ id: plans.id }).from(plans).where(eq(plans.providerPriceId, priceId)) : [];
    const paid = PAID_STATES.has(subscription.status) && plan;
    await db.transaction(async (tx) => {
      await tx
        .update(billingAccounts)
        .set({
          subscriptionId: subscription.id,
          status: subscription.status,
          providerPriceId: priceId,
          currentPeriodEnd: item ? new Date(item.current_period_end * 1000) : null,
          cancelAtPeriodEnd: subscription.cancel_at_period_end,
          updatedAt: deps.clock(),
        })
        .where(eq(billingAccounts.organizationId, acc.organizationId));
      await tx.update(organizations).set({ planId: paid ? plan.id : 'free', updatedAt: deps.clock() }).where(eq(organizations.id, acc.organizationId));
    });
    deps.plans.invalidate(acc.organizationId);
  };

  /** Reads the subscription afresh: its current state wins over whatever order the events came in. */
  const refreshSubscription = async (subscriptionId: string) => applySubscription(await sdk.subscriptions.retrieve(subscriptionId));

  const handle = async (event: Stripe.Event) => {
    switch (event.type) {
      case 'checkout.session.completed': {
        const session = event.data.object;
        const customerId = typeof session.customer === 'string' ? session.customer : session.customer?.id;
        const subscriptionId = typeof session.subscription === 'string' ? session.subscription : session.subscription?.id;
        if (!customerId || !subscriptionId) return;
        return refreshSubscription(subscriptionId);
      }
      case 'customer.subscription.updated':
      case 'customer.subscription.deleted':
        return refreshSubscription(event.data.object.id);
      case 'invoice.paid':
        return;
      case 'invoice.payment_failed': {
        const invoice = event.data.object;
        const customerId = typeof invoice.customer === 'string' ? invoice.customer : invoice.customer?.id;
        const [acc] = customerId ? await db.select().from(billingAccounts).where(eq(billingAccounts.customerId, customerId)) : [];
        if (!acc) return;
        const amount = `${(invoice.amount_due / 100).toFixed(2)} ${invoice.currency.toUpperCase()}`;
        for (const to of await deps.adminEmails(acc.organizationId)) {
          await deps.mailer.send({
            to,
            subject: 'Treadwise: a payment for your plan failed',
            text: `The payment of ${amount} for your Treadwise plan did not go through. Please update your payment details; the plan stays in force while the payment is retried.\n\n${deps.publicUrl}/billing`,
          });
        }
        return;
      }
      default:
        return;
    }
  };

  return {
    simulated: deps.connection.simulated,

    async overview(organizationId: string) {
      const [org] = await db.select({ planId: organizations.planId }).from(organizations).where(eq(organizations.id, organizationId));
      const acc = await account(organizationId);
      return { planId: org.planId, account: acc, offers: await offeredPlans(db) };
    },

    /** A checkout URL for a paid plan, or (with a subscription in place) the subscription moved to it. */
    async checkout(organizationId: string, planId: string, email: string | undefined, returnUrl: string) {
      const offer = (await offeredPlans(db)).find((p) => p.id === planId);
      if (!offer) throw new HttpProblem(404, 'plan_not_found', 'Plan not found', `No plan ${planId.slice(0, 60)} is on offer.`);
      if (!offer.price || !offer.providerPriceId) {
        throw new HttpProblem(409, 'plan_not_paid', 'Plan needs no payment', 'The free plan needs no checkout: cancel the subscription to return to it at the end of the period.');
      }
      let acc = await account(organizationId);
      if (acc?.subscriptionId && acc.status && acc.status !== 'canceled') {
        const sub = await sdk.subscriptions.retrieve(acc.subscriptionId);
        const updated = await sdk.subscriptions.update(sub.id, { items: [{ id: sub.items.data[0].id, price: offer.providerPriceId }], cancel_at_period_end: false, proration_behavior: 'create_prorations' });
        await applySubscription(updated);
        return { kind: 'changed' as const, url: null };
      }
      if (!acc) {
        const customer = await sdk.customers.create({ email, metadata: { organizationId } }, { idempotencyKey: `customer:${organizationId}` });
        await db.insert(billingAccounts).values({ organizationId, customerId: customer.id, updatedAt: deps.clock() }).onConflictDoNothing();
        acc = (await account(organizationId))!;
      }
      const session = await sdk.checkout.sessions.create({
        mode: 'subscription',
        customer: acc.customerId,
        client_reference_id: organizationId,
        metadata: { organizationId, planId },
        line_items: [{ price: offer.providerPriceId, quantity: 1 }],
        success_url: `${returnUrl}?checkout=done`,
        cancel_url: returnUrl,
      });
      if (!session.url) throw new HttpProblem(502, 'payments_unavailable', 'Payment provider error', 'The payment provider gave no checkout address.');
      return { kind: 'checkout' as const, url: session.url };
    },

    async cancel(organizationId: string) {
      const acc = await account(organizationId);
      if (!acc?.subscriptionId || acc.status === 'canceled') throw new HttpProblem(409, 'no_subscription', 'No subscription', 'This organisation has no paid subscription to cancel.');
      await applySubscription(await sdk.subscriptions.update(acc.subscriptionId, { cancel_at_period_end: true }));
    },

    async invoices(organizationId: string, limit: number) {
      const acc = await account(organizationId);
      if (!acc) return [];
      const list = await sdk.invoices.list({ customer: acc.customerId, limit });
      return list.data;
    },

    /** Verifies and handles one delivery; false for an event already handled. */
    async receive(raw: Buffer, signature: string | undefined): Promise<boolean> {
      let event: Stripe.Event;
      try {
        event = sdk.webhooks.constructEvent(raw, signature ?? '', deps.connection.webhookSecret, WEBHOOK_TOLERANCE_SECONDS);
      } catch {
        // The payload is not logged: it is unverified input and may carry personal data.
        deps.logger.warn({ bytes: raw.length, signed: signature !== undefined }, 'billing: webhook with a bad signature refused');
        throw new HttpProblem(400, 'bad_signature', 'Bad signature', 'The webhook signature does not verify.');
      }
      const [fresh] = await db.insert(billingEvents).values({ eventId: event.id, type: event.type, receivedAt: deps.clock() }).onConflictDoNothing().returning();
      if (!fresh) return false;
      try {
        await handle(event);
      } catch (err) {
        // Not handled: forget the id so the provider's retry gets another chance.
        await db.delete(billingEvents).where(eq(billingEvents.eventId, event.id));
        throw err;
      }
      return true;
    },
  };
}

export type BillingService = ReturnType<typeof createBillingService>;
