import { describe, expect, it } from 'vitest';

import type { TraceEntry } from '../../core/api-types.js';
import { PRICE_CHANGE } from '../saltmarsh-fixtures.js';
import { changedLines } from './estimate-changes.js';
import { searchTrace, traceOf } from './estimate-trace.js';

const entry = (quantity: string, formula = ''): TraceEntry => ({ quantity, value: 1, unit: '', formula, inputs: {}, reference: 'common practice, no published source' });
const TRACE = [entry('treadStrips.totalLoadW', 'Σ P'), entry('24 V rail: requiredRatingW', 'load / 0.8'), entry('treads.reels'), entry('totalWasteMm'), entry('loadingPercent')];

describe('traceOf', () => {
  it('finds a figure’s entries under their own name and their parts’ names', () => {
    expect(traceOf(TRACE, 'totalLoadW').map((t) => t.quantity)).toEqual(['treadStrips.totalLoadW']);
    expect(traceOf(TRACE, 'requiredRatingW').map((t) => t.quantity)).toEqual(['24 V rail: requiredRatingW']);
    expect(traceOf(TRACE, 'reels').map((t) => t.quantity)).toEqual(['treads.reels']);
    expect(traceOf(TRACE, 'WasteMm')).toEqual([]); // whole names only
  });

  it('searches quantities and formulas by every word', () => {
    expect(searchTrace(TRACE, 'load 0.8').map((t) => t.quantity)).toEqual(['24 V rail: requiredRatingW']);
    expect(searchTrace(TRACE, '  ')).toHaveLength(TRACE.length);
  });
});

describe('changedLines', () => {
  it('lists only what a re-run changed, old → new', () => {
    const lines = changedLines(PRICE_CHANGE);
    expect(lines).toEqual([
      { label: 'Catalog version', old: '21', new: '22' },
      { label: 'Net total', old: '310.4', new: '316.4' },
      { label: 'Gross total', old: '372.48', new: '379.68' },
    ]);
  });
});
