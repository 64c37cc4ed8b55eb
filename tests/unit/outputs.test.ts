import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { controllerProfileSchema, type ControllerProfile } from '../../shared/schemas/controller.js';
import { allocateOutputs } from '../../shared/sizing/outputs.js';

// HL-K20 (demo scenario): 20 outputs at 1.5 A; the tread range is invented for the test.
const hlK20: ControllerProfile = controllerProfileSchema.parse({ outputs: 20, maxCurrentPerOutputA: 1.5, minTreads: 2, maxTreads: 20 });

const profiles = fc.record(
  {
    outputs: fc.integer({ min: 0, max: 40 }),
    maxCurrentPerOutputA: fc.double({ min: 0.1, max: 5, noNaN: true }),
    minTreads: fc.integer({ min: 1, max: 5 }),
    maxTreads: fc.integer({ min: 5, max: 40 }),
    maxInputCurrentA: fc.double({ min: 0.5, max: 30, noNaN: true }),
  },
  { requiredKeys: ['outputs', 'maxCurrentPerOutputA'] },
);
const currents = fc.array(fc.double({ min: 0, max: 3, noNaN: true }), { minLength: 1, maxLength: 80 });

describe('output allocation', () => {
  it('one tread per output on a stair that fits one controller', () => {
    // Alder Row (demo scenario): 14 treads × 850 mm × 10 W/m at 24 V = 0.354 A each (hand arithmetic)
    const result = allocateOutputs({ treadCurrentsA: Array.from({ length: 14 }, () => 0.354), profile: hlK20 });
    expect(result.outputsNeeded).toBe(14);
    expect(result.controllersNeeded).toBe(1);
    // HL-K20 profile: 0.354 A ≤ 1.5 A per output
    expect(result.outputCurrentOk).toBe(true);
    expect(result.outputs.map((o) => o.treads)).toEqual(Array.from({ length: 14 }, (_, i) => [i + 1]));
  });

  it('splits a long stair into near-equal contiguous blocks', () => {
    // hand arithmetic: 21 treads, 20 per controller → 2 controllers of 11 and 10 (not 20 + 1, below minTreads 2)
    const result = allocateOutputs({ treadCurrentsA: Array.from({ length: 21 }, () => 0.3), profile: hlK20 });
    expect(result.controllersNeeded).toBe(2);
    expect(result.controllers.map((c) => [c.firstTread, c.lastTread])).toEqual([[1, 11], [12, 21]]);
    expect(result.outputCountOk).toBe(false);
    expect(result.treadCountInRange).toBe(false);
  });

  it('flags an output above the profile limit', () => {
    // HL-K20 profile: 1.6 A > 1.5 A per output
    const result = allocateOutputs({ treadCurrentsA: [0.5, 1.6, 0.5], profile: hlK20 });
    expect(result.outputCurrentOk).toBe(false);
    expect(result.outputs[1]?.withinLimit).toBe(false);
    expect(result.warnings.map((w) => w.code)).toContain('output_current_exceeded');
  });

  it('adds controllers while one draws more than its input limit', () => {
    // hand arithmetic: 10 treads × 1 A = 10 A; at most 4 A per controller → 3 blocks of 4, 3, 3 A
    const profile = { ...hlK20, maxInputCurrentA: 4 };
    const result = allocateOutputs({ treadCurrentsA: Array.from({ length: 10 }, () => 1), profile });
    expect(result.controllersNeeded).toBe(3);
    expect(result.controllers.map((c) => c.currentA)).toEqual([4, 3, 3]);
    expect(result.inputCurrentOk).toBe(true);
  });

  it('keeps current, covers every tread once, and respects the profile', () => {
    fc.assert(
      fc.property(currents, profiles, fc.integer({ min: 1, max: 3 }), (treadCurrentsA, raw, treadsPerOutput) => {
        const profile = controllerProfileSchema.parse(raw);
        const result = allocateOutputs({ treadCurrentsA, profile, treadsPerOutput });
        if (profile.outputs === 0) {
          expect(result.controllersNeeded).toBeNull();
          return;
        }
        // Kirchhoff's current law: output currents add up to the tread currents
        const total = treadCurrentsA.reduce((s, c) => s + c, 0);
        expect(result.outputs.reduce((s, o) => s + o.currentA, 0)).toBeCloseTo(total, 9);
        expect(result.controllers.reduce((s, c) => s + c.currentA, 0)).toBeCloseTo(total, 9);
        // a partition of treads 1…n in order, in contiguous blocks
        expect(result.outputs.flatMap((o) => o.treads)).toEqual(treadCurrentsA.map((_, i) => i + 1));
        result.controllers.forEach((c, i) => {
          expect(c.firstTread).toBe(i === 0 ? 1 : (result.controllers[i - 1]?.lastTread as number) + 1);
          expect(c.outputsUsed).toBeLessThanOrEqual(profile.outputs);
          expect(c.treads).toBeLessThanOrEqual(profile.maxTreads ?? Infinity);
        });
        for (const o of result.outputs) expect(o.treads.length).toBeLessThanOrEqual(treadsPerOutput);
        expect(result.outputCurrentOk).toBe(treadCurrentsA.length > 0 && result.outputs.every((o) => o.currentA <= profile.maxCurrentPerOutputA));
      }),
    );
  });
});
