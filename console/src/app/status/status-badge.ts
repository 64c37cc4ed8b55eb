import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import { MatIcon } from '@angular/material/icon';
import { MatProgressSpinner } from '@angular/material/progress-spinner';

import type { CheckState } from './check.js';

const LABELS: Readonly<Record<CheckState, string>> = {
  checking: 'Checking…',
  healthy: 'Healthy',
  unavailable: 'Unavailable',
};

/** A health state as icon and word; a live region, so a screen reader hears the change. */
@Component({
  selector: 'tw-status-badge',
  imports: [MatIcon, MatProgressSpinner],
  templateUrl: './status-badge.html',
  styleUrl: './status-badge.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
  host: { role: 'status', '[attr.data-state]': 'state()' },
})
export class StatusBadge {
  readonly state = input.required<CheckState>();
  protected readonly label = computed(() => LABELS[this.state()]);
}
