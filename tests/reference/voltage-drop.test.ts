import { unit } from 'mathjs';
import { describe, expect, it } from 'vitest';
import { voltageDropRequestSchema } from '../../shared/schemas/voltage-drop.js';
import { loopDropV, voltageDrop } from '../../shared/sizing/voltage-drop.js';

const run = (body: unknown) => voltageDrop(voltageDropRequestSchema.parse(body));

describe('IEC 60364-5-52 Annex G two-wire DC loop, worked examples', () => {
  it('24 V, 2 A, 10 m of 0.75 mm² class 5', () => {
    const result = run({ supplyVoltageV: 24, currentA: 2, lengthM: 10, conductor: { crossSectionMm2: 0.75 } });
    // domain.md worked example (IEC 60364-5-52 Annex G, cos φ = 1): 2 · 10 · 2 · 0.026 = 1.04 V
    expect(result.dropV).toBeCloseTo(1.04, 4);
    // domain.md worked example: 1.04 / 24 = 4.33 %
    expect(result.dropPercent).toBeCloseTo(4.33, 2);
    // IEC 60228 class 5 0.75 mm²: 26.0 Ω/km at 20 °C (the table's reference, used by default)
    expect(result.resistanceOhmPerKm).toBe(26);
    // common practice, no published source: 5 % default limit → 4.33 % passes
    expect(result.withinLimit).toBe(true);
    // 24 − 1.04 = 22.96 V (hand arithmetic)
    expect(result.voltageAtLoadV).toBeCloseTo(22.96, 4);
  });

  it('12 V, 5 A, 5 m of 1.5 mm² class 5', () => {
    const result = run({ supplyVoltageV: 12, currentA: 5, lengthM: 5, conductor: { crossSectionMm2: 1.5 } });
    // domain.md worked example: 2 · 5 · 5 · 0.0133 = 0.665 V
    expect(result.dropV).toBeCloseTo(0.665, 4);
    // domain.md worked example: 0.665 / 12 = 5.54 %
    expect(result.dropPercent).toBeCloseTo(5.54, 2);
    // common practice, no published source: 5 % default limit → 5.54 % fails
    expect(result.withinLimit).toBe(false);
    expect(result.warnings.map((w) => w.code)).toContain('drop_over_limit');
  });

  it('24 V, 3 A, 50 ft of 14 AWG stranded (NEC Table 8 at 75 °C)', () => {
    const lengthM = unit(50, 'ft').toNumber('m'); // mathjs: 50 ft = 15.24 m
    const result = run({ supplyVoltageV: 24, currentA: 3, lengthM, conductor: { awg: 14 }, conductorTable: 'nec-ch9-t8-stranded' });
    // domain.md worked example: 2 · 50 ft · 3 A · 3.14 Ω/kft = 0.942 V
    expect(result.dropV).toBeCloseTo(0.942, 4);
    // domain.md worked example: 0.942 / 24 = 3.925 %, printed there rounded half-up as 3.93 %
    expect(result.dropPercent).toBeCloseTo(3.925, 3);
    // NEC Chapter 9 Table 8 is at 75 °C, which is also the default temperature (domain.md)
    expect(result.temperatureC).toBe(75);
    // common practice, no published source: runs over 10 m are flagged
    expect(result.warnings.map((w) => w.code)).toContain('run_over_practice_length');
  });

  it('applies a given limit instead of the default', () => {
    // IEC 60364-5-52 Table G.52.1 (informative): lighting from a public LV supply 3 %; 4.33 % (worked example above) exceeds it
    const result = run({ supplyVoltageV: 24, currentA: 2, lengthM: 10, conductor: { crossSectionMm2: 0.75 }, maxDropPercent: 3 });
    expect(result.withinLimit).toBe(false);
    expect(result.maxDropPercent).toBe(3);
  });
});

describe('DC distributor theory: load spread along the run', () => {
  it('halves the drop of a uniform load fed from one end', () => {
    const result = run({ supplyVoltageV: 24, currentA: 2, lengthM: 10, conductor: { crossSectionMm2: 0.75 }, loadDistribution: 'uniform' });
    // DC distributor theory (any circuits text): I·R/2, half of the 1.04 V end-load worked example (domain.md)
    expect(result.dropV).toBeCloseTo(0.52, 4);
  });

  it('sums ten equal taps 1 m apart to R′ · L · I · (N+1)/N', () => {
    const rOhmPerKm = 26; // IEC 60228 class 5 0.75 mm²: 26.0 Ω/km
    const taps = 10;
    const currentA = 2;
    // Segment k (from the feed) carries the current of every tap beyond it.
    let discrete = 0;
    for (let k = 1; k <= taps; k += 1) discrete += loopDropV((currentA * (taps - k + 1)) / taps, 1, rOhmPerKm);
    // domain.md (DC distributor theory): Vd = R′ · L · I · (N+1)/N = 0.026 · 10 · 2 · 1.1 = 0.572 V
    expect(discrete).toBeCloseTo(0.572, 10);
    // DC distributor theory: the continuous limit (N → ∞) is the uniform rule, so ten taps drop a little more
    expect(discrete).toBeGreaterThan(loopDropV(currentA, taps, rOhmPerKm, 'uniform'));
  });
});

describe('current rating', () => {
  it('warns when the current exceeds the cord rating even though the drop is small', () => {
    // domain.md: "0.5 mm² at 10 A over 1 m drops little but overheats"; 0.5 mm² cord rating 3 A (BS 7671 Table 4F3A, from memory)
    const result = run({ supplyVoltageV: 24, currentA: 10, lengthM: 1, conductor: { crossSectionMm2: 0.5 }, maxDropPercent: 5 });
    expect(result.withinLimit).toBe(true); // 2 · 1 · 10 · 0.039 = 0.78 V = 3.25 % (IEC 60364-5-52 Annex G, IEC 60228 class 5)
    expect(result.warnings.map((w) => w.code)).toEqual(['current_over_rating']);
  });
});

describe('trace', () => {
  it('says which defaults were used', () => {
    const result = run({ supplyVoltageV: 24, currentA: 2, lengthM: 10, conductor: { awg: 18 } });
    // api-contract.md: awg defaults to the awg-solid table, temperature to its 20 °C reference
    expect(result.conductorTable).toBe('awg-solid');
    const byQuantity = Object.fromEntries(result.trace.map((t) => [t.quantity, t]));
    expect(byQuantity['conductorTable']!.inputs['default']).toBe(true);
    expect(byQuantity['temperatureC']!.inputs['default']).toBe(true);
    expect(byQuantity['withinLimit']!.inputs['maxDropPercentDefault']).toBe(true);
    expect(result.warnings.map((w) => w.code)).toContain('default_drop_limit');
    for (const quantity of ['resistanceOhmPerKm', 'loopResistanceOhm', 'dropV', 'dropPercent', 'voltageAtLoadV', 'withinLimit']) {
      expect(byQuantity[quantity]!.reference.length).toBeGreaterThan(0);
    }
  });

  it('keeps the table at its 20 °C reference (not the Annex G service value) and cites the table', () => {
    const result = run({ supplyVoltageV: 24, currentA: 2, lengthM: 10, conductor: { crossSectionMm2: 0.75 } });
    const basis = result.trace.find((t) => t.quantity === 'resistanceBasis')!;
    // api-contract.md: the calculation's default temperature is the table's reference, 20 °C for IEC 60228
    expect(basis.value).toBe('iec60228-class5 at 20 °C');
    expect(basis.reference).toMatch(/IEC 60228 class 5/);
    expect(basis.formula).toMatch(/not the Annex G service resistivity/);
    // IEC 60228 class 5 0.75 mm²: 26.0 Ω/km at 20 °C, unscaled
    expect(result.resistanceOhmPerKm).toBe(26);
  });

  it('cites the ELV lighting section for the 5 % default', () => {
    const result = run({ supplyVoltageV: 24, currentA: 2, lengthM: 10, conductor: { crossSectionMm2: 0.75 } });
    // IEC 60364-7-715 / BS 7671 715.525 (from memory): ≤ 5 % from the converter to the farthest luminaire
    expect(result.trace.find((t) => t.quantity === 'withinLimit')!.reference).toMatch(/IEC 60364-7-715 \/ BS 7671 715\.525/);
    expect(result.warnings.find((w) => w.code === 'default_drop_limit')!.message).toMatch(/ELV lighting limit/);
  });
});
