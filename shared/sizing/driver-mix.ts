/**
 * One supply per circuit. Constant-voltage drivers are not paralleled (unequal ones never share
 * a load in proportion to their ratings, and Class 2 supplies must not be interconnected), so a
 * load is split into separate circuits and each circuit gets one driver of its own.
 *
 * Two questions, answered here without trace so the estimate can ask them per circuit:
 *  - which single rating covers one circuit (smallest, or cheapest when prices are given);
 *  - into how many circuits a load that no single rating covers must be split.
 */

export interface SingleDriver {
  ratingW: number;
  /** null when no prices were given. */
  price: number | null;
}

export interface CircuitSplit {
  /** Separate circuits, each on its own driver. */
  circuits: number;
  /** Rating each circuit must have: requiredW / circuits. */
  requiredPerCircuitW: number;
  driver: SingleDriver;
}

const REL_TOL = 1e-9;

/**
 * The single rating that covers requiredW: the cheapest when priced (ties: the smaller rating),
 * else the smallest. null when no rating is large enough.
 */
export function singleDriverFor(requiredW: number, ratingsW: readonly number[], prices?: readonly number[]): SingleDriver | null {
  let best: SingleDriver | null = null;
  for (let i = 0; i < ratingsW.length; i++) {
    const ratingW = ratingsW[i] as number;
    if (ratingW < requiredW * (1 - REL_TOL)) continue;
    const price = prices ? (prices[i] as number) : null;
    if (
      best === null ||
      (price !== null && best.price !== null && (price < best.price - REL_TOL || (Math.abs(price - best.price) <= REL_TOL && ratingW < best.ratingW))) ||
      (price === null && ratingW < best.ratingW)
    ) {
      best = { ratingW, price };
    }
  }
  return best;
}

/**
 * The fewest equal circuits whose share each fits one available rating, and the driver for
 * each (all circuits get the same rating, the smallest or cheapest covering the share).
 * Fewest circuits first: every extra circuit is another driver, feeder and fuse to fit.
 * null when there is no rating at all.
 */
export function splitIntoCircuits(requiredW: number, ratingsW: readonly number[], prices?: readonly number[]): CircuitSplit | null {
  if (ratingsW.length === 0) return null;
  let largest = 0;
  for (const r of ratingsW) largest = Math.max(largest, r);
  const circuits = Math.max(1, Math.ceil(requiredW / largest - REL_TOL));
  const requiredPerCircuitW = requiredW / circuits;
  const driver = singleDriverFor(requiredPerCircuitW, ratingsW, prices) as SingleDriver;
  return { circuits, requiredPerCircuitW, driver };
}
