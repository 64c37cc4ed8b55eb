import type { TraceEntry } from '../../core/api-types.js';

/**
 * The trace entries behind a figure: the quantity itself (`totalLoadW`) and those of its parts
 * (`treadStrips.totalLoadW`, `24 V rail: requiredRatingW`), in the engine's order.
 */
export function traceOf(trace: TraceEntry[], quantity: string): TraceEntry[] {
  return trace.filter((t) => t.quantity === quantity || t.quantity.endsWith(`.${quantity}`) || t.quantity.endsWith(`: ${quantity}`));
}

/** Entries whose quantity, formula or reference holds every word of the query. */
export function searchTrace(trace: TraceEntry[], query: string): TraceEntry[] {
  const words = query.toLowerCase().split(/\s+/).filter(Boolean);
  if (words.length === 0) return trace;
  return trace.filter((t) => {
    const text = `${t.quantity} ${t.formula} ${t.reference}`.toLowerCase();
    return words.every((w) => text.includes(w));
  });
}
