import { CurrencyPipe, DecimalPipe, KeyValuePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, effect, inject, input, signal } from '@angular/core';
import { MatButton } from '@angular/material/button';
import { MatProgressBar } from '@angular/material/progress-bar';
import type { Subscription } from 'rxjs';

import type { KitOptionsResponse, Staircase } from '../core/api-types.js';
import { problemMessage } from '../core/problem-details.js';
import { ProjectsApi } from './projects-api.js';

type Options = { state: 'loading' } | { state: 'ready'; result: KitOptionsResponse } | { state: 'failed'; reason: string };

/** Kits the API answers for the stair, cheapest first, in columns side by side. */
@Component({
  selector: 'tw-kit-options',
  imports: [CurrencyPipe, DecimalPipe, KeyValuePipe, MatButton, MatProgressBar],
  templateUrl: './kit-options.html',
  styleUrl: './kit-options.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class KitOptions {
  private readonly api = inject(ProjectsApi);

  readonly staircase = input.required<Staircase>();
  /** Designs to compare; the API answers at most 10. */
  readonly limit = input(3);

  protected readonly options = signal<Options>({ state: 'loading' });

  private pending?: Subscription;

  constructor() {
    effect(() => this.load());
  }

  protected load(): void {
    this.options.set({ state: 'loading' });
    this.pending?.unsubscribe(); // a newer load wins over an answer still on its way
    this.pending = this.api.kitOptions({ layout: 'tread-strips', staircase: this.staircase(), limit: this.limit() }).subscribe({
      next: (result) => this.options.set({ state: 'ready', result }),
      error: (error: unknown) => this.options.set({ state: 'failed', reason: problemMessage(error) }),
    });
  }
}
