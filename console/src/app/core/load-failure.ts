import { ChangeDetectionStrategy, Component, input, output } from '@angular/core';
import { MatButton } from '@angular/material/button';

/** A page's failed load: what could not be loaded, the API's reason, and a way to try again. */
@Component({
  selector: 'tw-load-failure',
  imports: [MatButton],
  host: { class: 'tw-empty', role: 'alert' },
  template: `
    <h2>{{ what() }} could not be loaded</h2>
    <p>{{ reason() }}</p>
    <button matButton="tonal" type="button" (click)="retry.emit()">Try again</button>
  `,
  styles: `
    :host {
      display: block;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class LoadFailure {
  /** Capitalised, as it starts the heading: `The estimate`. */
  readonly what = input.required<string>();
  readonly reason = input.required<string>();
  readonly retry = output<void>();
}
