import { HttpErrorResponse } from '@angular/common/http';
import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { toSignal } from '@angular/core/rxjs-interop';
import { NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButton } from '@angular/material/button';
import { MatButtonToggle, MatButtonToggleGroup } from '@angular/material/button-toggle';
import { MatCheckbox } from '@angular/material/checkbox';
import { MAT_DIALOG_DATA, MatDialogActions, MatDialogClose, MatDialogContent, MatDialogRef, MatDialogTitle } from '@angular/material/dialog';
import { MatError, MatFormField, MatHint, MatLabel } from '@angular/material/form-field';
import { MatInput } from '@angular/material/input';
import { firstValueFrom } from 'rxjs';

import type { ApiKeyWithToken, KeyKind, Role, Scope } from '../core/api-types.js';
import { CLOCK } from '../core/clock.js';
import { problemMessage } from '../core/problem-details.js';
import { createRequest, futureDate, localDay, offeredScopes, originsFitKind } from './key-form.js';
import { KeysApi } from './keys-api.js';
import { randomIdempotencyKey } from '../core/idempotency.js';

export interface KeyCreateData {
  role: Role | null;
}

/** Asks for a new key's kind, name, scopes, origins and expiry; closes with the created key and its token. */
@Component({
  selector: 'tw-key-create-dialog',
  imports: [
    ReactiveFormsModule,
    MatDialogTitle,
    MatDialogContent,
    MatDialogActions,
    MatDialogClose,
    MatButton,
    MatButtonToggleGroup,
    MatButtonToggle,
    MatCheckbox,
    MatFormField,
    MatLabel,
    MatHint,
    MatError,
    MatInput,
  ],
  templateUrl: './key-create-dialog.html',
  styleUrl: './key-create-dialog.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class KeyCreateDialog {
  private readonly keysApi = inject(KeysApi);
  private readonly dialogRef = inject<MatDialogRef<KeyCreateDialog, ApiKeyWithToken>>(MatDialogRef);
  private readonly role = inject<KeyCreateData>(MAT_DIALOG_DATA).role;
  private readonly now = inject(CLOCK);
  /** The last request sent while its outcome is unknown (no answer, or a 5xx the API does not store). */
  private unanswered: { body: string; idempotencyKey: string } | null = null;

  protected readonly form = inject(NonNullableFormBuilder).group(
    {
      kind: ['server' as KeyKind],
      name: ['', [Validators.required, Validators.maxLength(100), Validators.pattern(/\S/)]],
      scopes: [['sizing:run'] as Scope[], Validators.required],
      origins: [''],
      expiresOn: ['', futureDate(this.now)],
    },
    { validators: originsFitKind },
  );
  protected readonly tomorrow = localDay(new Date(this.now().getTime() + 86_400_000));
  private readonly kind = toSignal(this.form.controls.kind.valueChanges, { initialValue: this.form.controls.kind.value });
  private readonly scopes = toSignal(this.form.controls.scopes.valueChanges, { initialValue: this.form.controls.scopes.value });
  protected readonly offered = computed(() => offeredScopes(this.kind(), this.role));
  protected readonly isEmbed = computed(() => this.kind() === 'embed');
  protected readonly busy = signal(false);
  protected readonly failure = signal<string | null>(null);

  constructor() {
    // Switching kind drops scopes the new kind cannot hold.
    this.form.controls.kind.valueChanges.subscribe((kind) => {
      const allowed = offeredScopes(kind, this.role);
      const kept = this.form.controls.scopes.value.filter((s) => allowed.includes(s));
      this.form.controls.scopes.setValue(kept.length ? kept : ['sizing:run']);
    });
  }

  protected hasScope(scope: Scope): boolean {
    return this.scopes().includes(scope);
  }

  protected toggleScope(scope: Scope, on: boolean): void {
    const current = this.form.controls.scopes.value.filter((s) => s !== scope);
    this.form.controls.scopes.setValue(on ? [...current, scope] : current);
    this.form.controls.scopes.markAsTouched();
  }

  protected async create(): Promise<void> {
    if (this.form.invalid) {
      this.form.markAllAsTouched();
      return;
    }
    this.busy.set(true);
    this.failure.set(null);
    const request = createRequest(this.form.getRawValue());
    const body = JSON.stringify(request);
    // Retrying the same request after a lost answer reuses its key, so the API replays the first
    // creation instead of making a second key. The API stores 4xx answers too, so after one (or for
    // a changed form) a fresh key lets the corrected request through.
    const idempotencyKey = this.unanswered?.body === body ? this.unanswered.idempotencyKey : randomIdempotencyKey();
    this.unanswered = { body, idempotencyKey };
    try {
      const created = await firstValueFrom(this.keysApi.create(request, idempotencyKey));
      this.dialogRef.close(created);
    } catch (error) {
      if (error instanceof HttpErrorResponse && error.status >= 400 && error.status < 500) this.unanswered = null;
      this.failure.set(problemMessage(error));
    } finally {
      this.busy.set(false);
    }
  }
}
