import type { PixelsInput, PixelsResult } from '../schemas/pixels.js';
import { DEFAULT_CURRENT_PER_PIXEL_MA, pixelCurrentA, pixelCurrentBasis, pixelCurrentTrace, type PixelCurrentBasis } from './strip.js';
import { round, type TraceEntry, type Warning } from './trace.js';
import { ENGINE_VERSION } from './version.js';

export const PIXEL_DEFAULTS = {
  bitsPerPixel: 24,
  resetUs: 280,
  clockHz: 1_000_000,
  currentPerPixelMa: DEFAULT_CURRENT_PER_PIXEL_MA,
  supplyVoltageV: 5,
  brightnessPercent: 100,
} as const;

/** Below this, sweeps along a stair look stepped (common practice, no published source). */
export const SMOOTH_REFRESH_HZ = 30;
/** Above this a run wants several feed points and fused branches (common practice, no published source). */
export const HIGH_CURRENT_A = 10;

const BIT_TIME_US = { 'one-wire-800k': 1.25, 'one-wire-400k': 2.5 } as const;

const DEFAULT_REFERENCES: Record<keyof typeof PIXEL_DEFAULTS, string> = {
  bitsPerPixel: '24 bits per RGB pixel — WS2812B datasheet',
  resetUs: 'reset ≥ 280 µs on newer parts — WS2812B and WS2812B-2020 datasheets',
  clockHz: '1 MHz clock, a conservative rate for two-wire parts (common practice, no published source)',
  currentPerPixelMa: '60 mA per 5 V RGB pixel at full white (common practice, from memory)',
  supplyVoltageV: '5 V pixel strip (common practice, no published source)',
  brightnessPercent: 'no brightness cap',
};

/**
 * Two-wire clocked frame: 32-bit zero start frame, 32 bits per LED, and an end frame giving at
 * least N/2 extra clock edges as whole bytes (⌈N/16⌉ bytes) but never under 32 bits —
 * APA102C datasheet; "Understanding the APA102 superled", cpldcpu 2014.
 */
export function clockedFrameBits(pixels: number): number {
  return 32 + 32 * pixels + Math.max(32, Math.ceil(pixels / 16) * 8);
}

/** POST /v1/calculations/pixels. Outputs are assumed to send in parallel. */
export function pixelData(input: PixelsInput): PixelsResult {
  const bitsPerPixel = input.bitsPerPixel ?? PIXEL_DEFAULTS.bitsPerPixel;
  const resetUs = input.resetUs ?? PIXEL_DEFAULTS.resetUs;
  const clockHz = input.clockHz ?? PIXEL_DEFAULTS.clockHz;
  const supplyVoltageV = input.supplyVoltageV ?? PIXEL_DEFAULTS.supplyVoltageV;
  // 60 mA for a 5 V RGB pixel as documented; 80 mA RGBW; per segment above 5 V (no density here).
  const current = pixelCurrentBasis({ currentPerPixelMa: input.currentPerPixelMa, voltageV: supplyVoltageV, bitsPerPixel: input.bitsPerPixel, protocol: input.protocol });
  const currentPerPixelMa = current.currentPerPixelMa;
  const brightnessPercent = input.brightnessPercent ?? PIXEL_DEFAULTS.brightnessPercent;

  const outputsNeeded = input.maxPixelsPerOutput ? Math.ceil(input.pixels / input.maxPixelsPerOutput) : 1;
  // An even split keeps every output's frame as short as the busiest one allows.
  const pixelsPerOutput = Math.ceil(input.pixels / outputsNeeded);

  let bitsPerFrame: number;
  let frameTimeUs: number;
  const trace: TraceEntry[] = [];
  if (input.protocol === 'clocked') {
    bitsPerFrame = clockedFrameBits(pixelsPerOutput);
    // The end frame latches; parts that latch on a pause instead get resetUs added (none by default).
    const latchUs = input.resetUs ?? 0;
    frameTimeUs = (bitsPerFrame / clockHz) * 1e6 + latchUs;
    trace.push({
      quantity: 'frameTimeUs',
      value: round(frameTimeUs, 3),
      unit: 'µs',
      formula: '(32 + 32 × pixels + max(32, ⌈pixels / 16⌉ × 8)) / clockHz + latch pause (resetUs, 0 by default)',
      inputs: { pixels: pixelsPerOutput, clockHz, bitsPerFrame, latchUs },
      reference: 'APA102C datasheet; "Understanding the APA102 superled", cpldcpu 2014',
    });
  } else {
    const bitTimeUs = BIT_TIME_US[input.protocol];
    bitsPerFrame = pixelsPerOutput * bitsPerPixel;
    frameTimeUs = bitsPerFrame * bitTimeUs + resetUs;
    trace.push({
      quantity: 'frameTimeUs',
      value: round(frameTimeUs, 3),
      unit: 'µs',
      formula: 'pixels × bitsPerPixel × bitTimeUs + resetUs',
      inputs: { pixels: pixelsPerOutput, bitsPerPixel, bitTimeUs, resetUs },
      reference:
        bitsPerPixel === 32
          ? 'SK6812RGBW datasheet (32 bits per pixel); bit time from the line rate'
          : 'WS2812B datasheet: 1.25 µs per bit at 800 kbit/s; reset as given or 280 µs',
    });
  }
  // An empty run with no latch time (estimates only: the calculation needs a pixel) sends nothing.
  const rate = 1e6 / frameTimeUs;
  const maxRefreshHz = Number.isFinite(rate) ? rate : 0;
  const fullWhiteCurrentA = pixelCurrentA(input.pixels, currentPerPixelMa, brightnessPercent);
  const powerW = fullWhiteCurrentA * supplyVoltageV;
  // The load with no cap: what the supply sees if the cap is not enforced.
  const uncappedCurrentA = pixelCurrentA(input.pixels, currentPerPixelMa, 100);

  trace.push(
    {
      quantity: 'maxRefreshHz',
      value: round(maxRefreshHz, 2),
      unit: 'Hz',
      formula: '1e6 / frameTimeUs',
      inputs: { frameTimeUs: round(frameTimeUs, 3), outputsSendInParallel: true },
      reference: 'refresh = 1 / frame time',
    },
    {
      quantity: 'outputsNeeded',
      value: outputsNeeded,
      unit: 'outputs',
      formula: input.maxPixelsPerOutput ? 'ceil(pixels / maxPixelsPerOutput)' : 'one output (no per-output limit given)',
      inputs: { pixels: input.pixels, maxPixelsPerOutput: input.maxPixelsPerOutput ?? null, pixelsPerOutput },
      reference: 'controller profile',
    },
    pixelCurrentTrace(input.pixels, input.currentPerPixelMa, input.brightnessPercent, 'fullWhiteCurrentA', current),
    {
      quantity: 'powerW',
      value: round(powerW),
      unit: 'W',
      formula: 'fullWhiteCurrentA × supplyVoltageV',
      inputs: { fullWhiteCurrentA: round(fullWhiteCurrentA), supplyVoltageV },
      reference: 'P = V·I',
    },
  );
  for (const key of usedDefaults(input)) {
    trace.push({
      quantity: `default ${key}`,
      value: key === 'currentPerPixelMa' ? currentPerPixelMa : PIXEL_DEFAULTS[key],
      unit: '',
      formula: 'not given; default used',
      inputs: {},
      reference: key === 'currentPerPixelMa' ? current.reference : DEFAULT_REFERENCES[key],
    });
  }

  return {
    frameTimeUs: round(frameTimeUs, 3),
    maxRefreshHz: round(maxRefreshHz, 2),
    bitsPerFrame,
    outputsNeeded,
    pixelsPerOutput,
    fullWhiteCurrentA: round(fullWhiteCurrentA),
    powerW: round(powerW),
    currentPerPixelMa: round(currentPerPixelMa, 4),
    uncappedCurrentA: round(uncappedCurrentA),
    uncappedPowerW: round(uncappedCurrentA * supplyVoltageV),
    warnings: pixelWarnings(input, maxRefreshHz, fullWhiteCurrentA, current, uncappedCurrentA * supplyVoltageV),
    engineVersion: ENGINE_VERSION,
    trace,
  };
}

/** Defaults that shaped this result; protocol-specific ones only for their protocol. */
function usedDefaults(input: PixelsInput): (keyof typeof PIXEL_DEFAULTS)[] {
  const relevant: (keyof typeof PIXEL_DEFAULTS)[] =
    input.protocol === 'clocked' ? ['clockHz'] : ['bitsPerPixel', 'resetUs'];
  relevant.push('currentPerPixelMa', 'supplyVoltageV', 'brightnessPercent');
  return relevant.filter((key) => input[key] === undefined);
}

function pixelWarnings(input: PixelsInput, refreshHz: number, currentA: number, current: PixelCurrentBasis, uncappedPowerW: number): Warning[] {
  const warnings: Warning[] = [];
  if (refreshHz < SMOOTH_REFRESH_HZ) {
    warnings.push({
      code: 'refresh_rate_low',
      message: `One frame allows ${round(refreshHz, 1)} Hz, below the ${SMOOTH_REFRESH_HZ} Hz that keeps animation smooth; use more data outputs.`,
    });
  }
  if (currentA > HIGH_CURRENT_A) {
    warnings.push({
      code: 'high_current',
      message: `The run draws ${round(currentA, 2)} A at full white; feed it at several points, fuse each branch, or cap the brightness.`,
    });
  }
  if (current.defaulted) {
    warnings.push({
      code: 'current_per_pixel_assumed',
      message: `No currentPerPixelMa given: ${round(current.currentPerPixelMa, 2)} mA assumed (${current.reference}); give it from the strip datasheet.`,
    });
  }
  const brightness = input.brightnessPercent ?? 100;
  if (brightness < 100) {
    warnings.push({
      code: 'brightness_cap_enforced',
      message: `Sized for the ${brightness} % brightness cap; at full white the run draws ${round(uncappedPowerW, 2)} W. Enforce the cap in the controller and use an overload-protected supply, or size for full white.`,
    });
  }
  const ignored =
    input.protocol === 'clocked'
      ? (['bitsPerPixel'] as const).filter((k) => input[k] !== undefined)
      : (['clockHz'] as const).filter((k) => input[k] !== undefined);
  if (ignored.length > 0) {
    warnings.push({ code: 'field_ignored', message: `${ignored.join(', ')} do not apply to ${input.protocol} and were ignored.` });
  }
  return warnings;
}

export interface RailGrouping {
  groups: number;
  pixelsPerGroup: number;
  /** Pixels to fit so every group has the same count: as many as the rail holds or slightly fewer. */
  pixelsToFit: number;
  sparePixels: number;
  /** false when the rail has fewer pixels than groups. */
  fits: boolean;
}

/**
 * A rail that animates with the treads gets two pixel groups per tread, so the rail's wave
 * keeps step with the treads (common practice, no published source).
 */
export function railGrouping(treads: number, railPixels: number): RailGrouping {
  const groups = 2 * treads;
  const pixelsPerGroup = Math.floor(railPixels / groups);
  const pixelsToFit = pixelsPerGroup * groups;
  return { groups, pixelsPerGroup, pixelsToFit, sparePixels: railPixels - pixelsToFit, fits: pixelsPerGroup >= 1 };
}

export function railGroupingTrace(treads: number, railPixels: number, grouping: RailGrouping): TraceEntry[] {
  return [
    {
      quantity: 'railGroups',
      value: grouping.groups,
      unit: 'groups',
      formula: '2 × treads',
      inputs: { treads },
      reference: 'two rail groups per tread (common practice, no published source)',
    },
    {
      quantity: 'railPixelsToFit',
      value: grouping.pixelsToFit,
      unit: 'pixels',
      formula: 'floor(railPixels / groups) × groups',
      inputs: { railPixels, groups: grouping.groups, pixelsPerGroup: grouping.pixelsPerGroup },
      reference: 'whole pixels per group so rail and treads move together (common practice, no published source)',
    },
  ];
}

/** Longest strip fed from one point: about 2.5 m at 5 V, 5 m at 12 V and 24 V (common practice, from memory). */
export function defaultMaxFeedLengthM(voltageV: number): number {
  return voltageV <= 5 ? 2.5 : 5;
}

export const DEFAULT_STRIP_MAX_DROP_PERCENT = 5;

export interface InjectionInput {
  lengthM: number;
  voltageV: number;
  /** The strip datasheet's longest run from one feed point. */
  maxFeedLengthM?: number;
  /** Resistance of one strip conductor (+ or −), Ω per metre. */
  traceResistanceOhmPerM?: number;
  /** Current of the whole strip, spread evenly along it; needed with the trace resistance. */
  currentA?: number;
  maxDropPercent?: number;
  /** Most current one feed point may push into the strip copper, A; needs currentA. */
  maxFeedCurrentA?: number | undefined;
}

/** Current one feed point may push into the strip copper when the datasheet gives none (common practice, from memory). */
export const DEFAULT_MAX_FEED_CURRENT_A = 5;

export interface InjectionPlan {
  /** Extra feed points besides the first. */
  injectionPoints: number;
  segmentLengthM: number;
  maxFeedLengthM: number;
  maxFeedLengthSource: 'given' | 'default' | 'voltage-drop' | 'current';
  /** Current each segment draws from its feed point (spread evenly), A; null without a current. */
  feedCurrentA: number | null;
  /** Drop along one segment fed from one end; null without a trace resistance and current. */
  dropV: number | null;
  dropPercent: number | null;
  warnings: Warning[];
}

/**
 * Injection points = ceil(length / longest feed run) − 1. With a trace resistance the longest
 * run comes from the spread-load rule instead: a segment s fed from one end with its current
 * i′·s spread evenly drops I·R/2 = i′·s · (2·R′·s) / 2 = i′·R′·s² (DC distributor theory). Each
 * segment is taken as fed from one end, the conservative case.
 */
export function injectionPoints(input: InjectionInput): InjectionPlan {
  const warnings: Warning[] = [];
  const maxDropPercent = input.maxDropPercent ?? DEFAULT_STRIP_MAX_DROP_PERCENT;
  const rPerM = input.traceResistanceOhmPerM;
  const currentPerM = input.currentA !== undefined && input.lengthM > 0 ? input.currentA / input.lengthM : undefined;

  let maxFeedLengthM = input.maxFeedLengthM ?? defaultMaxFeedLengthM(input.voltageV);
  let source: InjectionPlan['maxFeedLengthSource'] = input.maxFeedLengthM === undefined ? 'default' : 'given';
  if (rPerM !== undefined && currentPerM !== undefined) {
    const byDrop = currentPerM * rPerM > 0 ? Math.sqrt(((maxDropPercent / 100) * input.voltageV) / (currentPerM * rPerM)) : Infinity;
    if (input.maxFeedLengthM === undefined || byDrop < maxFeedLengthM) {
      maxFeedLengthM = byDrop;
      source = 'voltage-drop';
    }
  } else if (rPerM !== undefined) {
    warnings.push({ code: 'current_missing', message: 'A trace resistance needs the strip current; the feed length default was used.' });
  }
  // Density and current set the spacing too: a feed point pushes its whole segment's current
  // through the strip copper next to it, so a segment is no longer than maxFeedCurrentA / (A per m).
  if (input.maxFeedCurrentA !== undefined && currentPerM !== undefined && currentPerM > 0) {
    const byCurrent = input.maxFeedCurrentA / currentPerM;
    if (byCurrent < maxFeedLengthM) {
      maxFeedLengthM = byCurrent;
      source = 'current';
    }
  }
  if (source === 'default') {
    warnings.push({
      code: 'feed_length_assumed',
      message: `No feed length given; ${maxFeedLengthM} m assumed for ${input.voltageV} V strip — check the strip datasheet.`,
    });
  }

  const injections = Math.max(0, Math.ceil(input.lengthM / maxFeedLengthM - 1e-9) - 1);
  const segmentLengthM = input.lengthM / (injections + 1);
  const dropV = rPerM !== undefined && currentPerM !== undefined ? currentPerM * rPerM * segmentLengthM ** 2 : null;
  return {
    injectionPoints: injections,
    segmentLengthM,
    maxFeedLengthM,
    maxFeedLengthSource: source,
    feedCurrentA: currentPerM === undefined ? null : currentPerM * segmentLengthM,
    dropV,
    dropPercent: dropV === null ? null : (dropV / input.voltageV) * 100,
    warnings,
  };
}

export function injectionTrace(input: InjectionInput, plan: InjectionPlan): TraceEntry[] {
  const entries: TraceEntry[] = [
    {
      quantity: 'injectionPoints',
      value: plan.injectionPoints,
      unit: 'points',
      formula: 'ceil(lengthM / maxFeedLengthM) − 1',
      inputs: {
        lengthM: input.lengthM,
        maxFeedLengthM: Number.isFinite(plan.maxFeedLengthM) ? round(plan.maxFeedLengthM) : 'unlimited',
        source: plan.maxFeedLengthSource,
        maxFeedCurrentA: input.maxFeedCurrentA ?? null,
        feedCurrentA: plan.feedCurrentA === null ? null : round(plan.feedCurrentA),
      },
      reference:
        plan.maxFeedLengthSource === 'current'
          ? 'segment ≤ maxFeedCurrentA / (current per metre): each feed point pushes its segment’s current through the strip copper (5 A default: common practice, from memory)'
          : plan.maxFeedLengthSource === 'default'
          ? 'about 2.5 m for 5 V pixel strip, 5 m for 12 V / 24 V strip (common practice, from memory)'
          : plan.maxFeedLengthSource === 'given'
            ? 'strip datasheet, as given'
            : 'longest segment whose spread-load drop i′·R′·s² stays within maxDropPercent (DC distributor theory)',
    },
  ];
  if (plan.dropV !== null) {
    entries.push({
      quantity: 'stripDropV',
      value: round(plan.dropV),
      unit: 'V',
      formula: 'Vd = I·R/2 with I = currentA × s / lengthM, R = 2 × traceResistanceOhmPerM × s',
      inputs: {
        segmentLengthM: round(plan.segmentLengthM),
        currentA: input.currentA ?? null,
        traceResistanceOhmPerM: input.traceResistanceOhmPerM ?? null,
        maxDropPercent: input.maxDropPercent ?? DEFAULT_STRIP_MAX_DROP_PERCENT,
      },
      reference: 'load spread evenly, fed from one end: half the end-load drop (DC distributor theory, any circuits text)',
    });
  }
  return entries;
}
