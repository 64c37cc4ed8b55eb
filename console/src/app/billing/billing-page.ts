import { DatePipe, Location } from '@angular/common';
import { ChangeDetectionStrategy, Component, DestroyRef, type OnInit, computed, inject, input, signal } from '@angular/core';
import { MatButton } from '@angular/material/button';
import { MatDialog } from '@angular/material/dialog';
import { MatIcon } from '@angular/material/icon';
import { MatProgressBar } from '@angular/material/progress-bar';
import { MatSnackBar } from '@angular/material/snack-bar';
import { type Subscription, firstValueFrom, map } from 'rxjs';

import { POLL_WAIT } from '../core/poll.js';
import type { BillingOverview, Invoice, PlanOffer } from '../core/api-types.js';
import { Auth } from '../core/auth.js';
import { roleMay } from '../core/capabilities.js';
import { LoadFailure } from '../core/load-failure.js';
import { QuotaMeter } from '../core/quota-meter.js';
import { problemMessage } from '../core/problem-details.js';
import { BillingApi } from './billing-api.js';
import {
  STATE_LABELS,
  type PlanAction,
  describeState,
  formatCount,
  formatDay,
  formatGrace,
  formatMoney,
  formatMonth,
  formatOverage,
  formatPlanPrice,
  invoiceStatus,
  overagePrice,
  planAction,
  subscriptionInForce,
} from './billing-format.js';
import { LEAVE_FOR } from './checkout-redirect.js';
import { type PlanCancelData, PlanCancelDialog } from './plan-cancel-dialog.js';
import { watchPlan } from './plan-watch.js';

type View = { state: 'loading' } | { state: 'ready'; overview: BillingOverview } | { state: 'failed'; reason: string };
type Invoices = { state: 'loading' } | { state: 'ready'; items: Invoice[] } | { state: 'failed'; reason: string };
/** Back from a paid checkout: waiting for the provider's word that reaches the API by webhook. */
type Confirming = 'no' | 'waiting' | 'late';

/** The organisation's plan and what it costs: state, usage, the plans on offer, invoices. */
@Component({
  selector: 'tw-billing-page',
  imports: [DatePipe, MatButton, MatIcon, MatProgressBar, LoadFailure, QuotaMeter],
  templateUrl: './billing-page.html',
  styleUrl: './billing-page.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class BillingPage implements OnInit {
  private readonly api = inject(BillingApi);
  private readonly auth = inject(Auth);
  private readonly dialog = inject(MatDialog);
  private readonly snackBar = inject(MatSnackBar);
  private readonly location = inject(Location);
  private readonly wait = inject(POLL_WAIT);
  private readonly leaveFor = inject(LEAVE_FOR);
  private pending?: Subscription;

  /** From the query string: `done` when the payment provider sends the browser back after a payment. */
  readonly checkout = input<string>();

  protected readonly view = signal<View>({ state: 'loading' });
  protected readonly invoices = signal<Invoices>({ state: 'loading' });
  protected readonly confirming = signal<Confirming>('no');
  /** The plan whose button was pressed, while its change is on its way. */
  protected readonly busyPlan = signal<string | null>(null);
  /** True once the payment-details link is asked for: the browser is about to leave. */
  protected readonly leavingForCard = signal(false);
  protected readonly mayManage = computed(() => roleMay(this.auth.role(), 'billing:manage'));

  protected readonly overview = computed(() => {
    const view = this.view();
    return view.state === 'ready' ? view.overview : null;
  });
  protected readonly currentOffer = computed(() => {
    const overview = this.overview();
    return overview?.plans.find((p) => p.id === overview.plan.id) ?? null;
  });
  /** The price of 1,000 units past the quota on the plan in force, or null where such calls are refused. */
  protected readonly currentOverage = computed(() => {
    const offer = this.currentOffer();
    return offer ? overagePrice(offer) : null;
  });
  protected readonly usedPercent = computed(() => {
    const usage = this.overview()?.usage;
    if (!usage) return 0;
    if (usage.monthlyQuota === 0) return usage.used > 0 ? 100 : 0;
    return Math.min(100, (usage.used / usage.monthlyQuota) * 100);
  });

  protected readonly stateLabels = STATE_LABELS;
  protected readonly describeState = describeState;
  protected readonly formatCount = formatCount;
  protected readonly formatMoney = formatMoney;
  protected readonly formatGrace = formatGrace;
  protected readonly formatMonth = formatMonth;
  protected readonly formatOverage = formatOverage;
  protected readonly formatPlanPrice = formatPlanPrice;
  protected readonly invoiceStatus = invoiceStatus;

  constructor() {
    inject(DestroyRef).onDestroy(() => this.pending?.unsubscribe());
  }

  ngOnInit(): void {
    if (this.checkout() === 'done') this.awaitPayment();
    else this.load();
  }

  protected load(): void {
    this.pending?.unsubscribe();
    this.view.set({ state: 'loading' });
    this.pending = this.api
      .overview()
      .pipe(map((response) => response.body!))
      .subscribe({
        next: (overview) => this.view.set({ state: 'ready', overview }),
        error: (error: unknown) => this.view.set({ state: 'failed', reason: problemMessage(error) }),
      });
    this.loadInvoices();
  }

  private loadInvoices(): void {
    if (!this.mayManage()) return; // invoices are for admins (GET /v1/billing/invoices)
    this.invoices.set({ state: 'loading' });
    this.api.invoices().subscribe({
      next: (list) => this.invoices.set({ state: 'ready', items: list.items }),
      error: (error: unknown) => this.invoices.set({ state: 'failed', reason: problemMessage(error) }),
    });
  }

  /** After a paid checkout the plan changes once the provider's webhook arrives: ask again until it has. */
  private awaitPayment(): void {
    this.pending?.unsubscribe();
    this.confirming.set('waiting');
    let latest: BillingOverview | null = null;
    this.pending = watchPlan(() => this.api.overview(), this.wait, subscriptionInForce).subscribe({
      next: (overview) => {
        latest = overview;
        this.view.set({ state: 'ready', overview });
      },
      error: (error: unknown) => {
        this.confirming.set('no');
        this.view.set({ state: 'failed', reason: problemMessage(error) });
      },
      complete: () => {
        if (!latest || !subscriptionInForce(latest)) {
          this.confirming.set('late');
          return;
        }
        this.confirming.set('no');
        this.location.replaceState('/billing'); // a reload now shows the page, not another wait
        this.tell(`Payment received: you are on the ${latest.plan.name} plan.`);
        this.loadInvoices();
      },
    });
    this.loadInvoices();
  }

  protected async choose(overview: BillingOverview, offer: PlanOffer): Promise<void> {
    const action = planAction(overview, offer);
    if (action.kind === 'cancel') return this.cancel(overview, offer);
    if (action.kind !== 'checkout' || this.busyPlan()) return;
    this.busyPlan.set(offer.id);
    try {
      const result = await firstValueFrom(this.api.checkout(offer.id));
      if (result.outcome === 'checkout' && result.url) {
        this.leaveFor(result.url); // the button stays busy while the browser leaves for the checkout
        return;
      }
      const now = await this.reload();
      this.tell(now.plan.id === offer.id ? `Done: you are on the ${offer.name} plan.` : `${offer.name} takes over from ${now.plan.name} ${periodEndPhrase(now)}.`);
    } catch (error) {
      this.tell(problemMessage(error));
    }
    this.busyPlan.set(null);
  }

  /** Off to the provider's page to change the card; it sends the browser back here. */
  protected async openPaymentDetails(): Promise<void> {
    if (this.leavingForCard()) return;
    this.leavingForCard.set(true);
    try {
      this.leaveFor((await firstValueFrom(this.api.paymentDetails())).url);
    } catch (error) {
      this.tell(problemMessage(error));
      this.leavingForCard.set(false);
    }
  }

  private async cancel(overview: BillingOverview, free: PlanOffer): Promise<void> {
    const periodEnd = overview.subscription?.currentPeriodEnd ?? null;
    const data: PlanCancelData = { planName: overview.plan.name, freeName: free.name, endsOn: periodEnd ? formatDay(periodEnd) : null };
    const ref = this.dialog.open<PlanCancelDialog, PlanCancelData, boolean>(PlanCancelDialog, { data, width: '480px', maxWidth: '95vw' });
    if ((await firstValueFrom(ref.afterClosed())) !== true) return;
    this.busyPlan.set(free.id);
    try {
      await firstValueFrom(this.api.cancel());
      const now = await this.reload();
      this.tell(`Your ${now.plan.name} plan ends ${periodEndPhrase(now)}; then you are on ${free.name}.`);
    } catch (error) {
      this.tell(problemMessage(error));
    }
    this.busyPlan.set(null);
  }

  /** The overview afresh after a change, and the invoices it may have added. */
  private async reload(): Promise<BillingOverview> {
    this.pending?.unsubscribe();
    const overview = (await firstValueFrom(this.api.overview())).body!;
    this.view.set({ state: 'ready', overview });
    this.loadInvoices();
    return overview;
  }

  protected actionOf(overview: BillingOverview, offer: PlanOffer): PlanAction {
    return planAction(overview, offer);
  }

  private tell(message: string): void {
    this.snackBar.open(message, 'Dismiss', { duration: 8000 });
  }
}

function periodEndPhrase(overview: BillingOverview): string {
  const end = overview.subscription?.currentPeriodEnd;
  return end ? `on ${formatDay(end)}` : 'at the end of the period';
}
