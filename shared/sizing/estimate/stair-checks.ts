import type { EstimateCheck } from '../../schemas/estimate.js';
import type { StripFit } from '../strip.js';
import { flagged, passed, PRACTICE, treadsText, type Design } from './checks.js';

const FIT_REFERENCE = 'strip cut only at its marked cut points (strip datasheet); end clearance 20 mm by default (common practice, no published source)';

function inRange(count: number, min: number, max: number | undefined): boolean {
  return count >= min && (max === undefined || count <= max);
}

/** Only where treads are lit: a rail along a stair does not use the controller's tread outputs. */
export function treadCountCheck(d: Design): EstimateCheck | null {
  if (!d.stair || (!d.treadStrips && !d.treadPixels)) return null;
  const { profile } = d.settings;
  const n = d.stair.treads;
  const min = profile.minTreads ?? 1;
  const max = profile.maxTreads;
  const range = max === undefined ? `${min} or more` : `${min}–${max}`;
  if (n < min) {
    return flagged(
      'tread-count-range',
      'fail',
      `The stair has ${n} treads; the controller supports ${range} treads.`,
      n,
      range,
      'treads',
      'controller profile',
      `Choose a controller whose range starts at ${n} treads or fewer (this one needs at least ${min}).`,
    );
  }
  if (inRange(n, min, max)) {
    const text = max === undefined && min === 1 ? 'the profile sets no tread limit' : `within the controller's ${range} treads`;
    return passed('tread-count-range', `${n} treads: ${text}.`, n, range, 'treads', 'controller profile');
  }
  const blocks = d.controllerBlocks;
  const blocksOk = blocks.length > 1 && blocks.every((b) => inRange(b.lastTread - b.firstTread + 1, min, max));
  return flagged(
    'tread-count-range',
    blocksOk ? 'warn' : 'fail',
    blocksOk
      ? `${n} treads exceed one controller's ${range} treads; ${blocks.length} controllers take treads ${treadsText(blocks)}.`
      : `${n} treads exceed the controller's ${range} treads.`,
    n,
    range,
    'treads',
    'controller profile',
    blocksOk
      ? `Fit ${blocks.length} controllers as planned (treads ${treadsText(blocks)}), or choose one controller rated for ${n} treads.`
      : `Choose a controller rated for ${n} treads, or split the stair over ${Math.ceil(n / (max as number))} controllers.`,
  );
}

/** The strip (or pixel segment) must hold at least one cut pitch between the end clearances. */
export function stripFitsCheck(d: Design): EstimateCheck | null {
  const stairWidth = d.stair?.treadWidthMm;
  if (stairWidth === undefined) return null;
  let width: number = stairWidth;
  let fit: StripFit;
  let pitchMm: number;
  let pixels: number | null = null;
  let pixelsPerM = 0;
  if (d.treadStrips) {
    // The narrowest tread fails first when the stair lists each tread's width.
    fit = d.treadStrips.fit;
    width = d.treadStrips.narrowestWidthMm;
    pitchMm = d.treadStrips.strip.cutPitchMm;
  } else if (d.treadPixels) {
    fit = d.treadPixels.fit;
    width = d.treadPixels.narrowestWidthMm;
    pixelsPerM = d.treadPixels.block.pixelsPerM;
    pitchMm = d.treadPixels.block.cutPitchMm ?? 1000 / pixelsPerM;
    pixels = d.treadPixels.narrowestPixels;
  } else {
    return null;
  }
  const spaceMm = Math.round(fit.spaceMm * 1000) / 1000;
  const pitchText = Math.round(pitchMm * 1000) / 1000;
  if (!fit.fits) {
    const clearanceForOne = Math.floor((width - pitchMm) / 2);
    return flagged(
      'strip-fits-tread',
      'fail',
      `Not one ${pitchText} mm cut pitch fits the ${Math.max(0, spaceMm)} mm between the end clearances of a ${width} mm tread.`,
      0,
      Math.max(0, spaceMm),
      'mm',
      FIT_REFERENCE,
      clearanceForOne >= 0
        ? `Reduce endClearanceMm to ${clearanceForOne} mm or less${spaceMm >= 1 ? `, or use a strip cut every ${Math.floor(spaceMm)} mm or less` : ''}.`
        : `Use a strip with a cut pitch well under the ${width} mm tread width (this one is cut every ${pitchText} mm).`,
    );
  }
  if (pixels === 0) {
    const needPerM = Math.ceil(1000 / fit.stripLengthMm);
    return flagged(
      'strip-fits-tread',
      'fail',
      `${fit.stripLengthMm} mm of pixel strip on each tread holds no whole pixel.`,
      0,
      1,
      'pixels',
      FIT_REFERENCE,
      `Use a pixel strip with at least ${needPerM} pixels/m, or one cut every ${Math.floor(fit.stripLengthMm)} mm or less.`,
    );
  }
  return passed(
    'strip-fits-tread',
    `${Math.round(fit.stripLengthMm * 1000) / 1000} mm (${fit.pitches} × ${pitchText} mm) fits the ${spaceMm} mm between the end clearances${pixels === null ? '' : `: ${pixels} pixels per tread`}.`,
    Math.round(fit.stripLengthMm * 1000) / 1000,
    spaceMm,
    'mm',
    FIT_REFERENCE,
  );
}

/** A tread piece must come from one reel: a joint inside a piece is not planned. */
export function pieceFitsReelCheck(d: Design): EstimateCheck | null {
  const reels = d.treadReels;
  if (!reels) return null;
  let pieceMm = 0;
  for (const piece of d.treadStrips?.litPiecesMm ?? d.treadPixels?.litPiecesMm ?? []) pieceMm = Math.max(pieceMm, piece);
  const usable = reels.plan.usableReelLengthMm;
  const pieceText = Math.round(pieceMm * 1000) / 1000;
  if (reels.plan.unplaceableIndexes.length === 0) {
    return passed('piece-fits-reel', `Each ${pieceText} mm piece comes from one ${reels.reelLengthMm} mm reel without a joint.`, pieceText, usable, 'mm', PRACTICE);
  }
  return flagged(
    'piece-fits-reel',
    'fail',
    `${reels.plan.unplaceableIndexes.length} tread piece(s) of ${pieceText} mm are longer than the ${usable} mm a reel gives; each needs a joint.`,
    pieceText,
    usable,
    'mm',
    PRACTICE,
    `Buy reels of at least ${Math.ceil(pieceMm / 1000) * 1000} mm, or plan a soldered joint inside each of those pieces (${reels.jointReels} reels are counted for them).`,
  );
}
