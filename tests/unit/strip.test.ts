import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { cvLoad, fitStrip, pixelCurrentA, pixelPiece } from '../../shared/sizing/strip.js';

const lengthsMm = fc.array(fc.double({ min: 1, max: 5000, noNaN: true }), { minLength: 1, maxLength: 40 });

describe('strip loads', () => {
  it('the per-tread loads add up to the load of the whole run', () => {
    fc.assert(
      fc.property(lengthsMm, fc.double({ min: 0.5, max: 30, noNaN: true }), fc.constantFrom(5, 12, 24), (pieces, wPerM, v) => {
        const total = pieces.reduce((sum, l) => sum + l, 0);
        const perTread = pieces.map((l) => cvLoad(l, wPerM, v));
        // P = (W/m) × length is linear in length, so loads add (Kirchhoff's current law for I)
        expect(perTread.reduce((s, p) => s + p.powerW, 0)).toBeCloseTo(cvLoad(total, wPerM, v).powerW, 6);
        expect(perTread.reduce((s, p) => s + p.currentA, 0)).toBeCloseTo(cvLoad(total, wPerM, v).currentA, 6);
      }),
    );
  });

  it('the tread segments of a pixel chain add up to the chain current', () => {
    fc.assert(
      fc.property(fc.array(fc.integer({ min: 0, max: 500 }), { minLength: 1, maxLength: 40 }), fc.integer({ min: 0, max: 100 }), (pixels, brightness) => {
        const total = pixels.reduce((s, p) => s + p, 0);
        // pixels × mA × brightness is linear: the chain's current is the sum of its segments'
        expect(pixels.reduce((s, p) => s + pixelCurrentA(p, 60, brightness), 0)).toBeCloseTo(pixelCurrentA(total, 60, brightness), 9);
      }),
    );
  });
});

describe('strip fit', () => {
  it('is whole pitches, inside the clearances, and less than a pitch short of them', () => {
    fc.assert(
      fc.property(fc.integer({ min: 100, max: 3000 }), fc.constantFrom(10, 16.67, 25, 33.3, 50, 62.5, 100), fc.integer({ min: 0, max: 40 }), (width, pitch, clearance) => {
        const fit = fitStrip(width, pitch, clearance);
        const space = width - 2 * clearance;
        // domain rule: rounded down to whole pitches, at least one pitch
        expect(fit.stripLengthMm).toBeLessThanOrEqual(space + 1e-6);
        expect(fit.fits).toBe(space + 1e-6 >= pitch);
        if (fit.fits) expect(space - fit.stripLengthMm).toBeLessThan(pitch);
        expect(fit.stripLengthMm / pitch).toBeCloseTo(fit.pitches, 6);
      }),
    );
  });

  it('never counts more pixels than the piece holds', () => {
    fc.assert(
      fc.property(fc.double({ min: 0, max: 5000, noNaN: true }), fc.constantFrom(30, 60, 96, 144), (length, perM) => {
        const piece = pixelPiece(length, perM);
        // pixels × pitch ≤ cut length ≤ length (whole pixels, rounded down)
        expect(piece.lengthMm).toBeLessThanOrEqual(length + 1e-6);
        expect(piece.pixels).toBeLessThanOrEqual((perM * length) / 1000 + 1e-6);
        expect((perM * length) / 1000 - piece.pixels).toBeLessThan(1 + 1e-6);
      }),
    );
  });
});
