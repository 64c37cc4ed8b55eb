import { DatePipe } from '@angular/common';
import {
  ChangeDetectionStrategy,
  Component,
  DestroyRef,
  computed,
  inject,
  signal,
} from '@angular/core';
import { MatButton } from '@angular/material/button';
import { MatCard, MatCardContent, MatCardHeader, MatCardSubtitle, MatCardTitle } from '@angular/material/card';
import { MatIcon } from '@angular/material/icon';
import { type Observable, type Subscription, catchError, forkJoin, map, of } from 'rxjs';

import { CLOCK } from '../core/clock.js';
import { HealthApi, type Health, type Readiness } from '../core/health-api.js';
import { problemMessage } from '../core/problem-details.js';
import { CHECKING, type Check } from './check.js';
import { StatusBadge } from './status-badge.js';

/** Whether the API answers (liveness) and can reach its database (readiness). */
@Component({
  selector: 'tw-status-page',
  imports: [DatePipe, MatButton, MatCard, MatCardContent, MatCardHeader, MatCardSubtitle, MatCardTitle, MatIcon, StatusBadge],
  templateUrl: './status-page.html',
  styleUrl: './status-page.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class StatusPage {
  private readonly healthApi = inject(HealthApi);
  private readonly now = inject(CLOCK);
  private pending: Subscription | undefined;

  protected readonly api = signal<Check<Health>>(CHECKING);
  protected readonly database = signal<Check<null>>(CHECKING);
  protected readonly checkedAt = signal<Date | null>(null);
  protected readonly checking = computed(
    () => this.api().state === 'checking' || this.database().state === 'checking',
  );

  constructor() {
    inject(DestroyRef).onDestroy(() => this.pending?.unsubscribe());
    this.refresh();
  }

  protected refresh(): void {
    this.pending?.unsubscribe();
    this.api.set(CHECKING);
    this.database.set(CHECKING);
    this.pending = forkJoin({ api: this.checkApi(), database: this.checkDatabase() }).subscribe(
      ({ api, database }) => {
        this.api.set(api);
        this.database.set(database);
        this.checkedAt.set(this.now());
      },
    );
  }

  private checkApi(): Observable<Check<Health>> {
    return this.healthApi.liveness().pipe(
      map((liveness): Check<Health> => ({ state: 'healthy', value: liveness })),
      catchError((error: unknown) => of(unavailable(problemMessage(error)))),
    );
  }

  private checkDatabase(): Observable<Check<null>> {
    return this.healthApi.readiness().pipe(
      map(databaseCheck),
      // A 503 here is the API telling us it is up but not ready; its detail says why.
      catchError((error: unknown) => of(unavailable(problemMessage(error)))),
    );
  }
}

function databaseCheck(readiness: Readiness): Check<null> {
  // Read loosely: an older or newer API may report more, fewer or other check results.
  const result: unknown = readiness.checks?.database;
  if (result === 'ok') return { state: 'healthy', value: null };
  if (result === undefined) return unavailable('The readiness answer had no database check.');
  return unavailable(`The database check reported "${String(result)}".`);
}

function unavailable(reason: string): { state: 'unavailable'; reason: string } {
  return { state: 'unavailable', reason };
}
