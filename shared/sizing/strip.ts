import { round, type TraceEntry } from './trace.js';

/** Gap left at each end of a tread so the strip clears the stringer (domain rule, default). */
export const DEFAULT_END_CLEARANCE_MM = 20;
/** 5 V RGB pixel at full white, 20 mA per colour (common practice, widely published in makers' guides, from memory). */
export const DEFAULT_CURRENT_PER_PIXEL_MA = 60;
/** 5 V RGBW pixel at full white: a fourth 20 mA channel (common practice, from memory). */
export const DEFAULT_CURRENT_PER_RGBW_PIXEL_MA = 80;
/**
 * 12 V / 24 V pixel strip at full white when the request gives neither the current per pixel
 * nor the strip power: 14.4 W/m, the common 60 LED/m strip (20 segments/m × 0.06 A × 12 V —
 * common practice, from memory), × 4/3 for RGBW. Spread over the pixels per metre it gives one
 * pixel's (segment's) share: 20 pixels/m at 12 V → 60 mA, 60 pixels/m at 24 V → 10 mA.
 */
export const DEFAULT_PIXEL_STRIP_W_PER_M = 14.4;
/** Pixel strip above this voltage carries segments (one IC driving 3 or 6 LEDs): size it per metre. */
export const PER_PIXEL_MAX_VOLTAGE_V = 5.5;

// Cut counts are whole numbers, so they are computed on whole numbers: lengths in micrometres,
// densities in pixels per kilometre. Floating division of such integers (all far below 2^53)
// floors exactly, so 30 pixels/m on 960 mm gives 28 pixels, not 27 (28 × 33.33… mm = 933.33 mm).
const UM_PER_MM = 1000;
const toUm = (mm: number): number => Math.round(mm * UM_PER_MM);
/** Pixels per kilometre, an integer for any density given to three decimals. */
const perKm = (pixelsPerM: number): number => Math.round(pixelsPerM * 1000);
/** Whole pixels in a length of `lengthUm` µm at `pixelsPerKm`: floor(µm × px/km / 10⁹). */
const wholePixels = (lengthUm: number, pixelsPerKm: number): number => (lengthUm > 0 ? Math.floor((lengthUm * pixelsPerKm) / 1e9) : 0);

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

/** Strip may only be cut at its marks, so the usable length rounds down to whole pitches (in µm, exactly). */
export function fitStrip(treadWidthMm: number, cutPitchMm: number, endClearanceMm = DEFAULT_END_CLEARANCE_MM): StripFit {
  const spaceUm = toUm(treadWidthMm) - 2 * toUm(endClearanceMm);
  const pitchUm = toUm(cutPitchMm);
  const pitches = spaceUm > 0 && pitchUm > 0 ? Math.floor(spaceUm / pitchUm) : 0;
  return { fits: pitches >= 1, spaceMm: spaceUm / UM_PER_MM, stripLengthMm: (pitches * pitchUm) / UM_PER_MM, pitches };
}

/**
 * Pixel strip on a tread: without a cut pitch every pixel is a cut point, so the count is the
 * whole pixels the space holds (an integer count, not a rounded length); with a cut pitch, whole
 * pitches first, then the pixels on them. `fit.pitches` counts cut pieces of either kind.
 */
export function fitPixelStrip(
  treadWidthMm: number,
  pixelsPerM: number,
  cutPitchMm?: number,
  endClearanceMm = DEFAULT_END_CLEARANCE_MM,
): { fit: StripFit; piece: PixelPiece } {
  if (cutPitchMm !== undefined) {
    const fit = fitStrip(treadWidthMm, cutPitchMm, endClearanceMm);
    return { fit, piece: pitchPiece(fit.pitches, toUm(cutPitchMm), pixelsPerM) };
  }
  const spaceUm = toUm(treadWidthMm) - 2 * toUm(endClearanceMm);
  const pixels = wholePixels(spaceUm, perKm(pixelsPerM));
  const lengthMm = pixelsLengthMm(pixels, pixelsPerM);
  return { fit: { fits: pixels >= 1, spaceMm: spaceUm / UM_PER_MM, stripLengthMm: lengthMm, pitches: pixels }, piece: { lengthMm, pixels } };
}

/** Length of whole pixels at their own pitch, mm (to the nanometre, for display and reels). */
function pixelsLengthMm(pixels: number, pixelsPerM: number): number {
  return round((pixels * 1000) / pixelsPerM, 6);
}

/**
 * Pixels on whole cut pitches. A pitch normally holds a whole number of pixels (strip is cut
 * between pixel groups): when pitch × density is within 1 % of a whole number, that number per
 * pitch counts (so a 33.3 mm pitch at 30 pixels/m holds 1 pixel, not 0.999); otherwise the
 * whole pixels of the cut length.
 */
function pitchPiece(pitches: number, pitchUm: number, pixelsPerM: number): PixelPiece {
  const lengthMm = (pitches * pitchUm) / UM_PER_MM;
  const perPitch = (pitchUm * pixelsPerM) / 1e6;
  const whole = Math.round(perPitch);
  const pixels = whole >= 1 && Math.abs(perPitch - whole) <= 0.01 * whole ? pitches * whole : wholePixels(pitches * pitchUm, perKm(pixelsPerM));
  return { lengthMm, pixels };
}

/** Constant-voltage strip: P = (W/m) × length, I = P / V. */
export function cvLoad(lengthMm: number, powerWPerM: number, voltageV: number): CvLoad {
  const powerW = (powerWPerM * lengthMm) / 1000;
  return { powerW, currentA: powerW / voltageV };
}

/**
 * Whole pixels in a piece. With a cut pitch the piece is first cut down to whole pitches;
 * without one, each pixel is its own cut point. Counted in integers (see fitPixelStrip).
 */
export function pixelPiece(lengthMm: number, pixelsPerM: number, cutPitchMm?: number): PixelPiece {
  const lengthUm = toUm(lengthMm);
  if (cutPitchMm !== undefined) {
    const pitchUm = toUm(cutPitchMm);
    return pitchPiece(lengthUm > 0 ? Math.floor(lengthUm / pitchUm) : 0, pitchUm, pixelsPerM);
  }
  const pixels = wholePixels(lengthUm, perKm(pixelsPerM));
  return { lengthMm: pixelsLengthMm(pixels, pixelsPerM), pixels };
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
  basis?: PixelCurrentBasis,
): TraceEntry {
  const mA = basis?.currentPerPixelMa ?? currentPerPixelMa ?? DEFAULT_CURRENT_PER_PIXEL_MA;
  const defaulted = basis ? basis.defaulted : currentPerPixelMa === undefined;
  return {
    quantity,
    value: round(pixelCurrentA(pixels, mA, brightnessPercent)),
    unit: 'A',
    formula: 'I = pixels × currentPerPixelMa / 1000 × brightnessPercent / 100',
    inputs: {
      pixels,
      currentPerPixelMa: round(mA, 4),
      currentPerPixelDefaulted: defaulted,
      currentPerPixelSource: basis?.source ?? (defaulted ? 'default-5v-pixel' : 'given'),
      brightnessPercent: brightnessPercent ?? 100,
    },
    reference: `${basis?.reference ?? (defaulted ? '60 mA per 5 V RGB pixel at full white (common practice, from memory)' : 'current per pixel as given')}; brightness scales linearly`,
  };
}

/** How the current of one pixel at full white was found. */
export type PixelCurrentSource = 'given' | 'strip-power' | 'default-5v-pixel' | 'default-segment' | 'default-strip-power';

export interface PixelCurrentBasis {
  currentPerPixelMa: number;
  source: PixelCurrentSource;
  /** true when neither currentPerPixelMa nor powerWPerM was given (a warning is due). */
  defaulted: boolean;
  /** Strip power per metre behind the figure (given or assumed), W/m; null when sized per pixel. */
  powerWPerM: number | null;
  reference: string;
}

export interface PixelCurrentInput {
  currentPerPixelMa?: number | undefined;
  /** Strip power per metre at full white (datasheet). */
  powerWPerM?: number | undefined;
  /** Needed to spread a power per metre over the pixels; a calculation without it sizes per segment. */
  pixelsPerM?: number | undefined;
  voltageV: number;
  bitsPerPixel?: number | undefined;
  protocol?: string | undefined;
}

const RGBW_FACTOR = 4 / 3;

/**
 * Current of one pixel at full white. Given → as given; a strip power per metre → W/m ÷ (px/m × V);
 * otherwise a default by channels and voltage: 5 V pixels 60 mA RGB / 80 mA RGBW; 12 V / 24 V
 * strip 14.4 W/m (× 4/3 RGBW) spread over its pixels, or — with no density known — 60 / 80 mA per
 * segment (one IC per 3 or 6 LEDs in series, 20 mA per colour; from memory).
 */
export function pixelCurrentBasis(input: PixelCurrentInput): PixelCurrentBasis {
  const rgbw = input.protocol !== 'clocked' && input.bitsPerPixel === 32;
  if (input.currentPerPixelMa !== undefined) {
    return { currentPerPixelMa: input.currentPerPixelMa, source: 'given', defaulted: false, powerWPerM: null, reference: 'current per pixel as given (strip datasheet)' };
  }
  if (input.powerWPerM !== undefined && input.pixelsPerM !== undefined) {
    return {
      currentPerPixelMa: (input.powerWPerM / input.pixelsPerM / input.voltageV) * 1000,
      source: 'strip-power',
      defaulted: false,
      powerWPerM: input.powerWPerM,
      reference: 'strip power per metre as given (strip datasheet); I = P / V spread over the pixels per metre',
    };
  }
  if (input.voltageV <= PER_PIXEL_MAX_VOLTAGE_V) {
    return {
      currentPerPixelMa: rgbw ? DEFAULT_CURRENT_PER_RGBW_PIXEL_MA : DEFAULT_CURRENT_PER_PIXEL_MA,
      source: 'default-5v-pixel',
      defaulted: true,
      powerWPerM: null,
      reference: rgbw
        ? 'about 80 mA per 5 V RGBW pixel at full white, 20 mA per channel (common practice, from memory)'
        : '60 mA per 5 V RGB pixel at full white, 20 mA per colour (common practice, widely published in makers’ guides, from memory)',
    };
  }
  if (input.pixelsPerM !== undefined) {
    const wPerM = DEFAULT_PIXEL_STRIP_W_PER_M * (rgbw ? RGBW_FACTOR : 1);
    return {
      currentPerPixelMa: (wPerM / input.pixelsPerM / input.voltageV) * 1000,
      source: 'default-strip-power',
      defaulted: true,
      powerWPerM: wPerM,
      reference: `12 V / 24 V pixel strip sized per metre: ${round(wPerM, 2)} W/m assumed (a common 60 LED/m strip, 20 segments/m × 0.06 A × 12 V${rgbw ? ', × 4/3 for RGBW' : ''}; common practice, from memory)`,
    };
  }
  return {
    currentPerPixelMa: rgbw ? DEFAULT_CURRENT_PER_RGBW_PIXEL_MA : DEFAULT_CURRENT_PER_PIXEL_MA,
    source: 'default-segment',
    defaulted: true,
    powerWPerM: null,
    reference: `${rgbw ? 80 : 60} mA per 12 V / 24 V segment (one IC driving 3 or 6 LEDs in series, 20 mA per colour; common practice, from memory)`,
  };
}

/** Trace entry of the default current per pixel, for an estimate's list of defaults. */
export function pixelCurrentDefaultEntry(basis: PixelCurrentBasis): TraceEntry {
  return {
    quantity: 'default currentPerPixelMa',
    value: round(basis.currentPerPixelMa, 3),
    unit: 'mA',
    formula: basis.powerWPerM === null ? 'not given; default by channels and voltage' : 'not given; powerWPerM / pixelsPerM / voltageV × 1000',
    inputs: basis.powerWPerM === null ? {} : { powerWPerM: round(basis.powerWPerM, 3) },
    reference: basis.reference,
  };
}
