import type { EstimateInput } from '../../shared/schemas/estimate.js';
import type { ReelsInput } from '../../shared/schemas/reels.js';

/**
 * What one sizing call costs against the per-key cost budget, in work units, from its validated
 * body before the engine runs. Every call costs 1; the work that grows with the request adds to
 * it: each tread or lit landing sized (its strip, output, cable run and reel piece), every ten
 * pixels (data split, power and feed points grow with them) and every ten catalog items read.
 * A 14-tread stair costs 15; the largest request the limits allow about 2 400.
 */
export const PIXELS_PER_UNIT = 10;
export const CATALOG_ITEMS_PER_UNIT = 10;

export function estimateCost(input: EstimateInput): number {
  const stair = input.staircase;
  const treads = stair?.treads ?? 0;
  const landings = stair?.litLandings?.length ?? 0;
  let pixels = 0;
  if ('railPixels' in input && input.railPixels) pixels += Math.floor(input.railPixels.lengthM * input.railPixels.pixelsPerM);
  if (input.layout === 'tread-pixels' && stair) {
    const widthMm = stair.treadWidthsMm?.reduce((sum, mm) => sum + mm, 0) ?? treads * stair.treadWidthMm;
    pixels += Math.floor((widthMm / 1000) * input.treadPixels.pixelsPerM);
  }
  const catalogItems = input.catalog?.items.length ?? 0;
  return 1 + treads + landings + Math.ceil(pixels / PIXELS_PER_UNIT) + Math.ceil(catalogItems / CATALOG_ITEMS_PER_UNIT);
}

/** One unit per piece to cut (the exact search is bounded to 12 pieces; first-fit beyond). */
export function reelsCost(input: ReelsInput): number {
  return 1 + input.piecesMm.length;
}
