import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';

import type { Batch } from '../core/api-types.js';
import { statusText } from './batch-status.js';

/** A job's status as a small coloured label; the colour only repeats what the word says. */
@Component({
  selector: 'tw-batch-status-chip',
  host: { class: 'tw-batch-chip', '[attr.data-status]': 'batch().status', 'data-testid': 'batch-status' },
  template: `{{ text() }}`,
  styles: `
    :host {
      display: inline-block;
      padding: 2px 10px;
      border-radius: 8px;
      font: var(--mat-sys-label-medium);
      white-space: nowrap;
      background: var(--mat-sys-surface-container-highest);
      color: var(--mat-sys-on-surface);
    }
    :host([data-status='running']),
    :host([data-status='queued']) {
      background: var(--mat-sys-tertiary-container);
      color: var(--mat-sys-on-tertiary-container);
    }
    :host([data-status='succeeded']) {
      background: var(--mat-sys-primary-container);
      color: var(--mat-sys-on-primary-container);
    }
    :host([data-status='failed']),
    :host([data-status='stopped']) {
      background: var(--mat-sys-error-container);
      color: var(--mat-sys-on-error-container);
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class BatchStatusChip {
  readonly batch = input.required<Pick<Batch, 'status' | 'stopReason'>>();
  protected readonly text = computed(() => statusText(this.batch()));
}
