import { ChangeDetectionStrategy, Component, inject } from '@angular/core';
import { MatButton } from '@angular/material/button';
import { MAT_DIALOG_DATA, MatDialogActions, MatDialogClose, MatDialogContent, MatDialogTitle } from '@angular/material/dialog';

import type { ApiKey } from '../core/api-types.js';
import { KeySnippetsView } from './key-snippets-view.js';

/** Calls to paste for a listed key; its secret is not known any more, so they carry a placeholder. */
@Component({
  selector: 'tw-key-snippets-dialog',
  imports: [MatDialogTitle, MatDialogContent, MatDialogActions, MatDialogClose, MatButton, KeySnippetsView],
  template: `
    <h2 mat-dialog-title>Calling with “{{ key.name }}”</h2>
    <mat-dialog-content>
      <tw-key-snippets-view [kind]="key.kind" [keyId]="key.keyId" [origin]="key.allowedOrigins[0]" />
    </mat-dialog-content>
    <mat-dialog-actions align="end">
      <button matButton type="button" mat-dialog-close>Close</button>
    </mat-dialog-actions>
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class KeySnippetsDialog {
  protected readonly key = inject<ApiKey>(MAT_DIALOG_DATA);
}
