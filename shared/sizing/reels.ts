import type { ReelsInput, ReelsResult } from '../schemas/reels.js';
import { cutLengthMm, DEFAULT_REEL_LENGTH_MM, usableReelMm } from '../tables/cut-lengths.js';
import { round, type TraceEntry, type Warning } from './trace.js';
import { ENGINE_VERSION } from './version.js';

// Shared with the request schemas, so they live below both.
export { cutLengthMm, DEFAULT_REEL_LENGTH_MM, usableReelMm };

/** A common reel length (domain default). */
/** Exact search stays well under a millisecond up to here; beyond it first-fit decreasing. */
export const EXACT_SEARCH_MAX_PIECES = 12;

export interface ReelCut {
  reel: number;
  piecesMm: number[];
  /** Positions of these pieces in the input list (0-based), e.g. tread index − 1. */
  pieceIndexes: number[];
  wasteMm: number;
}

export type ReelMethod = 'exact' | 'first-fit-decreasing' | 'identical-pieces';

export interface ReelPlan {
  reels: number;
  plan: ReelCut[];
  totalWasteMm: number;
  /** ceil(Σ pieces / usable reel length). */
  lowerBoundReels: number;
  provenOptimal: boolean;
  method: ReelMethod;
  usableReelLengthMm: number;
  /** Pieces shortened to whole cut pitches. */
  roundedPieces: number;
  /** Pieces longer than a reel: they need a joint and are left out of the plan. */
  unplaceableIndexes: number[];
}

// Work in whole micrometres so sums and comparisons are exact for any millimetre input.
const UM_PER_MM = 1000;
const toUm = (mm: number) => Math.round(mm * UM_PER_MM);

/**
 * Cut plan without a trace, for the estimate's hot path. `strategy: 'first-fit-decreasing'`
 * skips the exact search and the equal-pieces closed form (to compare the two).
 */
export function cutReels(
  piecesMm: readonly number[],
  reelLengthMm = DEFAULT_REEL_LENGTH_MM,
  cutPitchMm?: number,
  strategy: 'auto' | 'first-fit-decreasing' = 'auto',
): ReelPlan {
  const capacity = toUm(usableReelMm(reelLengthMm, cutPitchMm));
  const reelUm = toUm(reelLengthMm);
  const sizes: number[] = [];
  const indexes: number[] = [];
  const unplaceableIndexes: number[] = [];
  let roundedPieces = 0;
  let sum = 0;
  let identical = true;
  for (let i = 0; i < piecesMm.length; i++) {
    const size = toUm(cutLengthMm(piecesMm[i] as number, cutPitchMm));
    if (size !== toUm(piecesMm[i] as number)) roundedPieces++;
    if (size > capacity) {
      unplaceableIndexes.push(i);
      continue;
    }
    if (sizes.length > 0 && size !== sizes[0]) identical = false;
    sizes.push(size);
    indexes.push(i);
    sum += size;
  }
  const lowerBoundReels = Math.ceil(sum / capacity);

  let bins: Int32Array;
  let order: number[];
  let method: ReelMethod;
  let provenOptimal: boolean;
  if (sizes.length === 0) {
    bins = new Int32Array(0);
    order = [];
    method = 'identical-pieces';
    provenOptimal = true;
  } else if (identical && strategy === 'auto') {
    // k pieces fit a reel and no reel can take more, so ceil(n / k) reels is optimal.
    const perReel = Math.floor(capacity / (sizes[0] as number));
    order = indexes.map((_, i) => i);
    bins = Int32Array.from(order, (i) => Math.floor(i / perReel));
    method = 'identical-pieces';
    provenOptimal = true;
  } else {
    order = indexes.map((_, i) => i).sort((a, b) => (sizes[b] as number) - (sizes[a] as number) || a - b);
    const sorted = order.map((i) => sizes[i] as number);
    const ffd = firstFitDecreasing(sorted, capacity);
    bins = ffd.bins;
    let count = ffd.count;
    const bound = Math.max(lowerBoundReels, countBound(sorted, capacity));
    if (sorted.length <= EXACT_SEARCH_MAX_PIECES && strategy === 'auto') {
      const exact = exactPack(sorted, capacity, bound, count);
      if (exact) {
        bins = exact.bins;
        count = exact.count;
      }
      method = 'exact';
      provenOptimal = true;
    } else {
      method = 'first-fit-decreasing';
      provenOptimal = count === bound;
    }
  }
  return assemble(bins, order, sizes, indexes, reelUm, {
    lowerBoundReels,
    provenOptimal,
    method,
    usableReelLengthMm: capacity / UM_PER_MM,
    roundedPieces,
    unplaceableIndexes,
  });
}

function assemble(
  bins: Int32Array,
  order: number[],
  sizes: number[],
  indexes: number[],
  reelUm: number,
  rest: Omit<ReelPlan, 'reels' | 'plan' | 'totalWasteMm'>,
): ReelPlan {
  const plan: ReelCut[] = [];
  const used: number[] = [];
  for (let k = 0; k < order.length; k++) {
    const bin = bins[k] as number;
    const item = order[k] as number;
    let cut = plan[bin];
    if (!cut) {
      cut = plan[bin] = { reel: bin + 1, piecesMm: [], pieceIndexes: [], wasteMm: 0 };
      used[bin] = 0;
    }
    cut.piecesMm.push((sizes[item] as number) / UM_PER_MM);
    cut.pieceIndexes.push(indexes[item] as number);
    used[bin] = (used[bin] as number) + (sizes[item] as number);
  }
  let wasteUm = 0;
  for (let b = 0; b < plan.length; b++) {
    const reelWaste = reelUm - (used[b] as number);
    (plan[b] as ReelCut).wasteMm = reelWaste / UM_PER_MM;
    wasteUm += reelWaste;
  }
  return { reels: plan.length, plan, totalWasteMm: wasteUm / UM_PER_MM, ...rest };
}

/**
 * No reel holds more pieces than the shortest ones that fit together, so at least
 * ceil(n / that many) reels are needed — sharper than the volume bound when pieces are just
 * over a third or a half of a reel. `sizes` sorted longest first.
 */
function countBound(sizes: number[], capacity: number): number {
  let most = 0;
  let sum = 0;
  for (let i = sizes.length - 1; i >= 0 && sum + (sizes[i] as number) <= capacity; i--) {
    sum += sizes[i] as number;
    most++;
  }
  return Math.ceil(sizes.length / most);
}

/** sizes sorted longest first; returns the reel of each piece. */
function firstFitDecreasing(sizes: number[], capacity: number): { bins: Int32Array; count: number } {
  const bins = new Int32Array(sizes.length);
  const free: number[] = [];
  for (let i = 0; i < sizes.length; i++) {
    const size = sizes[i] as number;
    let b = 0;
    while (b < free.length && (free[b] as number) < size) b++;
    if (b === free.length) free.push(capacity);
    free[b] = (free[b] as number) - size;
    bins[i] = b;
  }
  return { bins, count: free.length };
}

/**
 * Branch and bound over "which reel does each piece go on", longest piece first. Prunes when
 * the reels used plus those the remaining length needs beyond the free space cannot beat the
 * best plan; equal pieces go on non-decreasing reels, and reels with equal free space are tried
 * once, to skip mirror-image plans. Returns null when nothing beats `incumbent`.
 */
function exactPack(sizes: number[], capacity: number, lowerBound: number, incumbent: number): { bins: Int32Array; count: number } | null {
  const n = sizes.length;
  const assign = new Int32Array(n);
  const best = new Int32Array(n);
  const free = new Float64Array(n);
  let bestCount = incumbent;
  let found = false;

  const place = (i: number, used: number, remaining: number): void => {
    if (bestCount <= lowerBound) return;
    if (i === n) {
      bestCount = used;
      best.set(assign);
      found = true;
      return;
    }
    let totalFree = 0;
    for (let b = 0; b < used; b++) totalFree += free[b] as number;
    if (used + Math.max(0, Math.ceil((remaining - totalFree) / capacity)) >= bestCount) return;
    const size = sizes[i] as number;
    const first = i > 0 && sizes[i - 1] === size ? (assign[i - 1] as number) : 0;
    for (let b = first; b < used; b++) {
      const room = free[b] as number;
      if (room < size || seenRoom(free, first, b, room)) continue;
      free[b] = room - size;
      assign[i] = b;
      place(i + 1, used, remaining - size);
      free[b] = room;
    }
    if (used + 1 < bestCount) {
      free[used] = capacity - size;
      assign[i] = used;
      place(i + 1, used + 1, remaining - size);
    }
  };
  place(0, 0, sizes.reduce((a, b) => a + b, 0));
  return found ? { bins: best, count: bestCount } : null;
}

function seenRoom(free: Float64Array, from: number, to: number, room: number): boolean {
  for (let b = from; b < to; b++) if (free[b] === room) return true;
  return false;
}

/** POST /v1/calculations/reels. */
export function planReels(input: ReelsInput): ReelsResult {
  const reelLengthMm = input.reelLengthMm ?? DEFAULT_REEL_LENGTH_MM;
  const result = cutReels(input.piecesMm, reelLengthMm, input.cutPitchMm);
  const warnings: Warning[] = [];
  if (result.roundedPieces > 0) {
    warnings.push({
      code: 'pieces_rounded_down',
      message: `${result.roundedPieces} piece(s) shortened to the whole ${input.cutPitchMm} mm cut pitches that fit the length measured.`,
    });
  }
  if (result.unplaceableIndexes.length > 0) {
    warnings.push({
      code: 'piece_longer_than_reel',
      message: `Pieces ${result.unplaceableIndexes.join(', ')} are longer than a reel and need a joint; left out of the plan.`,
    });
  }
  return {
    reels: result.reels,
    plan: result.plan,
    totalWasteMm: round(result.totalWasteMm, 3),
    lowerBoundReels: result.lowerBoundReels,
    provenOptimal: result.provenOptimal,
    method: result.method,
    reelLengthMm,
    usableReelLengthMm: result.usableReelLengthMm,
    warnings,
    engineVersion: ENGINE_VERSION,
    trace: reelsTrace(input, result),
  };
}

export function reelsTrace(input: ReelsInput, result: ReelPlan): TraceEntry[] {
  const reelLengthMm = input.reelLengthMm ?? DEFAULT_REEL_LENGTH_MM;
  const methodText: Record<ReelMethod, string> = {
    exact: 'branch-and-bound search over every assignment (pieces ≤ 12)',
    'first-fit-decreasing': 'first-fit decreasing (pieces > 12)',
    'identical-pieces': 'equal pieces: ceil(pieces / floor(usable reel / piece))',
  };
  return [
    {
      quantity: 'reels',
      value: result.reels,
      unit: 'reels',
      formula: methodText[result.method],
      inputs: {
        pieces: input.piecesMm.length,
        reelLengthMm,
        reelLengthDefaulted: input.reelLengthMm === undefined,
        cutPitchMm: input.cutPitchMm ?? null,
        usableReelLengthMm: result.usableReelLengthMm,
        provenOptimal: result.provenOptimal,
      },
      reference: 'one-dimensional cutting stock without joints; 5 m reel by default (common practice, no published source)',
    },
    {
      quantity: 'lowerBoundReels',
      value: result.lowerBoundReels,
      unit: 'reels',
      formula: 'ceil(Σ pieces / usable reel length)',
      inputs: { usableReelLengthMm: result.usableReelLengthMm },
      reference: 'bin-packing volume bound',
    },
    {
      quantity: 'totalWasteMm',
      value: round(result.totalWasteMm, 3),
      unit: 'mm',
      formula: 'Σ over reels (reelLengthMm − Σ pieces on the reel)',
      inputs: { reels: result.reels, reelLengthMm, roundedPieces: result.roundedPieces },
      reference:
        input.cutPitchMm === undefined
          ? 'arithmetic'
          : 'pieces shortened to the whole cut pitches that fit their space; the reel tail shorter than a pitch counts as waste',
    },
  ];
}
