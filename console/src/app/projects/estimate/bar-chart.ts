import { DecimalPipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';

import type { BarChartData } from './estimate-charts.js';

const HEIGHT = 160;
const BAR_GAP = 2;
const MIN_BAR_WIDTH = 8;
const AXIS = 28;

/** A small bar chart drawn in SVG: one bar per item, a dashed line at the limit, over-limit bars in the error colour. */
@Component({
  selector: 'tw-bar-chart',
  imports: [DecimalPipe],
  template: `
    @let d = data();
    <figure>
      <figcaption>{{ caption() }}</figcaption>
      <div class="tw-scroll">
        <svg [attr.viewBox]="'0 0 ' + width() + ' ' + (height + 20)" [attr.width]="width()" [attr.height]="height + 20" role="img" [attr.aria-label]="summary()">
          @for (b of d.bars; track $index) {
            <rect
              [attr.x]="axis + $index * step()"
              [attr.y]="y(b.value)"
              [attr.width]="step() - gap"
              [attr.height]="height - y(b.value)"
              [attr.data-status]="b.status"
              data-testid="bar"
            >
              <title>{{ b.label }}: {{ b.value | number: '1.0-3' }} {{ d.unit }}</title>
            </rect>
            @if (labelEvery() === 1 || $index % labelEvery() === 0) {
              <text class="tw-x" [attr.x]="axis + $index * step() + (step() - gap) / 2" [attr.y]="height + 14">{{ b.label }}</text>
            }
          }
          <line class="tw-limit" [attr.x1]="axis" [attr.x2]="width()" [attr.y1]="y(d.limit)" [attr.y2]="y(d.limit)" data-testid="limit-line" />
          <text class="tw-limit-label" x="0" [attr.y]="y(d.limit) + 4">{{ d.limit | number: '1.0-2' }}</text>
          <line class="tw-axis" [attr.x1]="axis" [attr.x2]="width()" [attr.y1]="height" [attr.y2]="height" />
        </svg>
      </div>
    </figure>
  `,
  styles: `
    figure {
      margin: 0;
    }
    figcaption {
      font: var(--mat-sys-title-small);
      margin-bottom: 4px;
    }
    .tw-scroll {
      overflow-x: auto;
    }
    rect {
      fill: var(--mat-sys-primary);
    }
    rect[data-status='near'] {
      fill: var(--mat-sys-tertiary);
    }
    rect[data-status='over'] {
      fill: var(--mat-sys-error);
    }
    .tw-limit {
      stroke: var(--mat-sys-error);
      stroke-width: 1.5;
      stroke-dasharray: 5 3;
    }
    .tw-axis {
      stroke: var(--mat-sys-outline);
    }
    text {
      fill: var(--mat-sys-on-surface-variant);
      font-size: 10px;
      font-family: inherit;
    }
    .tw-x {
      text-anchor: middle;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class BarChart {
  readonly data = input.required<BarChartData>();
  readonly caption = input.required<string>();

  protected readonly height = HEIGHT;
  protected readonly gap = BAR_GAP;
  protected readonly axis = AXIS;
  protected readonly step = computed(() => Math.max(MIN_BAR_WIDTH + BAR_GAP, Math.min(32, 560 / Math.max(1, this.data().bars.length))));
  protected readonly width = computed(() => AXIS + this.data().bars.length * this.step() + 4);
  protected readonly labelEvery = computed(() => (this.step() >= 16 ? 1 : 5));
  protected readonly summary = computed(() => {
    const d = this.data();
    const over = d.bars.filter((b) => b.status === 'over').length;
    return `${this.caption()}: ${d.bars.length} bars against a limit of ${d.limit} ${d.unit}; ${over === 0 ? 'none over it' : `${over} over it`}.`;
  });

  /** SVG y of a value: 0 at the axis, the chart's max at the top. */
  protected y(value: number): number {
    const max = this.data().max || 1;
    return HEIGHT - (Math.max(0, value) / max) * (HEIGHT - 4);
  }
}
