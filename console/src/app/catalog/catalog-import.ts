import { ChangeDetectionStrategy, Component, inject, output, signal } from '@angular/core';
import { MatButton } from '@angular/material/button';
import { MatIcon } from '@angular/material/icon';
import { MatProgressBar } from '@angular/material/progress-bar';
import { firstValueFrom } from 'rxjs';

import type { CatalogImportReport } from '../core/api-types.js';
import { problemMessage } from '../core/problem-details.js';
import { CatalogApi } from './catalog-api.js';

type ImportState =
  | { step: 'idle' }
  | { step: 'checking'; file: File }
  | { step: 'checked'; file: File; report: CatalogImportReport }
  | { step: 'importing'; file: File; report: CatalogImportReport }
  | { step: 'done'; report: CatalogImportReport }
  | { step: 'failed'; reason: string };

/**
 * A CSV upload in two steps: the API checks the file first (a dry run) and its row-by-row report is
 * shown; only a file without a bad row can then be imported, on the admin's confirmation.
 */
@Component({
  selector: 'tw-catalog-import',
  imports: [MatButton, MatIcon, MatProgressBar],
  templateUrl: './catalog-import.html',
  styleUrl: './catalog-import.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class CatalogImport {
  private readonly api = inject(CatalogApi);

  readonly imported = output<CatalogImportReport>();
  protected readonly state = signal<ImportState>({ step: 'idle' });

  protected async picked(input: HTMLInputElement): Promise<void> {
    const file = input.files?.[0];
    input.value = ''; // choosing the same file again checks it again
    if (file) await this.check(file);
  }

  async check(file: File): Promise<void> {
    this.state.set({ step: 'checking', file });
    try {
      const report = await firstValueFrom(this.api.import(file, true));
      this.state.set({ step: 'checked', file, report });
    } catch (error) {
      this.state.set({ step: 'failed', reason: problemMessage(error) });
    }
  }

  protected async confirm(): Promise<void> {
    const current = this.state();
    if (current.step !== 'checked' || current.report.errors.length > 0) return;
    this.state.set({ step: 'importing', file: current.file, report: current.report });
    try {
      const report = await firstValueFrom(this.api.import(current.file, false));
      this.state.set({ step: 'done', report });
      this.imported.emit(report);
    } catch (error) {
      this.state.set({ step: 'failed', reason: problemMessage(error) });
    }
  }

  protected reset(): void {
    this.state.set({ step: 'idle' });
  }
}
