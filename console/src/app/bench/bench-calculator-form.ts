import { ChangeDetectionStrategy, Component, computed, inject, input, signal } from '@angular/core';
import { MatButton } from '@angular/material/button';
import { MatCheckbox } from '@angular/material/checkbox';
import { MatFormField, MatHint, MatLabel, MatSuffix } from '@angular/material/form-field';
import { MatInput } from '@angular/material/input';
import { MatProgressBar } from '@angular/material/progress-bar';
import { MatOption, MatSelect } from '@angular/material/select';
import { firstValueFrom } from 'rxjs';

import type { CalculationWarning, TraceEntry } from '../core/api-types.js';
import { problemMessage, readProblem } from '../core/problem-details.js';
import { BenchApi } from './bench-api.js';
import { type BenchCalculator, type BenchFigure, type FieldErrors, type FieldValues, initialValues, problemFieldErrors, requestBody, validate } from './bench-form-model.js';

interface Answer {
  figures: BenchFigure[];
  warnings: CalculationWarning[];
  trace: TraceEntry[];
  engineVersion: string;
}

/** One calculation endpoint as a form: checked as the API checks it, answered beside it. */
@Component({
  selector: 'tw-bench-calculator-form',
  imports: [MatButton, MatCheckbox, MatFormField, MatLabel, MatHint, MatSuffix, MatInput, MatSelect, MatOption, MatProgressBar],
  templateUrl: './bench-calculator-form.html',
  styleUrl: './bench-calculator-form.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class BenchCalculatorForm {
  private readonly api = inject(BenchApi);

  readonly calculator = input.required<BenchCalculator>();

  private readonly edited = signal<FieldValues | null>(null);
  protected readonly values = computed(() => this.edited() ?? initialValues(this.calculator().fields));
  protected readonly errors = signal<FieldErrors>({});
  protected readonly failure = signal<string | null>(null);
  protected readonly busy = signal(false);
  protected readonly answer = signal<Answer | null>(null);

  protected set(name: string, value: string | boolean): void {
    this.edited.set({ ...this.values(), [name]: value });
    if (this.errors()[name]) {
      const { [name]: _, ...rest } = this.errors();
      this.errors.set(rest);
    }
  }

  protected textOf(name: string): string {
    const value = this.values()[name];
    return typeof value === 'string' ? value : '';
  }

  protected async calculate(): Promise<void> {
    const calculator = this.calculator();
    const { body, errors: unreadable } = requestBody(calculator.fields, this.values());
    const errors = { ...validate(calculator, body), ...unreadable };
    this.errors.set(errors);
    this.failure.set(errors[''] ?? null);
    if (Object.keys(errors).length > 0) {
      this.answer.set(null);
      return;
    }
    this.busy.set(true);
    try {
      const result = (await firstValueFrom(this.api.calculate(calculator.path, body))) as { warnings: CalculationWarning[]; trace: TraceEntry[]; engineVersion: string };
      this.answer.set({ figures: calculator.figures(result as never), warnings: result.warnings, trace: result.trace, engineVersion: result.engineVersion });
    } catch (error) {
      this.answer.set(null);
      const placed = problemFieldErrors(calculator.fields, readProblem(error)?.errors ?? []);
      this.errors.set(placed);
      this.failure.set(placed[''] ?? problemMessage(error));
    } finally {
      this.busy.set(false);
    }
  }

  protected reset(): void {
    this.edited.set(null);
    this.errors.set({});
    this.failure.set(null);
    this.answer.set(null);
  }
}
