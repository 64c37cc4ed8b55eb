import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import { BarController, BarElement, CategoryScale, type ChartConfiguration, Legend, LinearScale, Tooltip } from 'chart.js';
import { BaseChartDirective, provideCharts } from 'ng2-charts';

import type { ChartSeries } from './traffic-data.js';

// Our palette's blue-green and amber first (console/src/theme), then tones that stay apart from them in light and dark.
const COLOURS = ['#27676e', '#e39b2d', '#6b5fa8', '#3f8f4f', '#b5476b', '#8a8f93'];

/** Calls per day, one stacked series per key. Only this lazily loaded screen pulls chart.js in. */
@Component({
  selector: 'tw-traffic-chart',
  imports: [BaseChartDirective],
  // Only the parts a bar chart needs are registered, which keeps the chunk small.
  providers: [
    provideCharts({
      registerables: [BarController, BarElement, CategoryScale, LinearScale, Legend, Tooltip],
      defaults: { font: { family: "'Fira Sans', sans-serif" } }, // the console's own face, not the canvas default
    }),
  ],
  template: `
    <div class="tw-chart">
      <canvas baseChart type="bar" [data]="data()" [options]="options" role="img" [attr.aria-label]="description()"></canvas>
    </div>
  `,
  styles: `
    .tw-chart {
      position: relative;
      height: 280px;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class TrafficChart {
  readonly labels = input.required<string[]>();
  readonly series = input.required<ChartSeries[]>();

  protected readonly data = computed<ChartConfiguration<'bar'>['data']>(() => ({
    labels: this.labels().map((day) => day.slice(5)), // MM-DD: the year is in the filter
    datasets: this.series().map((s, i) => ({ label: s.label, data: s.data, backgroundColor: COLOURS[i % COLOURS.length], stack: 'calls' })),
  }));

  /** What the chart shows, for screen readers; the table below it has every figure. */
  protected readonly description = computed(() => {
    const total = this.series().reduce((sum, s) => sum + s.data.reduce((a, b) => a + b, 0), 0);
    return `Calls per day by key, ${this.labels().length} days, ${total} calls in all, ${this.series().length} series. The table below lists each day.`;
  });

  protected readonly options: ChartConfiguration<'bar'>['options'] = {
    responsive: true,
    maintainAspectRatio: false,
    animation: false,
    scales: { x: { stacked: true }, y: { stacked: true, beginAtZero: true, ticks: { precision: 0 } } },
    plugins: { legend: { position: 'bottom' } },
  };
}
