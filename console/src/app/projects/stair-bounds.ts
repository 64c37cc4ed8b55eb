import { MAX_FLIGHTS, MAX_TREADS } from '../../../../shared/tables/limits.js';

export { MAX_FLIGHTS, MAX_TREADS };

/**
 * The bounds POST /v1/estimates puts on the fields the stair editor edits, mirrored from
 * shared/schemas/estimate.ts (staircaseSchema, treadStripSchema, estimateControllerSchema) so the
 * console does not ship zod; stair-bounds.spec.ts parses each bound with the schema itself and
 * fails when the two disagree.
 */
export const STAIR_BOUNDS = {
  treads: { min: 1, max: MAX_TREADS, integer: true },
  treadWidthMm: { min: 100, max: 5000 },
  riserHeightMm: { min: 50, max: 400 },
  goingMm: { min: 50, max: 1000 },
  flightTreads: { min: 1, max: MAX_TREADS, integer: true },
  landingLengthMm: { min: 0, max: 20_000 },
  voltageV: { min: 1, max: 400 },
  // The schema says positive(): greater than 0, not 0 itself.
  powerWPerM: { min: 0, max: 200, exclusiveMin: true },
  cutPitchMm: { min: 1, max: 1000 },
  endClearanceMm: { min: 0, max: 500 },
  controllerTread: { min: 1, max: MAX_TREADS, integer: true },
} as const satisfies Record<string, NumberBound>;

export interface NumberBound {
  min: number;
  max: number;
  integer?: boolean;
  exclusiveMin?: boolean;
}

export type StairBoundName = keyof typeof STAIR_BOUNDS;

/** Stair and project names: nameText(120) in shared/schemas/text.ts. */
export const NAME_MAX = 120;
export const PROFILE_ID_MAX = 64;
