import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { splitIntoCircuits } from '../../shared/sizing/driver-mix.js';
import { chooseDrivers, class2MaxVA, requiredRatingW } from '../../shared/sizing/drivers.js';
import { SizingInputError } from '../../shared/tables/errors.js';

/**
 * Independent oracle for one supply per circuit: try 1, 2, 3 … equal circuits until some single
 * rating covers a circuit's share; among those ratings the cheapest (or smallest).
 */
function oracle(requiredW: number, ratings: number[], prices?: number[]) {
  for (let circuits = 1; ; circuits += 1) {
    const share = requiredW / circuits;
    const fits = ratings.map((r, i) => ({ r, p: prices ? prices[i]! : r })).filter((x) => x.r >= share * (1 - 1e-9));
    if (fits.length === 0) continue;
    fits.sort((x, y) => x.p - y.p || x.r - y.r);
    return { circuits, ratingW: fits[0]!.r, price: fits[0]!.p };
  }
}

const ratings = fc.array(fc.integer({ min: 10, max: 500 }), { minLength: 1, maxLength: 5 });
const load = fc.double({ min: 1, max: 1500, noNaN: true });
const loading = fc.double({ min: 50, max: 100, noNaN: true });

describe('chooseDrivers', () => {
  it('gives every circuit one driver that covers it at or below the loading limit', () => {
    fc.assert(
      fc.property(load, loading, ratings, (loadW, maxLoadingPercent, availableRatingsW) => {
        const result = chooseDrivers({ loadW, outputVoltageV: 24, maxLoadingPercent, availableRatingsW });
        // one supply per circuit (domain.md "Driver"): a single rating group, count = circuits
        expect(result.drivers).toHaveLength(1);
        const [group] = result.drivers;
        expect(group!.count).toBe(result.circuits);
        // common practice, no published source: each circuit's rating ≥ its load / loading
        expect(group!.ratingW).toBeGreaterThanOrEqual(requiredRatingW(group!.loadW, maxLoadingPercent) * (1 - 1e-6));
        expect(group!.loadingPercent).toBeLessThanOrEqual(maxLoadingPercent + 1e-4);
        // the circuits add back up to the load (each loadW is rounded to 4 decimals)
        expect(Math.abs(group!.loadW * group!.count - loadW)).toBeLessThanOrEqual(5e-5 * group!.count + 1e-9);
        // no paralleling to reach a rating: more than one circuit only when no single rating covers the whole load
        if (result.circuits > 1) expect(Math.max(...availableRatingsW)).toBeLessThan(requiredRatingW(loadW, maxLoadingPercent));
      }),
    );
  });

  it('finds the same split as an independent oracle (fewest circuits, then the cheapest or smallest rating)', () => {
    const prices = fc.option(fc.array(fc.integer({ min: 1, max: 200 }), { minLength: 5, maxLength: 5 }), { nil: undefined });
    fc.assert(
      fc.property(fc.double({ min: 1, max: 2000, noNaN: true }), fc.array(fc.integer({ min: 50, max: 500 }), { minLength: 1, maxLength: 5 }), prices, (loadW, available, priceList) => {
        const requiredW = requiredRatingW(loadW);
        const p = priceList?.slice(0, available.length);
        const split = splitIntoCircuits(requiredW, available, p)!;
        const expected = oracle(requiredW, available, p);
        expect(split.circuits).toBe(expected.circuits);
        expect(split.driver.ratingW).toBe(expected.ratingW);
        if (p) expect(split.driver.price).toBe(expected.price);
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

  it('prefers the cheaper single driver when prices are given', () => {
    // 100 W needs 125 W (common practice 80 %); by rating one 150 W wins, by price one 200 W does (invented prices).
    expect(chooseDrivers({ loadW: 100, outputVoltageV: 24, availableRatingsW: [100, 150, 200] }).drivers.map((d) => d.ratingW)).toEqual([150]);
    const priced = chooseDrivers({ loadW: 100, outputVoltageV: 24, availableRatingsW: [100, 150, 200], prices: new Map([[100, 10], [150, 40], [200, 25]]) });
    expect(priced.drivers.map((d) => d.ratingW)).toEqual([200]);
    expect(priced.totalPrice).toBe(25); // one 200 W at 25 (the invented prices above)
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
