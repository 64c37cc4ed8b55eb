import { describe, expect, it } from 'vitest';
import { pixelsRequestSchema } from '../../shared/schemas/pixels.js';
import { clockedFrameBits, injectionPoints, pixelData, railGrouping } from '../../shared/sizing/pixels.js';

const run = (input: unknown) => pixelData(pixelsRequestSchema.parse(input));

describe('one-wire frame time', () => {
  it('300 RGB pixels at 800 kbit/s with a 280 µs reset', () => {
    const result = run({ pixels: 300, protocol: 'one-wire-800k' });
    // WS2812B datasheet: 24 bits × 1.25 µs per pixel, reset ≥ 280 µs → 300 × 30 + 280 = 9 280 µs
    expect(result.frameTimeUs).toBe(9280);
    // WS2812B datasheet timing: 1 / 9 280 µs = 107.76 Hz
    expect(result.maxRefreshHz).toBeCloseTo(107.76, 2);
  });

  it('300 RGBW pixels, 32 bits, 80 µs reset', () => {
    const result = run({ pixels: 300, protocol: 'one-wire-800k', bitsPerPixel: 32, resetUs: 80 });
    // SK6812RGBW datasheet: 32 bits × 1.25 µs × 300 + 80 µs = 12 080 µs
    expect(result.frameTimeUs).toBe(12080);
    // SK6812RGBW datasheet timing: 1 / 12 080 µs = 82.78 Hz
    expect(result.maxRefreshHz).toBeCloseTo(82.78, 2);
  });

  it('400 kbit/s doubles the bit time', () => {
    const result = run({ pixels: 100, protocol: 'one-wire-400k' });
    // 1 / 400 kbit/s = 2.5 µs per bit (arithmetic from the line rate): 100 × 24 × 2.5 + 280 = 6 280 µs
    expect(result.frameTimeUs).toBe(6280);
  });

  it('says which defaults it used', () => {
    const result = run({ pixels: 300, protocol: 'one-wire-800k' });
    const defaults = result.trace.filter((t) => t.quantity.startsWith('default ')).map((t) => t.quantity);
    // bitsPerPixel 24 and resetUs 280 (WS2812B datasheet), 60 mA (common practice, from memory), 5 V, 100 %
    expect(defaults).toEqual([
      'default bitsPerPixel',
      'default resetUs',
      'default currentPerPixelMa',
      'default supplyVoltageV',
      'default brightnessPercent',
    ]);
  });
});

describe('clocked frame time', () => {
  it('100 LEDs at 1 MHz: 32 + 3 200 + 56 bits', () => {
    // APA102C datasheet; "Understanding the APA102 superled", cpldcpu 2014: end frame ⌈100/16⌉ = 7 bytes = 56 bits
    expect(clockedFrameBits(100)).toBe(3288);
    // same sources: 3 288 bits at 1 MHz = 3 288 µs
    expect(run({ pixels: 100, protocol: 'clocked' }).frameTimeUs).toBe(3288);
  });

  it('never sends an end frame under 32 bits', () => {
    // cpldcpu 2014: ⌈10/16⌉ = 1 byte = 8 bits, raised to the 32-bit minimum → 32 + 320 + 32
    expect(clockedFrameBits(10)).toBe(384);
    // cpldcpu 2014: ⌈1000/16⌉ = 63 bytes = 504 bits → 32 + 32 000 + 504
    expect(clockedFrameBits(1000)).toBe(32536);
  });

  it('scales with the clock', () => {
    // APA102C datasheet frame: 3 288 bits at 4 MHz = 822 µs (arithmetic)
    expect(run({ pixels: 100, protocol: 'clocked', clockHz: 4_000_000 }).frameTimeUs).toBe(822);
  });
});

describe('outputs and power of the corridor rail', () => {
  // Quayside Studio (demo scenario): 18 m × 60 pixels/m = 1 080 pixels, outputs of 800 pixels
  const result = run({ pixels: 1080, protocol: 'one-wire-800k', maxPixelsPerOutput: 800, brightnessPercent: 50 });

  it('splits the rail over whole outputs', () => {
    // hand arithmetic: ceil(1 080 / 800) = 2 outputs, 540 pixels each
    expect(result.outputsNeeded).toBe(2);
    expect(result.pixelsPerOutput).toBe(540);
  });

  it('scales full-white current with the brightness cap', () => {
    // 60 mA per 5 V RGB pixel (common practice, from memory): 1 080 × 0.06 A × 50 % = 32.4 A
    expect(result.fullWhiteCurrentA).toBeCloseTo(32.4, 6);
    // P = V·I: 32.4 A × 5 V = 162 W
    expect(result.powerW).toBeCloseTo(162, 6);
    // common practice, no published source: above 10 A a run needs several feeds
    expect(result.warnings.map((w) => w.code)).toContain('high_current');
  });

  it('warns when a frame is too slow for smooth animation', () => {
    // WS2812B timing: 2 000 × 30 µs + 280 µs = 60 280 µs → 16.6 Hz, under 30 Hz (common practice, no published source)
    const slow = run({ pixels: 2000, protocol: 'one-wire-800k' });
    expect(slow.maxRefreshHz).toBeCloseTo(16.59, 2);
    expect(slow.warnings.map((w) => w.code)).toContain('refresh_rate_low');
  });
});

describe('rail grouping', () => {
  it('gives 16 treads 32 groups and fits whole groups of pixels', () => {
    const grouping = railGrouping(16, 1080);
    // common practice, no published source: two groups per tread
    expect(grouping.groups).toBe(32);
    // hand arithmetic: floor(1 080 / 32) = 33 pixels per group, 33 × 32 = 1 056 pixels fitted
    expect(grouping.pixelsPerGroup).toBe(33);
    expect(grouping.pixelsToFit).toBe(1056);
  });
});

describe('power injection', () => {
  it('feeds an 18 m 5 V pixel rail every 2.5 m', () => {
    // common practice, from memory: about 2.5 m per feed on 5 V pixel strip → ceil(18 / 2.5) − 1 = 7
    expect(injectionPoints({ lengthM: 18, voltageV: 5 }).injectionPoints).toBe(7);
  });

  it('feeds 24 V strip every 5 m', () => {
    // common practice, from memory: about 5 m per feed at 24 V → ceil(10 / 5) − 1 = 1; exactly 5 m needs none
    expect(injectionPoints({ lengthM: 10, voltageV: 24 }).injectionPoints).toBe(1);
    expect(injectionPoints({ lengthM: 5, voltageV: 24 }).injectionPoints).toBe(0);
  });

  it('drops I·R/2 along a strip with its load spread evenly', () => {
    const plan = injectionPoints({ lengthM: 2, voltageV: 24, traceResistanceOhmPerM: 0.05, currentA: 4 });
    // DC distributor theory: loop R = 2 × 0.05 × 2 = 0.2 Ω, Vd = 4 A × 0.2 Ω / 2 = 0.4 V, within 5 % of 24 V
    expect(plan.injectionPoints).toBe(0);
    expect(plan.dropV).toBeCloseTo(0.4, 9);
  });

  it('agrees with many equal taps', () => {
    // domain rule, equal taps 1 m apart: Vd = R′ · L · I · (N+1)/N → R′ · L · I as N grows (DC distributor theory)
    const taps = 1000;
    const lengthM = 2;
    const discrete = 0.05 * lengthM * 4 * (taps + 1) / taps;
    const plan = injectionPoints({ lengthM, voltageV: 24, traceResistanceOhmPerM: 0.05, currentA: 4 });
    expect(plan.dropV as number).toBeCloseTo(discrete, 3);
  });

  it('adds feeds until each segment stays within the drop limit', () => {
    const plan = injectionPoints({ lengthM: 2, voltageV: 5, traceResistanceOhmPerM: 0.05, currentA: 4 });
    // DC distributor theory: 5 % of 5 V = 0.25 V; longest segment √(0.25 / (2 A/m × 0.05 Ω/m)) = 1.58 m → one injection
    expect(plan.injectionPoints).toBe(1);
    // hand arithmetic: 1 m segments carry 2 A → 2 × 0.05 × 1² = 0.1 V
    expect(plan.dropV).toBeCloseTo(0.1, 9);
  });
});
