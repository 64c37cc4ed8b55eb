import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { chooseDriverMix } from '../../shared/sizing/driver-mix.js';
import { chooseDrivers, class2MaxVA, requiredRatingW } from '../../shared/sizing/drivers.js';
import { SizingInputError } from '../../shared/sizing/errors.js';

/**
 * Independent brute force: every multiset of the ratings, smallest count first; the best by
 * (cost, distinct ratings, total rating) — the order the handbook (domain.md) gives.
 */
function bruteForce(requiredW: number, ratings: number[], prices?: number[]) {
  const unique = [...new Set(ratings)].map((r) => ({ r, p: prices ? Math.min(...ratings.flatMap((x, i) => (x === r ? [prices[i]!] : []))) : r }));
  for (let count = 1; ; count += 1) {
    let best: { cost: number; distinct: number; total: number } | null = null;
    const walk = (start: number, left: number, total: number, cost: number, used: Set<number>) => {
      if (left === 0) {
        if (total < requiredW * (1 - 1e-9)) return;
        const cand = { cost, distinct: used.size, total };
        const better =
          !best ||
          cand.cost < best.cost - 1e-9 ||
          (Math.abs(cand.cost - best.cost) <= 1e-9 && (cand.distinct < best.distinct || (cand.distinct === best.distinct && cand.total < best.total - 1e-9)));
        if (better) best = cand;
        return;
      }
      for (let i = start; i < unique.length; i += 1) {
        const next = new Set(used).add(unique[i]!.r);
        walk(i, left - 1, total + unique[i]!.r, cost + unique[i]!.p, next);
      }
    };
    walk(0, count, 0, 0, new Set());
    if (best) return { count, ...(best as { cost: number; distinct: number; total: number }) };
  }
}

const ratings = fc.array(fc.integer({ min: 10, max: 500 }), { minLength: 1, maxLength: 5 });
const load = fc.double({ min: 1, max: 1500, noNaN: true });
const loading = fc.double({ min: 50, max: 100, noNaN: true });

describe('chooseDrivers', () => {
  it('always covers load / loading with the loading at or below the limit', () => {
    fc.assert(
      fc.property(load, loading, ratings, (loadW, maxLoadingPercent, availableRatingsW) => {
        const result = chooseDrivers({ loadW, outputVoltageV: 24, maxLoadingPercent, availableRatingsW });
        // common practice, no published source: Σ ratings ≥ load / loading
        expect(result.totalRatingW).toBeGreaterThanOrEqual(requiredRatingW(loadW, maxLoadingPercent) * (1 - 1e-9));
        for (const d of result.drivers) expect(d.loadingPercent).toBeLessThanOrEqual(maxLoadingPercent + 1e-4);
        // The load is shared in proportion to rating: the groups add back up to the load (each loadW is rounded to 4 decimals).
        const shared = result.drivers.reduce((sum, d) => sum + d.loadW * d.count, 0);
        expect(Math.abs(shared - loadW)).toBeLessThanOrEqual(5e-5 * result.driverCount + 1e-9);
      }),
    );
  });

  it('finds the same optimum as brute force (fewest, then cheapest or smallest, then fewest distinct)', () => {
    const prices = fc.option(fc.array(fc.integer({ min: 1, max: 200 }), { minLength: 5, maxLength: 5 }), { nil: undefined });
    fc.assert(
      // Small enough for brute force: at most 15 drivers from 5 ratings.
      fc.property(fc.double({ min: 1, max: 600, noNaN: true }), fc.array(fc.integer({ min: 50, max: 500 }), { minLength: 1, maxLength: 5 }), prices, (loadW, available, priceList) => {
        const requiredW = requiredRatingW(loadW);
        const p = priceList?.slice(0, available.length);
        const mix = chooseDriverMix(requiredW, available, p)!;
        const oracle = bruteForce(requiredW, available, p);
        expect(mix.driverCount).toBe(oracle.count);
        expect(mix.totalPrice ?? mix.totalRatingW).toBeCloseTo(oracle.cost, 6);
        expect(mix.ratingsW.length).toBe(oracle.distinct);
        expect(mix.totalRatingW).toBeCloseTo(oracle.total, 6);
        expect(mix.exhaustive).toBe(true);
      }),
    );
  });

  it('never uses a rating above the Class 2 or explicit cap', () => {
    const voltage = fc.double({ min: 1, max: 60, noNaN: true });
    const cap = fc.option(fc.double({ min: 1, max: 500, noNaN: true }), { nil: undefined });
    fc.assert(
      fc.property(load, voltage, cap, ratings, (loadW, outputVoltageV, maxSupplyVA, availableRatingsW) => {
        const result = chooseDrivers({ loadW, outputVoltageV, class2: true, maxSupplyVA, availableRatingsW });
        // NEC Chapter 9 Table 11(B) limit for the voltage, and the explicit cap
        const limit = Math.min(class2MaxVA(outputVoltageV)!, maxSupplyVA ?? Infinity);
        for (const d of result.drivers) expect(d.ratingW).toBeLessThanOrEqual(limit * (1 + 1e-9));
        if (result.drivers.length === 0) expect(result.warnings.map((w) => w.code)).toContain('no_usable_driver_rating');
      }),
    );
  });

  it('prefers the cheaper mix when prices are given', () => {
    // 200 W needs 250 W (common practice 80 %); by rating 150 + 100 (250 W) wins, by price 200 + 100 (invented prices) does.
    expect(chooseDrivers({ loadW: 200, outputVoltageV: 24, availableRatingsW: [100, 150, 200] }).drivers.map((d) => d.ratingW)).toEqual([150, 100]);
    const priced = chooseDrivers({ loadW: 200, outputVoltageV: 24, availableRatingsW: [100, 150, 200], prices: new Map([[100, 10], [150, 40], [200, 25]]) });
    expect(priced.drivers.map((d) => d.ratingW)).toEqual([200, 100]);
    expect(priced.totalPrice).toBe(35); // 25 + 10 (the invented prices above)
  });

  it('rejects prices that do not match the ratings', () => {
    expect(() => chooseDrivers({ loadW: 100, outputVoltageV: 24, availableRatingsW: [100, 150], prices: [10] })).toThrow(/prices/);
    expect(() => chooseDrivers({ loadW: 100, outputVoltageV: 24, availableRatingsW: [100, 150], prices: new Map([[100, 10]]) })).toThrow(/150 W/);
  });

  it('rejects ratings and loadings that would make the search endless', () => {
    expect(() => chooseDrivers({ loadW: 100, outputVoltageV: 24, availableRatingsW: [0, 100] })).toThrow(SizingInputError);
    expect(() => chooseDrivers({ loadW: 100, outputVoltageV: 24, maxLoadingPercent: 0 })).toThrow(SizingInputError);
  });
});
