import { ChangeDetectionStrategy, Component, inject, signal } from '@angular/core';
import { FormControl, FormGroup, ReactiveFormsModule, type ValidatorFn, Validators } from '@angular/forms';
import { MatButton } from '@angular/material/button';
import { MatDialogModule, MatDialogRef } from '@angular/material/dialog';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInput } from '@angular/material/input';
import { firstValueFrom } from 'rxjs';

import type { CreateProjectRequest, Project } from '../core/api-types.js';
import { CreationKey } from '../core/idempotency.js';
import { problemMessage } from '../core/problem-details.js';
import { ProjectsApi } from './projects-api.js';
import { NAME_MAX } from './stair-bounds.js';

// createProjectSchema (shared/schemas/projects.ts): names 120, address 300, notes 4000.
const ADDRESS_MAX = 300;
const NOTES_MAX = 4000;
const notBlank: ValidatorFn = (c) => (typeof c.value === 'string' && c.value.trim() === '' ? { required: true } : null);

/** A new project: its name, and the client and site if known. */
@Component({
  selector: 'tw-project-create-dialog',
  imports: [ReactiveFormsModule, MatDialogModule, MatButton, MatFormFieldModule, MatInput],
  template: `
    <h2 mat-dialog-title>New project</h2>
    <form [formGroup]="form" (ngSubmit)="create()">
      <mat-dialog-content>
        <mat-form-field appearance="outline">
          <mat-label>Name</mat-label>
          <input matInput formControlName="name" data-testid="project-name" required />
          <mat-error>Required, at most {{ nameMax }} characters.</mat-error>
        </mat-form-field>
        <mat-form-field appearance="outline">
          <mat-label>Client</mat-label>
          <input matInput formControlName="clientName" />
          <mat-error>At most {{ nameMax }} characters.</mat-error>
        </mat-form-field>
        <mat-form-field appearance="outline">
          <mat-label>Site address</mat-label>
          <textarea matInput rows="2" formControlName="siteAddress"></textarea>
          <mat-error>At most {{ addressMax }} characters.</mat-error>
        </mat-form-field>
        @if (failure()) {
          <p class="tw-form-failure" role="alert" data-testid="project-failure">{{ failure() }}</p>
        }
      </mat-dialog-content>
      <mat-dialog-actions align="end">
        <button matButton type="button" mat-dialog-close>Cancel</button>
        <button matButton="filled" type="submit" data-testid="project-create-submit" [disabled]="busy()">Create</button>
      </mat-dialog-actions>
    </form>
  `,
  styles: `
    mat-form-field {
      display: block;
      width: 100%;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ProjectCreateDialog {
  private readonly api = inject(ProjectsApi);
  private readonly ref = inject<MatDialogRef<ProjectCreateDialog, Project>>(MatDialogRef);
  private readonly keys = new CreationKey();

  protected readonly nameMax = NAME_MAX;
  protected readonly addressMax = ADDRESS_MAX;
  protected readonly busy = signal(false);
  protected readonly failure = signal<string | null>(null);
  protected readonly form = new FormGroup({
    name: new FormControl('', { nonNullable: true, validators: [Validators.required, notBlank, Validators.maxLength(NAME_MAX)] }),
    clientName: new FormControl('', { nonNullable: true, validators: [Validators.maxLength(NAME_MAX)] }),
    siteAddress: new FormControl('', { nonNullable: true, validators: [Validators.maxLength(ADDRESS_MAX)] }),
    notes: new FormControl('', { nonNullable: true, validators: [Validators.maxLength(NOTES_MAX)] }),
  });

  protected async create(): Promise<void> {
    if (this.form.invalid) return this.form.markAllAsTouched();
    const { name, clientName, siteAddress } = this.form.getRawValue();
    const request: CreateProjectRequest = { name: name.trim() };
    if (clientName.trim()) request.clientName = clientName.trim();
    if (siteAddress.trim()) request.siteAddress = siteAddress.trim();
    this.busy.set(true);
    this.failure.set(null);
    try {
      this.ref.close(await firstValueFrom(this.api.createProject(request, this.keys.for(request))));
    } catch (error) {
      this.keys.failed(error);
      this.failure.set(problemMessage(error));
    } finally {
      this.busy.set(false);
    }
  }
}
