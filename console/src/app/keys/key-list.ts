import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { MatButton, MatIconButton } from '@angular/material/button';
import { MatDialog } from '@angular/material/dialog';
import { MatIcon } from '@angular/material/icon';
import { MatProgressBar } from '@angular/material/progress-bar';
import { MatSnackBar } from '@angular/material/snack-bar';
import { MatTableModule } from '@angular/material/table';
import { MatTooltip } from '@angular/material/tooltip';
import { firstValueFrom } from 'rxjs';

import type { ApiKey, ApiKeyWithToken } from '../core/api-types.js';
import { Auth } from '../core/auth.js';
import { roleMay } from '../core/capabilities.js';
import { problemMessage } from '../core/problem-details.js';
import { KeyCreateDialog, type KeyCreateData } from './key-create-dialog.js';
import { KeyRevokeDialog } from './key-revoke-dialog.js';
import { KeyRotateDialog } from './key-rotate-dialog.js';
import { KeySecretDialog, type KeySecretData } from './key-secret-dialog.js';
import { KeySnippetsDialog } from './key-snippets-dialog.js';
import { KeysApi } from './keys-api.js';

type Listing =
  | { state: 'loading' }
  | { state: 'ready'; keys: ApiKey[]; nextCursor: string | null }
  | { state: 'failed'; reason: string };

const COLUMNS = ['name', 'kind', 'keyId', 'scopes', 'origins', 'created', 'lastUsed', 'expires', 'status', 'actions'] as const;

/** The organisation's API keys: list, create, rotate, revoke, and calls to paste. */
@Component({
  selector: 'tw-key-list',
  imports: [DatePipe, MatTableModule, MatButton, MatIconButton, MatIcon, MatProgressBar, MatTooltip],
  templateUrl: './key-list.html',
  styleUrl: './key-list.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class KeyList {
  private readonly keysApi = inject(KeysApi);
  private readonly dialog = inject(MatDialog);
  private readonly snackBar = inject(MatSnackBar);
  private readonly auth = inject(Auth);

  protected readonly columns = COLUMNS;
  protected readonly listing = signal<Listing>({ state: 'loading' });
  protected readonly mayManage = computed(() => roleMay(this.auth.role(), 'keys:manage'));
  protected readonly loadingMore = signal(false);

  constructor() {
    if (this.mayManage()) this.load();
  }

  protected load(): void {
    this.listing.set({ state: 'loading' });
    this.keysApi.list().subscribe({
      next: (page) => this.listing.set({ state: 'ready', keys: page.items, nextCursor: page.nextCursor }),
      error: (error: unknown) => this.listing.set({ state: 'failed', reason: problemMessage(error) }),
    });
  }

  protected loadMore(): void {
    const current = this.listing();
    if (current.state !== 'ready' || !current.nextCursor) return;
    this.loadingMore.set(true);
    this.keysApi.list(current.nextCursor).subscribe({
      next: (page) => {
        this.listing.set({ state: 'ready', keys: [...current.keys, ...page.items], nextCursor: page.nextCursor });
        this.loadingMore.set(false);
      },
      error: (error: unknown) => {
        this.loadingMore.set(false);
        this.tell(problemMessage(error));
      },
    });
  }

  protected async create(): Promise<void> {
    const data: KeyCreateData = { role: this.auth.role() };
    const ref = this.dialog.open<KeyCreateDialog, KeyCreateData, ApiKeyWithToken>(KeyCreateDialog, { data, width: '560px', maxWidth: '95vw' });
    const issued = await firstValueFrom(ref.afterClosed());
    if (!issued) return;
    this.upsert(issued.key, 'first');
    this.showSecret(issued, 'created');
  }

  protected async rotate(key: ApiKey): Promise<void> {
    const ref = this.dialog.open<KeyRotateDialog, ApiKey, ApiKeyWithToken>(KeyRotateDialog, { data: key, maxWidth: '95vw' });
    const issued = await firstValueFrom(ref.afterClosed());
    if (!issued) return;
    this.upsert(issued.key, 'in-place');
    this.showSecret(issued, 'rotated');
  }

  protected async revoke(key: ApiKey): Promise<void> {
    const ref = this.dialog.open<KeyRevokeDialog, ApiKey, boolean>(KeyRevokeDialog, { data: key, maxWidth: '95vw' });
    if (!(await firstValueFrom(ref.afterClosed()))) return;
    try {
      this.upsert(await firstValueFrom(this.keysApi.revoke(key.id)), 'in-place');
      this.tell(`Revoked “${key.name}”.`);
    } catch (error) {
      this.tell(problemMessage(error));
    }
  }

  protected snippets(key: ApiKey): void {
    this.dialog.open(KeySnippetsDialog, { data: key, width: '640px', maxWidth: '95vw' });
  }

  private showSecret(issued: ApiKeyWithToken, event: KeySecretData['event']): void {
    // Closing by Escape or a click outside would lose the key unseen: the button must be pressed.
    this.dialog.open<KeySecretDialog, KeySecretData>(KeySecretDialog, { data: { issued, event }, disableClose: true, width: '640px', maxWidth: '95vw' });
  }

  /** Puts the listed form of a key (never its token) into the table. */
  private upsert(key: ApiKey, where: 'first' | 'in-place'): void {
    const current = this.listing();
    if (current.state !== 'ready') return this.load();
    const others = current.keys.filter((k) => k.id !== key.id);
    const keys = where === 'first' ? [key, ...others] : current.keys.map((k) => (k.id === key.id ? key : k));
    this.listing.set({ ...current, keys });
  }

  private tell(message: string): void {
    this.snackBar.open(message, 'Dismiss', { duration: 6000 });
  }
}
