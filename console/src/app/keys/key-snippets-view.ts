import { Clipboard } from '@angular/cdk/clipboard';
import { ChangeDetectionStrategy, Component, computed, inject, input } from '@angular/core';
import { MatIconButton } from '@angular/material/button';
import { MatIcon } from '@angular/material/icon';
import { MatSnackBar } from '@angular/material/snack-bar';
import { MatTab, MatTabGroup } from '@angular/material/tabs';

import { toObservable, toSignal } from '@angular/core/rxjs-interop';
import { catchError, map, of, startWith, switchMap } from 'rxjs';

import type { EmbedManifest, KeyKind } from '../core/api-types.js';
import { EmbedManifestApi } from './embed-manifest-api.js';
import { KEY_PLACEHOLDER, embedTags, keySnippets } from './key-snippets.js';

type Manifest = { state: 'loading' } | { state: 'ready'; manifest: EmbedManifest } | { state: 'missing' };

/** curl and fetch calls for one key, and for an embed key the tags for a shop's page, each with a copy button. */
@Component({
  selector: 'tw-key-snippets-view',
  imports: [MatTabGroup, MatTab, MatIconButton, MatIcon],
  template: `
    @if (usesPlaceholder()) {
      <p class="tw-snippet-note">Put the key in <code>{{ placeholder }}</code> first: the console does not keep it.</p>
    }
    @if (kind() === 'embed') {
      @switch (manifest().state) {
        @case ('loading') {
          <p class="tw-snippet-note" data-testid="embed-manifest-loading">Reading the script's version and integrity hash…</p>
        }
        @case ('missing') {
          <p class="tw-snippet-note" data-testid="embed-manifest-missing">
            The estimator script is not built on this server, so the tag below loads its latest copy without an integrity hash.
          </p>
        }
        @case ('ready') {
          <p class="tw-snippet-note">The script tag pins this version with its integrity hash; paste it again after a new release.</p>
        }
      }
      @if (usesPlaceholder()) {
        <p class="tw-snippet-note">In the page tags, replace the <code>…</code> after the key id with the key's secret.</p>
      }
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
  private readonly manifests = inject(EmbedManifestApi);
  private readonly snackBar = inject(MatSnackBar);

  readonly kind = input.required<KeyKind>();
  readonly token = input<string>(KEY_PLACEHOLDER);
  readonly origin = input<string | undefined>(undefined);
  /** The key's public id: stands in the page tags for a key whose secret is not known. */
  readonly keyId = input<string>('');

  protected readonly placeholder = KEY_PLACEHOLDER;
  protected readonly usesPlaceholder = computed(() => this.token() === KEY_PLACEHOLDER);
  /** Asked only for embed keys: a server key has no page to go on. */
  protected readonly manifest = toSignal(
    toObservable(this.kind).pipe(
      switchMap((kind) =>
        kind === 'embed'
          ? this.manifests.manifest().pipe(
              map((manifest): Manifest => ({ state: 'ready', manifest })),
              catchError(() => of<Manifest>({ state: 'missing' })),
              startWith<Manifest>({ state: 'loading' }),
            )
          : of<Manifest>({ state: 'missing' }),
      ),
    ),
    { initialValue: { state: 'loading' } as Manifest },
  );
  protected readonly snippets = computed(() => {
    const apiUrl = globalThis.location?.origin ?? '';
    const { curl, fetch } = keySnippets(apiUrl, this.kind(), this.token(), this.origin());
    const calls = [
      { label: 'curl', code: curl },
      { label: 'fetch', code: fetch },
    ];
    if (this.kind() !== 'embed') return calls;
    // The tab is there from the start, so it stays the one shown when the hash arrives.
    const m = this.manifest();
    const token = this.usesPlaceholder() ? undefined : this.token();
    const tags = m.state === 'loading' ? '…' : embedTags(apiUrl, m.state === 'ready' ? m.manifest : null, { token, keyId: this.keyId() });
    return [{ label: 'HTML', code: tags }, ...calls];
  });

  protected copy(code: string): void {
    const copied = this.clipboard.copy(code);
    this.snackBar.open(copied ? 'Copied.' : 'Copying failed; select the text instead.', undefined, { duration: 2500 });
  }
}
