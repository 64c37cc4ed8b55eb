import { DOCUMENT, DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { MatButton } from '@angular/material/button';
import { MatIcon } from '@angular/material/icon';
import { MatProgressBar } from '@angular/material/progress-bar';
import { MatSnackBar } from '@angular/material/snack-bar';

import type { OutboxMessage } from '../core/api-types.js';
import { problemMessage } from '../core/problem-details.js';
import { consolePath, messageParts } from './message-links.js';
import { OperatorApi } from './operator-api.js';

type Listing = { state: 'loading' } | { state: 'ready'; messages: OutboxMessage[]; nextCursor: string | null } | { state: 'failed'; reason: string };

/** The local mail sink: every message the server would have sent, to open and follow its links. */
@Component({
  selector: 'tw-mail-outbox',
  imports: [DatePipe, MatButton, MatIcon, MatProgressBar],
  templateUrl: './mail-outbox.html',
  styleUrl: './mail-outbox.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class MailOutbox {
  private readonly api = inject(OperatorApi);
  private readonly snackBar = inject(MatSnackBar);
  private readonly origin = inject(DOCUMENT).location.origin;

  protected readonly listing = signal<Listing>({ state: 'loading' });
  protected readonly loadingMore = signal(false);
  protected readonly openId = signal<string | null>(null);
  protected readonly opened = computed(() => {
    const list = this.listing();
    return list.state === 'ready' ? (list.messages.find((m) => m.id === this.openId()) ?? null) : null;
  });
  protected readonly parts = computed(() => {
    const message = this.opened();
    return message ? messageParts(message.text) : [];
  });

  constructor() {
    this.load();
  }

  protected load(): void {
    this.listing.set({ state: 'loading' });
    this.api.outbox().subscribe({
      next: (page) => this.listing.set({ state: 'ready', messages: page.items, nextCursor: page.nextCursor }),
      error: (error: unknown) => this.listing.set({ state: 'failed', reason: problemMessage(error) }),
    });
  }

  protected loadMore(): void {
    const current = this.listing();
    if (current.state !== 'ready' || !current.nextCursor) return;
    this.loadingMore.set(true);
    this.api.outbox(current.nextCursor).subscribe({
      next: (page) => {
        this.loadingMore.set(false);
        this.listing.set({ state: 'ready', messages: [...current.messages, ...page.items], nextCursor: page.nextCursor });
      },
      error: (error: unknown) => {
        this.loadingMore.set(false);
        this.snackBar.open(problemMessage(error), 'Dismiss', { duration: 6000 });
      },
    });
  }

  protected open(message: OutboxMessage): void {
    this.openId.set(this.openId() === message.id ? null : message.id);
  }

  /** A link to this console opens here (a newcomer accepting an invitation); any other address in a new tab. */
  protected targetOf(href: string): string | null {
    return consolePath(href, this.origin) === null ? '_blank' : null;
  }
}
