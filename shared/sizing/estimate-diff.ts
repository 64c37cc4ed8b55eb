import type { EstimateCheck, EstimateResult } from '../schemas/estimate.js';
import type { EstimateChanges } from '../schemas/projects.js';

type Status = EstimateCheck['status'];
interface Change<T> {
  old: T;
  new: T;
  changed: boolean;
}

const change = <T>(old: T, next: T): Change<T> => ({ old, new: next, changed: old !== next });

/** The stored catalog version that priced a result; null when unpriced or priced inline. */
export function catalogVersionOf(result: EstimateResult): number | null {
  return result.pricing?.catalogVersion ?? null;
}

const netOf = (r: EstimateResult): number | null => r.pricing?.net ?? r.bomTotal ?? null;
const grossOf = (r: EstimateResult): number | null => r.pricing?.gross ?? null;
const currencyOf = (r: EstimateResult): string | null => r.pricing?.currency ?? r.currency ?? null;

/**
 * Checks keyed by id and, should an id ever repeat within one result, by its occurrence
 * (`cable-drop#2`), so each is compared with its counterpart rather than with the first.
 */
function keyedChecks(checks: readonly EstimateCheck[]): Map<string, EstimateCheck> {
  const seen = new Map<string, number>();
  const out = new Map<string, EstimateCheck>();
  for (const check of checks) {
    const n = (seen.get(check.id) ?? 0) + 1;
    seen.set(check.id, n);
    out.set(n === 1 ? check.id : `${check.id}#${n}`, check);
  }
  return out;
}

/**
 * What changed between two results of the same input: the headline figures, the engine and
 * catalog versions, and every check whose status moved (a check made only by one run counts, with
 * null for the run that lacks it). Pure: an installer sees at once what a new engine or a price
 * change did to a quote.
 */
export function diffEstimates(old: EstimateResult, next: EstimateResult): EstimateChanges {
  const oldChecks = keyedChecks(old.checks);
  const newChecks = keyedChecks(next.checks);
  const checks: EstimateChanges['checks'] = [];
  for (const [key, check] of newChecks) {
    const before: Status | null = oldChecks.get(key)?.status ?? null;
    if (before !== check.status) checks.push({ id: check.id, oldStatus: before, newStatus: check.status, message: check.message });
  }
  for (const [key, check] of oldChecks) {
    if (!newChecks.has(key)) checks.push({ id: check.id, oldStatus: check.status, newStatus: null, message: check.message });
  }

  const figures = {
    totalLoadW: change(old.summary.totalLoadW, next.summary.totalLoadW),
    driverCount: change(old.summary.driverCount, next.summary.driverCount),
    worstDropPercent: change(old.summary.worstDropPercent, next.summary.worstDropPercent),
    reels: change(old.summary.reels, next.summary.reels),
    bomTotal: change(netOf(old), netOf(next)),
    gross: change(grossOf(old), grossOf(next)),
  };
  const engineVersion = change(old.engineVersion, next.engineVersion);
  const catalogVersion = change(catalogVersionOf(old), catalogVersionOf(next));
  const currency = change(currencyOf(old), currencyOf(next));
  const changed =
    engineVersion.changed || catalogVersion.changed || currency.changed || checks.length > 0 || Object.values(figures).some((f) => f.changed);
  return { changed, engineVersion, catalogVersion, currency, figures, checks };
}
