import { HttpClient } from '@angular/common/http';
import { ChangeDetectionStrategy, Component, inject, signal } from '@angular/core';
import { NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButton } from '@angular/material/button';
import { MatError, MatFormField, MatHint, MatLabel } from '@angular/material/form-field';
import { MatInput } from '@angular/material/input';
import { ActivatedRoute, RouterLink } from '@angular/router';
import { firstValueFrom } from 'rxjs';

import { anonymous } from '../core/anonymous.js';
import type { PasswordResetConfirm } from '../core/api-types.js';
import { problemMessage } from '../core/problem-details.js';
import { AccountFrame } from './account-frame.js';
import { PASSWORD_MAX_LENGTH, PASSWORD_MIN_LENGTH, passwordsMatch } from './new-password.js';

/** Where the e-mailed link lands: /reset-password?token=… (api/services/password-resets.ts). */
@Component({
  selector: 'tw-password-reset-confirm',
  imports: [ReactiveFormsModule, RouterLink, MatButton, MatFormField, MatLabel, MatHint, MatInput, MatError, AccountFrame],
  template: `
    <tw-account-frame heading="Choose a new password">
      @if (!token) {
        <p role="alert" class="tw-form-failure">This page needs the link from the e-mail. Ask for a new one.</p>
      } @else if (done()) {
        <p role="status" data-testid="reset-done">Your password is changed and every session is signed out. Sign in with the new one.</p>
      } @else {
        <form [formGroup]="form" (ngSubmit)="submit()" novalidate>
          <mat-form-field>
            <mat-label>New password</mat-label>
            <input matInput type="password" formControlName="password" autocomplete="new-password" />
            <mat-hint>At least {{ minLength }} characters.</mat-hint>
            @if (form.controls.password.hasError('required')) {
              <mat-error>Choose a password.</mat-error>
            } @else if (form.controls.password.hasError('minlength')) {
              <mat-error>At least {{ minLength }} characters.</mat-error>
            } @else if (form.controls.password.hasError('maxlength')) {
              <mat-error>At most {{ maxLength }} characters.</mat-error>
            }
          </mat-form-field>
          <mat-form-field>
            <mat-label>The same again</mat-label>
            <input matInput type="password" formControlName="repeat" autocomplete="new-password" />
          </mat-form-field>
          @if (form.hasError('mismatch') && form.controls.repeat.touched) {
            <p class="tw-form-failure" role="alert">The two passwords differ.</p>
          }
          @if (failure(); as failure) {
            <p class="tw-form-failure" role="alert">{{ failure }}</p>
          }
          <button matButton="filled" type="submit" [disabled]="busy()">Set the password</button>
        </form>
      }
      <p class="tw-account-aside"><a routerLink="/sign-in">Sign in</a> · <a routerLink="/forgot-password">Ask for a new link</a></p>
    </tw-account-frame>
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class PasswordResetConfirmPage {
  private readonly http = inject(HttpClient);
  protected readonly token = inject(ActivatedRoute).snapshot.queryParamMap.get('token');
  protected readonly minLength = PASSWORD_MIN_LENGTH;
  protected readonly maxLength = PASSWORD_MAX_LENGTH;
  protected readonly form = inject(NonNullableFormBuilder).group(
    {
      password: ['', [Validators.required, Validators.minLength(PASSWORD_MIN_LENGTH), Validators.maxLength(PASSWORD_MAX_LENGTH)]],
      repeat: ['', Validators.required],
    },
    { validators: passwordsMatch },
  );
  protected readonly busy = signal(false);
  protected readonly done = signal(false);
  protected readonly failure = signal<string | null>(null);

  protected async submit(): Promise<void> {
    if (this.form.invalid || !this.token) return this.form.markAllAsTouched();
    this.busy.set(true);
    this.failure.set(null);
    try {
      const body: PasswordResetConfirm = { token: this.token, password: this.form.controls.password.value };
      await firstValueFrom(this.http.post('/v1/auth/password-reset/confirm', body, anonymous()));
      this.done.set(true);
    } catch (error) {
      this.failure.set(problemMessage(error));
    } finally {
      this.busy.set(false);
    }
  }
}
