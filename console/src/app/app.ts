import { ChangeDetectionStrategy, Component, inject } from '@angular/core';
import { RouterOutlet } from '@angular/router';

import { ColorScheme } from './core/color-scheme.js';

/** The root: signed-out pages and the signed-in shell are both routes below it. */
@Component({
  selector: 'tw-root',
  imports: [RouterOutlet],
  template: '<router-outlet />',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class App {
  constructor() {
    inject(ColorScheme); // applies the stored light or dark choice before the first page shows
  }
}
