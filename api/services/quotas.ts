import { and, eq, gte, inArray, lt, sql } from 'drizzle-orm';
import type { Logger } from 'pino';
import type { Db } from '../db/client.js';
import { organizations, quotaNotices, usageCounters } from '../db/schema.js';
import type { Mailer } from './mailer.js';
import { adminEmails } from './org-admins.js';
import type { Plan, PlanService } from './plans.js';
import type { FlushObserver } from './usage-meter.js';

/** Admins are told once each per organisation and month when usage reaches these shares. */
export const QUOTA_WARNING_PERCENTS = [80, 100] as const;

/**
 * One organisation's quota units in one month, as this instance knows them (a call uses 1, a
 * synchronous batch one per item). `base` is what the database held at the last sync; `unsynced`
 * counts units served here since then (some may be written already, the sync tells); `inFlight`
 * are units of admitted calls still running.
 */
interface MonthTally {
  organizationId: string;
  month: string; // YYYY-MM (UTC)
  ready: Promise<void>;
  base: number;
  unsynced: number;
  inFlight: number;
  noticed: Set<number>;
}

/**
 * An admitted call holding its units. settle() once it has been answered, release() instead when
 * it was refused after all (its units are given back); both idempotent, the first one wins.
 */
export interface QuotaTicket {
  /** Units this call holds. */
  readonly units: number;
  /** Takes `extra` more units for this call if the quota has them, all or none. */
  grow(extra: number): Promise<QuotaDecision>;
  settle(): void;
  release(): void;
}

export interface QuotaStanding {
  plan: Plan;
  month: string;
  used: number;
  remaining: number;
  resetsAt: Date;
}

export type QuotaDecision = (QuotaStanding & { admitted: true; ticket: QuotaTicket }) | (QuotaStanding & { admitted: false });

export function monthOf(at: Date): string {
  return at.toISOString().slice(0, 7);
}

function monthBounds(month: string): { start: string; end: Date } {
  const [y, m] = month.split('-').map(Number);
  return { start: `${month}-01`, end: new Date(Date.UTC(y, m, 1)) };
}

/**
 * Monthly call quotas from each organisation's plan. The month's count is loaded once from
 * usage_counters and then kept in memory: no query per request. After every usage flush it is
 * re-read, so several instances converge on one count (each may overshoot by what the others
 * served since their last flush).
 */
export function createQuotaService({
  db,
  plans,
  mailer,
  clock,
  logger,
  publicUrl,
}: {
  db: Db;
  plans: PlanService;
  mailer: Mailer;
  clock: () => Date;
  logger: Logger;
  publicUrl: string;
}) {
  const tallies = new Map<string, MonthTally>();
  const pendingNotices = new Set<Promise<void>>();

  const monthTotals = async (wanted: { organizationId: string; month: string }[]): Promise<Map<string, number>> => {
    const totals = new Map<string, number>();
    if (wanted.length === 0) return totals;
    const months = [...new Set(wanted.map((w) => w.month))].sort();
    const monthExpr = sql<string>`to_char(${usageCounters.day}, 'YYYY-MM')`;
    const rows = await db
      .select({
        organizationId: usageCounters.organizationId,
        month: monthExpr,
        used: sql<string>`sum(${usageCounters.units})`,
      })
      .from(usageCounters)
      .where(
        and(
          inArray(usageCounters.organizationId, [...new Set(wanted.map((w) => w.organizationId))]),
          gte(usageCounters.day, monthBounds(months[0]).start),
          lt(usageCounters.day, monthBounds(months[months.length - 1]).end.toISOString().slice(0, 10)),
        ),
      )
      .groupBy(usageCounters.organizationId, monthExpr);
    for (const r of rows) totals.set(`${r.organizationId}|${r.month}`, Number(r.used));
    return totals;
  };

  const tallyFor = async (organizationId: string, month: string): Promise<MonthTally> => {
    const id = `${organizationId}|${month}`;
    let tally = tallies.get(id);
    if (!tally) {
      const created: MonthTally = { organizationId, month, ready: Promise.resolve(), base: 0, unsynced: 0, inFlight: 0, noticed: new Set() };
      created.ready = monthTotals([{ organizationId, month }]).then(
        (totals) => {
          created.base = totals.get(id) ?? 0;
        },
        (err) => {
          tallies.delete(id); // the next call tries again
          throw err;
        },
      );
      tallies.set(id, created);
      tally = created;
    }
    await tally.ready;
    return tally;
  };

  const sendNotice = async (tally: MonthTally, percent: number, plan: Plan, used: number) => {
    const inserted = await db
      .insert(quotaNotices)
      .values({ organizationId: tally.organizationId, month: tally.month, thresholdPercent: percent, sentAt: clock() })
      .onConflictDoNothing()
      .returning({ month: quotaNotices.month });
    if (inserted.length === 0) return; // another instance (or an earlier run) sent it
    try {
      const [org] = await db.select({ name: organizations.name }).from(organizations).where(eq(organizations.id, tally.organizationId));
      const to = await adminEmails(db, tally.organizationId);
      if (to.length === 0 || !org) return;
      const message = noticeText(org.name, percent, plan, used, tally.month, publicUrl);
      await Promise.all(to.map((address) => mailer.send({ to: address, ...message })));
    } catch (err) {
      // Not sent: forget the notice so a later call tries again.
      await db
        .delete(quotaNotices)
        .where(
          and(eq(quotaNotices.organizationId, tally.organizationId), eq(quotaNotices.month, tally.month), eq(quotaNotices.thresholdPercent, percent)),
        );
      tally.noticed.delete(percent);
      throw err;
    }
  };

  const warnIfDue = (tally: MonthTally, plan: Plan, used: number) => {
    for (const percent of QUOTA_WARNING_PERCENTS) {
      if (tally.noticed.has(percent) || used * 100 < plan.monthlyQuota * percent) continue;
      tally.noticed.add(percent);
      const work = sendNotice(tally, percent, plan, used)
        .catch((err) => logger.error({ err, organizationId: tally.organizationId, percent }, 'quota notice not sent'))
        .finally(() => pendingNotices.delete(work));
      pendingNotices.add(work);
    }
  };

  const standing = (tally: MonthTally, plan: Plan, used: number): QuotaStanding => ({
    plan,
    month: tally.month,
    used,
    remaining: Math.max(0, plan.monthlyQuota - used),
    resetsAt: monthBounds(tally.month).end,
  });

  const observer: FlushObserver = {
    flushing() {
      const snapshot = [...tallies.values()].map((tally) => ({ tally, unsynced: tally.unsynced }));
      return {
        async written() {
          if (snapshot.length === 0) return;
          const totals = await monthTotals(snapshot.map((s) => s.tally));
          for (const { tally, unsynced } of snapshot) {
            tally.base = totals.get(`${tally.organizationId}|${tally.month}`) ?? 0;
            tally.unsynced -= unsynced;
          }
          const current = monthOf(clock());
          for (const [id, tally] of tallies) {
            if (tally.month !== current && tally.unsynced === 0 && tally.inFlight === 0) tallies.delete(id);
          }
        },
      };
    },
    async idle() {
      while (pendingNotices.size > 0) await Promise.all([...pendingNotices]);
    },
  };

  /**
   * Holds `units` more for a call if all of them fit in what is left; none otherwise. A plan with
   * overage always has room: the units beyond the quota are billed (billing-overage.ts reports them).
   */
  const take = (tally: MonthTally, plan: Plan, units: number, ticket: () => QuotaTicket, notify = true): QuotaDecision => {
    const used = tally.base + tally.unsynced + tally.inFlight;
    const fits = used + units <= plan.monthlyQuota || (plan.overage !== null && Number.isFinite(units));
    if (!fits) return { admitted: false, ...standing(tally, plan, used) };
    tally.inFlight += units;
    if (notify) warnIfDue(tally, plan, used + units);
    return { admitted: true, ticket: ticket(), ...standing(tally, plan, used + units) };
  };

  const ticketFor = (tally: MonthTally, plan: Plan, held: number): QuotaTicket => {
    let units = held;
    let ended = false;
    const ticket: QuotaTicket = {
      get units() {
        return units;
      },
      /** Takes `extra` more units (0 allowed: it only sends the notices now due). */
      async grow(extra) {
        // An ended ticket cannot take more: its call has been answered.
        const decision = take(tally, plan, ended ? Number.POSITIVE_INFINITY : extra, () => ticket);
        if (decision.admitted) units += extra;
        return decision;
      },
      settle() {
        if (ended) return;
        ended = true;
        tally.inFlight -= units;
        tally.unsynced += units;
      },
      release() {
        if (ended) return;
        ended = true;
        tally.inFlight -= units;
      },
    };
    return ticket;
  };

  return {
    /**
     * Counts `units` (1 a call) against the month of `at` if all of them fit in what is left.
     * `growing`: the call will grow() its ticket once it knows its size (a batch); the 80 % and
     * 100 % notices wait for that, so a batch refused whole never sends one.
     */
    async admit(organizationId: string, at: Date, units = 1, options: { growing?: boolean } = {}): Promise<QuotaDecision> {
      const plan = await plans.forOrganization(organizationId);
      const tally = await tallyFor(organizationId, monthOf(at));
      return take(tally, plan, units, () => ticketFor(tally, plan, units), !options.growing);
    },

    /** Units used this month (on the injected clock), for the usage API. */
    async standing(organizationId: string): Promise<QuotaStanding> {
      const plan = await plans.forOrganization(organizationId);
      const tally = await tallyFor(organizationId, monthOf(clock()));
      return standing(tally, plan, tally.base + tally.unsynced);
    },

    /** Hand this to the usage meter, which tells it when counts reach the database. */
    observer,

    /** Resolves when every quota e-mail started so far has been sent (or has failed). */
    idle: () => observer.idle!(),
  };
}

function noticeText(orgName: string, percent: number, plan: Plan, used: number, month: string, publicUrl: string) {
  const resets = monthBounds(month).end.toISOString().slice(0, 10);
  const reached = percent >= 100;
  const subject = reached
    ? `Treadwise: ${orgName} has used its monthly quota units`
    : `Treadwise: ${orgName} has used ${percent} % of its monthly quota units`;
  const rate = plan.overage ? `${(plan.overage.per1000Minor / 100).toFixed(2)} ${plan.overage.currency.toUpperCase()} per 1 000 units` : '';
  const consequence = plan.overage
    ? reached
      ? `Calls and batch jobs go on: the units beyond the quota are billed as overage (${rate}) with the next invoice, until the quota starts again on ${resets} at 00:00 UTC.`
      : `When all of them are used, calls and batch jobs go on and the units beyond the quota are billed as overage (${rate}) with the next invoice.`
    : reached
      ? `Further calls with the organisation's API keys are refused (HTTP 429, quota_exceeded), and running batch jobs stop, until the quota starts again on ${resets} at 00:00 UTC.`
      : `When all of them are used, calls with the organisation's API keys are refused and running batch jobs stop until the quota starts again on ${resets} at 00:00 UTC.`;
  const text = [
    'Hello,',
    '',
    `${orgName} has used ${used} of the ${plan.monthlyQuota} quota units that its ${plan.name} plan includes for ${month} (${percent} %).`,
    'A call uses one unit; a synchronous batch one per item; a batch job one per row it sizes.',
    consequence,
    '',
    `Usage by day, key and route: GET ${publicUrl}/v1/usage (or the usage page of the console at ${publicUrl}/).`,
    plan.overage ? `Plans and invoices: ${publicUrl}/billing.` : `For a larger plan, see ${publicUrl}/billing.`,
    '',
    '— Treadwise',
  ].join('\n');
  return { subject, text };
}

export type QuotaService = ReturnType<typeof createQuotaService>;
