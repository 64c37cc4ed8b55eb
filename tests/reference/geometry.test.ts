import { describe, expect, it } from 'vitest';
import { bestControllerTread, cableRuns, controllerTread, stepLengthM } from '../../shared/sizing/geometry.js';

// Alder Row townhouse (demo scenario): 14 treads, riser 185 mm, going 250 mm, width 900 mm.
const alderRow = { treads: 14, riserHeightMm: 185, goingMm: 250, treadWidthMm: 900 };
// Pythagoras: √(185² + 250²) = √96 725 = 311.0064 mm
const STEP_M = 0.3110064;

describe('stair geometry', () => {
  it('one step along the stringer', () => {
    // Pythagoras: √(185² + 250²) mm
    expect(stepLengthM(185, 250)).toBeCloseTo(STEP_M, 6);
  });

  it('controller positions', () => {
    // domain rule: bottom = 1, top = n, middle = ⌈n/2⌉ (⌈15/2⌉ = 8)
    expect(controllerTread('bottom', 14)).toBe(1);
    expect(controllerTread('top', 14)).toBe(14);
    expect(controllerTread('middle', 15)).toBe(8);
    expect(controllerTread({ tread: 5 }, 14)).toBe(5);
  });

  it('run from a controller at the foot to the head', () => {
    const runs = cableRuns(alderRow, 'bottom');
    // hand arithmetic: 13 steps × 0.3110064 m + 0.5 m service allowance = 4.5431 m
    expect(runs.longestRunM).toBeCloseTo(13 * STEP_M + 0.5, 5);
    expect(runs.longestRunTread).toBe(14);
    // hand arithmetic: the controller's own tread gets only the 0.5 m allowance
    expect(runs.runsM[0]).toBe(0.5);
  });

  it('mid-flight halves the longest run', () => {
    const runs = cableRuns(alderRow);
    // hand arithmetic: from tread 7 the farthest is tread 14, 7 steps + 0.5 m = 2.677 m (tread 8 ties; lower wins)
    expect(runs.controllerTread).toBe(7);
    expect(runs.longestRunM).toBeCloseTo(7 * STEP_M + 0.5, 5);
  });

  it('a run crosses the landing of a corner unit', () => {
    // Alder Row corner unit (demo scenario): 7 + 8 treads turning at a 900 mm landing
    const corner = { ...alderRow, treads: 15, flights: [{ treads: 7, landingLengthMm: 900 }, { treads: 8 }] };
    const runs = cableRuns(corner, 'bottom');
    // Pythagoras on the landing model of geometry.ts: step + √(185² + 900²) = 0.3110 + 0.9188 m between treads 7 and 8
    const landingM = STEP_M + Math.sqrt(185 ** 2 + 900 ** 2) / 1000;
    expect((runs.runsM[7] as number) - (runs.runsM[6] as number)).toBeCloseTo(landingM, 5);
    // hand arithmetic: 6 steps to tread 7, the landing crossing, 7 steps to tread 15, + 0.5 m = 5.7729 m
    expect(runs.longestRunM).toBeCloseTo(13 * STEP_M + landingM + 0.5, 5);
    // hand arithmetic: tread 8 sits 3.096 m from tread 1, nearest the midpoint 2.637 m of the 5.273 m route
    expect(bestControllerTread(corner)).toBe(8);
  });

  it('flags a run beyond the 10 m practice limit', () => {
    // hand arithmetic: 39 steps × 0.311 m + 0.5 m = 12.63 m > 10 m (common practice, no published source)
    const long = cableRuns({ ...alderRow, treads: 40 }, 'bottom');
    expect(long.longestRunM).toBeCloseTo(39 * STEP_M + 0.5, 5);
    expect(long.withinPracticeLimit).toBe(false);
  });
});
