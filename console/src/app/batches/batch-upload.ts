import { ChangeDetectionStrategy, Component, inject, output, signal } from '@angular/core';
import { NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButton } from '@angular/material/button';
import { MatButtonToggle, MatButtonToggleGroup } from '@angular/material/button-toggle';
import { MatError, MatFormField, MatHint, MatLabel } from '@angular/material/form-field';
import { MatIcon } from '@angular/material/icon';
import { MatInput } from '@angular/material/input';
import { MatProgressBar } from '@angular/material/progress-bar';
import { MatSnackBar } from '@angular/material/snack-bar';
import { firstValueFrom } from 'rxjs';

import type { Batch } from '../core/api-types.js';
import { saveDownload } from '../core/file-download.js';
import { problemMessage } from '../core/problem-details.js';
import { type BatchDetail, BatchesApi } from './batches-api.js';
import { JOB_NAME_MAX } from './batch-status.js';

/** The kinds of file a job reads (docs/batch-rows.md): stair rows as CSV, or one item per NDJSON line. */
const ACCEPTED = /\.(csv|ndjson|jsonl)$/i;

/** Starts a job from a file of stairs: the file, an optional name, and how much each answer holds. */
@Component({
  selector: 'tw-batch-upload',
  imports: [ReactiveFormsModule, MatButton, MatButtonToggle, MatButtonToggleGroup, MatFormField, MatLabel, MatHint, MatError, MatInput, MatIcon, MatProgressBar],
  templateUrl: './batch-upload.html',
  styleUrl: './batch-upload.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class BatchUpload {
  private readonly api = inject(BatchesApi);
  private readonly snackBar = inject(MatSnackBar);

  /** The queued job, once the API has taken the file. */
  readonly created = output<Batch>();

  protected readonly nameMax = JOB_NAME_MAX;
  protected readonly form = inject(NonNullableFormBuilder).group({
    name: ['', [Validators.maxLength(JOB_NAME_MAX)]],
    detail: ['summary' as BatchDetail],
  });
  protected readonly file = signal<File | null>(null);
  protected readonly fileError = signal<string | null>(null);
  protected readonly sending = signal(false);

  protected picked(input: HTMLInputElement): void {
    const file = input.files?.[0] ?? null;
    input.value = ''; // choosing the same file again picks it again
    if (!file) return;
    if (!ACCEPTED.test(file.name)) {
      this.file.set(null);
      this.fileError.set(`${file.name} is neither a .csv nor an .ndjson file.`);
      return;
    }
    this.fileError.set(null);
    this.file.set(file);
  }

  protected async start(): Promise<void> {
    const file = this.file();
    if (!file) {
      if (!this.fileError()) this.fileError.set('Choose a file of stairs first.');
      return;
    }
    if (this.form.invalid || this.sending()) return;
    const { name, detail } = this.form.getRawValue();
    this.sending.set(true);
    try {
      const batch = await firstValueFrom(this.api.create(file, name.trim(), detail));
      this.file.set(null);
      this.form.reset();
      this.created.emit(batch);
    } catch (error) {
      this.snackBar.open(problemMessage(error), 'Dismiss', { duration: 8000 });
    } finally {
      this.sending.set(false);
    }
  }

  protected async template(): Promise<void> {
    try {
      saveDownload(await firstValueFrom(this.api.template()), 'treadwise-stairs-template.csv');
    } catch (error) {
      this.snackBar.open(problemMessage(error), 'Dismiss', { duration: 8000 });
    }
  }
}
