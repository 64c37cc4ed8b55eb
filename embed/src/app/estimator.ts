import { ChangeDetectionStrategy, Component, DestroyRef, ElementRef, ViewEncapsulation, computed, inject, input, signal } from '@angular/core';
import { takeUntilDestroyed, toObservable } from '@angular/core/rxjs-interop';
import { catchError, debounceTime, map, of, startWith, switchMap, type Observable } from 'rxjs';
import type { KitDesign, KitOptionsResponse, StoredCatalogStrip } from './api-types.js';
import { addToBasketEvent, basketDetail } from './basket-event.js';
import { EstimatorApi, ShopperError, type ApiTarget } from './estimator-api.js';
import { checksInWords, designInWords, money, noKitInWords, stripLabel } from './plain-words.js';
import { setupMissing, type ShopperProblem } from './shopper-problem.js';
import { EMPTY_DRAFT, fieldOfPath, listAttribute, readDraft, type DraftField, type StairDraft } from './stair-draft.js';

/** Quiet time after the last keystroke before asking the API: one request per pause, not per key. */
export const TYPING_PAUSE_MS = 350;

/** A rate limit that lifts within this many seconds is retried by itself; longer ones wait for the shopper. */
const AUTO_RETRY_MAX_S = 60;

/** Shown before the first answer, so the cautions are never out of sight (the API's own follow). */
const STANDING_CAUTION = {
  code: 'installation',
  message: 'The drivers connect to mains power: a qualified electrician fits them, and local wiring rules apply.',
};

type Estimate =
  | { state: 'idle' }
  | { state: 'loading' }
  | { state: 'ready'; response: KitOptionsResponse }
  | { state: 'error'; problem: ShopperProblem };

interface Ask {
  target: ApiTarget;
  request: NonNullable<ReturnType<typeof readDraft>['request']>;
  attempt: number;
}

function asProblem(err: unknown): ShopperProblem {
  return err instanceof ShopperError ? err.problem : { kind: 'service', message: 'Something went wrong in the estimator. Please try again.' };
}

/**
 * `<treadwise-estimator>`: a shopper types in their stair and gets a kit from the shop's
 * catalog, its price and its checks, and hands the kit to the shop's basket as a DOM event.
 */
@Component({
  selector: 'tw-estimator',
  templateUrl: './estimator.html',
  styleUrl: './estimator.scss',
  encapsulation: ViewEncapsulation.ShadowDom,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class Estimator {
  private readonly api = inject(EstimatorApi);
  private readonly host = inject<ElementRef<HTMLElement>>(ElementRef);

  /** The shop's embed key (`embed-key`). */
  readonly embedKey = input('');
  /** Where the Treadwise API answers (`api-url`), e.g. https://api.treadwise.test. */
  readonly apiUrl = input('');
  /** What is fitted; kits are offered for strips on each tread (`tread-strips`). */
  readonly layout = input('tread-strips');
  /** The currency the shop expects (`currency`); prices come in the catalog's own. */
  readonly currency = input('');
  /** BCP 47 locale for numbers and prices (`locale`); default: the browser's. */
  readonly locale = input('');
  /** The strips to offer (`strip-skus`, space-separated SKUs); default: every active strip. */
  readonly stripSkus = input('');

  protected readonly measureFields: readonly { field: DraftField; label: string; hint: string; step: string }[] = [
    { field: 'treads', label: 'Treads', hint: 'Steps you stand on', step: '1' },
    { field: 'treadWidthMm', label: 'Tread width (mm)', hint: 'Side to side', step: '1' },
    { field: 'riserHeightMm', label: 'Riser (mm)', hint: 'Height of one step', step: '1' },
    { field: 'goingMm', label: 'Going (mm)', hint: 'Depth of one tread', step: '1' },
  ];

  protected readonly draft = signal<StairDraft>(EMPTY_DRAFT);
  protected readonly strips = signal<StoredCatalogStrip[]>([]);
  protected readonly stripsProblem = signal<ShopperProblem | null>(null);
  protected readonly estimate = signal<Estimate>({ state: 'idle' });
  protected readonly selectedRank = signal(1);
  protected readonly added = signal('');
  private readonly attempt = signal(0);
  private retryTimer: ReturnType<typeof setTimeout> | undefined;

  private readonly offered = computed(() => listAttribute(this.stripSkus()));
  protected readonly reading = computed(() => readDraft(this.draft(), this.offered()));
  protected readonly offeredStrips = computed(() => {
    const only = this.offered();
    return only.length ? this.strips().filter((s) => only.includes(s.sku)) : this.strips();
  });

  protected readonly setupProblem = computed<ShopperProblem | null>(() => {
    if (!this.embedKey().trim()) return setupMissing('key (embed-key)');
    if (!/^https?:\/\//.test(this.apiUrl().trim())) return setupMissing('API address (api-url)');
    if (this.layout() !== 'tread-strips') return { kind: 'setup', message: `This estimator offers kits for strips on each tread; the layout “${this.layout()}” is not offered here.` };
    return null;
  });

  private readonly target = computed<ApiTarget | null>(() => (this.setupProblem() ? null : { apiUrl: this.apiUrl().trim(), embedKey: this.embedKey().trim() }), {
    equal: (a, b) => a?.apiUrl === b?.apiUrl && a?.embedKey === b?.embedKey,
  });

  private readonly ask = computed<Ask | null>(
    () => {
      const target = this.target();
      const request = this.reading().request;
      return target && request ? { target, request, attempt: this.attempt() } : null;
    },
    { equal: (a, b) => JSON.stringify(a) === JSON.stringify(b) },
  );

  /** The problem the shopper reads: set-up first, then the estimate's, then the catalog's. */
  protected readonly problem = computed<ShopperProblem | null>(() => {
    const e = this.estimate();
    return this.setupProblem() ?? (e.state === 'error' ? e.problem : null) ?? this.stripsProblem();
  });

  protected readonly fieldErrors = computed(() => {
    const errors: Partial<Record<DraftField, string>> = { ...this.reading().errors };
    const e = this.estimate();
    if (e.state === 'error') for (const f of e.problem.fields ?? []) {
      const field = fieldOfPath(f.path);
      if (field && !errors[field]) errors[field] = f.message;
    }
    return errors;
  });

  /** The last answer stays in view (dimmed) while the next one is worked out, so nothing jumps as they type. */
  private readonly lastResponse = signal<KitOptionsResponse | null>(null);
  protected readonly response = computed(() => {
    const state = this.estimate().state;
    return state === 'ready' || state === 'loading' ? this.lastResponse() : null;
  });
  protected readonly designs = computed(() => this.response()?.designs ?? []);
  protected readonly selected = computed<KitDesign | null>(() => this.designs().find((d) => d.rank === this.selectedRank()) ?? this.designs()[0] ?? null);
  protected readonly shownCurrency = computed(() => this.response()?.currency ?? (this.currency() || 'EUR'));
  protected readonly currencyNote = computed(() => {
    const wanted = this.currency().trim().toUpperCase();
    const got = this.response()?.currency;
    return wanted && got && wanted !== got ? `Prices are in ${got}, the shop’s catalog currency.` : '';
  });
  /** One short sentence for screen readers per update, rather than the whole result read again. */
  protected readonly announcement = computed(() => {
    const e = this.estimate();
    if (e.state === 'loading') return 'Working out your kit…';
    const design = this.selected();
    if (e.state !== 'ready') return '';
    if (!design) return noKitInWords(e.response);
    return `Kit for your stair: ${this.price(design.pricing.gross)}. ${checksInWords(design)}`;
  });

  protected readonly cautions = computed(() => {
    const fromApi = this.response()?.cautions ?? [];
    return fromApi.length ? fromApi : [STANDING_CAUTION];
  });

  constructor() {
    toObservable(this.target)
      .pipe(
        switchMap((target) => (target ? this.api.strips(target).pipe(map((strips) => ({ strips, problem: null })), catchError((err: unknown) => of({ strips: [], problem: asProblem(err) }))) : of({ strips: [], problem: null }))),
        takeUntilDestroyed(),
      )
      .subscribe(({ strips, problem }) => {
        this.strips.set(strips);
        this.stripsProblem.set(problem);
      });

    // Each pause in typing asks once; a newer stair cancels the request still under way (switchMap).
    toObservable(this.ask)
      .pipe(
        debounceTime(TYPING_PAUSE_MS),
        switchMap((ask): Observable<Estimate> =>
          ask
            ? this.api.kitOptions(ask.target, ask.request).pipe(
                map((response): Estimate => ({ state: 'ready', response })),
                catchError((err: unknown) => of<Estimate>({ state: 'error', problem: asProblem(err) })),
                startWith<Estimate>({ state: 'loading' }),
              )
            : of<Estimate>({ state: 'idle' }),
        ),
        takeUntilDestroyed(),
      )
      .subscribe((estimate) => {
        clearTimeout(this.retryTimer);
        this.estimate.set(estimate);
        if (estimate.state !== 'loading') this.lastResponse.set(estimate.state === 'ready' ? estimate.response : null);
        const wait = estimate.state === 'error' && estimate.problem.kind === 'rate-limit' ? estimate.problem.retryAfterS : undefined;
        if (wait !== undefined && wait <= AUTO_RETRY_MAX_S) this.retryTimer = setTimeout(() => this.retry(), wait * 1000);
        if (estimate.state === 'ready') this.selectedRank.set(estimate.response.designs[0]?.rank ?? 1);
        if (estimate.state !== 'loading') this.added.set('');
      });
    inject(DestroyRef).onDestroy(() => clearTimeout(this.retryTimer));
  }

  protected update(field: DraftField, event: Event): void {
    const value = (event.target as HTMLInputElement | HTMLSelectElement).value;
    this.draft.update((d) => ({ ...d, [field]: value }));
  }

  protected choose(rank: number): void {
    this.selectedRank.set(rank);
    this.added.set('');
  }

  protected retry(): void {
    this.attempt.update((n) => n + 1);
  }

  protected addToBasket(): void {
    const design = this.selected();
    const response = this.response();
    if (!design || !response) return;
    this.host.nativeElement.dispatchEvent(addToBasketEvent(basketDetail(design, response.currency)));
    this.added.set(`Kit added to your basket: ${design.cart.length} items, ${money(design.pricing.gross, response.currency, this.locale())}.`);
  }

  protected price(amount: number): string {
    return money(amount, this.shownCurrency(), this.locale());
  }

  protected stripName(strip: StoredCatalogStrip): string {
    return stripLabel(strip, this.locale());
  }

  protected designName(design: KitDesign): string {
    return designInWords(design, this.strips(), this.locale());
  }

  protected checks(design: KitDesign): string {
    return checksInWords(design);
  }

  protected noKit(response: KitOptionsResponse): string {
    return noKitInWords(response);
  }

  protected lineName(sku: string): string {
    return this.strips().find((s) => s.sku === sku)?.description ?? sku;
  }
}
