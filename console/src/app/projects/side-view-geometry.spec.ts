import { describe, expect, it } from 'vitest';

import { RAIL_HEIGHT_MM, railLine, sideView } from './side-view-geometry.js';

describe('sideView', () => {
  it('climbs one riser and runs one going per tread of a straight flight', () => {
    // The Saltmarsh Cottage demo stair: 12 treads, 180 mm risers, 260 mm going.
    const view = sideView({ treads: 12, treadWidthMm: 1000, riserHeightMm: 180, goingMm: 260 }, true);
    expect(view.treads).toHaveLength(12);
    expect(view.landings).toEqual([]);
    expect(view.widthMm).toBe(12 * 260);
    expect(view.heightMm).toBe(12 * 180);
    expect(view.treads[0]).toEqual({ index: 1, x1: 0, x2: 260, y: 180, lit: true });
    expect(view.treads[11]).toEqual({ index: 12, x1: 11 * 260, x2: 12 * 260, y: 12 * 180, lit: true });
    expect(view.outline).toHaveLength(1 + 2 * 12); // the foot, then a riser and a tread each
  });

  it('puts a landing at the head of each flight but the last, as long as its cable run', () => {
    // Alder Row corner unit: 7 + 8 treads turning at a 900 mm landing, the landing lit.
    const view = sideView(
      { treads: 15, treadWidthMm: 900, riserHeightMm: 185, goingMm: 250, flights: [{ treads: 7, landingLengthMm: 1200 }, { treads: 8 }], litLandings: [1] },
      true,
    );
    expect(view.landings).toEqual([{ index: 1, x1: 7 * 250, x2: 7 * 250 + 1200, y: 7 * 185, lit: true }]);
    expect(view.treads[7]).toMatchObject({ index: 8, x1: 7 * 250 + 1200, y: 8 * 185 }); // the next flight starts past the landing
    expect(view.widthMm).toBe(15 * 250 + 1200);
    expect(view.heightMm).toBe(15 * 185);
  });

  it('takes the tread width as a landing length by default and lights no tread without tread strips', () => {
    const view = sideView({ treads: 4, treadWidthMm: 900, riserHeightMm: 170, goingMm: 280, flights: [{ treads: 2 }, { treads: 2 }] }, false);
    expect(view.landings[0]).toMatchObject({ x1: 560, x2: 1460, lit: false });
    expect(view.treads.every((t) => !t.lit)).toBe(true);
  });

  it('runs a handrail along the nosings, level over a landing', () => {
    const view = sideView({ treads: 4, treadWidthMm: 900, riserHeightMm: 170, goingMm: 280, flights: [{ treads: 2, landingLengthMm: 1000 }, { treads: 2 }] }, false);
    const h = RAIL_HEIGHT_MM;
    expect(railLine(view)).toEqual([
      { x: 0, y: 170 + h },
      { x: 280, y: 340 + h },
      { x: 560, y: 340 + h }, // the landing, level
      { x: 1560, y: 340 + h },
      { x: 1560, y: 510 + h },
      { x: 1840, y: 680 + h },
      { x: 2120, y: 680 + h },
    ]);
  });
});
