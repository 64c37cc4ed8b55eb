/**
 * The exact driver-mix search behind chooseDrivers: among multisets of the available ratings
 * whose sum covers the required rating, take the fewest drivers, then the least total cost
 * (price when given, else rating), then the fewest distinct ratings, then the least total
 * rating. It runs inside every estimate, so it enumerates counts per rating with bounds
 * instead of building combinations, and remembers recent answers per rating list.
 */

export interface DriverMix {
  /** Ratings used, largest first (only those with a count). */
  readonly ratingsW: readonly number[];
  readonly counts: readonly number[];
  readonly driverCount: number;
  readonly totalRatingW: number;
  /** null when no prices were given. */
  readonly totalPrice: number | null;
  /** false only if the search hit its node budget (pathological rating lists); the mix still covers the load. */
  readonly exhaustive: boolean;
}

/** A rating list sorted and bounded once, then reused for every load. */
interface PreparedRatings {
  /** Distinct ratings, largest first, so the first leaf reached (all of the largest) is feasible. */
  readonly r: Float64Array;
  readonly cost: Float64Array;
  readonly priced: boolean;
  /** Cheapest cost per driver, and per watt, among ratings j…: lower bounds for any completion. */
  readonly suffixMinCost: Float64Array;
  readonly suffixMinCostPerW: Float64Array;
  readonly answers: Map<number, DriverMix>;
}

// Enough for any realistic catalog many times over; keeps a hostile list from stalling a request.
const NODE_BUDGET = 200_000;
const MEMO_LIMIT = 64;
const REL_TOL = 1e-9;
const prepared = new Map<string, PreparedRatings>();

/**
 * @param requiredW rating the mix must reach (load / loading)
 * @param ratingsW usable ratings, any order, duplicates allowed
 * @param prices price of each rating, same index as ratingsW (a duplicate rating keeps its lowest price)
 * @returns null when there is no rating to choose from
 */
export function chooseDriverMix(requiredW: number, ratingsW: readonly number[], prices?: readonly number[]): DriverMix | null {
  if (ratingsW.length === 0) return null;
  const list = prepare(ratingsW, prices);
  const known = list.answers.get(requiredW);
  if (known) return known;
  const mix = search(list, requiredW);
  if (list.answers.size >= MEMO_LIMIT) list.answers.clear();
  list.answers.set(requiredW, mix);
  return mix;
}

function prepare(ratingsW: readonly number[], prices: readonly number[] | undefined): PreparedRatings {
  const key = prices ? `${ratingsW.join(',')}|${prices.join(',')}` : ratingsW.join(',');
  const known = prepared.get(key);
  if (known) return known;
  const byRating = new Map<number, number>();
  ratingsW.forEach((rating, i) => {
    const p = prices ? prices[i]! : rating;
    const seen = byRating.get(rating);
    if (seen === undefined || p < seen) byRating.set(rating, p);
  });
  const sorted = [...byRating.keys()].sort((a, b) => b - a);
  const k = sorted.length;
  const r = Float64Array.from(sorted);
  const cost = Float64Array.from(sorted, (x) => byRating.get(x)!);
  const suffixMinCost = new Float64Array(k);
  const suffixMinCostPerW = new Float64Array(k);
  for (let j = k - 1; j >= 0; j -= 1) {
    const last = j === k - 1;
    suffixMinCost[j] = last ? cost[j]! : Math.min(cost[j]!, suffixMinCost[j + 1]!);
    suffixMinCostPerW[j] = last ? cost[j]! / r[j]! : Math.min(cost[j]! / r[j]!, suffixMinCostPerW[j + 1]!);
  }
  const list: PreparedRatings = { r, cost, priced: prices !== undefined, suffixMinCost, suffixMinCostPerW, answers: new Map() };
  if (prepared.size >= MEMO_LIMIT) prepared.clear();
  prepared.set(key, list);
  return list;
}

// Search state lives at module level: the search is synchronous, and this keeps it allocation-free.
let list: PreparedRatings;
let target = 0;
let counts = new Int32Array(16);
let bestCounts = new Int32Array(16);
let bestCost = Infinity;
let bestDistinct = Infinity;
let bestRating = Infinity;
let nodes = 0;

// Lexicographic (cost, distinct, rating) strictly below the best so far, with float tolerance.
function beats(c: number, d: number, t: number): boolean {
  if (bestCost === Infinity) return true;
  const eps = REL_TOL * Math.max(1, bestCost);
  if (c < bestCost - eps) return true;
  if (c > bestCost + eps) return false;
  if (d !== bestDistinct) return d < bestDistinct;
  return t < bestRating - REL_TOL * Math.max(1, bestRating);
}

function visit(j: number, slots: number, sum: number, costSoFar: number, distinct: number): void {
  nodes += 1;
  if (nodes > NODE_BUDGET) return;
  const { r, cost } = list;
  const k = r.length;
  if (slots === 0) {
    // Without prices the cost is the rating sum, so it doubles as the third criterion.
    if (sum >= target && beats(costSoFar, distinct, sum)) {
      bestCost = costSoFar;
      bestDistinct = distinct;
      bestRating = sum;
      bestCounts.set(counts);
    }
    return;
  }
  if (j === k || sum + slots * r[j]! < target) return;
  const missingW = target - sum;
  const costBound = costSoFar + Math.max(slots * list.suffixMinCost[j]!, missingW * list.suffixMinCostPerW[j]!);
  if (!beats(costBound, distinct + 1, Math.max(target, sum + slots * r[k - 1]!))) return;
  const lowest = j === k - 1 ? slots : 0;
  for (let n = slots; n >= lowest; n -= 1) {
    const nextSum = sum + n * r[j]!;
    // Fewer of this rating only lowers the reachable sum further: stop at the first miss.
    if (n < slots && j + 1 < k && nextSum + (slots - n) * r[j + 1]! < target) break;
    counts[j] = n;
    visit(j + 1, slots - n, nextSum, costSoFar + n * cost[j]!, n > 0 ? distinct + 1 : distinct);
    if (nodes > NODE_BUDGET) break;
  }
  counts[j] = 0;
}

function search(prepared: PreparedRatings, requiredW: number): DriverMix {
  const { r, cost } = prepared;
  const k = r.length;
  list = prepared;
  target = requiredW * (1 - REL_TOL);
  if (counts.length < k) {
    counts = new Int32Array(k);
    bestCounts = new Int32Array(k);
  }
  counts.fill(0);
  bestCounts.fill(0);
  bestCost = Infinity;
  bestDistinct = Infinity;
  bestRating = Infinity;
  nodes = 0;
  const driverCount = Math.max(1, Math.ceil(requiredW / r[0]! - REL_TOL));
  visit(0, driverCount, 0, 0, 0);

  const usedRatings: number[] = [];
  const usedCounts: number[] = [];
  let totalRatingW = 0;
  let totalPrice = 0;
  for (let j = 0; j < k; j += 1) {
    const n = bestCounts[j]!;
    if (n === 0) continue;
    usedRatings.push(r[j]!);
    usedCounts.push(n);
    totalRatingW += n * r[j]!;
    totalPrice += n * cost[j]!;
  }
  return Object.freeze({
    ratingsW: Object.freeze(usedRatings),
    counts: Object.freeze(usedCounts),
    driverCount,
    totalRatingW,
    totalPrice: prepared.priced ? totalPrice : null,
    exhaustive: nodes <= NODE_BUDGET,
  });
}
