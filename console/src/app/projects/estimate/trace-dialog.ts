import { ChangeDetectionStrategy, Component, inject } from '@angular/core';
import { MatButton } from '@angular/material/button';
import { MAT_DIALOG_DATA, MatDialogModule } from '@angular/material/dialog';

import type { TraceEntry } from '../../core/api-types.js';
import { TraceList } from './trace-list.js';

export interface TraceDialogData {
  figure: string;
  entries: TraceEntry[];
}

/** How one figure was worked out: the engine's trace entries for it. */
@Component({
  selector: 'tw-trace-dialog',
  imports: [MatDialogModule, MatButton, TraceList],
  template: `
    <h2 mat-dialog-title>How “{{ data.figure }}” was worked out</h2>
    <mat-dialog-content>
      @if (data.entries.length === 0) {
        <p>The trace has no entry for this figure.</p>
      } @else {
        <tw-trace-list [entries]="data.entries" />
      }
    </mat-dialog-content>
    <mat-dialog-actions align="end">
      <button matButton type="button" mat-dialog-close>Close</button>
    </mat-dialog-actions>
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class TraceDialog {
  protected readonly data = inject<TraceDialogData>(MAT_DIALOG_DATA);
}
