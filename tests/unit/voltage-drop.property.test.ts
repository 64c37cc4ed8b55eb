import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { resistanceOhmPerKm, standardSizes } from '../../shared/sizing/conductors.js';
import { CONDUCTOR_TABLE_IDS } from '../../shared/tables/conductors.js';
import { loopDropV, voltageDrop } from '../../shared/sizing/voltage-drop.js';

// Ranges of the voltage-drop request schema (currentA, lengthM: > 0 and ≤ 1000).
const current = fc.double({ min: 1e-3, max: 1000, noNaN: true });
const length = fc.double({ min: 1e-3, max: 1000, noNaN: true });
const resistance = fc.double({ min: 0.1, max: 4000, noNaN: true });
const growth = fc.double({ min: 1.001, max: 10, noNaN: true });

describe('loop drop Vd = 2 · L · I · R′ (IEC 60364-5-52 Annex G)', () => {
  it('grows with length', () => {
    fc.assert(fc.property(current, length, resistance, growth, (i, l, r, k) => loopDropV(i, l * k, r) > loopDropV(i, l, r)));
  });

  it('grows with current', () => {
    fc.assert(fc.property(current, length, resistance, growth, (i, l, r, k) => loopDropV(i * k, l, r) > loopDropV(i, l, r)));
  });

  it('halves for a uniform load (DC distributor theory)', () => {
    fc.assert(
      fc.property(current, length, resistance, (i, l, r) => {
        expect(loopDropV(i, l, r, 'uniform')).toBeCloseTo(loopDropV(i, l, r) / 2, 12);
      }),
    );
  });

  it('falls as the cross-section grows, in every table and at any temperature', () => {
    const tableId = fc.constantFrom(...CONDUCTOR_TABLE_IDS);
    const temperature = fc.double({ min: -50, max: 150, noNaN: true });
    fc.assert(
      fc.property(tableId, current, length, temperature, (id, i, l, t) => {
        const drops = standardSizes(id).map((size) => loopDropV(i, l, resistanceOhmPerKm(id, size, t)));
        for (let k = 1; k < drops.length; k += 1) expect(drops[k]!).toBeLessThan(drops[k - 1]!);
      }),
    );
  });

  it('grows with temperature (copper’s positive α, IEC 60028)', () => {
    const temperature = fc.double({ min: -50, max: 149, noNaN: true });
    fc.assert(
      fc.property(temperature, (t) => resistanceOhmPerKm('iec60228-class5', { crossSectionMm2: 1 }, t + 1) > resistanceOhmPerKm('iec60228-class5', { crossSectionMm2: 1 }, t)),
    );
  });
});

describe('voltageDrop', () => {
  it('reports a drop that never falls with length or current (rounded output)', () => {
    fc.assert(
      fc.property(current, length, growth, (i, l, k) => {
        const base = { supplyVoltageV: 24, conductor: { crossSectionMm2: 0.75 } } as const;
        const d = voltageDrop({ ...base, currentA: i, lengthM: l }).dropV;
        expect(voltageDrop({ ...base, currentA: i, lengthM: l * k }).dropV).toBeGreaterThanOrEqual(d);
        expect(voltageDrop({ ...base, currentA: i * k, lengthM: l }).dropV).toBeGreaterThanOrEqual(d);
      }),
    );
  });

  it('flags the limit exactly when the percentage exceeds it', () => {
    const limit = fc.double({ min: 0.1, max: 50, noNaN: true });
    fc.assert(
      fc.property(current, length, limit, (i, l, maxDropPercent) => {
        const r = voltageDrop({ supplyVoltageV: 24, currentA: i, lengthM: l, conductor: { crossSectionMm2: 1.5 }, maxDropPercent });
        // dropPercent is rounded to 4 decimals for output; allow that rounding at the boundary.
        if (r.dropPercent > maxDropPercent + 1e-4) expect(r.withinLimit).toBe(false);
        if (r.dropPercent < maxDropPercent - 1e-4) expect(r.withinLimit).toBe(true);
        expect(r.warnings.some((w) => w.code === 'drop_over_limit')).toBe(!r.withinLimit);
      }),
    );
  });
});
