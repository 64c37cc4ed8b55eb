import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { SizingInputError } from '../../shared/tables/errors.js';
import { bestControllerTread, cableRuns, flightsMismatch, type StairGeometry } from '../../shared/sizing/geometry.js';

const stairs: fc.Arbitrary<StairGeometry> = fc
  .record({
    flights: fc.array(
      fc.record({ treads: fc.integer({ min: 1, max: 20 }), landingLengthMm: fc.option(fc.integer({ min: 0, max: 3000 }), { nil: undefined }) }),
      { minLength: 1, maxLength: 4 },
    ),
    riserHeightMm: fc.integer({ min: 100, max: 230 }),
    goingMm: fc.integer({ min: 200, max: 350 }),
    treadWidthMm: fc.option(fc.integer({ min: 600, max: 2000 }), { nil: undefined }),
  })
  .map((s) => ({ ...s, treads: s.flights.reduce((sum, f) => sum + f.treads, 0) }));

describe('controller position', () => {
  it('the best position minimises the longest run (brute force over every tread)', () => {
    fc.assert(
      fc.property(stairs, (stair) => {
        let bruteBest = Infinity;
        for (let c = 1; c <= stair.treads; c++) bruteBest = Math.min(bruteBest, cableRuns(stair, { tread: c }).longestRunM);
        // brute force is the definition of "the position that makes the longest run shortest"
        expect(cableRuns(stair).longestRunM).toBeCloseTo(bruteBest, 9);
        expect(cableRuns(stair).controllerTread).toBe(bestControllerTread(stair));
      }),
    );
  });

  it('runs grow with distance from the controller and reach the allowance at its tread', () => {
    fc.assert(
      fc.property(stairs, fc.double({ min: 0, max: 3, noNaN: true }), (stair, allowance) => {
        const c = 1 + (stair.treads >> 1);
        const runs = cableRuns(stair, { tread: c }, allowance);
        // geometry: positions along the route are monotonic, so runs rise away from c
        expect(runs.runsM[c - 1]).toBeCloseTo(allowance, 12);
        for (let k = c; k < stair.treads; k++) expect(runs.runsM[k] as number).toBeGreaterThan(runs.runsM[k - 1] as number);
        for (let k = c - 2; k >= 0; k--) expect(runs.runsM[k] as number).toBeGreaterThan(runs.runsM[k + 1] as number);
        expect(runs.longestRunM).toBe(Math.max(...runs.runsM));
      }),
    );
  });

  it('refuses flights that do not add up to the stair', () => {
    // flights of 7 + 8 hold 15 treads, not 14 (arithmetic)
    const stair = { treads: 14, riserHeightMm: 185, goingMm: 250, flights: [{ treads: 7 }, { treads: 8 }] };
    expect(flightsMismatch(stair)).toMatch(/15 treads/);
    expect(() => cableRuns(stair)).toThrow(SizingInputError);
    // a 14-tread stair has no tread 15 (arithmetic)
    expect(() => cableRuns({ ...stair, flights: undefined }, { tread: 15 })).toThrow(SizingInputError);
  });
});
