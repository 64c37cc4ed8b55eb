import { HttpClient } from '@angular/common/http';
import { ChangeDetectionStrategy, Component, inject, signal } from '@angular/core';
import { NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButton } from '@angular/material/button';
import { MatError, MatFormField, MatLabel } from '@angular/material/form-field';
import { MatInput } from '@angular/material/input';
import { RouterLink } from '@angular/router';
import { firstValueFrom } from 'rxjs';

import { anonymous } from '../core/anonymous.js';
import type { PasswordResetRequest } from '../core/api-types.js';
import { problemMessage } from '../core/problem-details.js';
import { AccountFrame } from './account-frame.js';

/** Asks for a reset link. The API answers 202 whether or not the address has an account. */
@Component({
  selector: 'tw-password-reset-request',
  imports: [ReactiveFormsModule, RouterLink, MatButton, MatFormField, MatLabel, MatInput, MatError, AccountFrame],
  template: `
    <tw-account-frame heading="Reset your password" lead="We e-mail you a link that works once, for one hour.">
      @if (sent()) {
        <p role="status" data-testid="reset-sent">
          If an account uses that address, a link is on its way. Check your inbox.
        </p>
      } @else {
        <form [formGroup]="form" (ngSubmit)="submit()" novalidate>
          <mat-form-field>
            <mat-label>E-mail address</mat-label>
            <input matInput type="email" formControlName="email" autocomplete="username" />
            @if (form.controls.email.hasError('required')) {
              <mat-error>Enter your e-mail address.</mat-error>
            } @else if (form.controls.email.hasError('email')) {
              <mat-error>That is not an e-mail address.</mat-error>
            }
          </mat-form-field>
          @if (failure(); as failure) {
            <p class="tw-form-failure" role="alert">{{ failure }}</p>
          }
          <button matButton="filled" type="submit" [disabled]="busy()">Send the link</button>
        </form>
      }
      <p class="tw-account-aside"><a routerLink="/sign-in">Back to sign-in</a></p>
    </tw-account-frame>
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class PasswordResetRequestPage {
  private readonly http = inject(HttpClient);
  protected readonly form = inject(NonNullableFormBuilder).group({ email: ['', [Validators.required, Validators.email]] });
  protected readonly busy = signal(false);
  protected readonly sent = signal(false);
  protected readonly failure = signal<string | null>(null);

  protected async submit(): Promise<void> {
    if (this.form.invalid) return this.form.markAllAsTouched();
    this.busy.set(true);
    this.failure.set(null);
    try {
      const body: PasswordResetRequest = this.form.getRawValue();
      await firstValueFrom(this.http.post('/v1/auth/password-reset', body, anonymous()));
      this.sent.set(true);
    } catch (error) {
      this.failure.set(problemMessage(error));
    } finally {
      this.busy.set(false);
    }
  }
}
