import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';

import type { EstimateChanges } from '../../core/api-types.js';

export interface ChangeLine {
  label: string;
  old: string;
  new: string;
}

const FIGURES: { key: keyof EstimateChanges['figures']; label: string; unit: string }[] = [
  { key: 'totalLoadW', label: 'Total load', unit: 'W' },
  { key: 'driverCount', label: 'Drivers', unit: '' },
  { key: 'worstDropPercent', label: 'Worst drop', unit: '%' },
  { key: 'reels', label: 'Reels', unit: '' },
  { key: 'bomTotal', label: 'Net total', unit: '' },
  { key: 'gross', label: 'Gross total', unit: '' },
];

const show = (value: unknown, unit: string) => (value === null || value === undefined ? '—' : `${value}${unit ? ' ' + unit : ''}`);

/** The lines of a re-run that changed: versions and figures, old → new. */
export function changedLines(changes: EstimateChanges): ChangeLine[] {
  const lines: ChangeLine[] = [];
  if (changes.engineVersion.changed) lines.push({ label: 'Engine', old: changes.engineVersion.old, new: changes.engineVersion.new });
  if (changes.catalogVersion.changed) lines.push({ label: 'Catalog version', old: show(changes.catalogVersion.old, ''), new: show(changes.catalogVersion.new, '') });
  if (changes.currency.changed) lines.push({ label: 'Currency', old: show(changes.currency.old, ''), new: show(changes.currency.new, '') });
  for (const f of FIGURES) {
    const c = changes.figures[f.key];
    if (c.changed) lines.push({ label: f.label, old: show(c.old, f.unit), new: show(c.new, f.unit) });
  }
  return lines;
}

/** What a re-run changed, set apart at the top of the new estimate. */
@Component({
  selector: 'tw-estimate-changes',
  template: `
    @let c = changes();
    <section class="tw-changes" role="status" data-testid="rerun-changes" [attr.data-changed]="c.changed">
      @if (!c.changed) {
        <h2>Re-run: nothing changed</h2>
        <p>Same engine, same catalog, same figures and checks.</p>
      } @else {
        <h2>Re-run: what changed</h2>
        <ul>
          @for (line of lines(); track line.label) {
            <li data-testid="changed-figure"><strong>{{ line.label }}</strong> {{ line.old }} → <mark>{{ line.new }}</mark></li>
          }
          @for (check of c.checks; track check.id) {
            <li data-testid="changed-check">
              <strong>Check {{ check.id }}</strong> {{ check.oldStatus ?? 'not made' }} → <mark>{{ check.newStatus ?? 'no longer made' }}</mark>: {{ check.message }}
            </li>
          }
        </ul>
      }
    </section>
  `,
  styles: `
    .tw-changes {
      border-radius: 12px;
      padding: 12px 16px;
      margin-bottom: 16px;
      background: var(--mat-sys-surface-container-high);
      &[data-changed='true'] {
        background: var(--mat-sys-tertiary-container);
        color: var(--mat-sys-on-tertiary-container);
      }
      h2 {
        font: var(--mat-sys-title-medium);
        margin: 0 0 4px;
      }
      ul {
        margin: 0;
        padding-left: 18px;
      }
      mark {
        background: none;
        color: inherit;
        font-weight: 600;
        text-decoration: underline;
      }
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class EstimateChangesPanel {
  readonly changes = input.required<EstimateChanges>();
  protected readonly lines = computed(() => changedLines(this.changes()));
}
