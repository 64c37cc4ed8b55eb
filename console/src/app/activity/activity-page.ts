import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, DestroyRef, computed, inject, signal } from '@angular/core';
import { MatButton } from '@angular/material/button';
import { MatFormField, MatLabel } from '@angular/material/form-field';
import { MatProgressBar } from '@angular/material/progress-bar';
import { MatOptgroup, MatOption, MatSelect } from '@angular/material/select';
import type { Subscription } from 'rxjs';

import type { AuditEvent } from '../core/api-types.js';
import { Auth } from '../core/auth.js';
import { roleMay } from '../core/capabilities.js';
import { problemMessage } from '../core/problem-details.js';
import { ActivityApi } from './activity-api.js';
import { AUDIT_ACTION_GROUPS, actionLabel, actorLabel, dataPairs } from './audit-actions.js';

type Listing = { state: 'loading' } | { state: 'ready'; events: AuditEvent[]; nextCursor: string | null } | { state: 'failed'; reason: string };

/** The audit trail: who did what and when, filtered by action, a page at a time. */
@Component({
  selector: 'tw-activity-page',
  imports: [DatePipe, MatButton, MatFormField, MatLabel, MatSelect, MatOption, MatOptgroup, MatProgressBar],
  templateUrl: './activity-page.html',
  styleUrl: './activity-page.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ActivityPage {
  private readonly api = inject(ActivityApi);
  private readonly auth = inject(Auth);
  private pending: Subscription | undefined;

  protected readonly groups = AUDIT_ACTION_GROUPS;
  protected readonly actionLabel = actionLabel;
  /** Member names by user id; ids are shown until (or unless) they load. */
  protected readonly names = signal<ReadonlyMap<string, string>>(new Map());
  protected readonly actorLabel = actorLabel;
  protected readonly dataPairs = dataPairs;
  protected readonly mayRead = computed(() => roleMay(this.auth.role(), 'audit:read'));
  protected readonly action = signal<string>('');
  protected readonly listing = signal<Listing>({ state: 'loading' });
  /** The cursor that fetched each page seen so far; the first page needs none. */
  private readonly cursors = signal<Array<string | undefined>>([undefined]);
  protected readonly pageNumber = computed(() => this.cursors().length);

  constructor() {
    inject(DestroyRef).onDestroy(() => this.pending?.unsubscribe());
    if (!this.mayRead()) return;
    this.api.memberNames().subscribe({ next: (names) => this.names.set(names), error: () => undefined });
    this.fetch();
  }

  protected filterBy(action: string): void {
    this.action.set(action);
    this.cursors.set([undefined]);
    this.fetch();
  }

  protected next(): void {
    const current = this.listing();
    if (current.state !== 'ready' || !current.nextCursor) return;
    this.cursors.set([...this.cursors(), current.nextCursor]);
    this.fetch();
  }

  protected previous(): void {
    if (this.cursors().length < 2) return;
    this.cursors.set(this.cursors().slice(0, -1));
    this.fetch();
  }

  protected fetch(): void {
    this.pending?.unsubscribe();
    this.listing.set({ state: 'loading' });
    this.pending = this.api.page({ action: this.action() || undefined, cursor: this.cursors().at(-1) }).subscribe({
      next: (page) => this.listing.set({ state: 'ready', events: page.items, nextCursor: page.nextCursor }),
      error: (error: unknown) => this.listing.set({ state: 'failed', reason: problemMessage(error) }),
    });
  }
}
