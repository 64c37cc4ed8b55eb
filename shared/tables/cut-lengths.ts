/** A reel of strip, when the request names no other length (common practice, no published source). */
export const DEFAULT_REEL_LENGTH_MM = 5000;

// Work in whole micrometres so sums and comparisons are exact for any millimetre input.
const UM_PER_MM = 1000;
const toUm = (mm: number) => Math.round(mm * UM_PER_MM);

/**
 * A piece can only be cut at a mark, and it must fit the space measured for it, so it is
 * shortened to the whole pitches that fit (rounding up would cut a piece longer than its space).
 * 0 when not even one pitch fits.
 */
export function cutLengthMm(pieceMm: number, cutPitchMm?: number): number {
  if (cutPitchMm === undefined) return toUm(pieceMm) / UM_PER_MM;
  const pitchUm = toUm(cutPitchMm);
  return (Math.floor(toUm(pieceMm) / pitchUm) * pitchUm) / UM_PER_MM;
}

/** Pieces cut from the reel's start at whole pitches cannot use a tail shorter than one pitch. */
export function usableReelMm(reelLengthMm: number, cutPitchMm?: number): number {
  if (cutPitchMm === undefined) return toUm(reelLengthMm) / UM_PER_MM;
  const pitchUm = toUm(cutPitchMm);
  return (Math.floor(toUm(reelLengthMm) / pitchUm) * pitchUm) / UM_PER_MM;
}
