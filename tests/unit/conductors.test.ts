import { describe, expect, it } from 'vitest';
import { awgCrossSectionMm2, findConductor, resistanceOhmPerKm, standardSizes } from '../../shared/sizing/conductors.js';
import { SizingInputError } from '../../shared/tables/errors.js';
import { CONDUCTOR_TABLES, CONDUCTOR_TABLE_IDS } from '../../shared/tables/conductors.js';

function thrown(f: () => unknown): SizingInputError {
  try {
    f();
  } catch (error) {
    if (error instanceof SizingInputError) return error;
    throw error;
  }
  throw new Error('expected a SizingInputError');
}

describe('conductor tables', () => {
  it.each(CONDUCTOR_TABLE_IDS)('%s ascends in area, falls in resistance, never falls in rating', (id) => {
    // The cable chooser takes the first row that passes, which is only the smallest if the table is ordered like this.
    const rows = CONDUCTOR_TABLES[id].rows;
    for (let i = 1; i < rows.length; i += 1) {
      expect(rows[i]!.areaMm2).toBeGreaterThan(rows[i - 1]!.areaMm2);
      expect(rows[i]!.resistanceOhmPerKm).toBeLessThan(rows[i - 1]!.resistanceOhmPerKm);
      expect(rows[i]!.currentRatingA).toBeGreaterThanOrEqual(rows[i - 1]!.currentRatingA);
    }
  });

  it('lists every integer gauge 0–40 in the solid AWG table, thinnest first', () => {
    // api-contract.md: awg is an integer 0–40
    expect(standardSizes('awg-solid')).toEqual(Array.from({ length: 41 }, (_, i) => ({ awg: 40 - i })));
  });

  it('marks every recalled current rating as such', () => {
    // RULES.md: a recalled value says `from memory`; an invented one says `no published source`.
    for (const id of CONDUCTOR_TABLE_IDS) {
      for (const row of CONDUCTOR_TABLES[id].rows) {
        expect(row.currentRatingSource).toMatch(/from memory|no published source/);
      }
    }
  });
});

describe('conductor lookup errors', () => {
  it('names conductorTable when a metric size meets an AWG table', () => {
    const error = thrown(() => findConductor('awg-solid', { crossSectionMm2: 0.75 }));
    expect(error.path).toEqual(['conductorTable']);
    expect(error.code).toBe('conductor_table_mismatch');
  });

  it('names conductorTable when a gauge meets a metric table', () => {
    expect(thrown(() => resistanceOhmPerKm('iec60228-class5', { awg: 18 })).path).toEqual(['conductorTable']);
  });

  it('names the size field when the table lacks the size', () => {
    const metric = thrown(() => findConductor('iec60228-class5', { crossSectionMm2: 0.6 }));
    expect(metric.path).toEqual(['conductor', 'crossSectionMm2']);
    expect(metric.code).toBe('conductor_size_not_in_table');
    // NEC Chapter 9 Table 8 starts at 18 AWG
    expect(thrown(() => findConductor('nec-ch9-t8-stranded', { awg: 20 })).path).toEqual(['conductor', 'awg']);
  });

  it('rejects gauges outside 0–40 and fractional gauges', () => {
    // api-contract.md: awg is an integer 0–40
    expect(thrown(() => awgCrossSectionMm2(41)).code).toBe('awg_out_of_range');
    expect(thrown(() => awgCrossSectionMm2(17.5)).code).toBe('awg_out_of_range');
    expect(awgCrossSectionMm2(0)).toBeGreaterThan(awgCrossSectionMm2(1));
  });
});
