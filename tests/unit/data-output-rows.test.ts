import { describe, expect, it } from 'vitest';
import { estimateRequestSchema, estimateResponseSchema } from '../../shared/schemas/estimate.js';
import { estimate } from '../../shared/sizing/estimate/estimate.js';
import { MAX_PIXELS_PER_RUN, MIN_PIXELS_PER_DATA_OUTPUT } from '../../shared/tables/limits.js';

const longRail = (dataOutputs: number) =>
  estimateRequestSchema.parse({
    layout: 'rail-pixels',
    // arithmetic: 200 m × 100 pixels/m = 20 000 pixels, at most 50 per output → 400 outputs
    railPixels: { lengthM: 200, pixelsPerM: 100, voltageV: 5, protocol: 'one-wire-800k' },
    controller: { profile: { outputs: 0, maxCurrentPerOutputA: 1, dataOutputs, maxPixelsPerOutput: MIN_PIXELS_PER_DATA_OUTPUT } },
  });

describe('data output rows are summarised (issue 9, item 2)', () => {
  it('400 identical rail outputs on 7 controllers answer one row per controller, not one per output', () => {
    const result = estimate(longRail(64));
    expect(estimateResponseSchema.safeParse(result).success).toBe(true);
    const rows = result.outputs.data;
    // arithmetic: ceil(400 / 64) = 7 controllers, every output 20 000 / 400 = 50 pixels
    expect(result.outputs.controllers).toBe(7);
    expect(rows).toHaveLength(7);
    expect(rows[0]).toEqual({ controller: 1, output: 1, lastOutput: 64, count: 64, run: 'rail', pixels: 50, firstTread: null, lastTread: null });
    // arithmetic: 400 − 6 × 64 = 16 outputs on the seventh controller
    expect(rows[6]).toMatchObject({ controller: 7, output: 1, lastOutput: 16, count: 16 });
    expect(rows.reduce((sum, r) => sum + r.count, 0)).toBe(result.pixels.rail?.dataOutputs);
    expect(rows.reduce((sum, r) => sum + r.count * r.pixels, 0)).toBe(MAX_PIXELS_PER_RUN);
  });

  it('outputs of different sizes split the row where the size changes, and the counts still add up', () => {
    const input = estimateRequestSchema.parse({
      layout: 'rail-pixels',
      // arithmetic: 1081 pixels over ceil(1081 / 540) = 3 outputs → 361, 360, 360
      railPixels: { lengthM: 10.81, pixelsPerM: 100, voltageV: 5, protocol: 'one-wire-800k' },
      controller: { profile: { outputs: 0, maxCurrentPerOutputA: 1, dataOutputs: 4, maxPixelsPerOutput: 540 } },
    });
    const rows = estimate(input).outputs.data;
    expect(rows).toEqual([
      { controller: 1, output: 1, lastOutput: 1, count: 1, run: 'rail', pixels: 361, firstTread: null, lastTread: null },
      { controller: 1, output: 2, lastOutput: 3, count: 2, run: 'rail', pixels: 360, firstTread: null, lastTread: null },
    ]);
  });

  it('the outputs block of 400 outputs stays a few kilobytes (it was one row per output before)', () => {
    const outputs = estimate(longRail(64)).outputs;
    // 7 rows of well under 200 characters each, plus the fixed fields
    expect(JSON.stringify(outputs).length).toBeLessThan(7 * 200 + 1000);
  });
});
