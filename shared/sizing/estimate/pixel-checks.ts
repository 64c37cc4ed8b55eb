import type { EstimateCheck } from '../../schemas/estimate.js';
import type { PixelsResult } from '../../schemas/pixels.js';
import { pixelData, SMOOTH_REFRESH_HZ } from '../pixels.js';
import { flagged, fmt, passed, type Design } from './checks.js';
import { DATA_LINE_REFERENCE, type DataGap } from './data-lines.js';

const PROFILE = 'controller profile';
const REFRESH_REFERENCE =
  'frame time from the WS2812B / SK6812RGBW / APA102C datasheets; 30 Hz for smooth sweeps (common practice, no published source)';
const GROUPING_REFERENCE = 'two rail groups per tread (common practice, no published source)';

/** The pixel run of a layout, seen the same way whether it is a rail or chained treads. */
interface PixelRunView {
  name: 'rail' | 'tread';
  pixels: number;
  busiestOutputPixels: number;
  outputsNeeded: number;
  controllers: number;
  data: PixelsResult;
  protocol: 'one-wire-800k' | 'one-wire-400k' | 'clocked';
  bitsPerPixel: 24 | 32 | undefined;
  /** tread-pixels: one tread is already more than an output drives. */
  treadTooLarge: boolean;
  pixelsPerTread: number | null;
  treadPieceMm: number | null;
}

function pixelRun(d: Design): PixelRunView | null {
  if (d.rail) {
    const r = d.rail;
    return {
      name: 'rail',
      pixels: r.pixels,
      busiestOutputPixels: r.data.pixelsPerOutput,
      outputsNeeded: r.dataOutputsNeeded,
      controllers: r.controllersNeeded,
      data: r.data,
      protocol: r.rail.protocol,
      bitsPerPixel: r.rail.bitsPerPixel,
      treadTooLarge: false,
      pixelsPerTread: null,
      treadPieceMm: null,
    };
  }
  if (d.treadPixels) {
    const t = d.treadPixels;
    return {
      name: 'tread',
      pixels: t.totalPixels,
      busiestOutputPixels: t.busiestChainPixels,
      outputsNeeded: t.chains.length,
      controllers: t.controllers,
      data: t.data,
      protocol: t.block.protocol,
      bitsPerPixel: t.block.bitsPerPixel,
      treadTooLarge: t.treadsPerChainLimit === 0,
      pixelsPerTread: t.pixelsPerTread,
      treadPieceMm: t.piece.lengthMm,
    };
  }
  return null;
}

export function pixelsPerOutputCheck(d: Design): EstimateCheck | null {
  const run = pixelRun(d);
  if (!run) return null;
  const max = d.settings.profile.maxPixelsPerOutput;
  if (max === undefined) {
    return flagged(
      'pixels-per-output',
      'warn',
      `The profile gives no pixel limit per data output; the busiest output drives ${run.busiestOutputPixels} pixels.`,
      run.busiestOutputPixels,
      null,
      'pixels',
      PROFILE,
      `Add maxPixelsPerOutput from the controller's datasheet and confirm one output drives ${run.busiestOutputPixels} pixels.`,
    );
  }
  if (run.treadTooLarge) {
    const perM = run.treadPieceMm ? Math.floor(max / (run.treadPieceMm / 1000)) : 0;
    return flagged(
      'pixels-per-output',
      'fail',
      `One tread's ${run.pixelsPerTread} pixels are more than the ${max} a data output drives.`,
      run.pixelsPerTread,
      max,
      'pixels',
      PROFILE,
      `Use a pixel strip with at most ${perM} pixels/m, or a controller that drives at least ${run.pixelsPerTread} pixels per output.`,
    );
  }
  return passed(
    'pixels-per-output',
    `The busiest data output drives ${run.busiestOutputPixels} of ${max} pixels (${run.outputsNeeded} output${run.outputsNeeded === 1 ? '' : 's'}).`,
    run.busiestOutputPixels,
    max,
    'pixels',
    PROFILE,
  );
}

export function pixelsTotalCheck(d: Design): EstimateCheck | null {
  const run = pixelRun(d);
  if (!run) return null;
  const { profile } = d.settings;
  const outputs = profile.dataOutputs ?? 0;
  const max = profile.maxPixelsPerOutput;
  if (outputs === 0) {
    return flagged(
      'pixels-total',
      'fail',
      `The controller has no data outputs for the ${run.pixels}-pixel ${run.name} run.`,
      run.pixels,
      0,
      'pixels',
      PROFILE,
      `Choose a controller with at least ${run.outputsNeeded} data output${run.outputsNeeded === 1 ? '' : 's'}${max ? ` of ${max} pixels` : ''}.`,
    );
  }
  const capacity = max === undefined ? null : outputs * max;
  if (run.outputsNeeded <= outputs) {
    return passed(
      'pixels-total',
      capacity === null
        ? `${run.pixels} pixels on ${run.outputsNeeded} of ${outputs} data outputs (the profile gives no pixel limit).`
        : `${run.pixels} pixels within one controller's ${outputs} × ${max} = ${capacity}.`,
      run.pixels,
      capacity,
      'pixels',
      PROFILE,
    );
  }
  return flagged(
    'pixels-total',
    'warn',
    `${run.pixels} pixels need ${run.outputsNeeded} data outputs; one controller has ${outputs}${capacity === null ? '' : ` (${capacity} pixels)`}, so ${run.controllers} controllers are planned.`,
    run.pixels,
    capacity,
    'pixels',
    PROFILE,
    `Fit ${run.controllers} controllers as planned (their animations must start together), or choose a controller with at least ${run.outputsNeeded} data outputs${max ? ` of ${max} pixels` : ''}.`,
  );
}

export function refreshRateCheck(d: Design): EstimateCheck | null {
  const run = pixelRun(d);
  // No pixel, no frame to judge (strip-fits-tread or rail-holds-pixels fails instead).
  if (!run || run.pixels === 0) return null;
  const hz = run.data.maxRefreshHz;
  if (hz >= SMOOTH_REFRESH_HZ) {
    return passed(
      'refresh-rate',
      `A frame of ${run.busiestOutputPixels} pixels takes ${fmt(run.data.frameTimeUs / 1000, 3)} ms: up to ${fmt(hz, 1)} Hz.`,
      hz,
      SMOOTH_REFRESH_HZ,
      'Hz',
      REFRESH_REFERENCE,
    );
  }
  return flagged(
    'refresh-rate',
    'warn',
    `A frame of ${run.busiestOutputPixels} pixels takes ${fmt(run.data.frameTimeUs / 1000, 2)} ms: ${fmt(hz, 1)} Hz, below the ${SMOOTH_REFRESH_HZ} Hz that keeps sweeps smooth.`,
    hz,
    SMOOTH_REFRESH_HZ,
    'Hz',
    REFRESH_REFERENCE,
    refreshSuggestion(run),
  );
}

/** The fewest data outputs that reach a smooth refresh, computed with the pixel module itself. */
function refreshSuggestion(run: PixelRunView): string {
  for (let outputs = run.outputsNeeded + 1; outputs <= 64; outputs++) {
    const perOutput = Math.ceil(run.pixels / outputs);
    const data = pixelData({ pixels: perOutput, protocol: run.protocol, bitsPerPixel: run.bitsPerPixel });
    if (data.maxRefreshHz >= SMOOTH_REFRESH_HZ) {
      return `Spread the run over ${outputs} data outputs (about ${perOutput} pixels each): up to ${fmt(data.maxRefreshHz, 1)} Hz.`;
    }
  }
  return 'Use a clocked (data + clock) pixel strip, which sends far faster, or fewer pixels per metre.';
}

export function railGroupingCheck(d: Design): EstimateCheck | null {
  const grouping = d.rail?.grouping;
  if (!d.rail || !grouping) return null;
  if (grouping.fits) {
    return passed(
      'rail-grouping',
      `${grouping.groups} rail groups (two per tread) of ${grouping.pixelsPerGroup} pixels: drive ${grouping.pixelsToFit} of the rail's ${d.rail.pixelsOnRail} pixels${grouping.sparePixels > 0 ? `, leaving ${grouping.sparePixels} dark at the end` : ''}.`,
      grouping.pixelsPerGroup,
      1,
      'pixels per group',
      GROUPING_REFERENCE,
    );
  }
  const perM = Math.ceil(grouping.groups / d.rail.rail.lengthM);
  return flagged(
    'rail-grouping',
    'fail',
    `The rail holds ${d.rail.pixelsOnRail} pixels, fewer than the ${grouping.groups} groups (two per tread) that keep it in step with the treads.`,
    0,
    1,
    'pixels per group',
    GROUPING_REFERENCE,
    `Use a rail strip with at least ${perM} pixels/m over the ${d.rail.rail.lengthM} m rail.`,
  );
}

/** The pixel run's load figures, rail or chained treads. */
function pixelLoad(d: Design) {
  if (d.rail) {
    const r = d.rail;
    return { name: 'rail', current: r.current, cap: r.rail.brightnessPercent ?? 100, sized: r.sizingBrightnessPercent, currentA: r.currentA, uncappedA: r.uncappedCurrentA, voltageV: r.rail.voltageV };
  }
  if (d.treadPixels) {
    const t = d.treadPixels;
    const cap = t.block.brightnessPercent ?? 100;
    return { name: 'tread', current: t.current, cap, sized: t.sizingBrightnessPercent, currentA: t.totalCurrentA, uncappedA: t.uncappedCurrentA, voltageV: t.block.voltageV };
  }
  return null;
}

/** Every default current per pixel is a guess the installer must confirm (issue 8). */
export function pixelCurrentCheck(d: Design): EstimateCheck | null {
  const run = pixelLoad(d);
  if (!run) return null;
  const mA = run.current.currentPerPixelMa;
  const value = Math.round(mA * 1e4) / 1e4;
  if (!run.current.defaulted) {
    return passed('pixel-current', `Each ${run.name} pixel draws ${fmt(mA, 2)} mA at full white (${run.current.source === 'given' ? 'as given' : `from ${fmt(run.current.powerWPerM ?? 0, 2)} W/m`}).`, value, null, 'mA', run.current.reference);
  }
  return flagged(
    'pixel-current',
    'warn',
    `No current per pixel or strip power given: ${fmt(mA, 2)} mA per ${run.name} pixel at ${run.voltageV} V assumed${run.current.powerWPerM === null ? '' : ` (${fmt(run.current.powerWPerM, 2)} W/m)`}.`,
    value,
    null,
    'mA',
    run.current.reference,
    'Give currentPerPixelMa or powerWPerM from the strip datasheet: drivers, feeders and feed points are sized from it.',
  );
}

/**
 * A brightness cap lowers the load only while the controller enforces it: show both loads, and
 * either size for full white or say the cap must be enforced and the supply overload-protected.
 */
export function brightnessCapCheck(d: Design): EstimateCheck | null {
  const run = pixelLoad(d);
  if (!run || run.cap >= 100) return null;
  const cappedA = run.uncappedA * (run.cap / 100);
  const both = `${run.cap} % cap: ${fmt(cappedA, 2)} A (${fmt(cappedA * run.voltageV, 1)} W); full white: ${fmt(run.uncappedA, 2)} A (${fmt(run.uncappedA * run.voltageV, 1)} W)`;
  if (run.sized >= 100) {
    return passed('brightness-cap', `Drivers and cables sized for full white. ${both}.`, round4(run.uncappedA), round4(run.uncappedA), 'A', CAP_REFERENCE);
  }
  return flagged(
    'brightness-cap',
    'warn',
    `Drivers and cables are sized for the brightness cap. ${both}.`,
    round4(cappedA),
    round4(run.uncappedA),
    'A',
    CAP_REFERENCE,
    `Enforce the ${run.cap} % cap in the controller and use an overload-protected (current-limiting) supply, or set sizeForFullWhite: true to size for ${fmt(run.uncappedA * run.voltageV, 1)} W.`,
  );
}

const CAP_REFERENCE = 'PWM brightness scales current linearly; a cap set in software is not a protection (common practice, no published source)';
const round4 = (x: number) => Math.round(x * 1e4) / 1e4;

function gapText(g: DataGap): string {
  if (g.kind === 'lead') {
    const from = g.output === null ? 'the controller' : `data output ${g.output}${g.controller !== null && g.controller > 1 ? ` of controller ${g.controller}` : ''}`;
    return g.tread === null ? `the lead from ${from} to its stretch of rail` : `the lead from ${from} to tread ${g.tread}`;
  }
  return `the link into tread ${g.tread}`;
}

/** One-wire data is regenerated at every pixel, so every gap on its own stays short (issue 8, item 6). */
export function dataLineLengthCheck(d: Design): EstimateCheck | null {
  const lines = d.rail?.dataLines ?? d.treadPixels?.dataLines;
  if (!lines || !lines.oneWire || !lines.worst) return null;
  const worst = lines.worst;
  if (lines.overLimit.length === 0) {
    return passed(
      'data-line-length',
      `Every one-wire data gap is within its unbuffered limit; the longest relative to its limit is ${gapText(worst)}, ${fmt(worst.lengthM, 2)} m of ${fmt(worst.limitM, 2)} m.`,
      round4(worst.lengthM),
      worst.limitM,
      'm',
      DATA_LINE_REFERENCE,
    );
  }
  const n = lines.overLimit.length;
  const listed = lines.overLimit.slice(0, 3).map((g) => `${gapText(g)} ${fmt(g.lengthM, 2)} m`).join('; ');
  return flagged(
    'data-line-length',
    'fail',
    `${n} one-wire data gap${n === 1 ? '' : 's'} exceed${n === 1 ? 's' : ''} the unbuffered limit: ${listed}${n > 3 ? '; …' : ''} (limit ${fmt(worst.limitM, 2)} m).`,
    round4(worst.lengthM),
    worst.limitM,
    'm',
    DATA_LINE_REFERENCE,
    `Fit a differential data link (transmitter at the sending end, receiver beside the first pixel; ${n} pair${n === 1 ? '' : 's'} in the bill of materials) on ${n === 1 ? 'that gap' : 'each of those gaps'}, or a buffer at the sending end for a little more length, or move the controller so that each gap is within ${fmt(worst.limitM, 2)} m${worst.kind === 'lead' && d.rail ? ' (e.g. between two outputs’ stretches, each output running outward)' : ''}.`,
  );
}

/** A 3.3 V data output is under the 0.7 × VDD a 5 V pixel reads as high: a level shifter is needed. */
export function dataLogicLevelCheck(d: Design): EstimateCheck | null {
  const lines = d.rail?.dataLines ?? d.treadPixels?.dataLines;
  if (!lines || lines.dataLogicV === null) return null;
  const limit = Math.round(lines.logicHighV * 1000) / 1000;
  if (lines.levelShiftersNeeded === 0) {
    return passed('data-logic-level', `The controller's ${lines.dataLogicV} V data reaches the ${fmt(limit, 2)} V the pixels read as high.`, lines.dataLogicV, limit, 'V', LOGIC_REFERENCE);
  }
  return flagged(
    'data-logic-level',
    'fail',
    `The controller's ${lines.dataLogicV} V data is below the ${fmt(limit, 2)} V (0.7 × VDD) the pixels need to read a high bit.`,
    lines.dataLogicV,
    limit,
    'V',
    LOGIC_REFERENCE,
    `Fit a level shifter to 5 V logic at each of the ${lines.levelShiftersNeeded} data output${lines.levelShiftersNeeded === 1 ? '' : 's'} used (in the bill of materials), or choose a controller with 5 V data outputs.`,
  );
}

const LOGIC_REFERENCE = 'logic high ≥ 0.7 × VDD (WS2812B datasheet, VIH); pixel ICs on 12 V / 24 V strip run from about 5 V (from memory)';

const FEED_REFERENCE =
  'each feed point pushes its segment’s current through the strip copper; at most maxFeedCurrentA per feed point (strip datasheet; 5 A by default, common practice, from memory)';

/** Feed points are spaced by density and current: no feed point pushes more than the strip copper takes (issue 8, item 10). */
export function feedPointCurrentCheck(d: Design): EstimateCheck | null {
  let perFeedA: number;
  let limit: number;
  let feeds: number;
  let treadA: number | null = null;
  if (d.rail) {
    if (d.rail.pixels === 0) return null;
    feeds = d.rail.feedPoints;
    perFeedA = d.rail.currentA / feeds;
    limit = d.rail.maxFeedCurrentA;
  } else if (d.treadPixels && d.treadPixels.pixelsPerTread > 0) {
    const t = d.treadPixels;
    feeds = t.feedGroups.length;
    perFeedA = 0;
    for (const g of t.feedGroups) perFeedA = Math.max(perFeedA, g.currentA);
    limit = t.maxFeedCurrentA;
    treadA = t.treadCurrentA;
  } else {
    return null;
  }
  if (perFeedA <= limit + 1e-9) {
    return passed('feed-point-current', `${feeds} feed point${feeds === 1 ? '' : 's'}; the busiest feeds ${fmt(perFeedA, 2)} A of the ${limit} A one feed point may push.`, round4(perFeedA), limit, 'A', FEED_REFERENCE);
  }
  return flagged(
    'feed-point-current',
    'fail',
    treadA !== null
      ? `One tread's segment draws ${fmt(treadA, 2)} A, more than the ${limit} A one feed point may push into the strip.`
      : `A feed point pushes ${fmt(perFeedA, 2)} A, more than the ${limit} A allowed.`,
    round4(perFeedA),
    limit,
    'A',
    FEED_REFERENCE,
    'Feed each tread’s segment at both ends, cap the brightness in the controller, or use a strip with fewer pixels per metre or a higher voltage.',
  );
}

/** A rail must hold at least one whole pixel; otherwise nothing is lit and no reel is ordered (issue 8, item 12). */
export function railHoldsPixelsCheck(d: Design): EstimateCheck | null {
  if (!d.rail) return null;
  const { rail, pixels } = d.rail;
  const reference = 'arithmetic: whole pixels only';
  if (pixels > 0) return passed('rail-holds-pixels', `The ${rail.lengthM} m rail holds ${pixels} pixels.`, pixels, 1, 'pixels', reference);
  return flagged(
    'rail-holds-pixels',
    'fail',
    `The ${rail.lengthM} m rail at ${rail.pixelsPerM} pixels/m holds no whole pixel: nothing would light, and no reel is ordered.`,
    0,
    1,
    'pixels',
    reference,
    `Use a strip with at least ${Math.ceil(1 / rail.lengthM)} pixels/m, or check the rail length.`,
  );
}
