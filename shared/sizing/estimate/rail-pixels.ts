import type { PixelsResult } from '../../schemas/pixels.js';
import type { ControllerProfile } from '../../schemas/controller.js';
import type { RailPixelsBlock } from '../../schemas/estimate.js';
import { blockSizes } from '../outputs.js';
import { DEFAULT_MAX_FEED_CURRENT_A, injectionPoints, injectionTrace, pixelData, railGrouping, railGroupingTrace, type InjectionPlan, type RailGrouping } from '../pixels.js';
import { pixelCurrentA, pixelCurrentBasis, pixelPiece, type PixelCurrentBasis } from '../strip.js';
import { round, type TraceEntry } from '../trace.js';
import { DEFAULT_RAIL_DATA_LEAD_M, dataLines, dataLinesTrace, gap, maxDataLeadM, type DataGap, type DataLines } from './data-lines.js';

export interface DataOutputUse {
  controller: number;
  output: number;
  pixels: number;
  firstTread: number | null;
  lastTread: number | null;
}

export interface RailPart {
  rail: RailPixelsBlock;
  /** Whole pixels the rail length holds. */
  pixelsOnRail: number;
  /** Pixels driven: with treads, a whole number per group (railGrouping), else every pixel. */
  pixels: number;
  grouping: RailGrouping | null;
  data: PixelsResult;
  /** Data outputs the run needs for the per-output limit, before any is found missing. */
  dataOutputsNeeded: number;
  /** Controllers whose data outputs the run needs (1 when the profile has none: the check fails). */
  controllersNeeded: number;
  dataOutputs: DataOutputUse[];
  currentA: number;
  powerW: number;
  /** Current of one pixel at full white and how it was found. */
  current: PixelCurrentBasis;
  /** Brightness the loads are sized for: the cap, or 100 with sizeForFullWhite. */
  sizingBrightnessPercent: number;
  /** Whole run at full white with no cap, A. */
  uncappedCurrentA: number;
  injection: InjectionPlan;
  feedPoints: number;
  /** Current limit per feed point used, A (given or the 5 A default). */
  maxFeedCurrentA: number;
  /** Data leads from each controller to the start of each of its outputs' stretch of rail. */
  dataLines: DataLines;
}

const TIMING_QUANTITIES = new Set(['frameTimeUs', 'maxRefreshHz', 'outputsNeeded']);

/** Keeps the pixel module's timing entries, named for the run they describe. */
export function timingTrace(prefix: string, data: PixelsResult, into: TraceEntry[]): void {
  for (const entry of data.trace) {
    if (TIMING_QUANTITIES.has(entry.quantity)) into.push({ ...entry, quantity: `${prefix}.${entry.quantity}` });
  }
}

/**
 * rail-pixels (and the rail of treads-and-rail): pixels the rail holds, data time and outputs,
 * full-white power and the feed points along it. Pixel power is fed from the drivers at the
 * feed points, not through the controller, which sends only data.
 */
export function sizeRailPixels(rail: RailPixelsBlock, profile: ControllerProfile, treadsInStep: number | null, trace: TraceEntry[]): RailPart {
  const pixelsOnRail = pixelPiece(rail.lengthM * 1000, rail.pixelsPerM).pixels;
  const grouping = treadsInStep === null ? null : railGrouping(treadsInStep, pixelsOnRail);
  const pixels = grouping && grouping.fits ? grouping.pixelsToFit : pixelsOnRail;

  const current = pixelCurrentBasis(rail);
  // Sized for the cap unless the caller asks for full white (the brightness-cap check says which).
  const sizingBrightnessPercent = rail.sizeForFullWhite ? 100 : (rail.brightnessPercent ?? 100);
  const data = pixelData({
    pixels,
    protocol: rail.protocol,
    bitsPerPixel: rail.bitsPerPixel,
    resetUs: rail.resetUs,
    clockHz: rail.clockHz,
    // pixelData splits N pixels over ceil(N / limit) outputs; with no pixel there is nothing to split.
    maxPixelsPerOutput: pixels > 0 ? profile.maxPixelsPerOutput : undefined,
    currentPerPixelMa: current.currentPerPixelMa,
    supplyVoltageV: rail.voltageV,
    brightnessPercent: sizingBrightnessPercent,
  });
  const currentA = pixelCurrentA(pixels, current.currentPerPixelMa, sizingBrightnessPercent);
  const powerW = currentA * rail.voltageV;

  const perController = profile.dataOutputs ?? 0;
  const dataOutputsNeeded = data.outputsNeeded;
  const controllersNeeded = perController > 0 ? Math.ceil(dataOutputsNeeded / perController) : 1;
  const dataOutputs: DataOutputUse[] = [];
  if (perController > 0) {
    blockSizes(pixels, dataOutputsNeeded).forEach((count, o) => {
      dataOutputs.push({ controller: Math.floor(o / perController) + 1, output: (o % perController) + 1, pixels: count, firstTread: null, lastTread: null });
    });
  }

  // A controller sits dataLeadM before the first stretch it drives; each output's lead runs on to
  // the first pixel of its own stretch (outputs take consecutive stretches of the rail).
  const gaps: DataGap[] = [];
  const leadM = rail.dataLeadM ?? DEFAULT_RAIL_DATA_LEAD_M;
  let startPixel = 0;
  let controllerStartPixel = 0;
  // A rail without a pixel has no data line (rail-holds-pixels fails instead).
  for (const o of pixels > 0 ? dataOutputs : []) {
    if (o.output === 1) controllerStartPixel = startPixel;
    gaps.push(gap('lead', 'rail', leadM + (startPixel - controllerStartPixel) / rail.pixelsPerM, maxDataLeadM(profile), { controller: o.controller, output: o.output }));
    startPixel += o.pixels;
  }
  if (dataOutputs.length === 0 && pixels > 0) gaps.push(gap('lead', 'rail', leadM, maxDataLeadM(profile), {}));
  const lines = dataLines(gaps, rail.protocol, rail.voltageV, profile, dataOutputs.length);
  trace.push(dataLinesTrace('rail', lines, profile, undefined));

  const maxFeedCurrentA = rail.maxFeedCurrentA ?? DEFAULT_MAX_FEED_CURRENT_A;
  const injectionInput = { lengthM: rail.lengthM, voltageV: rail.voltageV, maxFeedLengthM: rail.maxFeedLengthM, currentA, maxFeedCurrentA };
  const injection = injectionPoints(injectionInput);

  timingTrace('rail', data, trace);
  trace.push(
    {
      quantity: 'rail.pixels',
      value: pixels,
      unit: 'pixels',
      formula: grouping ? 'floor(lengthM × pixelsPerM), then whole pixels per group' : 'floor(lengthM × pixelsPerM)',
      inputs: { lengthM: rail.lengthM, pixelsPerM: rail.pixelsPerM, pixelsOnRail },
      reference: 'arithmetic: whole pixels only',
    },
    {
      quantity: 'rail.powerW',
      value: round(powerW),
      unit: 'W',
      formula: 'pixels × currentPerPixelMa / 1000 × brightnessPercent / 100 × voltageV',
      inputs: {
        pixels,
        currentPerPixelMa: round(current.currentPerPixelMa, 4),
        currentPerPixelSource: current.source,
        brightnessPercent: sizingBrightnessPercent,
        voltageV: rail.voltageV,
      },
      reference: `${current.reference}; P = V·I`,
    },
    ...injectionTrace(injectionInput, injection).map((e) => ({ ...e, quantity: `rail.${e.quantity}` })),
  );
  if (grouping && treadsInStep !== null) trace.push(...railGroupingTrace(treadsInStep, pixelsOnRail, grouping));

  return {
    rail,
    pixelsOnRail,
    pixels,
    grouping,
    data,
    dataOutputsNeeded,
    controllersNeeded,
    dataOutputs,
    currentA,
    powerW,
    current,
    sizingBrightnessPercent,
    uncappedCurrentA: pixelCurrentA(pixels, current.currentPerPixelMa, 100),
    injection,
    feedPoints: injection.injectionPoints + 1,
    maxFeedCurrentA,
    dataLines: lines,
  };
}
