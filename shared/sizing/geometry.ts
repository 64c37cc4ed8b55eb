import { SizingInputError } from '../tables/errors.js';
import { flightsMismatch } from '../tables/stair-flights.js';

export { flightsMismatch };
import { round, type TraceEntry } from './trace.js';

/** Drop from the stringer to the strip's feed end, added to every run (domain default). */
export const DEFAULT_SERVICE_ALLOWANCE_M = 0.5;
/** Longest controller-to-tread run the trade accepts (common practice, no published source). */
export const PRACTICE_MAX_RUN_M = 10;

export type ControllerPosition = 'bottom' | 'top' | 'middle' | { tread: number };

export interface Flight {
  treads: number;
  /** Cable length across the landing at the head of this flight; ignored on the last flight. */
  landingLengthMm?: number;
}

export interface StairGeometry {
  treads: number;
  riserHeightMm: number;
  goingMm: number;
  /** Default landing length when a flight does not give one. */
  treadWidthMm?: number;
  flights?: Flight[];
  /** Width of each tread where the strip goes (winders, bullnose), foot first; default: treadWidthMm. */
  treadWidthsMm?: number[] | undefined;
  /** Landings lit with a strip of their own (1 = the landing above flight 1). */
  litLandings?: number[] | undefined;
}

/** Width of tread k (1 = foot): its own when the stair lists them, else the stair's width. */
export function treadWidthsOf(stair: StairGeometry): number[] {
  if (stair.treadWidthsMm && stair.treadWidthsMm.length === stair.treads) return stair.treadWidthsMm;
  return new Array(stair.treads).fill(stair.treadWidthMm ?? 0);
}

export interface CableRuns {
  controllerTread: number;
  stepLengthM: number;
  /** runsM[k − 1] is the run to tread k (1 = foot), service allowance included. */
  runsM: number[];
  longestRunM: number;
  longestRunTread: number;
  withinPracticeLimit: boolean;
}

/** One step along the stringer: the diagonal of riser and going (Pythagoras). */
export function stepLengthM(riserHeightMm: number, goingMm: number): number {
  return Math.hypot(riserHeightMm, goingMm) / 1000;
}


/**
 * Distance of each tread from tread 1 along the cable route, in metres.
 *
 * Model: treads are numbered 1…n across all flights. Between two treads of one flight the
 * cable runs one step along the stringer. A landing is treated as a tread (unlit) whose going
 * is its length: from the last tread of a flight the cable climbs one step onto the landing,
 * then crosses it and climbs the next flight's first riser, √(rise² + landing²). For a corner
 * landing give the length the cable actually runs (both legs). Without a length the landing is
 * taken to be as long as the stair is wide (building rules commonly ask for a landing at least
 * the stair's width — from memory), or one going when no width is known.
 */
export function treadPositionsM(stair: StairGeometry): Float64Array {
  const issue = flightsMismatch(stair);
  if (issue) throw new SizingInputError(['staircase', 'flights'], issue, 'flights_treads_mismatch');
  const step = stepLengthM(stair.riserHeightMm, stair.goingMm);
  const positions = new Float64Array(stair.treads);
  const flights = stair.flights && stair.flights.length > 0 ? stair.flights : [{ treads: stair.treads }];
  let tread = 0;
  let x = 0;
  for (let f = 0; f < flights.length; f++) {
    const flight = flights[f] as Flight;
    for (let t = 0; t < flight.treads; t++) {
      if (tread > 0) x += t === 0 ? landingCrossingM(stair, flights[f - 1] as Flight) : step;
      positions[tread++] = x;
    }
  }
  return positions;
}

function landingCrossingM(stair: StairGeometry, previous: Flight): number {
  const landingMm = previous.landingLengthMm ?? stair.treadWidthMm ?? stair.goingMm;
  return stepLengthM(stair.riserHeightMm, stair.goingMm) + Math.hypot(stair.riserHeightMm, landingMm) / 1000;
}

export function controllerTread(position: ControllerPosition, treads: number): number {
  if (position === 'bottom') return 1;
  if (position === 'top') return treads;
  if (position === 'middle') return Math.ceil(treads / 2);
  if (!Number.isInteger(position.tread) || position.tread < 1 || position.tread > treads) {
    throw new SizingInputError(
      ['controller', 'position', 'tread'],
      `must be a tread from 1 to ${treads}`,
      'controller_tread_out_of_range',
    );
  }
  return position.tread;
}

/**
 * The tread whose longest run is shortest: positions grow along the stair, so the longest run
 * from c is to tread 1 or tread n, and the best c sits next to the route's midpoint.
 * Ties go to the lower tread (nearer the foot, where supplies usually are).
 */
export function bestControllerTread(stair: StairGeometry, positions = treadPositionsM(stair)): number {
  const n = positions.length;
  const last = positions[n - 1] as number;
  const mid = last / 2;
  let hi = 0;
  while (hi < n - 1 && (positions[hi] as number) < mid) hi++;
  const lo = Math.max(0, hi - 1);
  const worst = (i: number) => Math.max(positions[i] as number, last - (positions[i] as number));
  return worst(lo) <= worst(hi) + 1e-12 ? lo + 1 : hi + 1;
}

/** Run from the controller to every tread; without a position the best one is used. */
export function cableRuns(
  stair: StairGeometry,
  position?: ControllerPosition,
  serviceAllowanceM = DEFAULT_SERVICE_ALLOWANCE_M,
): CableRuns {
  const positions = treadPositionsM(stair);
  const c = position === undefined ? bestControllerTread(stair, positions) : controllerTread(position, stair.treads);
  const origin = positions[c - 1] as number;
  const runsM: number[] = new Array(positions.length);
  let longestRunM = -1;
  let longestRunTread = 1;
  for (let k = 0; k < positions.length; k++) {
    const run = Math.abs((positions[k] as number) - origin) + serviceAllowanceM;
    runsM[k] = run;
    if (run > longestRunM) {
      longestRunM = run;
      longestRunTread = k + 1;
    }
  }
  return {
    controllerTread: c,
    stepLengthM: stepLengthM(stair.riserHeightMm, stair.goingMm),
    runsM,
    longestRunM,
    longestRunTread,
    withinPracticeLimit: longestRunM <= PRACTICE_MAX_RUN_M,
  };
}

export function cableRunsTrace(
  stair: StairGeometry,
  position: ControllerPosition | undefined,
  serviceAllowanceM: number | undefined,
  runs: CableRuns,
): TraceEntry[] {
  const landings = (stair.flights?.length ?? 1) - 1;
  return [
    {
      quantity: 'stepLengthM',
      value: round(runs.stepLengthM),
      unit: 'm',
      formula: '√(riserHeightMm² + goingMm²) / 1000',
      inputs: { riserHeightMm: stair.riserHeightMm, goingMm: stair.goingMm },
      reference: 'Pythagoras: one step along the stringer',
    },
    {
      quantity: 'controllerTread',
      value: runs.controllerTread,
      unit: 'tread',
      formula:
        position === undefined
          ? 'tread whose longest run is shortest'
          : 'bottom = 1, top = n, middle = ⌈n/2⌉, or the tread given',
      inputs: { treads: stair.treads, position: position === undefined ? 'best (default)' : positionLabel(position) },
      reference: 'controller where the longest run is shortest (common practice, no published source)',
    },
    {
      quantity: 'longestRunM',
      value: round(runs.longestRunM),
      unit: 'm',
      formula:
        landings > 0
          ? '|x(k) − x(c)| + serviceAllowanceM; crossing a landing adds step + √(rise² + landingLength²)'
          : '|k − c| × stepLengthM + serviceAllowanceM',
      inputs: {
        tread: runs.longestRunTread,
        controllerTread: runs.controllerTread,
        serviceAllowanceM: serviceAllowanceM ?? DEFAULT_SERVICE_ALLOWANCE_M,
        serviceAllowanceDefaulted: serviceAllowanceM === undefined,
        landings,
        practiceLimitM: PRACTICE_MAX_RUN_M,
      },
      reference: 'stair geometry; 10 m practice limit (common practice, no published source)',
    },
  ];
}

function positionLabel(position: ControllerPosition): string {
  return typeof position === 'string' ? position : `tread ${position.tread}`;
}
