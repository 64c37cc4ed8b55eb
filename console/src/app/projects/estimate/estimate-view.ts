import { CurrencyPipe, DecimalPipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, inject, input, signal } from '@angular/core';
import { MatButton } from '@angular/material/button';
import { MatDialog } from '@angular/material/dialog';
import { MatExpansionModule } from '@angular/material/expansion';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInput } from '@angular/material/input';

import type { EstimateChanges, EstimateResponse } from '../../core/api-types.js';
import { BarChart } from './bar-chart.js';
import { outputLoadChart, treadDropChart } from './estimate-charts.js';
import { searchTrace, traceOf } from './estimate-trace.js';
import { ReelPlan } from './reel-plan.js';
import { TraceDialog, type TraceDialogData } from './trace-dialog.js';
import { TraceList } from './trace-list.js';

export interface Tile {
  label: string;
  value: string;
  /** The trace quantity behind it. */
  quantity: string;
  /** The re-run figure it corresponds to, to highlight when it changed. */
  figure?: keyof EstimateChanges['figures'];
}

const round = (n: number, digits: number) => Number(n.toFixed(digits)).toLocaleString('en');

/** The headline figures, each with the trace quantity it comes from. */
export function summaryTiles(result: EstimateResponse): Tile[] {
  const s = result.summary;
  const tiles: Tile[] = [
    { label: 'Lit treads', value: `${s.litTreads} of ${s.treads}`, quantity: 'stripLengthMm' },
    { label: 'Total load', value: `${round(s.totalLoadW, 1)} W`, quantity: 'totalLoadW', figure: 'totalLoadW' },
    { label: 'Drivers', value: String(s.driverCount), quantity: 'requiredRatingW', figure: 'driverCount' },
    { label: 'Worst drop', value: `${round(s.worstDropPercent, 2)} %`, quantity: 'worstDropPercent', figure: 'worstDropPercent' },
    { label: 'Longest run', value: `${round(s.longestRunM, 2)} m`, quantity: 'longestRunM' },
    { label: 'Reels', value: String(s.reels), quantity: 'reels', figure: 'reels' },
    { label: 'Motion sensors', value: String(s.motionSensors), quantity: 'motionSensors' },
  ];
  if (result.pricing) {
    tiles.push({ label: 'Total with tax', value: `${result.pricing.gross.toLocaleString('en', { minimumFractionDigits: 2 })} ${result.pricing.currency}`, quantity: 'bomGross', figure: 'gross' });
  }
  return tiles;
}

/** The whole estimate: figures, cautions, checks, charts, schedule, drivers, reels, bill and trace. */
@Component({
  selector: 'tw-estimate-view',
  imports: [CurrencyPipe, DecimalPipe, MatButton, MatExpansionModule, MatFormFieldModule, MatInput, BarChart, ReelPlan, TraceList],
  templateUrl: './estimate-view.html',
  styleUrl: './estimate-view.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class EstimateView {
  private readonly dialog = inject(MatDialog);

  readonly result = input.required<EstimateResponse>();
  readonly changes = input<EstimateChanges | null>(null);

  protected readonly tiles = computed(() => summaryTiles(this.result()));
  protected readonly dropChart = computed(() => treadDropChart(this.result()));
  protected readonly outputChart = computed(() => outputLoadChart(this.result()));
  protected readonly pixelRuns = computed(() => [this.result().pixels.rail, this.result().pixels.treads].filter((run) => run !== null));
  protected readonly changedChecks = computed(() => new Set((this.changes()?.checks ?? []).map((c) => c.id)));
  protected readonly traceQuery = signal('');
  protected readonly traceShown = computed(() => searchTrace(this.result().trace, this.traceQuery()));

  protected changed(tile: Tile): boolean {
    return !!tile.figure && !!this.changes()?.figures[tile.figure].changed;
  }

  protected showTrace(figure: string, quantity: string): void {
    const data: TraceDialogData = { figure, entries: traceOf(this.result().trace, quantity) };
    this.dialog.open(TraceDialog, { data, width: '640px', maxWidth: '95vw' });
  }
}
