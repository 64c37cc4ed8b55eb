import type { Staircase } from '../core/api-types.js';

/** A horizontal piece of the side view, in mm from the foot of the stair: x along, y up. */
export interface Step {
  /** Tread number from 1 at the foot, or landing number from 1 (the landing above flight 1). */
  index: number;
  x1: number;
  x2: number;
  y: number;
  lit: boolean;
}

export interface SideView {
  /** The stair's profile: up each riser, along each tread and landing, foot first. */
  outline: { x: number; y: number }[];
  treads: Step[];
  landings: Step[];
  widthMm: number;
  heightMm: number;
}

/**
 * The stair drawn from the side, unfolded along its stringer as the cables run: each tread climbs
 * one riser and runs one going; a landing runs its cable length (the tread width by default, as
 * the API assumes) at the height of the tread below it.
 */
export function sideView(stair: Pick<Staircase, 'treads' | 'riserHeightMm' | 'goingMm' | 'treadWidthMm' | 'flights' | 'litLandings'>, treadsLit: boolean): SideView {
  const flights = stair.flights && stair.flights.length > 0 ? stair.flights : [{ treads: stair.treads }];
  const litLandings = new Set(stair.litLandings ?? []);
  const outline = [{ x: 0, y: 0 }];
  const treads: Step[] = [];
  const landings: Step[] = [];
  let x = 0;
  let y = 0;
  let tread = 0;
  flights.forEach((flight, f) => {
    for (let i = 0; i < flight.treads; i++) {
      y += stair.riserHeightMm;
      outline.push({ x, y });
      tread += 1;
      treads.push({ index: tread, x1: x, x2: x + stair.goingMm, y, lit: treadsLit });
      x += stair.goingMm;
      outline.push({ x, y });
    }
    if (f < flights.length - 1) {
      const length = flight.landingLengthMm ?? stair.treadWidthMm;
      landings.push({ index: f + 1, x1: x, x2: x + length, y, lit: litLandings.has(f + 1) });
      x += length;
      outline.push({ x, y });
    }
  });
  return { outline, treads, landings, widthMm: x, heightMm: y };
}

/** Handrail height above the nosings, mm: a typical figure for drawing only (common practice, no published source). */
export const RAIL_HEIGHT_MM = 900;

/** A handrail drawn along the nosings (sloping up each flight, level over each landing), foot first. */
export function railLine(view: SideView): { x: number; y: number }[] {
  const points = [...view.treads.map((t) => ({ x: t.x1, y: t.y })), ...view.landings.flatMap((l) => [{ x: l.x1, y: l.y }, { x: l.x2, y: l.y }])];
  const last = view.treads.at(-1);
  if (last) points.push({ x: last.x2, y: last.y });
  return points.sort((a, b) => a.x - b.x || a.y - b.y).map((p) => ({ x: p.x, y: p.y + RAIL_HEIGHT_MM }));
}
