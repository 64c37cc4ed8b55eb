import type { EstimateResult } from '../../shared/schemas/estimate.js';
import type { ExportContext } from './context.js';

/**
 * Small readings of an estimate both the CSV and the PDF renderers need, so the two papers of
 * one estimate never disagree.
 */

/**
 * The flight each tread belongs to: from the context's flights when given, else 1 for a stair the
 * answer shows to be one flight (its sensors name flight 1 only), else unknown (null).
 */
export function flightOfTread(result: EstimateResult, context: ExportContext): (tread: number) => number | null {
  const perFlight = context.treadsPerFlight;
  if (perFlight && perFlight.length > 0) {
    const lastTreadOfFlight = perFlight.reduce<number[]>((acc, n) => [...acc, (acc.at(-1) ?? 0) + n], []);
    return (tread) => {
      const i = lastTreadOfFlight.findIndex((last) => tread <= last);
      return i === -1 ? null : i + 1;
    };
  }
  const flights = result.sensors.placements.map((p) => p.flight).filter((f): f is number => f !== null);
  const oneFlight = flights.length > 0 && flights.every((f) => f === 1) && (result.landings ?? []).length === 0;
  return () => (oneFlight ? 1 : null);
}

interface Sized {
  crossSectionMm2?: number | null;
  awg?: number | null;
}

/** A conductor as the trade writes it: `0.5 mm²`, `18 AWG`, `none fits` when no size passes. */
export function conductorLabel(size: Sized): string {
  if (typeof size.crossSectionMm2 === 'number') return `${size.crossSectionMm2} mm²`;
  if (typeof size.awg === 'number') return `${size.awg} AWG`;
  if (size.crossSectionMm2 === null || size.awg === null) return 'none fits';
  return '';
}

/** Every data gap of the pixel runs, each with the run it belongs to. */
export function dataGaps(result: EstimateResult) {
  return [result.pixels.rail, result.pixels.treads].flatMap((run) => (run ? run.dataGaps.map((gap) => ({ run: run.run, ...gap })) : []));
}

/** The pixel runs the answer holds (rail first). */
export function pixelRuns(result: EstimateResult) {
  return [result.pixels.rail, result.pixels.treads].filter((run) => run !== null);
}
