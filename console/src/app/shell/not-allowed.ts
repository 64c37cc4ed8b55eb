import { ChangeDetectionStrategy, Component, inject } from '@angular/core';
import { RouterLink } from '@angular/router';

import { Auth } from '../core/auth.js';

@Component({
  selector: 'tw-not-allowed',
  imports: [RouterLink],
  template: `
    <section class="tw-empty" data-testid="not-allowed">
      <h1>Not for your role</h1>
      <p>
        As {{ role() ?? 'a member without a role here' }} in {{ organization()?.name ?? 'this organisation' }}, you cannot open that page.
        An admin of your organisation can change your role.
      </p>
      <p><a routerLink="/status">Go to the status page</a></p>
    </section>
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class NotAllowed {
  private readonly auth = inject(Auth);
  protected readonly role = this.auth.role;
  protected readonly organization = this.auth.organization;
}
