import { round, type TraceEntry } from './trace.js';

/** Gap left at each end of a tread so the strip clears the stringer (domain rule, default). */
export const DEFAULT_END_CLEARANCE_MM = 20;
/** 5 V RGB pixel at full white, 20 mA per colour (common practice, from memory). */
export const DEFAULT_CURRENT_PER_PIXEL_MA = 60;

// Lengths such as 17 × 33.3 mm must not lose a whole pitch to float noise.
const EPSILON = 1e-9;

export interface StripFit {
  fits: boolean;
  /** Tread width less both end clearances. */
  spaceMm: number;
  /** Whole cut pitches that fit the space; 0 when not even one does. */
  stripLengthMm: number;
  pitches: number;
}

export interface CvLoad {
  powerW: number;
  currentA: number;
}

export interface PixelPiece {
  /** Length actually cut: whole cut pitches (or whole pixels when no pitch is given). */
  lengthMm: number;
  pixels: number;
}

/** Strip may only be cut at its marks, so the usable length rounds down to whole pitches. */
export function fitStrip(treadWidthMm: number, cutPitchMm: number, endClearanceMm = DEFAULT_END_CLEARANCE_MM): StripFit {
  const spaceMm = treadWidthMm - 2 * endClearanceMm;
  const pitches = spaceMm > 0 ? Math.floor(spaceMm / cutPitchMm + EPSILON) : 0;
  return { fits: pitches >= 1, spaceMm, stripLengthMm: round(pitches * cutPitchMm, 6), pitches };
}

/** Constant-voltage strip: P = (W/m) × length, I = P / V. */
export function cvLoad(lengthMm: number, powerWPerM: number, voltageV: number): CvLoad {
  const powerW = (powerWPerM * lengthMm) / 1000;
  return { powerW, currentA: powerW / voltageV };
}

/**
 * Whole pixels in a piece. With a cut pitch the piece is first cut down to whole pitches;
 * without one, each pixel is its own cut point.
 */
export function pixelPiece(lengthMm: number, pixelsPerM: number, cutPitchMm?: number): PixelPiece {
  const pitchMm = cutPitchMm ?? 1000 / pixelsPerM;
  const cutMm = lengthMm > 0 ? Math.floor(lengthMm / pitchMm + EPSILON) * pitchMm : 0;
  const pixels = Math.floor((pixelsPerM * cutMm) / 1000 + EPSILON);
  return { lengthMm: round(cutMm, 6), pixels };
}

/** Full-white current; a brightness cap scales it linearly (PWM duty). */
export function pixelCurrentA(
  pixels: number,
  currentPerPixelMa = DEFAULT_CURRENT_PER_PIXEL_MA,
  brightnessPercent = 100,
): number {
  return (pixels * currentPerPixelMa * brightnessPercent) / 100 / 1000;
}

export function stripFitTrace(treadWidthMm: number, cutPitchMm: number, endClearanceMm: number | undefined, fit: StripFit): TraceEntry {
  return {
    quantity: 'stripLengthMm',
    value: fit.stripLengthMm,
    unit: 'mm',
    formula: 'floor((treadWidthMm − 2 × endClearanceMm) / cutPitchMm) × cutPitchMm; at least one pitch',
    inputs: {
      treadWidthMm,
      cutPitchMm,
      endClearanceMm: endClearanceMm ?? DEFAULT_END_CLEARANCE_MM,
      endClearanceDefaulted: endClearanceMm === undefined,
      fits: fit.fits,
    },
    reference: 'strip cut only at its marks; end clearance 20 mm by default (common practice, no published source)',
  };
}

export function cvLoadTrace(lengthMm: number, powerWPerM: number, voltageV: number, load: CvLoad, quantity = 'powerW'): TraceEntry[] {
  return [
    {
      quantity,
      value: round(load.powerW),
      unit: 'W',
      formula: 'P = powerWPerM × lengthMm / 1000',
      inputs: { powerWPerM, lengthMm },
      reference: 'constant-voltage strip rating per metre (strip datasheet)',
    },
    {
      quantity: quantity.replace(/powerW$/, 'currentA'),
      value: round(load.currentA),
      unit: 'A',
      formula: 'I = P / V',
      inputs: { powerW: round(load.powerW), voltageV },
      reference: 'P = V·I',
    },
  ];
}

export function pixelCurrentTrace(
  pixels: number,
  currentPerPixelMa: number | undefined,
  brightnessPercent: number | undefined,
  quantity = 'fullWhiteCurrentA',
): TraceEntry {
  return {
    quantity,
    value: round(pixelCurrentA(pixels, currentPerPixelMa, brightnessPercent)),
    unit: 'A',
    formula: 'I = pixels × currentPerPixelMa / 1000 × brightnessPercent / 100',
    inputs: {
      pixels,
      currentPerPixelMa: currentPerPixelMa ?? DEFAULT_CURRENT_PER_PIXEL_MA,
      currentPerPixelDefaulted: currentPerPixelMa === undefined,
      brightnessPercent: brightnessPercent ?? 100,
    },
    reference:
      currentPerPixelMa === undefined
        ? '60 mA per 5 V RGB pixel at full white, 20 mA per colour (common practice, from memory); brightness scales linearly'
        : 'current per pixel as given; brightness scales linearly',
  };
}
