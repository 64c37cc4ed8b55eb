import { z } from 'zod';

const price = z
  .strictObject({
    monthlyMinor: z.int().min(0).max(100_000_000).meta({ description: 'Price a month in minor units (cents).', example: 2900 }),
    currency: z.string().regex(/^[a-z]{3}$/).meta({ description: 'ISO 4217 code, lower case.', example: 'eur' }),
  })
  .meta({ id: 'PlanPrice' });

export const planOfferSchema = z
  .strictObject({
    id: z.string().min(1).max(64).meta({ example: 'partner' }),
    name: z.string().min(1).max(200).meta({ example: 'Partner' }),
    monthlyQuota: z.int().min(0).meta({ description: 'Calls (work units) a month.', example: 500000 }),
    ratePerMinute: z.int().min(0).meta({ description: 'Requests a minute per key.', example: 3000 }),
    maxApiKeys: z.int().min(0).meta({ example: 5 }),
    price: price.nullable().meta({ description: 'Null: the plan needs no payment.' }),
    overage: z
      .strictObject({
        per1000Minor: z.int().min(0).max(100_000_000).meta({ description: 'Price of each 1 000 units beyond the monthly quota, in minor units of the plan currency.', example: 40 }),
      })
      .nullable()
      .meta({ description: 'Null: calls beyond the quota are refused (429 quota_exceeded). Set: they go on and are billed with the next invoice.' }),
    graceDays: z.int().min(0).max(90).meta({ description: 'Days a paid plan stays in force after a failed payment before the organisation falls back to free.', example: 7 }),
  })
  .meta({ id: 'PlanOffer' });

export const billingOverviewSchema = z
  .strictObject({
    plan: z.strictObject({ id: z.string().min(1).max(64), name: z.string().min(1).max(200) }),
    state: z.enum(['free', 'active', 'past_due', 'ending', 'internal']).meta({
      description: 'free: no subscription; active: paid and renewing; past_due: a payment failed and is retried; ending: cancelled, ends at currentPeriodEnd; internal: a plan set by the operator.',
    }),
    subscription: z
      .strictObject({
        status: z.string().min(1).max(40).meta({ example: 'active' }),
        currentPeriodEnd: z.iso.datetime().nullable(),
        cancelAtPeriodEnd: z.boolean(),
        scheduledPlanId: z
          .string()
          .min(1)
          .max(64)
          .nullable()
          .optional()
          .meta({ description: 'A downgrade waiting for the period end: the plan in force from currentPeriodEnd (the current plan stays until then).', example: 'shop' }),
      })
      .nullable(),
    usage: z.strictObject({
      month: z.string().regex(/^\d{4}-\d{2}$/).meta({ example: '2026-12' }),
      used: z.int().min(0),
      monthlyQuota: z.int().min(0),
      remaining: z.int().min(0),
      overage: z.int().min(0).meta({ description: 'Units used beyond the quota this month, billed as overage (0 on a plan without overage).' }),
    }),
    graceEndsAt: z.iso.datetime().nullable().meta({ description: 'While a payment is past due: when the organisation falls back to the free plan unless the payment succeeds.' }),
    plans: z.array(planOfferSchema).max(50).meta({ description: 'The plans on offer, cheapest first.' }),
    simulated: z.boolean().meta({ description: 'True when payments go to the local simulation, not a real provider.' }),
  })
  .meta({ id: 'BillingOverview' });

export const checkoutRequestSchema = z
  .strictObject({ planId: z.string().min(1).max(64).regex(/^[a-z0-9-]+$/).meta({ example: 'partner' }) })
  .meta({ id: 'CheckoutRequest' });

export const checkoutResultSchema = z
  .strictObject({
    outcome: z.enum(['checkout', 'changed', 'scheduled']).meta({
      description:
        'checkout: open `url` to pay; changed: the subscription in place moved to the plan now (an upgrade: the rest of the period is invoiced at once, prorated); ' +
        'scheduled: a cheaper plan, in force from the end of the period already paid (the current plan stays until then).',
    }),
    url: z.url().max(2000).nullable(),
  })
  .meta({ id: 'CheckoutResult' });

export const paymentDetailsLinkSchema = z
  .strictObject({ url: z.url().max(2000).meta({ description: "The payment provider's hosted page for changing the card; valid for a short while. An unpaid invoice is paid with the new card." }) })
  .meta({ id: 'PaymentDetailsLink' });

export const invoiceSchema = z
  .strictObject({
    id: z.string().min(1).max(255),
    number: z.string().max(255).nullable(),
    status: z.string().max(40).nullable(),
    amountDue: z.int().min(0),
    amountPaid: z.int().min(0),
    currency: z.string().regex(/^[a-z]{3}$/),
    createdAt: z.iso.datetime(),
    url: z.string().max(2000).nullable(),
  })
  .meta({ id: 'Invoice' });

export const invoiceListSchema = z.strictObject({ items: z.array(invoiceSchema).max(100) }).meta({ id: 'InvoiceList' });

export const webhookReceiptSchema = z.strictObject({ received: z.literal(true), duplicate: z.boolean() }).meta({ id: 'WebhookReceipt' });
