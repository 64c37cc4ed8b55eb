import { Clipboard } from '@angular/cdk/clipboard';
import { ChangeDetectionStrategy, Component, inject, signal } from '@angular/core';
import { MatButton } from '@angular/material/button';
import { MAT_DIALOG_DATA, MatDialogActions, MatDialogClose, MatDialogContent, MatDialogTitle } from '@angular/material/dialog';
import { MatIcon } from '@angular/material/icon';

import type { ApiKeyWithToken } from '../core/api-types.js';
import { KeySnippetsView } from './key-snippets-view.js';

export interface KeySecretData {
  issued: ApiKeyWithToken;
  /** 'created' or 'rotated': what the heading says happened. */
  event: 'created' | 'rotated';
}

/**
 * The one place a key's token appears. The token lives only in this dialog's data: the key list
 * never stores it, so once the dialog closes the console cannot show it again.
 */
@Component({
  selector: 'tw-key-secret-dialog',
  imports: [MatDialogTitle, MatDialogContent, MatDialogActions, MatDialogClose, MatButton, MatIcon, KeySnippetsView],
  template: `
    <h2 mat-dialog-title>{{ data.event === 'created' ? 'Your new key' : 'The new secret' }} · {{ data.issued.key.name }}</h2>
    <mat-dialog-content>
      <p class="tw-warning" role="alert" data-testid="once-warning">
        Copy this key now. It is shown only this once: Treadwise keeps a fingerprint of it, not the key itself.
        If you lose it, rotate the key to get a new one.
      </p>
      <div class="tw-token">
        <code data-testid="new-token">{{ data.issued.token }}</code>
        <button matButton="tonal" type="button" data-testid="copy-token" (click)="copy()">
          <mat-icon svgIcon="tw:copy" />
          {{ copied() ? 'Copied' : 'Copy' }}
        </button>
      </div>
      <h3>Try it</h3>
      <tw-key-snippets-view [kind]="data.issued.key.kind" [keyId]="data.issued.key.keyId" [token]="data.issued.token" [origin]="data.issued.key.allowedOrigins[0]" />
    </mat-dialog-content>
    <mat-dialog-actions align="end">
      <button matButton="filled" type="button" mat-dialog-close data-testid="secret-done">I have stored it</button>
    </mat-dialog-actions>
  `,
  styles: `
    .tw-warning {
      padding: 12px;
      border-radius: 8px;
      background: var(--mat-sys-tertiary-container);
      color: var(--mat-sys-on-tertiary-container);
    }
    .tw-token {
      display: flex;
      flex-wrap: wrap;
      align-items: center;
      gap: 8px;
      code {
        flex: 1 1 240px;
        padding: 10px;
        border-radius: 8px;
        word-break: break-all;
        font: 14px/1.4 ui-monospace, monospace;
        background: var(--mat-sys-surface-container-highest);
      }
    }
    h3 {
      font: var(--mat-sys-title-small);
      margin: 20px 0 4px;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class KeySecretDialog {
  private readonly clipboard = inject(Clipboard);
  protected readonly data = inject<KeySecretData>(MAT_DIALOG_DATA);
  protected readonly copied = signal(false);

  protected copy(): void {
    this.copied.set(this.clipboard.copy(this.data.issued.token));
  }
}
