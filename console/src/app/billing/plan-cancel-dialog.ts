import { ChangeDetectionStrategy, Component, inject } from '@angular/core';
import { MatButton } from '@angular/material/button';
import { MAT_DIALOG_DATA, MatDialogActions, MatDialogClose, MatDialogContent, MatDialogTitle } from '@angular/material/dialog';

/** What the cancel confirmation names: the paid plan, the free one, and the day the change happens. */
export interface PlanCancelData {
  planName: string;
  freeName: string;
  /** Already formatted, e.g. "Jan 1, 2027"; null when the provider gave no period end. */
  endsOn: string | null;
}

/** Asks before ending the subscription, naming the day it ends. Closes with true to go ahead. */
@Component({
  selector: 'tw-plan-cancel-dialog',
  imports: [MatDialogTitle, MatDialogContent, MatDialogActions, MatDialogClose, MatButton],
  template: `
    <h2 mat-dialog-title data-testid="cancel-plan-title">Switch to {{ data.freeName }}{{ data.endsOn ? ' on ' + data.endsOn : ' at the period end' }}?</h2>
    <mat-dialog-content>
      <p data-testid="cancel-plan-text">
        Your {{ data.planName }} plan stays in force until {{ data.endsOn ?? 'the end of the period you paid for' }}, then the organisation
        is back on {{ data.freeName }} with its lower limits. Nothing more is charged. You can choose a paid plan again at any time.
      </p>
    </mat-dialog-content>
    <mat-dialog-actions align="end">
      <button matButton type="button" [mat-dialog-close]="false" data-testid="cancel-plan-keep">Keep {{ data.planName }}</button>
      <button matButton="filled" class="tw-danger" type="button" [mat-dialog-close]="true" data-testid="cancel-plan-confirm">
        Switch to {{ data.freeName }}
      </button>
    </mat-dialog-actions>
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class PlanCancelDialog {
  protected readonly data = inject<PlanCancelData>(MAT_DIALOG_DATA);
}
