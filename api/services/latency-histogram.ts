/**
 * Fixed latency buckets, so counters from many requests, keys and instances can simply be added
 * and still give p50/p95. Bucket i holds latencies in (BOUNDS[i-1], BOUNDS[i]] ms; the last one
 * holds everything above the last bound.
 */
export const LATENCY_BOUNDS_MS = [5, 10, 25, 50, 100, 250, 500, 1000, 2500] as const;
export const LATENCY_BUCKET_COUNT = LATENCY_BOUNDS_MS.length + 1;

export function emptyBuckets(): number[] {
  return new Array<number>(LATENCY_BUCKET_COUNT).fill(0);
}

export function bucketIndex(latencyMs: number): number {
  const i = LATENCY_BOUNDS_MS.findIndex((bound) => latencyMs <= bound);
  return i === -1 ? LATENCY_BOUNDS_MS.length : i;
}

/** Adds `more` into `into` element by element (rows written by older code may be shorter). */
export function addBuckets(into: number[], more: readonly number[]): number[] {
  for (let i = 0; i < LATENCY_BUCKET_COUNT; i++) into[i] += more[i] ?? 0;
  return into;
}

/**
 * The p-th percentile, interpolated linearly inside the bucket where it falls. A percentile in
 * the open last bucket is reported as that bucket's lower bound (it is at least that). Null when
 * there is nothing to estimate from.
 */
export function estimatePercentile(buckets: readonly number[], percentile: number): number | null {
  const total = buckets.reduce((a, b) => a + b, 0);
  if (total === 0) return null;
  const rank = (percentile / 100) * total;
  let below = 0;
  for (let i = 0; i < buckets.length; i++) {
    const inBucket = buckets[i];
    if (inBucket > 0 && below + inBucket >= rank) {
      const lower = i === 0 ? 0 : LATENCY_BOUNDS_MS[i - 1];
      const upper = i < LATENCY_BOUNDS_MS.length ? LATENCY_BOUNDS_MS[i] : lower;
      return Math.round((lower + ((rank - below) / inBucket) * (upper - lower)) * 10) / 10;
    }
    below += inBucket;
  }
  return LATENCY_BOUNDS_MS[LATENCY_BOUNDS_MS.length - 1];
}
