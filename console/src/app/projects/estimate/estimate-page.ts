import { DatePipe, Location } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, effect, inject, input, signal } from '@angular/core';
import { MatButton } from '@angular/material/button';
import { MatIcon } from '@angular/material/icon';
import { MatProgressBar } from '@angular/material/progress-bar';
import { MatSnackBar } from '@angular/material/snack-bar';
import { RouterLink } from '@angular/router';
import { firstValueFrom, type Subscription } from 'rxjs';

import type { EstimateChanges, StoredEstimate } from '../../core/api-types.js';
import { Auth } from '../../core/auth.js';
import { roleMay } from '../../core/capabilities.js';
import { saveDownload } from '../../core/file-download.js';
import { problemMessage } from '../../core/problem-details.js';
import { LoadFailure } from '../../core/load-failure.js';
import { type EstimateDocument, ProjectsApi } from '../projects-api.js';
import { EstimateChangesPanel } from './estimate-changes.js';
import { EstimateView } from './estimate-view.js';

type Loaded = { state: 'loading' } | { state: 'ready'; estimate: StoredEstimate; changes: EstimateChanges | null } | { state: 'failed'; reason: string };

const DOCUMENTS: { file: EstimateDocument; label: string }[] = [
  { file: 'wiring-schedule.csv', label: 'Wiring schedule CSV' },
  { file: 'bom.csv', label: 'BOM CSV' },
  { file: 'document.pdf', label: 'PDF' },
];

/** A stored estimate: the view, the downloads, and a re-run that says what changed. */
@Component({
  selector: 'tw-estimate-page',
  imports: [DatePipe, RouterLink, MatButton, MatIcon, MatProgressBar, EstimateView, EstimateChangesPanel, LoadFailure],
  template: `
    @let d = loaded();
    @switch (d.state) {
      @case ('loading') {
        <mat-progress-bar mode="indeterminate" aria-label="Loading the estimate" />
      }
      @case ('failed') {
        <tw-load-failure data-testid="estimate-failed" what="The estimate" [reason]="d.reason" (retry)="load()" />
      }
      @case ('ready') {
        @let e = d.estimate;
        <a matButton [routerLink]="['/projects', e.projectId, 'stairs', e.stairId]" class="tw-back"><mat-icon svgIcon="tw:back" />The stair</a>
        <header class="tw-page-head">
          <div>
            <h1 data-testid="estimate-title">Estimate of {{ e.createdAt | date: 'medium' }}</h1>
            <p>
              {{ e.result.layout }} · engine {{ e.engineVersion }}{{ e.catalogVersion !== null ? ' · catalog version ' + e.catalogVersion : '' }}{{ e.rerunOf ? ' · a re-run' : '' }}
            </p>
          </div>
          <div class="tw-actions">
            @for (doc of documents; track doc.file) {
              <button matButton="outlined" type="button" [attr.data-testid]="'download-' + doc.file" [disabled]="downloading() !== null" (click)="download(doc.file)">
                <mat-icon svgIcon="tw:download" />
                {{ doc.label }}
              </button>
            }
            @if (mayRun()) {
              <button matButton="filled" type="button" data-testid="rerun" [disabled]="rerunning()" (click)="rerun()">
                <mat-icon svgIcon="tw:refresh" />
                Re-run
              </button>
            }
          </div>
        </header>
        @if (rerunning() || downloading()) {
          <mat-progress-bar mode="indeterminate" [attr.aria-label]="rerunning() ? 'Re-running' : 'Downloading'" />
        }
        @if (d.changes) {
          <tw-estimate-changes [changes]="d.changes" />
        }
        <tw-estimate-view [result]="e.result" [changes]="d.changes" />
      }
    }
  `,
  styles: `
    .tw-back {
      margin-bottom: 8px;
    }
    .tw-actions {
      display: flex;
      flex-wrap: wrap;
      gap: 8px;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class EstimatePage {
  private readonly api = inject(ProjectsApi);
  private readonly auth = inject(Auth);
  private readonly location = inject(Location);
  private readonly snackBar = inject(MatSnackBar);

  /** From the route (`estimates/:estimateId`). */
  readonly estimateId = input.required<string>();

  protected readonly documents = DOCUMENTS;
  protected readonly loaded = signal<Loaded>({ state: 'loading' });
  protected readonly rerunning = signal(false);
  protected readonly downloading = signal<EstimateDocument | null>(null);
  protected readonly mayRun = computed(() => roleMay(this.auth.role(), 'projects:write'));

  private pending?: Subscription;

  constructor() {
    effect(() => this.load());
  }

  protected load(): void {
    const id = this.estimateId();
    this.loaded.set({ state: 'loading' });
    this.pending?.unsubscribe(); // a newer load wins over an answer still on its way
    this.pending = this.api.estimate(id).subscribe({
      next: (estimate) => this.loaded.set({ state: 'ready', estimate, changes: null }),
      error: (error: unknown) => this.loaded.set({ state: 'failed', reason: problemMessage(error) }),
    });
  }

  protected async rerun(): Promise<void> {
    const d = this.loaded();
    if (d.state !== 'ready') return;
    this.rerunning.set(true);
    try {
      const { changes, ...estimate } = await firstValueFrom(this.api.rerun(d.estimate.id));
      this.loaded.set({ state: 'ready', estimate, changes });
      // The address names the new estimate without reloading the page, so the changes stay shown.
      this.location.replaceState(`/projects/estimates/${estimate.id}`);
    } catch (error) {
      this.snackBar.open(problemMessage(error), 'Dismiss', { duration: 6000 });
    } finally {
      this.rerunning.set(false);
    }
  }

  protected async download(file: EstimateDocument): Promise<void> {
    const d = this.loaded();
    if (d.state !== 'ready') return;
    this.downloading.set(file);
    try {
      saveDownload(await firstValueFrom(this.api.download(d.estimate.id, file)), file);
    } catch (error) {
      this.snackBar.open(problemMessage(error), 'Dismiss', { duration: 6000 });
    } finally {
      this.downloading.set(null);
    }
  }
}
