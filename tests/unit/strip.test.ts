import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { cvLoad, fitPixelStrip, fitStrip, pixelCurrentA, pixelPiece } from '../../shared/sizing/strip.js';

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

  // Common pixel densities (pixels/m) of one-wire strip (common practice, no published source).
  const densities = fc.constantFrom(20, 30, 32, 48, 60, 72, 74, 96, 144);

  it('pixel fit: the pixels fit the space and no whole extra pixel pitch would (exact integer check)', () => {
    fc.assert(
      fc.property(fc.integer({ min: 100, max: 5000 }), densities, fc.integer({ min: 0, max: 40 }), (width, perM, clearance) => {
        const { fit, piece } = fitPixelStrip(width, perM, undefined, clearance);
        const spaceMm = width - 2 * clearance;
        // arithmetic on whole numbers (mm × pixels/m): n pixels take n × 1000 / perM mm, so
        // n fit when n × 1000 ≤ space × perM, and n + 1 do not when (n + 1) × 1000 > space × perM
        expect(piece.pixels * 1000).toBeLessThanOrEqual(spaceMm * perM);
        expect((piece.pixels + 1) * 1000).toBeGreaterThan(spaceMm * perM);
        expect(fit.fits).toBe(piece.pixels >= 1);
        expect(piece.lengthMm).toBeCloseTo((piece.pixels * 1000) / perM, 5);
      }),
    );
  });

  it('pixel pieces: no whole extra pixel would still fit the length', () => {
    fc.assert(
      fc.property(fc.integer({ min: 0, max: 20_000 }), densities, (lengthMm, perM) => {
        const piece = pixelPiece(lengthMm, perM);
        // same whole-number criterion as above, on a rail or piece length
        expect(piece.pixels * 1000).toBeLessThanOrEqual(lengthMm * perM);
        expect((piece.pixels + 1) * 1000).toBeGreaterThan(lengthMm * perM);
      }),
    );
  });

  it('CV fit: no whole extra cut pitch would still fit (pitches given to the micrometre)', () => {
    fc.assert(
      fc.property(fc.integer({ min: 100_000, max: 3_000_000 }), fc.integer({ min: 1_000, max: 200_000 }), fc.integer({ min: 0, max: 40_000 }), (widthUm, pitchUm, clearanceUm) => {
        const fit = fitStrip(widthUm / 1000, pitchUm / 1000, clearanceUm / 1000);
        const spaceUm = widthUm - 2 * clearanceUm;
        // domain rule (round down to whole pitches), checked on whole micrometres
        expect(fit.pitches * pitchUm).toBeLessThanOrEqual(Math.max(0, spaceUm));
        expect((fit.pitches + 1) * pitchUm).toBeGreaterThan(spaceUm);
        expect(Math.round(fit.stripLengthMm * 1000)).toBe(fit.pitches * pitchUm);
      }),
    );
  });
});
