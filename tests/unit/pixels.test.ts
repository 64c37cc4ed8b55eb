import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { pixelsRequestSchema, pixelsResponseSchema } from '../../shared/schemas/pixels.js';
import { injectionPoints, pixelData, railGrouping } from '../../shared/sizing/pixels.js';
import { MAX_CURRENT_PER_PIXEL_MA, MAX_PIXELS_PER_DATA_OUTPUT, MAX_PIXELS_PER_RUN } from '../../shared/tables/limits.js';

const requests = fc.record(
  {
    pixels: fc.integer({ min: 1, max: MAX_PIXELS_PER_RUN }),
    protocol: fc.constantFrom('one-wire-800k', 'one-wire-400k', 'clocked'),
    bitsPerPixel: fc.constantFrom(24, 32),
    resetUs: fc.double({ min: 0, max: 10_000, noNaN: true }),
    clockHz: fc.double({ min: 1_000, max: 50_000_000, noNaN: true }),
    maxPixelsPerOutput: fc.integer({ min: 1, max: MAX_PIXELS_PER_DATA_OUTPUT }),
    currentPerPixelMa: fc.double({ min: 0, max: MAX_CURRENT_PER_PIXEL_MA, noNaN: true }),
    supplyVoltageV: fc.double({ min: 0.1, max: 60, noNaN: true }),
    brightnessPercent: fc.double({ min: 0, max: 100, noNaN: true }),
  },
  { requiredKeys: ['pixels', 'protocol'] },
);

describe('pixel data', () => {
  it('no request in the schema range throws, and the response matches its schema', () => {
    fc.assert(
      fc.property(requests, (body) => {
        const input = pixelsRequestSchema.parse(body);
        const result = pixelData(input);
        expect(pixelsResponseSchema.safeParse(result).success).toBe(true);
        // ceil(N / limit) outputs, each within the limit (domain rule)
        if (input.maxPixelsPerOutput) expect(result.pixelsPerOutput).toBeLessThanOrEqual(input.maxPixelsPerOutput);
        expect(result.outputsNeeded * result.pixelsPerOutput).toBeGreaterThanOrEqual(input.pixels);
      }),
    );
  });

  it('a longer chain never refreshes faster', () => {
    fc.assert(
      fc.property(fc.integer({ min: 1, max: 50_000 }), fc.constantFrom('one-wire-800k', 'one-wire-400k', 'clocked') as fc.Arbitrary<'clocked'>, (n, protocol) => {
        // frame time grows with N in every protocol (datasheet frame formats)
        expect(pixelData({ pixels: n + 1, protocol }).frameTimeUs).toBeGreaterThan(pixelData({ pixels: n, protocol }).frameTimeUs);
      }),
    );
  });

  it('rail grouping fits whole groups, no more pixels than the rail has', () => {
    fc.assert(
      fc.property(fc.integer({ min: 1, max: 60 }), fc.integer({ min: 0, max: 5000 }), (treads, pixels) => {
        const g = railGrouping(treads, pixels);
        // common practice, no published source: 2 groups per tread, pixels ≤ rail, fewer by less than one group
        expect(g.groups).toBe(2 * treads);
        expect(g.pixelsToFit).toBeLessThanOrEqual(pixels);
        expect(pixels - g.pixelsToFit).toBeLessThan(g.groups);
        expect(g.pixelsToFit % g.groups).toBe(0);
      }),
    );
  });

  it('injection keeps every segment within the feed length and the drop limit', () => {
    fc.assert(
      fc.property(
        fc.double({ min: 0.1, max: 100, noNaN: true }),
        fc.constantFrom(5, 12, 24),
        fc.double({ min: 0.001, max: 0.5, noNaN: true }),
        fc.double({ min: 0.1, max: 60, noNaN: true }),
        (lengthM, voltageV, rPerM, currentA) => {
          const plan = injectionPoints({ lengthM, voltageV, traceResistanceOhmPerM: rPerM, currentA });
          // spread-load rule (DC distributor theory): segment drop ≤ 5 % default limit
          expect(plan.segmentLengthM).toBeLessThanOrEqual(plan.maxFeedLengthM * (1 + 1e-9));
          expect(plan.dropPercent as number).toBeLessThanOrEqual(5 * (1 + 1e-9));
        },
      ),
    );
  });

  it('the request example gives the response example', () => {
    // the schemas' own examples (Quayside Studio rail) must agree with the engine
    const request = pixelsRequestSchema.meta()?.example;
    const response = pixelsResponseSchema.meta()?.example as Record<string, unknown>;
    const result = pixelData(pixelsRequestSchema.parse(request));
    for (const key of ['frameTimeUs', 'maxRefreshHz', 'bitsPerFrame', 'outputsNeeded', 'pixelsPerOutput', 'fullWhiteCurrentA', 'powerW']) {
      expect(result[key as keyof typeof result]).toBe(response[key]);
    }
    expect(pixelsResponseSchema.safeParse(response).success).toBe(true);
  });
});
