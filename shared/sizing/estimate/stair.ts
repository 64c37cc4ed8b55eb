import { blockSizes } from '../outputs.js';
import type { TraceEntry } from '../trace.js';
import { cableRuns, cableRunsTrace, PRACTICE_MAX_RUN_M, type CableRuns, type ControllerPosition, type Flight, type StairGeometry } from '../geometry.js';

/** Treads first…last (1-based) as a stair of their own, with the landings that fall inside. */
export function subStair(stair: StairGeometry, first: number, last: number): StairGeometry {
  if (first === 1 && last === stair.treads) return stair;
  const treads = last - first + 1;
  const treadWidthsMm = stair.treadWidthsMm?.slice(first - 1, last);
  if (!stair.flights || stair.flights.length <= 1) return { ...stair, treads, flights: undefined, treadWidthsMm };
  const flights: Flight[] = [];
  let start = 1;
  for (const flight of stair.flights) {
    const end = start + flight.treads - 1;
    const from = Math.max(start, first);
    const to = Math.min(end, last);
    if (from <= to) {
      const part: Flight = { treads: to - from + 1 };
      if (flight.landingLengthMm !== undefined) part.landingLengthMm = flight.landingLengthMm;
      flights.push(part);
    }
    start = end + 1;
  }
  return { ...stair, treads, flights, treadWidthsMm };
}

/**
 * Where one controller of several sits: bottom / top / middle apply within its own block; a
 * given tread applies to the block that holds it, the other blocks take their best position.
 */
export function positionInBlock(position: ControllerPosition | undefined, first: number, last: number): ControllerPosition | undefined {
  if (position === undefined || typeof position === 'string') return position;
  return position.tread >= first && position.tread <= last ? { tread: position.tread - first + 1 } : undefined;
}

export interface TreadBlock {
  firstTread: number;
  lastTread: number;
}

export interface BlockRuns extends TreadBlock {
  controller: number;
  /** Tread the controller sits at, counted on the whole stair. */
  atTread: number;
  runs: CableRuns;
}

export interface StairRuns {
  blocks: BlockRuns[];
  /** runsM[k − 1]: run from tread k's controller to tread k, service allowance included. */
  runsM: number[];
  longestRunM: number;
  longestRunTread: number;
  /** The block holding the longest run (its runs feed the trace). */
  longestBlock: BlockRuns;
}

/**
 * Runs from each controller to the treads of its block, using the geometry module per block.
 * `blockPositions` (relative to each block) overrides `position` where a layout knows better.
 */
export function stairRuns(
  stair: StairGeometry,
  blocks: readonly TreadBlock[],
  position: ControllerPosition | undefined,
  serviceAllowanceM: number | undefined,
  blockPositions?: readonly (ControllerPosition | undefined)[],
): StairRuns {
  const runsM: number[] = new Array(stair.treads);
  const out: BlockRuns[] = [];
  let longestRunM = -1;
  let longestRunTread = 1;
  let longestBlock: BlockRuns | undefined;
  for (let b = 0; b < blocks.length; b++) {
    const { firstTread, lastTread } = blocks[b] as TreadBlock;
    const at = blockPositions ? blockPositions[b] : positionInBlock(position, firstTread, lastTread);
    const runs = cableRuns(subStair(stair, firstTread, lastTread), at, serviceAllowanceM);
    const block: BlockRuns = { controller: b + 1, firstTread, lastTread, atTread: firstTread + runs.controllerTread - 1, runs };
    out.push(block);
    for (let k = 0; k < runs.runsM.length; k++) runsM[firstTread - 1 + k] = runs.runsM[k] as number;
    if (runs.longestRunM > longestRunM) {
      longestRunM = runs.longestRunM;
      longestRunTread = firstTread + runs.longestRunTread - 1;
      longestBlock = block;
    }
  }
  return { blocks: out, runsM, longestRunM, longestRunTread, longestBlock: longestBlock as BlockRuns };
}

/** Contiguous near-equal blocks for k controllers. */
export function evenBlocks(treads: number, controllers: number): TreadBlock[] {
  const blocks: TreadBlock[] = [];
  let first = 1;
  for (const size of blockSizes(treads, controllers)) {
    blocks.push({ firstTread: first, lastTread: first + size - 1 });
    first += size;
  }
  return blocks;
}

export interface RunLengthAdvice {
  /** Longest run with each controller at its best position. */
  bestLongestRunM: number;
  bestTreads: number[];
  /** Fewest controllers (at best positions) that bring every run within limitM; null if even one per tread does not. */
  controllersForLimit: number | null;
  longestWithThoseM: number | null;
  blocksForLimit: TreadBlock[] | null;
}

/**
 * What moving or adding controllers would do to the longest run: the basis of concrete
 * suggestions. `limitM` is the longest run wanted (the practice limit, or the longest run whose
 * drop stays within the limit).
 */
export function runLengthAdvice(
  stair: StairGeometry,
  blocks: readonly TreadBlock[],
  serviceAllowanceM: number | undefined,
  limitM: number = PRACTICE_MAX_RUN_M,
): RunLengthAdvice {
  const best = stairRuns(stair, blocks, undefined, serviceAllowanceM);
  let controllersForLimit: number | null = null;
  let longestWithThoseM: number | null = null;
  let blocksForLimit: TreadBlock[] | null = null;
  for (let k = blocks.length; k <= stair.treads; k++) {
    const candidate = evenBlocks(stair.treads, k);
    const runs = k === blocks.length ? best : stairRuns(stair, candidate, undefined, serviceAllowanceM);
    if (runs.longestRunM <= limitM) {
      controllersForLimit = k;
      longestWithThoseM = runs.longestRunM;
      blocksForLimit = k === blocks.length ? [...blocks] : candidate;
      break;
    }
  }
  return { bestLongestRunM: best.longestRunM, bestTreads: best.blocks.map((b) => b.atTread), controllersForLimit, longestWithThoseM, blocksForLimit };
}

/** The trace of the runs describes the block holding the longest run. */
export function runsTrace(stair: StairGeometry, runs: StairRuns, position: ControllerPosition | undefined, serviceAllowanceM: number | undefined): TraceEntry[] {
  const b = runs.longestBlock;
  return cableRunsTrace(subStair(stair, b.firstTread, b.lastTread), positionInBlock(position, b.firstTread, b.lastTread), serviceAllowanceM, b.runs);
}
