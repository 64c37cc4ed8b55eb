import { HttpClient } from '@angular/common/http';
import { ChangeDetectionStrategy, Component, inject, signal } from '@angular/core';
import { NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButton } from '@angular/material/button';
import { MatError, MatFormField, MatHint, MatLabel } from '@angular/material/form-field';
import { MatInput } from '@angular/material/input';
import { ActivatedRoute, Router } from '@angular/router';
import { firstValueFrom } from 'rxjs';

import { anonymous } from '../core/anonymous.js';
import type { AcceptInvitationRequest, Session } from '../core/api-types.js';
import { Auth } from '../core/auth.js';
import { problemMessage } from '../core/problem-details.js';
import { AccountFrame } from './account-frame.js';
import { PASSWORD_MAX_LENGTH, PASSWORD_MIN_LENGTH } from './new-password.js';

/** Where the invitation e-mail's link lands: /accept-invitation?token=… (api/services/members.ts). */
@Component({
  selector: 'tw-accept-invitation',
  imports: [ReactiveFormsModule, MatButton, MatFormField, MatLabel, MatHint, MatInput, MatError, AccountFrame],
  template: `
    <tw-account-frame
      heading="Join your team"
      lead="New to Treadwise? Give your name and choose a password. Already have an account? Leave the name empty and enter your current password."
    >
      @if (!token) {
        <p role="alert" class="tw-form-failure">This page needs the link from the invitation e-mail.</p>
      } @else {
        <form [formGroup]="form" (ngSubmit)="submit()" novalidate>
          <mat-form-field>
            <mat-label>Your name</mat-label>
            <input matInput formControlName="name" autocomplete="name" />
            @if (form.controls.name.hasError('maxlength')) {
              <mat-error>At most 100 characters.</mat-error>
            }
          </mat-form-field>
          <mat-form-field>
            <mat-label>Password</mat-label>
            <input matInput type="password" formControlName="password" autocomplete="new-password" />
            <mat-hint>At least {{ minLength }} characters.</mat-hint>
            @if (form.controls.password.hasError('required')) {
              <mat-error>A password is needed.</mat-error>
            } @else if (form.controls.password.hasError('minlength')) {
              <mat-error>At least {{ minLength }} characters.</mat-error>
            }
          </mat-form-field>
          @if (failure(); as failure) {
            <p class="tw-form-failure" role="alert">{{ failure }}</p>
          }
          <button matButton="filled" type="submit" [disabled]="busy()">Join</button>
        </form>
      }
    </tw-account-frame>
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class AcceptInvitationPage {
  private readonly http = inject(HttpClient);
  private readonly auth = inject(Auth);
  private readonly router = inject(Router);
  protected readonly token = inject(ActivatedRoute).snapshot.queryParamMap.get('token');
  protected readonly minLength = PASSWORD_MIN_LENGTH;
  protected readonly form = inject(NonNullableFormBuilder).group({
    name: ['', Validators.maxLength(100)],
    password: ['', [Validators.required, Validators.minLength(PASSWORD_MIN_LENGTH), Validators.maxLength(PASSWORD_MAX_LENGTH)]],
  });
  protected readonly busy = signal(false);
  protected readonly failure = signal<string | null>(null);

  protected async submit(): Promise<void> {
    if (this.form.invalid || !this.token) return this.form.markAllAsTouched();
    this.busy.set(true);
    this.failure.set(null);
    const { name, password } = this.form.getRawValue();
    const body: AcceptInvitationRequest = { token: this.token, password, ...(name.trim() ? { name: name.trim() } : {}) };
    try {
      const session = await firstValueFrom(this.http.post<Session>('/v1/auth/invitations/accept', body, anonymous()));
      this.auth.startSession(session);
      await this.router.navigateByUrl('/');
    } catch (error) {
      this.failure.set(problemMessage(error));
    } finally {
      this.busy.set(false);
    }
  }
}
