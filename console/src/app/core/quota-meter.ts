import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';

/** The month's quota as a bar (traffic and billing pages); amber from 80 % on. */
@Component({
  selector: 'tw-quota-meter',
  template: `
    <div
      class="tw-meter"
      role="meter"
      aria-label="Quota used this month"
      aria-valuemin="0"
      [attr.aria-valuemax]="quota()"
      [attr.aria-valuenow]="valueNow()"
      [attr.aria-valuetext]="valueText()"
    >
      <span [style.width.%]="width()" [class.tw-high]="percent() >= 80"></span>
    </div>
  `,
  styles: `
    :host {
      display: block;
    }
    .tw-meter {
      height: 10px;
      border-radius: 5px;
      background: var(--mat-sys-surface-container-highest);
      overflow: hidden;

      span {
        display: block;
        height: 100%;
        background: var(--mat-sys-primary);

        &.tw-high {
          background: var(--mat-sys-tertiary);
        }
      }
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class QuotaMeter {
  readonly quota = input.required<number>();
  /** What the meter reports as its value (a page may cap it at the quota). */
  readonly valueNow = input.required<number>();
  readonly percent = input.required<number>();
  readonly valueText = input.required<string>();
  protected readonly width = computed(() => Math.min(100, this.percent()));
}
