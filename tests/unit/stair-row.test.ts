import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { estimateRequestSchema } from '../../shared/schemas/estimate.js';
import { estimateExamples } from '../../shared/schemas/estimate-examples.js';
import { REF_COLUMN, requestToRow, rowToRequest, stairRowColumns, type StairRow } from '../../shared/schemas/stair-row.js';

/** The row as a CSV reader hands it back: every cell text (numbers spelt as JavaScript writes them). */
const asText = (row: StairRow): StairRow => Object.fromEntries(Object.entries(row).map(([c, v]) => [c, String(v)]));

describe('the stair-row columns', () => {
  it('come from the schema: ref first, dotted names, indexed arrays, each layout’s blocks', () => {
    const columns = stairRowColumns();
    expect(columns[0]).toBe(REF_COLUMN);
    expect(new Set(columns).size).toBe(columns.length);
    for (const name of [
      'layout',
      'staircase.treads',
      'staircase.flights.0.treads',
      'staircase.flights.1.landingLengthMm',
      'treadStrip.voltageV',
      'railPixels.lengthM',
      'treadPixels.pixelsPerM',
      'controller.profileId',
      'controller.profile.sensorInput.type',
      'controller.position',
      'controller.position.tread',
      'drivers.availableRatingsW.1',
      'catalog.items.0.sku',
    ]) {
      expect(columns).toContain(name);
    }
    expect(columns).not.toContain('staircase.flights.2.treads'); // two indexed columns unless rows need more
  });

  it('grow to the widest array of the requests given, and can leave out a block', () => {
    const columns = stairRowColumns(Object.values(estimateExamples), { omit: ['catalog'] });
    expect(columns.some((c) => c.startsWith('catalog'))).toBe(false);
    const corner = requestToRow(estimateExamples.alderRowCornerUnit);
    for (const column of Object.keys(corner)) expect(columns).toContain(column);
    // The checkout example's inline catalog has 22 items: its columns reach index 21 when not omitted.
    expect(stairRowColumns([estimateExamples.harborLaneCheckout])).toContain('catalog.items.21.sku');
  });
});

describe('rows and requests', () => {
  it('round-trip every documented example, typed and as text', () => {
    for (const [name, example] of Object.entries(estimateExamples)) {
      const row = requestToRow(example, name);
      expect(row[REF_COLUMN]).toBe(name);
      expect(rowToRequest(row)).toEqual({ ref: name, request: example });
      expect(rowToRequest(asText(row))).toEqual({ ref: name, request: example });
    }
  });

  it('turns text into the type the schema wants there, and leaves empty cells out', () => {
    const { ref, request } = rowToRequest({
      ref: 'Plot 3',
      layout: 'tread-strips',
      'staircase.treads': '12',
      'staircase.treadWidthMm': '1000',
      'staircase.riserHeightMm': '180',
      'staircase.goingMm': '260',
      'staircase.flights.0.treads': '6',
      'staircase.flights.0.landingLengthMm': '900',
      'staircase.flights.1.treads': '6',
      'treadStrip.voltageV': '24',
      'treadStrip.powerWPerM': '9.6',
      'treadStrip.cutPitchMm': '50',
      'treadStrip.sku': '0042', // a SKU stays text even when it looks like a number
      'controller.profileId': 'HL-K20',
      'drivers.class2': 'TRUE',
      'drivers.availableRatingsW.0': '60',
      'drivers.availableRatingsW.1': '100',
      'cable.maxDropPercent': '',
      'sensors.daylightCutoffLux': '',
    });
    expect(ref).toBe('Plot 3');
    expect(request).toEqual({
      layout: 'tread-strips',
      staircase: { treads: 12, treadWidthMm: 1000, riserHeightMm: 180, goingMm: 260, flights: [{ treads: 6, landingLengthMm: 900 }, { treads: 6 }] },
      treadStrip: { voltageV: 24, powerWPerM: 9.6, cutPitchMm: 50, sku: '0042' },
      controller: { profileId: 'HL-K20' },
      drivers: { class2: true, availableRatingsW: [60, 100] },
    });
    expect(estimateRequestSchema.safeParse(request).success).toBe(true);
  });

  it('leaves a cell the schema cannot read as text, so validation names its column', () => {
    const { request } = rowToRequest({ ...asText(requestToRow(estimateExamples.alderRowTownhouse)), 'staircase.treads': 'fourteen' });
    const parsed = estimateRequestSchema.safeParse(request);
    expect(parsed.success).toBe(false);
    expect(parsed.error!.issues.map((i) => i.path.join('.'))).toContain('staircase.treads');
  });

  it('never builds prototype keys from a column name', () => {
    const { request } = rowToRequest({ '__proto__.polluted': 'yes', 'constructor.prototype.x': '1', layout: 'tread-strips' });
    expect(request).toEqual({ layout: 'tread-strips' });
    expect(({} as Record<string, unknown>).polluted).toBeUndefined();
  });
});

// Random valid requests: every field a row can hold (no empty arrays or blocks, which have no cells;
// no -0, which a CSV writes as 0 — common practice, no published source: CSV has no signed zero).
const dim = (min: number, max: number) => fc.double({ min, max, noNaN: true, noDefaultInfinity: true }).map((v) => (Object.is(v, -0) ? 0 : v));
const staircase = fc
  .record(
    {
      treads: fc.integer({ min: 2, max: 40 }),
      treadWidthMm: dim(300, 3000),
      riserHeightMm: dim(100, 250),
      goingMm: dim(150, 400),
    },
    { requiredKeys: ['treads', 'treadWidthMm', 'riserHeightMm', 'goingMm'] },
  )
  .chain((s) =>
    fc.option(fc.integer({ min: 1, max: Math.min(4, s.treads) }), { nil: undefined }).map((flights) => {
      if (!flights || flights < 2) return s;
      const per = Math.floor(s.treads / flights);
      const list = Array.from({ length: flights }, (_, i) => ({ treads: i === flights - 1 ? s.treads - per * (flights - 1) : per }));
      return { ...s, flights: list };
    }),
  );
const request = fc.record(
  {
    layout: fc.constant('tread-strips' as const),
    staircase,
    treadStrip: fc.record(
      { voltageV: fc.constantFrom(12, 24), powerWPerM: dim(1, 30), cutPitchMm: dim(10, 100), endClearanceMm: dim(0, 50), sku: fc.stringMatching(/^[A-Z][A-Z0-9-]{0,11}$/) },
      { requiredKeys: ['voltageV', 'powerWPerM', 'cutPitchMm'] },
    ),
    controller: fc.oneof(
      fc.record({ profile: fc.record({ outputs: fc.integer({ min: 1, max: 64 }), maxCurrentPerOutputA: dim(0.1, 10) }), position: fc.constantFrom('bottom', 'top', 'middle') }),
      fc.record({ profileId: fc.stringMatching(/^[A-Z][A-Z0-9-]{0,11}$/) }),
    ),
    drivers: fc.record({ availableRatingsW: fc.array(dim(10, 1000), { minLength: 1, maxLength: 5 }), class2: fc.boolean() }),
    cable: fc.record({ maxDropPercent: dim(1, 10) }),
  },
  { requiredKeys: ['layout', 'staircase', 'treadStrip', 'controller'] },
);

describe('random requests', () => {
  it('round-trip through a row and through its text', () => {
    let checked = 0;
    fc.assert(
      fc.property(request, fc.option(fc.stringMatching(/^[A-Za-z0-9 ,.-]{1,30}$/), { nil: undefined }), (req, ref) => {
        const parsed = estimateRequestSchema.safeParse(req);
        fc.pre(parsed.success); // only what the API would take
        checked++;
        const row = requestToRow(req, ref);
        const expected = ref === undefined ? { request: req } : { ref, request: req };
        expect(rowToRequest(row)).toEqual(expected);
        expect(rowToRequest(asText(row))).toEqual(expected);
        for (const column of Object.keys(row)) expect(stairRowColumns([req])).toContain(column);
      }),
      { numRuns: 300, seed: 0x57a1 },
    );
    expect(checked).toBeGreaterThan(100);
  });
});
