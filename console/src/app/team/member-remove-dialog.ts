import { ChangeDetectionStrategy, Component, inject } from '@angular/core';
import { MatButton } from '@angular/material/button';
import { MAT_DIALOG_DATA, MatDialogActions, MatDialogClose, MatDialogContent, MatDialogTitle } from '@angular/material/dialog';

import type { Member } from '../core/api-types.js';

/** Asks before removing a member, naming them. Closes with true to go ahead. */
@Component({
  selector: 'tw-member-remove-dialog',
  imports: [MatDialogTitle, MatDialogContent, MatDialogActions, MatDialogClose, MatButton],
  template: `
    <h2 mat-dialog-title data-testid="remove-title">Remove {{ label }} from the team?</h2>
    <mat-dialog-content>
      <p>
        {{ member.email }} loses access to this organisation at once: keys, projects and the catalog. Their account stays, and
        an admin can invite them again.
      </p>
    </mat-dialog-content>
    <mat-dialog-actions align="end">
      <button matButton type="button" [mat-dialog-close]="false">Keep {{ label }}</button>
      <button matButton="filled" class="tw-danger" type="button" [mat-dialog-close]="true" data-testid="remove-confirm">Remove {{ label }}</button>
    </mat-dialog-actions>
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class MemberRemoveDialog {
  protected readonly member = inject<Member>(MAT_DIALOG_DATA);
  protected readonly label = this.member.name ?? this.member.email;
}
