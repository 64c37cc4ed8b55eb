import { ChangeDetectionStrategy, Component, inject } from '@angular/core';
import { MatButton } from '@angular/material/button';
import { MAT_DIALOG_DATA, MatDialogActions, MatDialogClose, MatDialogContent, MatDialogTitle } from '@angular/material/dialog';

import type { Batch } from '../core/api-types.js';
import { jobLabel } from './batch-status.js';

/** Asks before cancelling, naming the job: a cancelled job cannot be resumed. Closes with true to go ahead. */
@Component({
  selector: 'tw-batch-cancel-dialog',
  imports: [MatDialogTitle, MatDialogContent, MatDialogActions, MatDialogClose, MatButton],
  template: `
    <h2 mat-dialog-title data-testid="cancel-title">Cancel “{{ label }}”?</h2>
    <mat-dialog-content>
      <p>
        No further row is sized. The {{ batch.rows.done }} of {{ batch.rows.total }} rows already answered are kept and can still be
        downloaded. A cancelled job cannot be resumed; upload the file again to start over.
      </p>
    </mat-dialog-content>
    <mat-dialog-actions align="end">
      <button matButton type="button" [mat-dialog-close]="false">Keep it running</button>
      <button matButton="filled" class="tw-danger" type="button" [mat-dialog-close]="true" data-testid="cancel-confirm">Cancel the job</button>
    </mat-dialog-actions>
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class BatchCancelDialog {
  protected readonly batch = inject<Batch>(MAT_DIALOG_DATA);
  protected readonly label = jobLabel(this.batch);
}
