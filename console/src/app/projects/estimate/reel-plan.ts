import { DecimalPipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, input } from '@angular/core';

import type { EstimateResponse } from '../../core/api-types.js';

type TreadReels = NonNullable<EstimateResponse['reels']['treads']>;

/** Each reel as a bar cut into its pieces, the waste hatched at the end. */
@Component({
  selector: 'tw-reel-plan',
  imports: [DecimalPipe],
  template: `
    @let r = reels();
    <p>
      {{ r.reels }} reel{{ r.reels === 1 ? '' : 's' }} of {{ r.reelLengthMm / 1000 | number: '1.0-2' }} m{{ r.sku ? ' (' + r.sku + ')' : '' }}, {{ r.totalWasteMm | number }} mm
      left over · {{ r.method }}{{ r.provenOptimal ? ', fewest possible' : '' }}
    </p>
    @if (r.unplaceableTreads.length > 0) {
      <p class="tw-form-failure">Treads {{ r.unplaceableTreads.join(', ') }} need a piece longer than a reel.</p>
    }
    <ol class="tw-reels" data-testid="reel-plan">
      @for (reel of r.plan; track reel.reel) {
        <li>
          <span class="tw-reel-name">Reel {{ reel.reel }}</span>
          <svg viewBox="0 0 1000 24" preserveAspectRatio="none" role="img" [attr.aria-label]="'Reel ' + reel.reel + ': pieces of ' + reel.piecesMm.join(', ') + ' mm, ' + reel.wasteMm + ' mm left'">
            @for (piece of reel.piecesMm; track $index) {
              <rect class="tw-piece" [attr.x]="offset(reel.piecesMm, $index, r.reelLengthMm)" y="2" [attr.width]="(piece / r.reelLengthMm) * 1000 - 3" height="20" data-testid="reel-piece" />
            }
            <rect class="tw-waste" [attr.x]="1000 - (reel.wasteMm / r.reelLengthMm) * 1000" y="2" [attr.width]="(reel.wasteMm / r.reelLengthMm) * 1000" height="20" />
          </svg>
        </li>
      }
    </ol>
  `,
  styles: `
    .tw-reels {
      list-style: none;
      padding: 0;
      margin: 0;
    }
    li {
      display: grid;
      grid-template-columns: 64px 1fr;
      align-items: center;
      gap: 8px;
      margin-bottom: 4px;
    }
    svg {
      width: 100%;
      height: 24px;
    }
    .tw-piece {
      fill: var(--mat-sys-tertiary);
    }
    .tw-waste {
      fill: var(--mat-sys-surface-container-highest);
    }
    .tw-reel-name {
      font: var(--mat-sys-label-medium);
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ReelPlan {
  readonly reels = input.required<TreadReels>();

  /** Where a piece starts on its reel, in the drawing's 0–1000 units. */
  protected offset(pieces: number[], index: number, reelMm: number): number {
    return (pieces.slice(0, index).reduce((sum, p) => sum + p, 0) / reelMm) * 1000;
  }
}
