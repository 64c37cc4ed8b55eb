import { DOCUMENT, DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, DestroyRef, computed, inject, signal } from '@angular/core';
import { NonNullableFormBuilder, ReactiveFormsModule } from '@angular/forms';
import { MatButton } from '@angular/material/button';
import { MatFormField, MatLabel } from '@angular/material/form-field';
import { MatIcon } from '@angular/material/icon';
import { MatInput } from '@angular/material/input';
import { MatProgressBar } from '@angular/material/progress-bar';
import { MatOption, MatSelect } from '@angular/material/select';
import { MatSnackBar } from '@angular/material/snack-bar';
import { type Observable, type Subscription, catchError, firstValueFrom, forkJoin, map, of, switchMap } from 'rxjs';

import type { UsageReport } from '../core/api-types.js';
import { QuotaMeter } from '../core/quota-meter.js';
import { Auth } from '../core/auth.js';
import { roleMay } from '../core/capabilities.js';
import { CLOCK } from '../core/clock.js';
import { problemMessage } from '../core/problem-details.js';
import { TrafficApi } from './traffic-api.js';
import { TrafficChart } from './traffic-chart.js';
import {
  KEY_ID,
  type KeySeries,
  type TrafficFilter,
  callsPerDayPerKey,
  chartKeys,
  dayErrors,
  defaultRange,
  exportFilename,
  formatCount,
  formatOneDecimal,
  rangeProblem,
  requestsByDay,
  summarize,
} from './traffic-data.js';

type View = { state: 'loading' } | { state: 'ready'; report: UsageReport; keys: KeySeries[] } | { state: 'failed'; reason: string };

/** The organisation's API traffic: calls per day per key, errors and 429s, latency, the month's quota. */
@Component({
  selector: 'tw-traffic-page',
  imports: [DatePipe, ReactiveFormsModule, MatButton, MatIcon, MatFormField, MatLabel, MatInput, MatSelect, MatOption, MatProgressBar, TrafficChart, QuotaMeter],
  templateUrl: './traffic-page.html',
  styleUrl: './traffic-page.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class TrafficPage {
  private readonly api = inject(TrafficApi);
  private readonly auth = inject(Auth);
  private readonly snackBar = inject(MatSnackBar);
  private readonly document = inject(DOCUMENT);
  private pending: Subscription | undefined;

  protected readonly mayRead = computed(() => roleMay(this.auth.role(), 'usage:read'));
  protected readonly view = signal<View>({ state: 'loading' });
  protected readonly filter = signal<TrafficFilter>({ ...defaultRange(inject(CLOCK)()), keyId: null });
  protected readonly rangeError = signal<string | null>(null);
  protected readonly downloading = signal(false);
  /** Key names, for admins (who may list keys); everyone else sees key ids. */
  private readonly names = signal<Map<string, string>>(new Map());
  /** Keys seen in the range without a key filter, so the filter can offer them. */
  private readonly seenKeys = signal<string[]>([]);

  protected readonly form = inject(NonNullableFormBuilder).group({ from: this.filter().from, to: this.filter().to, keyId: '' });

  protected readonly keyOptions = computed(() => {
    const ids = new Set([...this.seenKeys(), ...this.names().keys()]);
    return [...ids].filter((id) => KEY_ID.test(id)).map((id) => ({ id, label: this.labelOf(id) }));
  });
  protected readonly summary = computed(() => {
    const view = this.view();
    return view.state === 'ready' ? summarize(view.report) : null;
  });
  protected readonly chart = computed(() => {
    const view = this.view();
    return view.state === 'ready' ? callsPerDayPerKey(view.report, view.keys) : null;
  });
  protected readonly dayErrors = dayErrors;
  protected readonly formatCount = formatCount;
  protected readonly formatOneDecimal = formatOneDecimal;

  constructor() {
    inject(DestroyRef).onDestroy(() => this.pending?.unsubscribe());
    if (!this.mayRead()) return;
    if (roleMay(this.auth.role(), 'keys:manage')) {
      this.api.keyNames().subscribe({ next: (names) => this.names.set(names), error: () => undefined }); // ids are shown instead
    }
    this.load();
  }

  protected apply(): void {
    const { from, to, keyId } = this.form.getRawValue();
    const problem = rangeProblem(from, to);
    this.rangeError.set(problem);
    if (problem) return;
    this.filter.set({ from, to, keyId: keyId || null });
    this.load();
  }

  protected load(): void {
    const filter = this.filter();
    this.pending?.unsubscribe();
    this.view.set({ state: 'loading' });
    this.pending = this.api
      .report(filter)
      .pipe(switchMap((report) => this.withKeySeries(filter, report)))
      .subscribe({
        next: ({ report, keys }) => {
          if (!filter.keyId) this.seenKeys.set(report.totals.byKey.map((k) => k.keyId));
          this.view.set({ state: 'ready', report, keys });
        },
        error: (error: unknown) => this.view.set({ state: 'failed', reason: problemMessage(error) }),
      });
  }

  /** One report per busy key gives its calls per day (the range's report has days and keys, not both at once). */
  private withKeySeries(filter: TrafficFilter, report: UsageReport): Observable<{ report: UsageReport; keys: KeySeries[] }> {
    const days = report.data.map((d) => d.day);
    if (filter.keyId) {
      return of({ report, keys: [{ keyId: filter.keyId, label: this.labelOf(filter.keyId), requests: requestsByDay(days, report.data) }] });
    }
    const ids = chartKeys(report);
    if (ids.length === 0) return of({ report, keys: [] });
    return forkJoin(
      ids.map((keyId) =>
        this.api.report(filter, keyId).pipe(
          map((keyReport): KeySeries => ({ keyId, label: this.labelOf(keyId), requests: requestsByDay(days, keyReport.data) })),
          catchError(() => of(null)), // a key whose figures could not be read falls into "other calls"
        ),
      ),
    ).pipe(map((keys) => ({ report, keys: keys.filter((k): k is KeySeries => k !== null) })));
  }

  protected async download(): Promise<void> {
    const filter = this.filter();
    this.downloading.set(true);
    try {
      const response = await firstValueFrom(this.api.exportCsv(filter));
      const url = URL.createObjectURL(response.body ?? new Blob([]));
      const link = this.document.createElement('a');
      link.href = url;
      link.download = exportFilename(response.headers.get('Content-Disposition'), filter);
      link.click();
      setTimeout(() => URL.revokeObjectURL(url), 0);
    } catch (error) {
      this.snackBar.open(problemMessage(error), 'Dismiss', { duration: 6000 });
    } finally {
      this.downloading.set(false);
    }
  }

  protected labelOf(keyId: string): string {
    const name = this.names().get(keyId);
    return name ? `${name} (${keyId})` : keyId;
  }
}
