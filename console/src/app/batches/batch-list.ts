import { DatePipe, NgTemplateOutlet } from '@angular/common';
import { ChangeDetectionStrategy, Component, DestroyRef, computed, inject, signal } from '@angular/core';
import { MatButton } from '@angular/material/button';
import { MatIcon } from '@angular/material/icon';
import { MatProgressBar } from '@angular/material/progress-bar';
import { MatSnackBar } from '@angular/material/snack-bar';
import { Router, RouterLink } from '@angular/router';
import { EMPTY, type Subscription, expand, firstValueFrom, switchMap, take } from 'rxjs';

import type { Batch, BatchPage } from '../core/api-types.js';
import { Auth } from '../core/auth.js';
import { roleMay } from '../core/capabilities.js';
import { LoadFailure } from '../core/load-failure.js';
import { problemMessage } from '../core/problem-details.js';
import { BatchStatusChip } from './batch-status-chip.js';
import { formatEta, formatRate, isFinal, jobLabel } from './batch-status.js';
import { BatchUpload } from './batch-upload.js';
import { DEFAULT_POLL_MS, POLL_WAIT } from '../core/poll.js';
import { BatchesApi } from './batches-api.js';

type Listing = { state: 'loading' } | { state: 'ready'; jobs: Batch[]; nextCursor: string | null } | { state: 'failed'; reason: string };

/** The organisation's batch jobs, newest first, with an upload panel for those who may start one. */
@Component({
  selector: 'tw-batch-list',
  imports: [DatePipe, NgTemplateOutlet, RouterLink, MatButton, MatIcon, MatProgressBar, LoadFailure, BatchStatusChip, BatchUpload],
  templateUrl: './batch-list.html',
  styleUrl: './batch-list.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class BatchList {
  private readonly api = inject(BatchesApi);
  private readonly auth = inject(Auth);
  private readonly router = inject(Router);
  private readonly snackBar = inject(MatSnackBar);
  private readonly wait = inject(POLL_WAIT);

  protected readonly listing = signal<Listing>({ state: 'loading' });
  /** Older pages, fetched on request; their jobs have mostly ended, so they are not refreshed. */
  protected readonly older = signal<Batch[]>([]);
  protected readonly olderCursor = signal<string | null>(null);
  protected readonly loadingOlder = signal(false);
  protected readonly mayWrite = computed(() => roleMay(this.auth.role(), 'batches:write'));
  protected readonly label = jobLabel;
  protected readonly eta = formatEta;
  protected readonly rate = formatRate;
  protected readonly final = isFinal;

  private watching?: Subscription;

  constructor() {
    inject(DestroyRef).onDestroy(() => this.watching?.unsubscribe());
    this.load();
  }

  /** The first page, asked again while any job on it is still queued or running. */
  protected load(): void {
    this.watching?.unsubscribe();
    this.listing.set({ state: 'loading' });
    this.older.set([]);
    this.olderCursor.set(null);
    const active = (page: BatchPage) => page.items.some((b) => !isFinal(b.status));
    this.watching = this.api
      .list()
      .pipe(expand((page) => (active(page) ? this.wait(DEFAULT_POLL_MS).pipe(take(1), switchMap(() => this.api.list())) : EMPTY)))
      .subscribe({
        next: (page) => {
          this.listing.set({ state: 'ready', jobs: page.items, nextCursor: page.nextCursor });
          if (this.older().length === 0) this.olderCursor.set(page.nextCursor);
        },
        error: (error: unknown) => {
          const current = this.listing();
          // A refresh that fails keeps the rows on screen; only a first load shows the failure.
          if (current.state === 'ready') this.snackBar.open(`The list stopped updating: ${problemMessage(error)}`, 'Dismiss', { duration: 8000 });
          else this.listing.set({ state: 'failed', reason: problemMessage(error) });
        },
      });
  }

  protected async showOlder(): Promise<void> {
    const cursor = this.olderCursor();
    if (!cursor) return;
    this.loadingOlder.set(true);
    try {
      const page = await firstValueFrom(this.api.list(cursor));
      this.older.update((jobs) => [...jobs, ...page.items]);
      this.olderCursor.set(page.nextCursor);
    } catch (error) {
      this.snackBar.open(problemMessage(error), 'Dismiss', { duration: 8000 });
    } finally {
      this.loadingOlder.set(false);
    }
  }

  protected async created(batch: Batch): Promise<void> {
    await this.router.navigate(['/batches', batch.id]);
  }
}
