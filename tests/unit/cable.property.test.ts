import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import type { CableAlternative } from '../../shared/schemas/cable.js';
import { chooseCable, sizeFeeder, smallestSuitableConductor } from '../../shared/sizing/cable.js';
import { resistanceOhmPerKm } from '../../shared/sizing/conductors.js';
import { CONDUCTOR_TABLE_IDS } from '../../shared/tables/conductors.js';
import { loopDropV } from '../../shared/sizing/voltage-drop.js';

// Within the cable request schema's ranges, skewed to stair-sized runs so that every branch is hit.
const cableInput = fc.record(
  {
    supplyVoltageV: fc.constantFrom(5, 12, 24, 48),
    currentA: fc.double({ min: 0.01, max: 40, noNaN: true }),
    lengthM: fc.double({ min: 0.1, max: 40, noNaN: true }),
    maxDropPercent: fc.double({ min: 0.1, max: 50, noNaN: true }),
    conductorTable: fc.constantFrom(...CONDUCTOR_TABLE_IDS),
    minCrossSectionMm2: fc.constantFrom(0.1, 0.5, 0.75, 1.5, 4),
    temperatureC: fc.double({ min: -50, max: 150, noNaN: true }),
    loadDistribution: fc.constantFrom('end' as const, 'uniform' as const),
  },
  { requiredKeys: ['supplyVoltageV', 'currentA', 'lengthM'] },
);

const passes = (a: CableAlternative) => a.withinLimit && a.carriesCurrent && a.meetsMinimum;
const sizeOf = (a: CableAlternative) => ('awg' in a ? { awg: a.awg } : { crossSectionMm2: a.crossSectionMm2 });

describe('chooseCable', () => {
  it('recommends a size that meets the drop limit, the current and the minimum, and no smaller size does', () => {
    fc.assert(
      fc.property(cableInput, (input) => {
        const result = chooseCable(input);
        const index = result.alternatives.findIndex(passes);
        if (index === -1) {
          expect(result.recommended).toBeNull();
          expect(result.warnings.map((w) => w.code)).toContain('no_suitable_size');
          return;
        }
        const chosen = result.alternatives[index]!;
        expect(result.recommended).toEqual(sizeOf(chosen));
        // Recompute the drop unrounded from the table (IEC 60364-5-52 Annex G loop, IEC 60028 correction).
        const table = input.conductorTable ?? 'iec60228-class5';
        const r = resistanceOhmPerKm(table, sizeOf(chosen), input.temperatureC);
        const dropPercent = (loopDropV(input.currentA, input.lengthM, r, input.loadDistribution) / input.supplyVoltageV) * 100;
        expect(dropPercent).toBeLessThanOrEqual((input.maxDropPercent ?? 5) * (1 + 1e-9));
        expect(input.currentA).toBeLessThanOrEqual(result.currentRatingA!);
        // Every thinner size fails a check; the one just below fails drop or current unless it is under the minimum.
        for (const thinner of result.alternatives.slice(0, index)) expect(passes(thinner)).toBe(false);
        const below = result.alternatives[index - 1];
        if (below && below.meetsMinimum) expect(below.withinLimit && below.carriesCurrent).toBe(false);
      }),
    );
  });

  it('agrees with the trace-free chooser the estimate uses', () => {
    fc.assert(
      fc.property(cableInput, (input) => {
        const lean = smallestSuitableConductor(input.supplyVoltageV, input.currentA, input.lengthM, input);
        expect(lean ? lean.size : null).toEqual(chooseCable(input).recommended);
      }),
    );
  });

  it('warns about runs over 10 m (common practice, no published source)', () => {
    fc.assert(
      fc.property(cableInput, (input) => {
        const warned = chooseCable(input).warnings.some((w) => w.code === 'run_over_practice_length');
        expect(warned).toBe(input.lengthM > 10);
      }),
    );
  });

  it('never recommends an AWG gauge thinner than the mm² minimum', () => {
    fc.assert(
      fc.property(cableInput, (input) => {
        const result = chooseCable({ ...input, conductorTable: 'awg-solid' });
        const chosen = result.alternatives.find(passes);
        if (chosen) expect(chosen.areaMm2).toBeGreaterThanOrEqual((input.minCrossSectionMm2 ?? 0.5) - 1e-4);
      }),
    );
  });
});

describe('sizeFeeder', () => {
  it('sizes for the total current and flags it against the controller maximum', () => {
    const maxInput = fc.option(fc.double({ min: 0.5, max: 40, noNaN: true }), { nil: undefined });
    fc.assert(
      fc.property(cableInput, maxInput, (input, maxInputCurrentA) => {
        const { currentA, ...rest } = input;
        const feeder = sizeFeeder({ ...rest, totalCurrentA: currentA, maxInputCurrentA });
        expect(feeder.cable.recommended).toEqual(chooseCable(input).recommended);
        expect(feeder.exceedsControllerInput).toBe(maxInputCurrentA === undefined ? null : currentA > maxInputCurrentA);
        expect(feeder.warnings.length > 0).toBe(feeder.exceedsControllerInput === true);
      }),
    );
  });
});
