import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';

import { RAIL_HEIGHT_MM, type SideView, railLine } from './side-view-geometry.js';

const MARGIN_MM = 120;

/** The stair seen from the side: its profile, lit treads and landings in amber, tread numbers. */
@Component({
  selector: 'tw-stair-side-view',
  template: `
    @let v = view();
    <svg
      [attr.viewBox]="viewBox()"
      preserveAspectRatio="xMidYMid meet"
      role="img"
      [attr.aria-label]="description()"
      data-testid="side-view"
    >
      <line class="floor" [attr.x1]="-margin" [attr.x2]="v.widthMm + margin" [attr.y1]="v.heightMm" [attr.y2]="v.heightMm" vector-effect="non-scaling-stroke" />
      <polyline class="profile" [attr.points]="points()" vector-effect="non-scaling-stroke" />
      @if (rail()) {
        <polyline class="rail" data-testid="lit-rail" [attr.points]="railPoints()" vector-effect="non-scaling-stroke" />
      }
      @for (t of v.treads; track t.index) {
        @if (t.lit) {
          <line class="lit" data-testid="lit-tread" [attr.x1]="t.x1 + 10" [attr.x2]="t.x2 - 10" [attr.y1]="y(t.y) + strip()" [attr.y2]="y(t.y) + strip()" vector-effect="non-scaling-stroke" />
        }
        @if (labelEvery() === 1 || t.index % labelEvery() === 0 || t.index === 1) {
          <text class="label" [attr.x]="(t.x1 + t.x2) / 2" [attr.y]="y(t.y) - fontMm() * 0.4" [attr.font-size]="fontMm()">{{ t.index }}</text>
        }
      }
      @for (l of v.landings; track l.index) {
        <line class="landing" [class.lit]="l.lit" [attr.data-testid]="l.lit ? 'lit-landing' : 'landing'" [attr.x1]="l.x1" [attr.x2]="l.x2" [attr.y1]="y(l.y) + strip()" [attr.y2]="y(l.y) + strip()" vector-effect="non-scaling-stroke" />
        <text class="label landing-label" [attr.x]="(l.x1 + l.x2) / 2" [attr.y]="y(l.y) - fontMm() * 0.4" [attr.font-size]="fontMm()">L{{ l.index }}</text>
      }
    </svg>
  `,
  styles: `
    :host {
      display: block;
    }
    svg {
      width: 100%;
      height: auto;
      max-height: 320px;
      display: block;
    }
    .floor {
      stroke: var(--mat-sys-outline-variant);
      stroke-width: 1;
    }
    .profile {
      fill: none;
      stroke: var(--mat-sys-on-surface);
      stroke-width: 2;
      stroke-linejoin: round;
    }
    .rail {
      fill: none;
      stroke: var(--mat-sys-tertiary);
      stroke-width: 3;
      stroke-dasharray: 2 4;
      stroke-linecap: round;
    }
    .lit {
      stroke: var(--mat-sys-tertiary);
      stroke-width: 4;
      stroke-linecap: round;
    }
    .landing:not(.lit) {
      stroke: var(--mat-sys-outline);
      stroke-width: 1;
      stroke-dasharray: 4 4;
    }
    .label {
      fill: var(--mat-sys-on-surface-variant);
      text-anchor: middle;
      font-family: inherit;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class StairSideView {
  readonly view = input.required<SideView>();
  /** Draws a lit handrail (layouts with a rail pixel run). */
  readonly rail = input(false);

  protected readonly margin = MARGIN_MM;
  /** SVG's y runs down; the geometry's runs up from the floor. */
  protected y(up: number): number {
    return this.view().heightMm - up;
  }

  protected readonly viewBox = computed(() => {
    const v = this.view();
    const top = MARGIN_MM * 2 + (this.rail() ? RAIL_HEIGHT_MM : 0);
    return `${-MARGIN_MM} ${-top} ${v.widthMm + 2 * MARGIN_MM} ${v.heightMm + top + MARGIN_MM}`;
  });
  protected readonly points = computed(() => {
    const v = this.view();
    return v.outline.map((p) => `${p.x},${v.heightMm - p.y}`).join(' ');
  });
  protected readonly railPoints = computed(() => {
    const v = this.view();
    return railLine(v)
      .map((p) => `${p.x},${v.heightMm - p.y}`)
      .join(' ');
  });
  /** Text and strip offsets follow the drawing's size, so a long stair still reads. */
  protected readonly fontMm = computed(() => Math.max(60, Math.max(this.view().widthMm, this.view().heightMm) / 40));
  protected readonly strip = computed(() => this.fontMm() * 0.25);
  protected readonly labelEvery = computed(() => (this.view().treads.length <= 24 ? 1 : 5));
  protected readonly description = computed(() => {
    const v = this.view();
    const lit = v.treads.filter((t) => t.lit).length + v.landings.filter((l) => l.lit).length;
    const flights = v.landings.length + 1;
    return `Side view of the stair: ${v.treads.length} treads in ${flights} flight${flights === 1 ? '' : 's'}, rising ${(v.heightMm / 1000).toFixed(2)} m over ${(v.widthMm / 1000).toFixed(2)} m; ${lit} lit.`;
  });
}
