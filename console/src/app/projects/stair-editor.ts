import { ChangeDetectionStrategy, Component, effect, input, linkedSignal, signal } from '@angular/core';
import { type AbstractControl, ReactiveFormsModule } from '@angular/forms';
import { MatButton } from '@angular/material/button';
import { MatCheckbox } from '@angular/material/checkbox';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInput } from '@angular/material/input';
import { MatSelectModule } from '@angular/material/select';

import { MAX_FLIGHTS, NAME_MAX, type StairBoundName } from './stair-bounds.js';
import { boundMessage, flightGroup, type StairForm, type StairFormValue } from './stair-form.js';
import { type SideView, sideView } from './side-view-geometry.js';
import { StairSideView } from './stair-side-view.js';

/** The stair's measurements, strip and controller, with the side view redrawn as they change. */
@Component({
  selector: 'tw-stair-editor',
  imports: [ReactiveFormsModule, MatButton, MatCheckbox, MatFormFieldModule, MatInput, MatSelectModule, StairSideView],
  templateUrl: './stair-editor.html',
  styleUrl: './stair-editor.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class StairEditor {
  readonly form = input.required<StairForm>();
  /** Layouts with a strip on every tread show the strip's fields (and may light landings). */
  readonly treadStrip = input(true);
  /** Whether the layout lights the treads (every layout but a rail run alone). */
  readonly treadsLit = input(true);
  /** Whether the layout runs pixels along a handrail. */
  readonly railLit = input(false);
  /** The controller is an inline profile in the stored request: no profile id to edit. */
  readonly inlineController = input(false);

  protected readonly nameMax = NAME_MAX;
  protected readonly maxFlights = MAX_FLIGHTS;
  private readonly value = signal<StairFormValue | null>(null);

  /** The last drawable stair: while a measurement is out of bounds the drawing keeps the last good one. */
  protected readonly view = linkedSignal<StairFormValue | null, SideView | null>({
    source: this.value,
    computation: (value, previous) => (value && this.drawable() ? sideView(this.staircase(value), this.treadsLit()) : (previous?.value ?? null)),
  });

  constructor() {
    effect((onCleanup) => {
      const form = this.form();
      this.value.set(form.getRawValue());
      const changes = form.valueChanges.subscribe(() => this.value.set(form.getRawValue()));
      onCleanup(() => changes.unsubscribe());
    });
  }

  private drawable(): boolean {
    const c = this.form().controls;
    // `invalid`, not `!valid`: a viewer's disabled form is neither, and still draws.
    return !c.treads.invalid && !c.riserHeightMm.invalid && !c.goingMm.invalid && !c.treadWidthMm.invalid && !c.flights.invalid && !this.form().hasError('flights');
  }

  private staircase(value: StairFormValue) {
    const flights = value.flights.map((f) => ({ treads: Number(f.treads), landingLengthMm: f.landingLengthMm === null ? undefined : Number(f.landingLengthMm) }));
    return {
      treads: Number(value.treads),
      treadWidthMm: Number(value.treadWidthMm),
      riserHeightMm: Number(value.riserHeightMm),
      goingMm: Number(value.goingMm),
      flights: flights.length > 0 ? flights : undefined,
      litLandings: value.flights.slice(0, -1).flatMap((f, i) => (f.landingLit ? [i + 1] : [])),
    };
  }

  /** The message beside a field, once the user has been there. */
  protected error(control: AbstractControl, bound: StairBoundName): string | null {
    if (control.hasError('required')) return 'Required.';
    if (control.hasError('bound')) return boundMessage(bound);
    return null;
  }

  /** Splits the stair into two flights, or the last flight into two; the treads still add up. */
  protected addFlight(): void {
    const flights = this.form().controls.flights;
    if (flights.length >= MAX_FLIGHTS) return;
    if (flights.length === 0) {
      const treads = Number(this.form().controls.treads.value ?? 2);
      const first = Math.max(1, Math.ceil(treads / 2));
      flights.push(flightGroup(first));
      flights.push(flightGroup(Math.max(1, treads - first)));
      return;
    }
    const last = flights.at(flights.length - 1).controls.treads;
    const treads = Number(last.value ?? 1);
    if (treads >= 2) last.setValue(Math.ceil(treads / 2));
    flights.push(flightGroup(treads >= 2 ? Math.floor(treads / 2) : 1));
  }

  /** Removes a flight, giving its treads to its neighbour; one flight left is a straight stair. */
  protected removeFlight(index: number): void {
    const flights = this.form().controls.flights;
    const removed = Number(flights.at(index).controls.treads.value ?? 0);
    flights.removeAt(index);
    const neighbour = flights.at(Math.max(0, index - 1))?.controls.treads;
    if (neighbour) neighbour.setValue(Number(neighbour.value ?? 0) + removed);
    if (flights.length === 1) flights.clear();
  }
}
