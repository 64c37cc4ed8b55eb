import { describe, expect, it } from 'vitest';
import { cvLoad, fitPixelStrip, fitStrip, pixelCurrentA, pixelPiece } from '../../shared/sizing/strip.js';

describe('strip on a tread', () => {
  it('fits 850 mm on a 900 mm tread with a 50 mm pitch', () => {
    const fit = fitStrip(900, 50);
    // hand arithmetic from the domain rules: 900 − 2 × 20 = 860 mm → 17 whole 50 mm pitches = 850 mm
    expect(fit.spaceMm).toBe(860);
    expect(fit.stripLengthMm).toBe(850);
    expect(fit.fits).toBe(true);
  });

  it('needs at least one whole pitch', () => {
    // hand arithmetic: 100 − 40 = 60 mm holds one 50 mm pitch; 89 − 40 = 49 mm holds none
    expect(fitStrip(100, 50).stripLengthMm).toBe(50);
    expect(fitStrip(89, 50).fits).toBe(false);
    expect(fitStrip(89, 50).stripLengthMm).toBe(0);
  });

  it('keeps whole pitches that are not round numbers', () => {
    // hand arithmetic: 860 / 16.66… mm (60 pixels/m) = 51.6 → 51 pitches = 850 mm, 51 pixels
    const piece = pixelPiece(fitStrip(900, 1000 / 60).stripLengthMm, 60);
    expect(piece.pixels).toBe(51);
    expect(piece.lengthMm).toBeCloseTo(850, 6);
  });

  it('fits 28 pixels of 30 pixels/m strip on a 1000 mm tread (issue 8, item 7)', () => {
    // hand arithmetic: 1000 − 2 × 20 = 960 mm; 960 × 30 / 1000 = 28.8 → 28 pixels = 28 × 33.33… = 933.33 mm
    // (the old float rounding cut 933.333333 mm back to 27 pixels)
    const { fit, piece } = fitPixelStrip(1000, 30);
    expect(piece.pixels).toBe(28);
    expect(fit.stripLengthMm).toBeCloseTo(933.333, 3);
    // hand arithmetic: 144 pixels/m on 900 mm: 860 × 144 / 1000 = 123.84 → 123 pixels
    expect(fitPixelStrip(900, 144).piece.pixels).toBe(123);
    // hand arithmetic: a 33.3 mm cut pitch at 30 pixels/m holds one pixel (0.999 rounds to the pixel it cuts around);
    // 960 / 33.3 = 28.8 → 28 pitches, 28 pixels
    expect(fitPixelStrip(1000, 30, 33.3).piece.pixels).toBe(28);
  });

  it('counts pixels per cut pitch', () => {
    // hand arithmetic: 20 pixels/m cut every 50 mm (one pixel per cut) on 850 mm → 17 pixels
    expect(pixelPiece(850, 20, 50).pixels).toBe(17);
    // hand arithmetic: 60 pixels/m with a 50 mm cut (3 pixels) on 870 mm → 850 mm cut, 51 pixels
    expect(pixelPiece(870, 60, 50)).toEqual({ lengthMm: 850, pixels: 51 });
  });
});

describe('loads', () => {
  it('15 treads × 1.0 m × 14.4 W/m at 24 V', () => {
    const perTread = cvLoad(1000, 14.4, 24);
    // hand arithmetic: 15 × 14.4 W = 216 W; 216 W / 24 V = 9.0 A
    expect(15 * perTread.powerW).toBeCloseTo(216, 9);
    expect(15 * perTread.currentA).toBeCloseTo(9.0, 9);
  });

  it('14.4 W/m is 20 segments × 0.06 A at 12 V', () => {
    // team handbook (common practice, from memory): 5050 60 LED/m at 12 V, 20 segments/m × 0.06 A = 1.2 A/m
    expect(cvLoad(1000, 14.4, 12).currentA).toBeCloseTo(20 * 0.06, 9);
  });

  it('pixel current at full white and under a brightness cap', () => {
    // 60 mA per 5 V RGB pixel (common practice, from memory) → 51 × 0.06 = 3.06 A; linear brightness at 50 % → 1.53 A
    expect(pixelCurrentA(51)).toBeCloseTo(3.06, 9);
    expect(pixelCurrentA(51, 60, 50)).toBeCloseTo(1.53, 9);
    // WS2811 datasheet: 18.5 mA per output × 3 outputs = 55.5 mA per pixel → 100 pixels 5.55 A
    expect(pixelCurrentA(100, 3 * 18.5)).toBeCloseTo(5.55, 9);
  });
});
