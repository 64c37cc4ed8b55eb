import { ChangeDetectionStrategy, Component, input } from '@angular/core';

/** The card that every signed-out page sits in: the mark, a heading, a lead line, the form. */
@Component({
  selector: 'tw-account-frame',
  template: `
    <main class="tw-account">
      <section class="tw-account-card" [attr.aria-labelledby]="'tw-account-heading'">
        <svg class="tw-account-mark" viewBox="0 0 32 32" aria-hidden="true">
          <path class="tw-mark-steps" d="M6 26V20h6v-6h6V8h8v18z" />
          <path class="tw-mark-light" d="M6 20h6M12 14h6M18 8h8" />
        </svg>
        <h1 id="tw-account-heading">{{ heading() }}</h1>
        @if (lead()) {
          <p class="tw-account-lead">{{ lead() }}</p>
        }
        <ng-content />
      </section>
    </main>
  `,
  styleUrl: './account-frame.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class AccountFrame {
  readonly heading = input.required<string>();
  readonly lead = input<string>('');
}
