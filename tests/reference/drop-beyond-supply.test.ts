import { describe, expect, it } from 'vitest';
import { cableRequestSchema } from '../../shared/schemas/cable.js';
import { estimateRequestSchema } from '../../shared/schemas/estimate.js';
import { voltageDropRequestSchema } from '../../shared/schemas/voltage-drop.js';
import { chooseCable } from '../../shared/sizing/cable.js';
import { estimate } from '../../shared/sizing/estimate/estimate.js';
import { voltageDrop } from '../../shared/sizing/voltage-drop.js';

// issue 9, item 15: a drop larger than the supply was answered as −6.9 MV at the load, a plain 200.
describe('a drop as large as the supply is flagged, never shown as a negative load voltage', () => {
  it('voltage-drop: AWG 40 over 1000 m at 1000 A on 24 V → 0 V at the load, drop_exceeds_supply, not within the limit', () => {
    const result = voltageDrop(voltageDropRequestSchema.parse({ supplyVoltageV: 24, currentA: 1000, lengthM: 1000, conductor: { awg: 40 } }));
    // IEC 60364-5-52 Annex G: Vd = 2 · L · I · R′ = 2 · 1 km · 1000 A · R′ (Ω/km) — millions of volts on a 24 V supply
    expect(result.dropV).toBeCloseTo(2 * 1 * 1000 * result.resistanceOhmPerKm, 0);
    expect(result.dropV).toBeGreaterThan(1_000_000);
    expect(result.voltageAtLoadV).toBe(0);
    expect(result.withinLimit).toBe(false);
    expect(result.warnings.map((w) => w.code)).toContain('drop_exceeds_supply');
    expect(result.trace.find((e) => e.quantity === 'voltageAtLoadV')?.value).toBe(0);
  });

  it('voltage-drop: exactly the supply is flagged too, just under it is not', () => {
    // 0.75 mm² class 5 at 20 °C: 26.0 Ω/km (IEC 60228 Table 3); Vd = 2 · 0.01 km · I · 26 = 0.52 · I
    const at = (currentA: number) => voltageDrop(voltageDropRequestSchema.parse({ supplyVoltageV: 26, currentA, lengthM: 10, conductor: { crossSectionMm2: 0.75 }, maxDropPercent: 50 }));
    const equal = at(50); // arithmetic: 0.52 · 50 = 26 V = the supply
    expect(equal.dropV).toBeCloseTo(26, 6);
    expect(equal.voltageAtLoadV).toBe(0);
    expect(equal.warnings.map((w) => w.code)).toContain('drop_exceeds_supply');
    const under = at(25); // arithmetic: 13 V of 26 V, 50 %
    expect(under.voltageAtLoadV).toBeCloseTo(13, 6);
    expect(under.warnings.map((w) => w.code)).not.toContain('drop_exceeds_supply');
  });

  it('cable: when even the largest size drops more than the supply, the answer says so', () => {
    const result = chooseCable(cableRequestSchema.parse({ supplyVoltageV: 5, currentA: 500, lengthM: 1000 }));
    expect(result.recommended).toBeNull();
    const largest = result.alternatives.at(-1)!;
    expect(largest.dropV).toBeGreaterThanOrEqual(5);
    expect(result.warnings.map((w) => w.code)).toEqual(expect.arrayContaining(['no_suitable_size', 'drop_exceeds_supply']));
  });

  it('cable: a run that merely misses the limit gets no drop_exceeds_supply', () => {
    const result = chooseCable(cableRequestSchema.parse({ supplyVoltageV: 24, currentA: 20, lengthM: 30 }));
    expect(result.warnings.map((w) => w.code)).not.toContain('drop_exceeds_supply');
  });

  it('estimate: a drop of 100 % or more fails cable-drop and says no voltage would reach the strip', () => {
    // 4 treads of 5 m at 200 W/m on 1 V: 1000 A per tread (P / V), far beyond any cable of the table
    const result = estimate(
      estimateRequestSchema.parse({
        layout: 'tread-strips',
        staircase: { treads: 4, treadWidthMm: 5000, riserHeightMm: 180, goingMm: 250 },
        treadStrip: { voltageV: 1, powerWPerM: 200, cutPitchMm: 50 },
        controller: { profile: { outputs: 20, maxCurrentPerOutputA: 100 } },
      }),
    );
    const check = result.checks.find((c) => c.id === 'cable-drop')!;
    expect(check.status).toBe('fail');
    expect(Number(check.value)).toBeGreaterThanOrEqual(100);
    expect(check.message).toContain('no voltage would reach the strip');
  });
});
