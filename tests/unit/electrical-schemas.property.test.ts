import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import type { z } from 'zod';
import { cableRequestSchema, cableResponseSchema } from '../../shared/schemas/cable.js';
import { driverRequestSchema, driverResponseSchema } from '../../shared/schemas/driver.js';
import { voltageDropRequestSchema, voltageDropResponseSchema } from '../../shared/schemas/voltage-drop.js';
import { chooseCable } from '../../shared/sizing/cable.js';
import { chooseDrivers } from '../../shared/sizing/drivers.js';
import { SizingInputError } from '../../shared/tables/errors.js';
import { CONDUCTOR_TABLES, CONDUCTOR_TABLE_IDS } from '../../shared/tables/conductors.js';
import { voltageDrop } from '../../shared/sizing/voltage-drop.js';

type Bounded = { minValue: number | null; maxValue: number | null };

/** A double inside a zod number schema's own bounds, so the test follows the schema when it changes. */
function within(schema: z.ZodType): fc.Arbitrary<number> {
  const inner = ('unwrap' in schema ? (schema as unknown as z.ZodOptional<z.ZodType>).unwrap() : schema) as unknown as Bounded;
  return fc.double({ min: inner.minValue ?? -1e6, max: inner.maxValue ?? 1e6, noNaN: true, minExcluded: true });
}

const optional = <T>(arb: fc.Arbitrary<T>) => fc.option(arb, { nil: undefined });
const metricSizes = [...new Set(CONDUCTOR_TABLES['iec60228-class5'].rows.map((r) => r.size))];

describe('voltage-drop request schema', () => {
  const s = voltageDropRequestSchema.shape;
  const body = fc.record({
    supplyVoltageV: within(s.supplyVoltageV),
    currentA: within(s.currentA),
    lengthM: within(s.lengthM),
    // Mostly real sizes, some that no table lists, both systems against every table.
    conductor: fc.oneof(
      fc.record({ crossSectionMm2: fc.oneof(fc.constantFrom(...metricSizes), fc.double({ min: 0.01, max: 1000, noNaN: true })) }),
      fc.record({ awg: fc.integer({ min: 0, max: 40 }) }),
    ),
    conductorTable: optional(fc.constantFrom(...CONDUCTOR_TABLE_IDS)),
    temperatureC: optional(within(s.temperatureC)),
    loadDistribution: optional(fc.constantFrom('end' as const, 'uniform' as const)),
    maxDropPercent: optional(within(s.maxDropPercent)),
  });

  it('accepts only what the engine can size, and names the field when it cannot', () => {
    fc.assert(
      fc.property(body, (raw) => {
        const parsed = voltageDropRequestSchema.safeParse(raw);
        if (parsed.success) {
          expect(() => voltageDropResponseSchema.parse(voltageDrop(parsed.data))).not.toThrow();
          return;
        }
        // Everything else is in range, so the only rejection left is the conductor/table check.
        const paths = parsed.error.issues.map((i) => i.path.join('.'));
        expect(paths.every((p) => ['conductorTable', 'conductor.crossSectionMm2', 'conductor.awg'].includes(p))).toBe(true);
        let engineError: unknown;
        try {
          voltageDrop(raw as z.output<typeof voltageDropRequestSchema>);
        } catch (error) {
          engineError = error;
        }
        expect(engineError).toBeInstanceOf(SizingInputError);
        expect(paths).toContain((engineError as SizingInputError).path.join('.'));
      }),
    );
  });
});

describe('cable request schema', () => {
  const s = cableRequestSchema.shape;
  const body = fc.record({
    supplyVoltageV: within(s.supplyVoltageV),
    currentA: within(s.currentA),
    lengthM: within(s.lengthM),
    maxDropPercent: optional(within(s.maxDropPercent)),
    conductorTable: optional(fc.constantFrom(...CONDUCTOR_TABLE_IDS)),
    minCrossSectionMm2: optional(within(s.minCrossSectionMm2)),
    temperatureC: optional(within(s.temperatureC)),
    loadDistribution: optional(fc.constantFrom('end' as const, 'uniform' as const)),
  });

  it('never throws inside its ranges and answers in the response schema', () => {
    fc.assert(
      fc.property(body, (raw) => {
        const input = cableRequestSchema.parse(raw);
        expect(() => cableResponseSchema.parse(chooseCable(input))).not.toThrow();
      }),
    );
  });
});

describe('driver request schema', () => {
  const s = driverRequestSchema.shape;
  const ratings = driverRequestSchema.shape.availableRatingsW.unwrap();
  const body = fc.record({
    loadW: within(s.loadW),
    outputVoltageV: within(s.outputVoltageV),
    maxLoadingPercent: optional(within(s.maxLoadingPercent)),
    availableRatingsW: optional(fc.array(within(ratings.element), { minLength: 1, maxLength: 16 })),
    maxSupplyVA: optional(within(s.maxSupplyVA)),
    class2: optional(fc.boolean()),
    efficiencyPercent: optional(within(s.efficiencyPercent)),
    mainsVoltageV: optional(within(s.mainsVoltageV)),
    powerFactor: optional(within(s.powerFactor)),
  });

  it('never throws inside its ranges and answers in the response schema', () => {
    fc.assert(
      fc.property(body, (raw) => {
        const input = driverRequestSchema.parse(raw);
        expect(() => driverResponseSchema.parse(chooseDrivers(input))).not.toThrow();
      }),
    );
  });
});
