import { describe, expect, it } from 'vitest';

import { MAX_USAGE_RANGE_DAYS } from '../../../../shared/schemas/usage.js';
import { day, report } from './traffic-fixtures.js';
import { MAX_RANGE_DAYS, OTHER_SERIES, formatCount, formatOneDecimal, callsPerDayPerKey, chartKeys, dayErrors, defaultRange, exportFilename, rangeProblem, requestsByDay, summarize } from './traffic-data.js';

const CHECKOUT = 'h7kq2mzx4c5d';
const PAGES = 'p4g3sk3yabcd';

describe('traffic data shaping', () => {
  it('stacks calls per day per key, with what the keys drawn do not explain as "other calls"', () => {
    const r = report([day('2026-12-01', 10), day('2026-12-02', 7)], [{ keyId: CHECKOUT, requests: 9 }, { keyId: PAGES, requests: 6 }, { keyId: 'console', requests: 2 }]);
    const chart = callsPerDayPerKey(r, [
      { keyId: CHECKOUT, label: 'Checkout', requests: [6, 3] },
      { keyId: PAGES, label: PAGES, requests: [3, 3] },
    ]);
    expect(chart.labels).toEqual(['2026-12-01', '2026-12-02']);
    expect(chart.series).toEqual([
      { label: 'Checkout', data: [6, 3] },
      { label: PAGES, data: [3, 3] },
      { label: OTHER_SERIES, data: [1, 1] },
    ]);
    // every bar adds up to the day's calls
    for (const [i, d] of r.data.entries()) expect(chart.series.reduce((s, x) => s + x.data[i]!, 0)).toBe(d.requests);
  });

  it('draws no "other" series when the keys explain every call', () => {
    const r = report([day('2026-12-01', 4)], [{ keyId: CHECKOUT, requests: 4 }]);
    expect(callsPerDayPerKey(r, [{ keyId: CHECKOUT, label: 'Checkout', requests: [4] }]).series.map((s) => s.label)).toEqual(['Checkout']);
  });

  it('draws the busiest keys that can be filtered by id, at most five, skipping console sizing and idle keys', () => {
    const ids = ['aaaaaaaaaaaa', 'bbbbbbbbbbbb', 'cccccccccccc', 'dddddddddddd', 'eeeeeeeeeeee', 'ffffffffffff'];
    const r = report([day('2026-12-01', 30)], [{ keyId: 'console', requests: 9 }, ...ids.map((keyId, i) => ({ keyId, requests: 6 - i })), { keyId: 'gggggggggggg', requests: 0 }]);
    expect(chartKeys(r)).toEqual(ids.slice(0, 5));
  });

  it('lines a key’s days up with the range, zero where it has none', () => {
    expect(requestsByDay(['2026-12-01', '2026-12-02', '2026-12-03'], [day('2026-12-02', 5)])).toEqual([0, 5, 0]);
  });

  it('counts errors without the 429s, which are shown on their own', () => {
    const d = day('2026-12-01', 20, { limited: 3, byStatusClass: { '2xx': 12, '3xx': 0, '4xx': 6, '5xx': 2 } });
    expect(dayErrors(d)).toBe(5);
    const s = summarize(report([d], []));
    expect([s.requests, s.errors, s.limited, s.p50LatencyMs, s.p95LatencyMs]).toEqual([20, 5, 3, 5.8, 21.6]);
  });

  it('defaults to the last 30 days, as the API does', () => {
    expect(defaultRange(new Date('2026-12-02T23:30:00Z'))).toEqual({ from: '2026-11-03', to: '2026-12-02' });
  });

  it('refuses what the API would: missing dates, a reversed range, more than 366 days', () => {
    expect(rangeProblem('', '2026-12-02')).toBe('Give both dates.');
    expect(rangeProblem('2026-12-03', '2026-12-02')).toContain('must not be after');
    expect(rangeProblem('2025-12-01', '2026-12-01')).toBeNull(); // 366 days, inclusive
    expect(rangeProblem('2025-11-30', '2026-12-01')).toContain('366 days');
  });

  it('formats counts with thousands separators and latencies to one decimal', () => {
    expect(formatCount(50000)).toBe('50,000');
    expect(formatOneDecimal(21.64)).toBe('21.6');
    expect(formatOneDecimal(5)).toBe('5');
    expect(formatOneDecimal(null)).toBe('—');
  });

  it('allows the range the usage API allows', () => {
    expect(MAX_RANGE_DAYS).toBe(MAX_USAGE_RANGE_DAYS);
  });

  it('names the download as the API suggests', () => {
    const filter = { from: '2026-11-03', to: '2026-12-02', keyId: null };
    expect(exportFilename('attachment; filename="treadwise-usage-harbor-lane-2026-11-03-to-2026-12-02.csv"', filter)).toBe('treadwise-usage-harbor-lane-2026-11-03-to-2026-12-02.csv');
    expect(exportFilename(null, filter)).toBe('treadwise-usage-2026-11-03-to-2026-12-02.csv');
  });
});
