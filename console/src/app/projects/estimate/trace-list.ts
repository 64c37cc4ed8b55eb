import { KeyValuePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, input } from '@angular/core';

import type { TraceEntry } from '../../core/api-types.js';

/** Trace entries: quantity = value unit, the formula, its inputs and its source. */
@Component({
  selector: 'tw-trace-list',
  imports: [KeyValuePipe],
  template: `
    <ol class="tw-trace" data-testid="trace-list">
      @for (t of entries(); track $index) {
        <li>
          <div>
            <code>{{ t.quantity }}</code> = <strong>{{ t.value }}</strong> {{ t.unit }}
          </div>
          <div class="tw-formula">{{ t.formula }}</div>
          @if ((t.inputs | keyvalue).length > 0) {
            <div class="tw-inputs">
              @for (i of t.inputs | keyvalue; track i.key) {
                <span>{{ i.key }} {{ i.value }}</span>
              }
            </div>
          }
          <div class="tw-ref">{{ t.reference }}</div>
        </li>
      }
    </ol>
  `,
  styles: `
    .tw-trace {
      padding-left: 20px;
      margin: 0;
    }
    li {
      margin-bottom: 10px;
    }
    .tw-formula {
      font-family: ui-monospace, monospace;
      font-size: 0.9em;
      overflow-wrap: anywhere;
    }
    .tw-inputs span {
      display: inline-block;
      margin-right: 10px;
      font-size: 0.9em;
      color: var(--mat-sys-on-surface-variant);
    }
    .tw-ref {
      font-size: 0.85em;
      color: var(--mat-sys-on-surface-variant);
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class TraceList {
  readonly entries = input.required<TraceEntry[]>();
}
