import { ChangeDetectionStrategy, Component, inject, signal } from '@angular/core';
import { NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButton } from '@angular/material/button';
import { MAT_DIALOG_DATA, MatDialogActions, MatDialogClose, MatDialogContent, MatDialogRef, MatDialogTitle } from '@angular/material/dialog';
import { MatError, MatFormField, MatHint, MatLabel, MatSuffix } from '@angular/material/form-field';
import { MatInput } from '@angular/material/input';
import { firstValueFrom } from 'rxjs';

import type { ApiKey, ApiKeyWithToken } from '../core/api-types.js';
import { problemMessage } from '../core/problem-details.js';
import { KeysApi } from './keys-api.js';

/** The API's bound (shared/schemas/api-keys.ts, MAX_OVERLAP_HOURS) and its default. */
export const MAX_OVERLAP_HOURS = 72;
const DEFAULT_OVERLAP_HOURS = 24;

/** Issues a new secret; the old one keeps working for the overlap chosen here. */
@Component({
  selector: 'tw-key-rotate-dialog',
  imports: [ReactiveFormsModule, MatDialogTitle, MatDialogContent, MatDialogActions, MatDialogClose, MatButton, MatFormField, MatLabel, MatHint, MatError, MatSuffix, MatInput],
  template: `
    <h2 mat-dialog-title>Rotate “{{ key.name }}”</h2>
    <form [formGroup]="form" (ngSubmit)="rotate()" novalidate>
      <mat-dialog-content>
        <p>A new secret is issued for <code>{{ key.keyId }}</code>. The current one keeps working for the overlap, so you can deploy the new one first.</p>
        <mat-form-field>
          <mat-label>Overlap</mat-label>
          <input matInput type="number" formControlName="overlapHours" min="0" [max]="maxHours" step="1" data-testid="overlap-hours" />
          <span matTextSuffix>hours</span>
          <mat-hint>0 stops the old secret at once; at most {{ maxHours }}.</mat-hint>
          @if (form.controls.overlapHours.invalid) {
            <mat-error>A whole number of hours from 0 to {{ maxHours }}.</mat-error>
          }
        </mat-form-field>
        @if (failure(); as failure) {
          <p class="tw-form-failure" role="alert">{{ failure }}</p>
        }
      </mat-dialog-content>
      <mat-dialog-actions align="end">
        <button matButton type="button" mat-dialog-close>Cancel</button>
        <button matButton="filled" type="submit" [disabled]="busy()" data-testid="rotate-submit">Rotate</button>
      </mat-dialog-actions>
    </form>
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class KeyRotateDialog {
  private readonly keysApi = inject(KeysApi);
  private readonly dialogRef = inject<MatDialogRef<KeyRotateDialog, ApiKeyWithToken>>(MatDialogRef);
  protected readonly key = inject<ApiKey>(MAT_DIALOG_DATA);
  protected readonly maxHours = MAX_OVERLAP_HOURS;
  protected readonly form = inject(NonNullableFormBuilder).group({
    overlapHours: [DEFAULT_OVERLAP_HOURS, [Validators.required, Validators.min(0), Validators.max(MAX_OVERLAP_HOURS), Validators.pattern(/^\d+$/)]],
  });
  protected readonly busy = signal(false);
  protected readonly failure = signal<string | null>(null);

  protected async rotate(): Promise<void> {
    if (this.form.invalid) return this.form.markAllAsTouched();
    this.busy.set(true);
    this.failure.set(null);
    try {
      const rotated = await firstValueFrom(this.keysApi.rotate(this.key.id, { overlapHours: Number(this.form.controls.overlapHours.value) }));
      this.dialogRef.close(rotated);
    } catch (error) {
      this.failure.set(problemMessage(error));
    } finally {
      this.busy.set(false);
    }
  }
}
