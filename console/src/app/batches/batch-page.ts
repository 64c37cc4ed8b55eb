import { DatePipe, PercentPipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, DestroyRef, computed, effect, inject, input, signal, untracked } from '@angular/core';
import { MatButton } from '@angular/material/button';
import { MatDialog } from '@angular/material/dialog';
import { MatIcon } from '@angular/material/icon';
import { MatProgressBar } from '@angular/material/progress-bar';
import { MatSnackBar } from '@angular/material/snack-bar';
import { RouterLink } from '@angular/router';
import { type Subscription, firstValueFrom } from 'rxjs';

import type { Batch } from '../core/api-types.js';
import { Auth } from '../core/auth.js';
import { roleMay } from '../core/capabilities.js';
import { saveDownload } from '../core/file-download.js';
import { LoadFailure } from '../core/load-failure.js';
import { problemMessage } from '../core/problem-details.js';
import { BatchCancelDialog } from './batch-cancel-dialog.js';
import { BatchStatusChip } from './batch-status-chip.js';
import { formatEta, formatRate, isFinal, jobLabel } from './batch-status.js';
import { POLL_WAIT } from '../core/poll.js';
import { watchBatch } from './batch-watch.js';
import { BatchesApi, type ResultFormat } from './batches-api.js';

type Watched =
  | { state: 'loading' }
  | { state: 'ready'; batch: Batch; stalled?: string }
  | { state: 'failed'; reason: string };

type Download = 'csv' | 'ndjson' | 'errors';

/** One job, watched live until it ends: counts, rate, time left, downloads and cancel. */
@Component({
  selector: 'tw-batch-page',
  imports: [DatePipe, PercentPipe, RouterLink, MatButton, MatIcon, MatProgressBar, LoadFailure, BatchStatusChip],
  templateUrl: './batch-page.html',
  styleUrl: './batch-page.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class BatchPage {
  private readonly api = inject(BatchesApi);
  private readonly auth = inject(Auth);
  private readonly dialog = inject(MatDialog);
  private readonly snackBar = inject(MatSnackBar);
  private readonly wait = inject(POLL_WAIT);

  /** From the route (`:batchId`). */
  readonly batchId = input.required<string>();

  protected readonly watched = signal<Watched>({ state: 'loading' });
  protected readonly mayWrite = computed(() => roleMay(this.auth.role(), 'batches:write'));
  protected readonly downloading = signal<Download | null>(null);
  protected readonly cancelling = signal(false);
  protected readonly label = jobLabel;
  protected readonly eta = formatEta;
  protected readonly rate = formatRate;
  protected readonly final = isFinal;

  private watching?: Subscription;

  constructor() {
    inject(DestroyRef).onDestroy(() => this.watching?.unsubscribe());
    // Only the id is tracked: watch() reads and writes the page's own state.
    effect(() => {
      const id = this.batchId();
      untracked(() => this.watch(id));
    });
  }

  protected retry(): void {
    this.watch(this.batchId());
  }

  private watch(id: string): void {
    this.watching?.unsubscribe(); // a newer job id, or a retry, replaces the running watch
    const current = this.watched();
    if (current.state !== 'ready' || current.batch.id !== id) this.watched.set({ state: 'loading' });
    this.watching = watchBatch(() => this.api.get(id), this.wait).subscribe({
      next: (batch) => this.watched.set({ state: 'ready', batch }),
      error: (error: unknown) => {
        const shown = this.watched();
        // Keep the last figures on screen and say that they stopped moving.
        if (shown.state === 'ready') this.watched.set({ ...shown, stalled: problemMessage(error) });
        else this.watched.set({ state: 'failed', reason: problemMessage(error) });
      },
    });
  }

  protected async cancel(batch: Batch): Promise<void> {
    const ref = this.dialog.open<BatchCancelDialog, Batch, boolean>(BatchCancelDialog, { data: batch, width: '480px', maxWidth: '95vw' });
    if ((await firstValueFrom(ref.afterClosed())) !== true) return;
    this.cancelling.set(true);
    try {
      const cancelled = await firstValueFrom(this.api.cancel(batch.id));
      this.watching?.unsubscribe(); // the answer is final: nothing more to watch
      this.watched.set({ state: 'ready', batch: cancelled });
      this.snackBar.open(`Cancelled ${jobLabel(cancelled)}; the rows already sized are kept.`, 'Dismiss', { duration: 6000 });
    } catch (error) {
      this.snackBar.open(problemMessage(error), 'Dismiss', { duration: 8000 });
      this.watch(batch.id); // e.g. it ended meanwhile: show what it is now
    } finally {
      this.cancelling.set(false);
    }
  }

  protected async download(batch: Batch, what: Download): Promise<void> {
    this.downloading.set(what);
    const base = `treadwise-batch-${batch.id.slice(0, 8)}`;
    try {
      if (what === 'errors') saveDownload(await firstValueFrom(this.api.errors(batch.id)), `${base}-errors.csv`);
      else saveDownload(await firstValueFrom(this.api.results(batch.id, what satisfies ResultFormat)), `${base}.${what}`);
    } catch (error) {
      this.snackBar.open(problemMessage(error), 'Dismiss', { duration: 8000 });
    } finally {
      this.downloading.set(null);
    }
  }
}
