import { and, eq, ne, sql } from 'drizzle-orm';
import type { Logger } from 'pino';
import type Stripe from 'stripe';
import type { Db } from '../db/client.js';
import { billingAccounts, billingEvents, organizations, plans } from '../db/schema.js';
import { WEBHOOK_TOLERANCE_SECONDS, type PaymentsConnection } from '../payments/client.js';
import { HttpProblem } from '../problem.js';
import { createBillingMaintenance } from './billing-maintenance.js';
import { reportOverage } from './billing-overage.js';
import type { Mailer } from './mailer.js';
import { offeredPlans } from './plans.js';

/** Subscription states in which the paid plan applies (past_due: the provider is still retrying, within the grace). */
const PAID_STATES = new Set(['active', 'trialing', 'past_due']);
/** States in which a payment is owed: the grace runs from the first failure. */
const OWING_STATES = new Set(['past_due', 'unpaid']);
const DAY_MS = 24 * 3600 * 1000;

/**
 * Subscription metadata of a downgrade: the price paid for the current period and when that
 * period ends. The subscription itself already carries the cheaper price (so the renewal bills
 * it); the organisation keeps the plan paid for until the period it was paid for is over.
 */
const HELD_PRICE = 'held_price_id';
const HELD_UNTIL = 'held_until';

export interface BillingDeps {
  db: Db;
  sdk: Stripe;
  connection: PaymentsConnection;
  /** Tells every instance's plan cache (key-change channel) that an organisation's plan changed. */
  planChanged: (organizationId: string) => Promise<void>;
  mailer: Mailer;
  logger: Logger;
  clock: () => Date;
  publicUrl: string;
  /** E-mail addresses of an organisation's admins (for the failed-payment notice). */
  adminEmails: (organizationId: string) => Promise<string[]>;
}

/** The price the current period is paid at: the held one while a downgrade waits for the period end. */
export function paidPriceOf(subscription: Stripe.Subscription): string | null {
  const item = subscription.items.data[0];
  if (!item) return null;
  const held = subscription.metadata?.[HELD_PRICE];
  const until = Number(subscription.metadata?.[HELD_UNTIL]);
  return held && until > item.current_period_start ? held : item.price.id;
}

export function createBillingService(deps: BillingDeps) {
  const { db, sdk } = deps;

  const account = async (organizationId: string) => (await db.select().from(billingAccounts).where(eq(billingAccounts.organizationId, organizationId)))[0];
  const accountOfCustomer = async (customer: string | { id: string } | null | undefined) => {
    const customerId = typeof customer === 'string' ? customer : customer?.id;
    return customerId ? (await db.select().from(billingAccounts).where(eq(billingAccounts.customerId, customerId)))[0] : undefined;
  };
  const planOfPrice = async (priceId: string | null) =>
    priceId ? (await db.select({ id: plans.id, graceDays: plans.graceDays }).from(plans).where(eq(plans.providerPriceId, priceId)))[0] : undefined;
  const graceEnd = (since: Date | null, graceDays: number) => (since ? new Date(since.getTime() + graceDays * DAY_MS) : null);

  /** Sets the organisation's plan; every instance hears of a change. */
  const setPlan = async (organizationId: string, planId: string) => {
    const [changed] = await db
      .update(organizations)
      .set({ planId, updatedAt: deps.clock() })
      .where(and(eq(organizations.id, organizationId), ne(organizations.planId, planId)))
      .returning({ id: organizations.id });
    if (changed) await deps.planChanged(organizationId);
  };

  /** Sets the organisation's plan from the subscription as the provider describes it now. */
  const applySubscription = async (subscription: Stripe.Subscription) => {
    const acc = await accountOfCustomer(subscription.customer);
    if (!acc) return void deps.logger.warn({ subscription: subscription.id }, 'billing: subscription of an unknown customer ignored');
    // A stale event about a subscription this organisation has since replaced changes nothing.
    if (acc.subscriptionId && acc.subscriptionId !== subscription.id && subscription.status === 'canceled') return;
    const item = subscription.items.data[0];
    const plan = await planOfPrice(paidPriceOf(subscription));
    const owing = OWING_STATES.has(subscription.status);
    // The grace runs from the first failure: later retries keep the date, a payment clears it.
    const pastDueSince = owing ? (acc.pastDueSince ?? deps.clock()) : null;
    const graceOver = plan && pastDueSince ? graceEnd(pastDueSince, plan.graceDays)!.getTime() <= deps.clock().getTime() : false;
    const paid = PAID_STATES.has(subscription.status) && plan && !graceOver;
    await db
      .update(billingAccounts)
      .set({
        subscriptionId: subscription.id,
        status: subscription.status,
        providerPriceId: item?.price.id ?? null,
        currentPeriodEnd: item ? new Date(item.current_period_end * 1000) : null,
        cancelAtPeriodEnd: subscription.cancel_at_period_end,
        pastDueSince,
        updatedAt: deps.clock(),
      })
      .where(eq(billingAccounts.organizationId, acc.organizationId));
    await setPlan(acc.organizationId, paid ? plan.id : 'free');
  };

  /** Reads the subscription afresh: its current state wins over whatever order the events came in. */
  const refreshSubscription = async (subscriptionId: string) => applySubscription(await sdk.subscriptions.retrieve(subscriptionId));

  /**
   * Organisations past due for longer than their paid plan's grace fall back to free. One UPDATE
   * whose WHERE holds only while the fall-back is due: several instances running it at once is
   * harmless. The subscription is left to the provider; if it is paid later, the plan comes back.
   */
  const fallBackAfterGrace = async (organizationId?: string): Promise<string[]> => {
    const now = deps.clock();
    const result = await db.execute(sql`
      update ${organizations} as o set plan_id = 'free', updated_at = ${now.toISOString()}::timestamptz
      from ${billingAccounts} as b, ${plans} as p
      where b.organization_id = o.id and p.id = o.plan_id and p.provider_price_id is not null
        and b.past_due_since is not null
        and b.past_due_since + make_interval(days => p.grace_days) <= ${now.toISOString()}::timestamptz
        ${organizationId ? sql`and o.id = ${organizationId}::uuid` : sql``}
      returning o.id`);
    const ids = (result as unknown as { rows: { id: string }[] }).rows.map((r) => r.id);
    for (const id of ids) {
      deps.logger.info({ organizationId: id }, 'billing: payment past due beyond the grace, plan fell back to free');
      await deps.planChanged(id);
    }
    return ids;
  };

  const mailPaymentFailed = async (organizationId: string, invoice: Stripe.Invoice) => {
    const acc = await account(organizationId);
    if (!acc?.pastDueSince) return; // paid meanwhile (an event that arrived late): nothing to tell
    const ends = graceEnd(acc.pastDueSince, (await planOfPrice(acc.providerPriceId))?.graceDays ?? 0)!;
    const date = ends.toISOString().slice(0, 10);
    const amount = `${(invoice.amount_due / 100).toFixed(2)} ${invoice.currency.toUpperCase()}`;
    for (const to of await deps.adminEmails(organizationId)) {
      await deps.mailer.send({
        to,
        subject: 'Treadwise: a payment for your plan failed',
        text:
          `The payment of ${amount} for your Treadwise plan did not go through. The plan stays in force while the payment is retried, ` +
          `until ${date} (${ends.toISOString().slice(11, 16)} UTC): if it has not been paid by then, the organisation falls back to the free plan ` +
          `(the paid plan comes back once the payment succeeds). Please update your payment details.\n\n${deps.publicUrl}/billing`,
      });
    }
  };

  const handle = async (event: Stripe.Event) => {
    switch (event.type) {
      case 'checkout.session.completed': {
        const session = event.data.object;
        const subscriptionId = typeof session.subscription === 'string' ? session.subscription : session.subscription?.id;
        if (!session.customer || !subscriptionId) return;
        return refreshSubscription(subscriptionId);
      }
      case 'customer.subscription.updated':
      case 'customer.subscription.deleted':
        return refreshSubscription(event.data.object.id);
      case 'invoice.paid': {
        const acc = await accountOfCustomer(event.data.object.customer);
        if (!acc) return;
        // The subscription says whether this payment settled what was owed (active again: past-due
        // cleared, the paid plan back); a late receipt of an older invoice restarts no grace.
        if (acc.subscriptionId) return refreshSubscription(acc.subscriptionId);
        await db.update(billingAccounts).set({ pastDueSince: null, updatedAt: deps.clock() }).where(eq(billingAccounts.organizationId, acc.organizationId));
        return;
      }
      case 'invoice.payment_failed': {
        const acc = await accountOfCustomer(event.data.object.customer);
        if (!acc?.subscriptionId) return;
        // The subscription's state (past_due) starts the grace; then the admins hear until when.
        await refreshSubscription(acc.subscriptionId);
        return mailPaymentFailed(acc.organizationId, event.data.object);
      }
      default:
        return;
    }
  };

  /** One pass of the periodic work: grace fall-backs, then the overage report. */
  const maintain = async (): Promise<void> => {
    await fallBackAfterGrace();
    await reportOverage({ db, sdk, clock: deps.clock, logger: deps.logger });
  };

  return {
    simulated: deps.connection.simulated,

    fallBackAfterGrace,
    maintain,
    /** Started by the server (server.ts), not by the app: tests run `maintain()` themselves. */
    maintenance: createBillingMaintenance({ maintain, logger: deps.logger }),

    async overview(organizationId: string) {
      await fallBackAfterGrace(organizationId); // due now even if the sweep has not run yet
      const [org] = await db.select({ planId: organizations.planId }).from(organizations).where(eq(organizations.id, organizationId));
      const acc = await account(organizationId);
      const offers = await offeredPlans(db);
      const paidPlan = acc?.pastDueSince ? await planOfPrice(acc.providerPriceId) : undefined;
      const graceEndsAt = acc?.pastDueSince && paidPlan ? graceEnd(acc.pastDueSince, paidPlan.graceDays) : null;
      // A downgrade waiting for the period end: the subscription already names the cheaper plan.
      const subscribed = acc?.status && PAID_STATES.has(acc.status) ? offers.find((o) => o.providerPriceId === acc.providerPriceId) : undefined;
      const scheduledPlanId = subscribed && subscribed.id !== org.planId && !acc?.pastDueSince ? subscribed.id : null;
      return { planId: org.planId, account: acc, offers, graceEndsAt, scheduledPlanId };
    },

    /**
     * A checkout URL for a paid plan; with a subscription in place, that subscription moves to the
     * plan: an upgrade at once (the rest of the period invoiced now, prorated), a downgrade at the
     * period end (the period paid for keeps its plan).
     */
    async checkout(organizationId: string, planId: string, email: string | undefined, returnUrl: string) {
      const offers = await offeredPlans(db);
      const offer = offers.find((p) => p.id === planId);
      if (!offer) throw new HttpProblem(404, 'plan_not_found', 'Plan not found', `No plan ${planId.slice(0, 60)} is on offer.`);
      if (!offer.price || !offer.providerPriceId) {
        throw new HttpProblem(409, 'plan_not_paid', 'Plan needs no payment', 'The free plan needs no checkout: cancel the subscription to return to it at the end of the period.');
      }
      let acc = await account(organizationId);
      if (acc?.subscriptionId && acc.status && acc.status !== 'canceled') {
        const sub = await sdk.subscriptions.retrieve(acc.subscriptionId);
        const item = sub.items.data[0];
        const paidPrice = paidPriceOf(sub);
        const paidMinor = offers.find((o) => o.providerPriceId === paidPrice)?.price?.monthlyMinor ?? 0;
        const clearHold = { [HELD_PRICE]: '', [HELD_UNTIL]: '' }; // an empty value removes a metadata key
        let kind: 'changed' | 'scheduled' = 'changed';
        let params: Stripe.SubscriptionUpdateParams;
        if (offer.providerPriceId === paidPrice) {
          // Back to the plan this period is paid at: a pending downgrade or cancellation is dropped.
          params = { items: [{ id: item.id, price: offer.providerPriceId }], cancel_at_period_end: false, proration_behavior: 'none', metadata: clearHold };
        } else if (offer.price.monthlyMinor < paidMinor) {
          kind = 'scheduled';
          params = {
            items: [{ id: item.id, price: offer.providerPriceId }],
            cancel_at_period_end: false,
            proration_behavior: 'none',
            metadata: { [HELD_PRICE]: paidPrice!, [HELD_UNTIL]: String(item.current_period_end) },
          };
        } else {
          params = { items: [{ id: item.id, price: offer.providerPriceId }], cancel_at_period_end: false, proration_behavior: 'always_invoice', metadata: clearHold };
        }
        await applySubscription(await sdk.subscriptions.update(sub.id, params));
        return { kind, url: null };
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

    /** The provider's hosted page where an admin changes the card; an unpaid invoice is paid with the new one. */
    async paymentDetails(organizationId: string, returnUrl: string): Promise<string> {
      const acc = await account(organizationId);
      if (!acc) throw new HttpProblem(409, 'no_billing_account', 'No billing account', 'This organisation has never paid for a plan, so it has no payment details to change. Choose a paid plan first.');
      const session = await sdk.billingPortal.sessions.create({ customer: acc.customerId, return_url: returnUrl });
      return session.url;
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
