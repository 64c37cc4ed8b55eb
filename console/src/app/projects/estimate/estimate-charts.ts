import type { EstimateResponse } from '../../core/api-types.js';

export type BarStatus = 'within' | 'near' | 'over';

export interface Bar {
  label: string;
  value: number;
  status: BarStatus;
}

export interface BarChartData {
  bars: Bar[];
  limit: number;
  unit: string;
  /** Top of the value axis: the limit or the tallest bar, whichever is higher, with headroom. */
  max: number;
}

/** Within 90 % of the limit a bar is drawn as near it (common practice, no published source: a margin for tolerances). */
const NEAR_SHARE = 0.9;

function statusOf(value: number, limit: number): BarStatus {
  if (value > limit) return 'over';
  return value >= limit * NEAR_SHARE ? 'near' : 'within';
}

function chart(bars: Omit<Bar, 'status'>[], limit: number, unit: string): BarChartData {
  const tallest = Math.max(limit, ...bars.map((b) => b.value));
  return { bars: bars.map((b) => ({ ...b, status: statusOf(b.value, limit) })), limit, unit, max: tallest * 1.1 };
}

// The API's default end-to-end limit when no cable-drop check states one (estimateCableSchema maxDropPercent).
const DEFAULT_DROP_LIMIT_PERCENT = 5;

/**
 * Each tread's voltage drop against the limit: end to end (driver → feeder → lead) where the
 * estimate gives it, as the cable-drop check measures it; else the lead's own drop.
 */
export function treadDropChart(result: EstimateResponse): BarChartData {
  const check = result.checks.find((c) => c.id === 'cable-drop');
  const limit = typeof check?.limit === 'number' ? check.limit : DEFAULT_DROP_LIMIT_PERCENT;
  const bars = result.treads.map((t) => ({ label: String(t.index), value: t.pathDropPercent ?? t.dropPercent }));
  return chart(bars, limit, '%');
}

/** Current of each constant-voltage output against the controller's per-output limit. */
export function outputLoadChart(result: EstimateResponse): BarChartData | null {
  const outputs = result.outputs.cv;
  if (outputs.length === 0) return null;
  const several = result.outputs.controllers > 1;
  const bars = outputs.map((o) => ({ label: several ? `${o.controller}.${o.output}` : String(o.output), value: o.currentA }));
  return chart(bars, result.outputs.maxCurrentPerOutputA, 'A');
}
