import { ChangeDetectionStrategy, Component, inject } from '@angular/core';
import { MatButton } from '@angular/material/button';
import { MAT_DIALOG_DATA, MatDialogActions, MatDialogClose, MatDialogContent, MatDialogTitle } from '@angular/material/dialog';

import type { ApiKey } from '../core/api-types.js';

/** Asks before revoking, naming the key: revoking cannot be undone. Closes with true to go ahead. */
@Component({
  selector: 'tw-key-revoke-dialog',
  imports: [MatDialogTitle, MatDialogContent, MatDialogActions, MatDialogClose, MatButton],
  template: `
    <h2 mat-dialog-title data-testid="revoke-title">Revoke “{{ key.name }}”?</h2>
    <mat-dialog-content>
      <p>
        The {{ key.kind }} key <code>{{ key.keyId }}</code> stops working at once, including any secret still in a rotation
        overlap. Calls made with it will be refused. This cannot be undone.
      </p>
    </mat-dialog-content>
    <mat-dialog-actions align="end">
      <button matButton type="button" [mat-dialog-close]="false">Keep it</button>
      <button matButton="filled" class="tw-danger" type="button" [mat-dialog-close]="true" data-testid="revoke-confirm">Revoke {{ key.name }}</button>
    </mat-dialog-actions>
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class KeyRevokeDialog {
  protected readonly key = inject<ApiKey>(MAT_DIALOG_DATA);
}
