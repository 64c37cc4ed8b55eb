import { Clipboard } from '@angular/cdk/clipboard';
import { ChangeDetectionStrategy, Component, computed, inject, input } from '@angular/core';
import { MatIconButton } from '@angular/material/button';
import { MatIcon } from '@angular/material/icon';
import { MatSnackBar } from '@angular/material/snack-bar';
import { MatTab, MatTabGroup } from '@angular/material/tabs';

import type { KeyKind } from '../core/api-types.js';
import { KEY_PLACEHOLDER, keySnippets } from './key-snippets.js';

/** curl and fetch calls for one key, each with a copy button. */
@Component({
  selector: 'tw-key-snippets-view',
  imports: [MatTabGroup, MatTab, MatIconButton, MatIcon],
  template: `
    @if (usesPlaceholder()) {
      <p class="tw-snippet-note">Put the key in <code>{{ placeholder }}</code> first: the console does not keep it.</p>
    }
    <mat-tab-group animationDuration="0ms">
      @for (snippet of snippets(); track snippet.label) {
        <mat-tab [label]="snippet.label">
          <div class="tw-snippet">
            <pre [attr.data-testid]="'snippet-' + snippet.label">{{ snippet.code }}</pre>
            <button matIconButton type="button" [attr.aria-label]="'Copy the ' + snippet.label + ' snippet'" (click)="copy(snippet.code)">
              <mat-icon svgIcon="tw:copy" />
            </button>
          </div>
        </mat-tab>
      }
    </mat-tab-group>
  `,
  styles: `
    .tw-snippet {
      display: flex;
      align-items: flex-start;
      gap: 4px;
      padding-top: 8px;
    }
    pre {
      flex: 1;
      margin: 0;
      padding: 12px;
      overflow-x: auto;
      border-radius: 8px;
      font: 13px/1.5 ui-monospace, monospace;
      background: var(--mat-sys-surface-container-highest);
    }
    .tw-snippet-note {
      font: var(--mat-sys-body-small);
      color: var(--mat-sys-on-surface-variant);
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class KeySnippetsView {
  private readonly clipboard = inject(Clipboard);
  private readonly snackBar = inject(MatSnackBar);

  readonly kind = input.required<KeyKind>();
  readonly token = input<string>(KEY_PLACEHOLDER);
  readonly origin = input<string | undefined>(undefined);

  protected readonly placeholder = KEY_PLACEHOLDER;
  protected readonly usesPlaceholder = computed(() => this.token() === KEY_PLACEHOLDER);
  protected readonly snippets = computed(() => {
    const { curl, fetch } = keySnippets(globalThis.location?.origin ?? '', this.kind(), this.token(), this.origin());
    return [
      { label: 'curl', code: curl },
      { label: 'fetch', code: fetch },
    ];
  });

  protected copy(code: string): void {
    const copied = this.clipboard.copy(code);
    this.snackBar.open(copied ? 'Copied.' : 'Copying failed; select the text instead.', undefined, { duration: 2500 });
  }
}
