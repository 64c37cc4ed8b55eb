import { ChangeDetectionStrategy, Component, computed, inject } from '@angular/core';
import { MatTab, MatTabGroup } from '@angular/material/tabs';

import { Auth } from '../core/auth.js';
import { roleMay } from '../core/capabilities.js';
import { BENCH_CALCULATORS } from './bench-calculators.js';
import { BenchCalculatorForm } from './bench-calculator-form.js';

/** Each calculation endpoint as a small form, for a quick answer without a project. */
@Component({
  selector: 'tw-bench-page',
  imports: [MatTabGroup, MatTab, BenchCalculatorForm],
  template: `
    <header class="tw-page-head">
      <div>
        <h1>Bench</h1>
        <p>Quick answers from the sizing engine, one calculation at a time. Nothing is stored; each answer counts as one call.</p>
      </div>
    </header>
    @if (!mayRun()) {
      <section class="tw-empty" data-testid="bench-not-allowed">
        <h2>The bench is for estimators and admins</h2>
        <p>Ask an admin of your organisation for the estimator role.</p>
      </section>
    } @else {
      <mat-tab-group mat-stretch-tabs="false" animationDuration="0ms" data-testid="bench-tabs">
        @for (calculator of calculators; track calculator.id) {
          <mat-tab [label]="calculator.title">
            <tw-bench-calculator-form [calculator]="calculator" [attr.data-calculator]="calculator.id" />
          </mat-tab>
        }
      </mat-tab-group>
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class BenchPage {
  private readonly auth = inject(Auth);
  protected readonly calculators = BENCH_CALCULATORS;
  protected readonly mayRun = computed(() => roleMay(this.auth.role(), 'sizing:run'));
}
