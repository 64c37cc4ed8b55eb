import { describe, expect, it } from 'vitest';
import { estimateRequestSchema, type EstimateResult } from '../../shared/schemas/estimate.js';
import { estimateExamples } from '../../shared/schemas/estimate-examples.js';
import { diffEstimates } from '../../shared/sizing/estimate-diff.js';
import { estimate } from '../../shared/sizing/estimate/estimate.js';

const run = (input: unknown) => estimate(estimateRequestSchema.parse(input));
const townhouse = run(estimateExamples.alderRowTownhouse);

/** A result priced by a stored catalog (the shape the stored-catalog pricing answers). */
function priced(result: EstimateResult, catalogVersion: number, net: number, gross: number): EstimateResult {
  return {
    ...result,
    bomTotal: net,
    currency: 'EUR',
    pricing: { source: 'stored', catalogVersion, currency: 'EUR', taxRatePercent: 20, net, tax: Number((gross - net).toFixed(2)), gross, complete: true, unpricedLines: 0 },
  };
}

describe('diffEstimates', () => {
  it('finds nothing between two runs of the same input on the same engine', () => {
    const changes = diffEstimates(townhouse, run(estimateExamples.alderRowTownhouse));
    expect(changes.changed).toBe(false);
    expect(changes.checks).toEqual([]);
    for (const figure of Object.values(changes.figures)) expect(figure.changed).toBe(false);
    expect(changes.engineVersion).toEqual({ old: townhouse.engineVersion, new: townhouse.engineVersion, changed: false });
  });

  it('reports the headline figures old → new when the design changes', () => {
    // Twice the strip power: the load doubles, so the total load must move and be reported both ways.
    const stronger = run({ ...estimateExamples.alderRowTownhouse, treadStrip: { ...estimateExamples.alderRowTownhouse.treadStrip, powerWPerM: 20 } });
    const changes = diffEstimates(townhouse, stronger);
    expect(changes.changed).toBe(true);
    expect(changes.figures.totalLoadW).toEqual({ old: townhouse.summary.totalLoadW, new: stronger.summary.totalLoadW, changed: true });
    expect(stronger.summary.totalLoadW).toBeGreaterThan(townhouse.summary.totalLoadW);
    expect(changes.figures.worstDropPercent.old).toBe(townhouse.summary.worstDropPercent);
    expect(changes.figures.worstDropPercent.new).toBe(stronger.summary.worstDropPercent);
    // Every check whose status moved is listed with both statuses; none that kept its status is.
    const moved = stronger.checks.filter((c) => townhouse.checks.find((o) => o.id === c.id)?.status !== c.status);
    expect(changes.checks.map((c) => c.id)).toEqual(moved.map((c) => c.id));
    for (const c of changes.checks) {
      expect(c.oldStatus).toBe(townhouse.checks.find((o) => o.id === c.id)?.status ?? null);
      expect(c.newStatus).toBe(stronger.checks.find((n) => n.id === c.id)?.status);
    }
  });

  it('names a check whose status changed with the new message, and one that is gone with null', () => {
    const [first, second, ...rest] = townhouse.checks;
    const next: EstimateResult = {
      ...townhouse,
      checks: [{ ...first!, status: 'fail', message: 'now failing' }, ...rest],
    };
    const changes = diffEstimates(townhouse, next);
    expect(changes.checks).toEqual([
      { id: first!.id, oldStatus: first!.status, newStatus: 'fail', message: 'now failing' },
      { id: second!.id, oldStatus: second!.status, newStatus: null, message: second!.message },
    ]);
    expect(changes.changed).toBe(true);
  });

  it('shows a price change: the old and new net and gross totals and catalog versions', () => {
    const before = priced(townhouse, 21, 310.4, 372.48);
    const after = priced(townhouse, 22, 316.4, 379.68);
    const changes = diffEstimates(before, after);
    expect(changes.figures.bomTotal).toEqual({ old: 310.4, new: 316.4, changed: true });
    expect(changes.figures.gross).toEqual({ old: 372.48, new: 379.68, changed: true });
    expect(changes.catalogVersion).toEqual({ old: 21, new: 22, changed: true });
    expect(changes.figures.totalLoadW.changed).toBe(false);
    expect(changes.checks).toEqual([]);
  });

  it('tells an unpriced run (null totals) from a priced one', () => {
    const changes = diffEstimates(townhouse, priced(townhouse, 3, 100, 120));
    expect(changes.figures.bomTotal).toEqual({ old: null, new: 100, changed: true });
    expect(changes.catalogVersion).toEqual({ old: null, new: 3, changed: true });
    expect(changes.currency).toEqual({ old: null, new: 'EUR', changed: true });
  });

  it('reports a new engine version', () => {
    const changes = diffEstimates({ ...townhouse, engineVersion: '2.0.0' }, townhouse);
    expect(changes.engineVersion).toEqual({ old: '2.0.0', new: townhouse.engineVersion, changed: true });
    expect(changes.changed).toBe(true);
  });
});
