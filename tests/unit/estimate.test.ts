import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { CONDUCTOR_TABLE_IDS } from '../../shared/tables/conductors.js';
import { CHECK_IDS, estimateRequestSchema, estimateResponseSchema, type EstimateInput, type EstimateResult } from '../../shared/schemas/estimate.js';
import { alderRowTownhouse, estimateExamples, harborLaneCatalog, hlK20Profile } from '../../shared/schemas/estimate-examples.js';
import { SizingInputError } from '../../shared/tables/errors.js';
import { estimate } from '../../shared/sizing/estimate/estimate.js';

// ---- generators: any request within the schema's ranges ------------------------------------

const dbl = (min: number, max: number) => fc.double({ min, max, noNaN: true, noDefaultInfinity: true });

/** Flights that add up to the stair: cut points between treads. */
const flightsOf = (treads: number) =>
  fc
    .uniqueArray(fc.integer({ min: 1, max: Math.max(1, treads - 1) }), { maxLength: Math.min(19, treads - 1) })
    .chain((cuts) => {
      const points = [0, ...[...cuts].sort((a, b) => a - b), treads];
      const sizes = points.slice(1).map((p, i) => p - (points[i] as number));
      return fc.tuple(...sizes.map((size) => fc.record({ treads: fc.constant(size), landingLengthMm: fc.option(dbl(0, 20_000), { nil: undefined }) })));
    });

const staircase = fc.integer({ min: 1, max: 200 }).chain((treads) =>
  fc.record(
    {
      treads: fc.constant(treads),
      treadWidthMm: dbl(100, 5000),
      riserHeightMm: dbl(50, 400),
      goingMm: dbl(50, 1000),
      flights: flightsOf(treads),
      treadWidthsMm: fc.array(dbl(100, 5000), { minLength: treads, maxLength: treads }),
      litLandings: fc.uniqueArray(fc.integer({ min: 1, max: 3 }), { maxLength: 3 }),
    },
    { requiredKeys: ['treads', 'treadWidthMm', 'riserHeightMm', 'goingMm'] },
  ),
);

const profile = fc
  .record(
    {
      outputs: fc.integer({ min: 0, max: 64 }),
      maxCurrentPerOutputA: dbl(0.05, 10),
      dataOutputs: fc.integer({ min: 0, max: 8 }),
      maxPixelsPerOutput: fc.integer({ min: 50, max: 3000 }),
      minTreads: fc.integer({ min: 1, max: 10 }),
      maxTreads: fc.integer({ min: 10, max: 200 }),
      maxInputCurrentA: dbl(0.5, 100),
      sensorInput: fc.record({ type: fc.constantFrom('pnp', 'npn'), supplyV: dbl(1, 24), maxCurrentMa: dbl(1, 100) }),
      dataLogicV: fc.constantFrom(3.3, 5),
      maxDataLeadM: dbl(0.1, 1000),
      sensorInputs: fc.integer({ min: 0, max: 64 }),
    },
    { requiredKeys: ['outputs', 'maxCurrentPerOutputA'] },
  );

const protocol = fc.constantFrom('one-wire-800k', 'one-wire-400k', 'clocked');
const pixelFields = {
  pixelsPerM: dbl(1, 200),
  voltageV: dbl(1, 60),
  protocol,
  bitsPerPixel: fc.constantFrom(24, 32),
  currentPerPixelMa: dbl(0, 300),
  brightnessPercent: dbl(1, 100),
  maxFeedLengthM: dbl(0.5, 100),
  powerWPerM: dbl(0.01, 200),
  sizeForFullWhite: fc.boolean(),
  clockHz: dbl(1_000, 50_000_000),
  resetUs: dbl(0, 10_000),
  maxDataLinkM: dbl(0.1, 100),
  maxFeedCurrentA: dbl(1, 100),
};
const optionalPixel = ['pixelsPerM', 'voltageV', 'protocol'] as const;

const treadStrip = fc.record(
  { voltageV: dbl(1, 400), powerWPerM: dbl(0.01, 200), cutPitchMm: dbl(1, 1000), endClearanceMm: dbl(0, 500), sku: fc.constantFrom('HL-S24-10', 'NOT-STOCKED') },
  { requiredKeys: ['voltageV', 'powerWPerM', 'cutPitchMm'] },
);
const railPixels = fc.record({ lengthM: dbl(0.1, 200), dataLeadM: dbl(0, 100), ...pixelFields }, { requiredKeys: ['lengthM', ...optionalPixel] });
const treadPixels = fc.record(
  { ...pixelFields, cutPitchMm: dbl(1, 1000), endClearanceMm: dbl(0, 500) },
  { requiredKeys: [...optionalPixel] },
);

/** A shop catalog of drivers, cables and a controller in a currency with 0, 2 or 3 minor digits. */
function randomCatalog() {
  const digits = { JPY: 0, EUR: 2, KWD: 3 } as const;
  return fc.constantFrom('JPY', 'EUR', 'KWD').chain((currency) => {
    const price = fc.option(fc.integer({ min: 0, max: 1_000_000 }).map((minor) => minor / 10 ** digits[currency]), { nil: undefined });
    const driver = fc.record({ ratingW: dbl(1, 2000), voltageV: fc.constantFrom(5, 12, 24, 48), unitPrice: price });
    const cable = fc.record({ crossSectionMm2: fc.constantFrom(0.5, 0.75, 1, 1.5, 2.5), unitPrice: price, cores: fc.constantFrom(2, 3) });
    return fc.record({ drivers: fc.array(driver, { maxLength: 6 }), cables: fc.array(cable, { maxLength: 4 }), controller: profile, controllerPrice: price }).map((c) => ({
      currency,
      items: [
        ...c.drivers.map((d, i) => ({ sku: `D-${i}`, kind: 'driver', ...d })),
        ...c.cables.map((k, i) => ({ sku: `C-${i}`, kind: 'cable', ...k })),
        { sku: 'HL-K20', kind: 'controller', profile: c.controller, unitPrice: c.controllerPrice },
      ],
    }));
  });
}

const common = {
  controller: fc.oneof(
    fc.record({ profile, position: fc.option(fc.constantFrom('bottom', 'top', 'middle'), { nil: undefined }) }),
    fc.record({ profileId: fc.constantFrom('HL-K20', 'HL-K36', 'HL-K99') }),
  ),
  cable: fc.record(
    {
      conductorTable: fc.constantFrom(...CONDUCTOR_TABLE_IDS),
      maxDropPercent: dbl(0.1, 50),
      minCrossSectionMm2: dbl(0.01, 100),
      serviceAllowanceM: dbl(0, 10),
      temperatureC: dbl(-50, 150),
      feederLengthM: dbl(0.1, 100),
      feederDropPercent: dbl(0.1, 20),
      jurisdiction: fc.constantFrom('iec', 'uk', 'us'),
    },
    { requiredKeys: [] },
  ),
  drivers: fc.record(
    {
      maxLoadingPercent: dbl(10, 100),
      availableRatingsW: fc.array(dbl(1, 100_000), { minLength: 1, maxLength: 16 }),
      class2: fc.boolean(),
      efficiencyPercent: dbl(10, 100),
      mainsVoltageV: dbl(50, 1000),
      powerFactor: dbl(0.1, 1),
      positionsM: fc.array(dbl(0, 500), { minLength: 1, maxLength: 4 }),
      currentLimitPercent: dbl(100, 300),
      powerInputsPerController: fc.integer({ min: 1, max: 16 }),
    },
    { requiredKeys: [] },
  ),
  sensors: fc.record(
    {
      motion: fc.record({ outputType: fc.constantFrom('pnp', 'npn'), supplyV: dbl(0.1, 60), currentMa: dbl(0.1, 1000) }),
      daylightCutoffLux: dbl(1, 100_000),
      useDaylightCutoff: fc.boolean(),
      joinedLandings: fc.array(fc.integer({ min: 1, max: 3 }), { maxLength: 2 }),
      sideEntrances: fc.integer({ min: 0, max: 50 }),
    },
    { requiredKeys: [] },
  ),
  reels: fc.record({ reelLengthMm: dbl(100, 1_000_000) }, { requiredKeys: [] }),
  catalog: fc.oneof(fc.constant(harborLaneCatalog), randomCatalog()),
};
// Each layout's own block is required; staircase is optional only for a corridor; the rest may be left out.
const layouts = {
  'tread-strips': fc.record(
    { layout: fc.constant('tread-strips'), staircase, treadStrip, ...common },
    { requiredKeys: ['layout', 'controller', 'staircase', 'treadStrip'] },
  ),
  'rail-pixels': fc.record({ layout: fc.constant('rail-pixels'), staircase, railPixels, ...common }, { requiredKeys: ['layout', 'controller', 'railPixels'] }),
  'treads-and-rail': fc.record(
    { layout: fc.constant('treads-and-rail'), staircase, treadStrip, railPixels, ...common },
    { requiredKeys: ['layout', 'controller', 'staircase', 'treadStrip', 'railPixels'] },
  ),
  'tread-pixels': fc.record(
    { layout: fc.constant('tread-pixels'), staircase, treadPixels, ...common },
    { requiredKeys: ['layout', 'controller', 'staircase', 'treadPixels'] },
  ),
};

/** Parses like the API does; a body the schema refuses is not an estimate input. */
function parsed(body: unknown): EstimateInput | null {
  const result = estimateRequestSchema.safeParse(body);
  return result.success ? result.data : null;
}

/** The only SizingInputError estimate() documents: a profileId no catalog holds. */
function estimateOrDocumentedError(input: EstimateInput): EstimateResult | null {
  try {
    return estimate(input);
  } catch (error) {
    expect(error).toBeInstanceOf(SizingInputError);
    expect((error as SizingInputError).path).toEqual(['controller', 'profileId']);
    const id = 'profileId' in input.controller ? input.controller.profileId : undefined;
    expect(input.catalog?.items.some((i) => i.kind === 'controller' && (i.profileId ?? i.sku) === id) ?? false).toBe(false);
    return null;
  }
}

const RUNS = 60;

describe('estimate: any request in the schema’s range', () => {
  for (const [layout, arbitrary] of Object.entries(layouts)) {
    it(`${layout}: never throws (but for an unknown profileId) and answers in the response schema`, () => {
      fc.assert(
        fc.property(arbitrary, (body) => {
          const input = parsed(body);
          fc.pre(input !== null);
          const result = estimateOrDocumentedError(input as EstimateInput);
          if (!result) return;
          const check = estimateResponseSchema.safeParse(result);
          expect(check.success ? [] : check.error.issues.slice(0, 3)).toEqual([]);
          expect(result.layout).toBe(layout);
        }),
        { numRuns: RUNS },
      );
    });

    it(`${layout}: check ids are unique and stable, and every warn or fail says what to change`, () => {
      fc.assert(
        fc.property(arbitrary, (body) => {
          const input = parsed(body);
          fc.pre(input !== null);
          const result = estimateOrDocumentedError(input as EstimateInput);
          if (!result) return;
          const ids = result.checks.map((c) => c.id);
          expect(new Set(ids).size).toBe(ids.length);
          for (const id of ids) expect(CHECK_IDS).toContain(id);
          for (const c of result.checks) {
            if (c.status !== 'pass') expect(c.suggestion?.length ?? 0).toBeGreaterThan(10);
            expect(c.reference.length).toBeGreaterThan(0);
          }
        }),
        { numRuns: RUNS },
      );
    });

    it(`${layout}: the treads' loads add up to their rail and the drivers cover load / loading`, () => {
      fc.assert(
        fc.property(arbitrary, (body) => {
          const input = parsed(body);
          fc.pre(input !== null);
          const result = estimateOrDocumentedError(input as EstimateInput);
          if (!result) return;
          // Rows are rounded to 4 decimals each: allow half a unit per row.
          // Lit landings (issue 8) are loads of the tread rail too, with rows of their own.
          const landingRows = result.landings ?? [];
          const rowsW = result.treads.reduce((sum, t) => sum + t.powerW, 0) + landingRows.reduce((sum, l) => sum + l.powerW, 0);
          const treadLoadW = result.pixels.treads?.powerW ?? rowsW;
          const rowCount = result.treads.length + landingRows.length;
          expect(Math.abs(rowsW - treadLoadW)).toBeLessThanOrEqual(5e-5 * rowCount + 1e-6 * treadLoadW + 1e-9);
          const railW = result.pixels.rail?.powerW ?? 0;
          const totalW = result.drivers.reduce((sum, r) => sum + r.loadW, 0);
          expect(Math.abs(totalW - (treadLoadW + railW))).toBeLessThanOrEqual(5e-5 * (rowCount + 2) + 1e-6 * totalW);
          const maxLoading = input?.drivers?.maxLoadingPercent ?? 80;
          for (const rail of result.drivers) {
            // One supply per circuit (domain.md "Driver"): the sum only covers the rail when every circuit has its driver.
            if (rail.loadW === 0 || rail.driverCount < (rail.circuits ?? 1)) continue;
            // common practice, no published source: Σ ratings ≥ load / loading (loadW is shown to 4 decimals)
            expect(rail.totalRatingW).toBeGreaterThanOrEqual((((rail.loadW - 5e-5) * 100) / maxLoading) * (1 - 1e-9));
          }
          // A rail with a circuit that has no driver must be reported as a failing driver check.
          if (result.drivers.some((r) => r.loadW > 0 && r.driverCount < (r.circuits ?? 1))) {
            expect(result.checks.find((c) => c.id === 'driver-loading')?.status).toBe('fail');
          }
        }),
        { numRuns: RUNS },
      );
    });
  }
});

describe('output current', () => {
  it('fails exactly when one tread draws more than an output may carry, and then suggests a strip', () => {
    fc.assert(
      fc.property(
        dbl(300, 2000),
        dbl(1, 60),
        fc.constantFrom(12, 24),
        dbl(10, 100),
        dbl(0.2, 3),
        (treadWidthMm, powerWPerM, voltageV, cutPitchMm, maxCurrentPerOutputA) => {
          const input = estimateRequestSchema.parse({
            ...alderRowTownhouse,
            staircase: { ...alderRowTownhouse.staircase, treadWidthMm },
            treadStrip: { voltageV, powerWPerM, cutPitchMm },
            controller: { profile: { ...hlK20Profile, maxCurrentPerOutputA } },
          });
          const check = estimate(input).checks.find((c) => c.id === 'output-current');
          // domain rules: strip = floor((width − 2 × 20) / pitch) × pitch; I = W/m × length / V
          const stripM = (Math.floor((treadWidthMm - 40) / cutPitchMm + 1e-9) * cutPitchMm) / 1000;
          const currentA = (powerWPerM * stripM) / voltageV;
          fc.pre(Math.abs(currentA - maxCurrentPerOutputA) > 1e-6 && stripM > 0);
          expect(check?.status).toBe(currentA > maxCurrentPerOutputA ? 'fail' : 'pass');
          if (check?.status === 'fail') expect(check.suggestion).toMatch(/W\/m/);
        },
      ),
    );
  });
});

describe('request schema', () => {
  const issuePaths = (body: unknown) => estimateRequestSchema.safeParse(body).error?.issues.map((i) => i.path.join('.')) ?? [];

  it('every documented example parses and gives a response of the response schema', () => {
    for (const example of Object.values(estimateExamples)) {
      const result = estimate(estimateRequestSchema.parse(example));
      expect(estimateResponseSchema.safeParse(result).success).toBe(true);
    }
  });

  it('the documented response is what the engine answers for the documented request', () => {
    const example = estimateResponseSchema.meta()?.example as EstimateResult;
    expect(estimateResponseSchema.safeParse(example).success).toBe(true);
    const result = estimate(estimateRequestSchema.parse(estimateRequestSchema.meta()?.example));
    const { treads, outputs, trace, ...rest } = example;
    const { treads: allTreads, outputs: allOutputs, trace: fullTrace, ...restOfResult } = result;
    expect(restOfResult).toEqual(rest);
    for (const row of treads) expect(allTreads[row.index - 1]).toEqual(row);
    expect(allOutputs).toMatchObject({ ...outputs, cv: expect.arrayContaining(outputs.cv) });
    for (const entry of trace) expect(fullTrace).toContainEqual(entry);
  });

  it('the block a layout needs is required, at its own path', () => {
    const { treadStrip: _omit, ...withoutStrip } = alderRowTownhouse;
    expect(issuePaths(withoutStrip)).toEqual(['treadStrip']);
    expect(issuePaths({ ...withoutStrip, layout: 'tread-pixels' })).toEqual(['treadPixels']);
    // A block the layout does not use is an unknown field, not silently ignored.
    const strayBlock = estimateRequestSchema.safeParse({ ...alderRowTownhouse, layout: 'tread-pixels' }).error?.issues ?? [];
    expect(strayBlock.map((i) => [i.path.join('.'), i.code])).toEqual([
      ['treadPixels', 'invalid_type'],
      ['', 'unrecognized_keys'],
    ]);
    expect(strayBlock[1]).toMatchObject({ keys: ['treadStrip'] });
    expect(issuePaths({ ...alderRowTownhouse, layout: 'treads-and-rail' })).toEqual(['railPixels']);
    const { staircase: _stair, ...withoutStair } = alderRowTownhouse;
    expect(issuePaths(withoutStair)).toEqual(['staircase']);
    expect(issuePaths({ ...alderRowTownhouse, layout: 'escalator' })).toEqual(['layout']);
  });

  it('a corridor needs no staircase', () => {
    expect(issuePaths(estimateExamples.quaysideCorridor)).toEqual([]);
    expect('staircase' in estimateExamples.quaysideCorridor).toBe(false);
  });

  it('flights must add up to the treads, and stair-relative fields must fall on the stair', () => {
    // arithmetic: 7 + 7 = 14 ≠ 15
    expect(issuePaths({ ...alderRowTownhouse, staircase: { ...alderRowTownhouse.staircase, treads: 15, flights: [{ treads: 7 }, { treads: 7 }] } })).toEqual([
      'staircase.flights',
    ]);
    expect(issuePaths({ ...alderRowTownhouse, controller: { profile: hlK20Profile, position: { tread: 15 } } })).toEqual(['controller.position.tread']);
    expect(issuePaths({ ...alderRowTownhouse, sensors: { joinedLandings: [1] } })).toEqual(['sensors.joinedLandings.0']);
    // a 150 mm reel cannot hold one 200 mm cut pitch (arithmetic)
    expect(issuePaths({ ...alderRowTownhouse, treadStrip: { ...alderRowTownhouse.treadStrip, cutPitchMm: 200 }, reels: { reelLengthMm: 150 } })).toEqual([
      'reels.reelLengthMm',
    ]);
    expect(issuePaths({ ...alderRowTownhouse, staircase: { ...alderRowTownhouse.staircase, treads: 0 } })).toEqual(['staircase.treads']);
    expect(issuePaths({ ...alderRowTownhouse, staircase: { ...alderRowTownhouse.staircase, treads: -3 } })).toEqual(['staircase.treads']);
  });

  it('a controller is an inline profile or a profileId, never both or neither', () => {
    expect(issuePaths({ ...alderRowTownhouse, controller: {} })).toEqual(['controller.profile']);
    expect(issuePaths({ ...alderRowTownhouse, controller: { profile: hlK20Profile, profileId: 'HL-K20' } })).toEqual(['controller.profile']);
  });

  it('catalog prices must be whole minor units and SKUs unique', () => {
    const items = [
      { sku: 'X-1', kind: 'daylight-sensor', unitPrice: 1.005 },
      { sku: 'X-1', kind: 'daylight-sensor', unitPrice: 2 },
    ];
    expect(issuePaths({ ...alderRowTownhouse, catalog: { currency: 'EUR', items } })).toEqual(['catalog.items.0.unitPrice', 'catalog.items.1.sku']);
    // ISO 4217: JPY has no minor unit, so ¥1.5 is not a price
    expect(issuePaths({ ...alderRowTownhouse, catalog: { currency: 'JPY', items: [{ sku: 'Y', kind: 'daylight-sensor', unitPrice: 1.5 }] } })).toEqual([
      'catalog.items.0.unitPrice',
    ]);
  });
});

describe('controller profiles from the catalog', () => {
  it('a profileId gives the same sizing as the same profile inline', () => {
    const byId = estimate(estimateRequestSchema.parse(estimateExamples.harborLaneCheckout));
    const inline = estimate(estimateRequestSchema.parse({ ...estimateExamples.harborLaneCheckout, controller: { profile: hlK20Profile } }));
    expect(byId.treads).toEqual(inline.treads);
    expect(byId.checks).toEqual(inline.checks);
    expect(byId.bom.find((l) => l.category === 'controller')?.sku).toBe('HL-K20');
    expect(inline.bom.find((l) => l.category === 'controller')?.sku).toBeUndefined();
  });

  it('an unknown profileId is a SizingInputError at controller.profileId', () => {
    const missing = estimateRequestSchema.parse({ ...estimateExamples.harborLaneCheckout, controller: { profileId: 'HL-K99' } });
    expect(() => estimate(missing)).toThrow(SizingInputError);
    try {
      estimate(missing);
    } catch (error) {
      expect((error as SizingInputError).path).toEqual(['controller', 'profileId']);
      expect((error as SizingInputError).message).toMatch(/HL-K99/);
    }
    const noCatalog = estimateRequestSchema.parse({ ...alderRowTownhouse, controller: { profileId: 'HL-K20' } });
    expect(() => estimate(noCatalog)).toThrow(/catalog/);
  });
});

describe('bill of materials money', () => {
  it('totals are exact sums of minor units, whatever the prices', () => {
    fc.assert(
      fc.property(fc.array(fc.integer({ min: 0, max: 100_000 }), { minLength: 4, maxLength: 4 }), (cents) => {
        const [strip, cable05, cable075, driver] = cents as [number, number, number, number];
        const catalog = {
          currency: 'EUR',
          items: [
            { sku: 'S', kind: 'strip', unitPrice: strip / 100, voltageV: 24, powerWPerM: 10, cutPitchMm: 50 },
            { sku: 'C5', kind: 'cable', unitPrice: cable05 / 100, crossSectionMm2: 0.5 },
            { sku: 'C7', kind: 'cable', unitPrice: cable075 / 100, crossSectionMm2: 0.75 },
            { sku: 'D', kind: 'driver', unitPrice: driver / 100, voltageV: 24, ratingW: 150 },
          ],
        };
        const result = estimate(estimateRequestSchema.parse({ ...alderRowTownhouse, treadStrip: { ...alderRowTownhouse.treadStrip, sku: undefined }, catalog }));
        const priced = result.bom.filter((l) => l.lineTotal !== undefined);
        const sumCents = priced.reduce((sum, l) => sum + Math.round((l.lineTotal as number) * 100), 0);
        expect(Math.round((result.bomTotal as number) * 100)).toBe(sumCents);
        // each line: quantity × unit price in cents, exactly
        for (const l of priced) expect(Math.round((l.lineTotal as number) * 100)).toBe(l.quantity * Math.round((l.unitPrice as number) * 100));
        expect(result.currency).toBe('EUR');
        // the controller, sensors and daylight sensor have no catalog item here
        expect(result.bomTotalComplete).toBe(false);
        for (const l of result.bom) if (l.lineTotal === undefined) expect(l.note).toMatch(/not priced|no price/);
      }),
    );
  });

  it('without a catalog every line keeps its quantity and nothing is priced', () => {
    const result = estimate(estimateRequestSchema.parse(alderRowTownhouse));
    expect(result.bomTotal).toBeUndefined();
    expect(result.currency).toBeUndefined();
    for (const l of result.bom) {
      expect(Number.isInteger(l.quantity)).toBe(true);
      expect(l.quantity).toBeGreaterThan(0);
      expect(l.unitPrice).toBeUndefined();
    }
  });
});

describe('several controllers', () => {
  it('a stair longer than one controller’s outputs is split into near-equal blocks, each with its own runs', () => {
    // HL-K20 (demo scenario): 20 outputs; 36 treads → 2 controllers of 18 (outputs.ts balances the blocks)
    const result = estimate(estimateRequestSchema.parse({ ...alderRowTownhouse, staircase: { ...alderRowTownhouse.staircase, treads: 36 } }));
    expect(result.outputs.controllers).toBe(2);
    expect(result.outputs.controllerTreads.map((c) => [c.firstTread, c.lastTread])).toEqual([
      [1, 18],
      [19, 36],
    ]);
    expect(result.checks.find((c) => c.id === 'output-count')?.status).toBe('warn');
    expect(result.bom.find((l) => l.category === 'controller')?.quantity).toBe(2);
    // every tread's lead starts at its own block's controller: no run crosses the other block
    for (const t of result.treads) {
      const block = result.outputs.controllerTreads.find((c) => t.index >= c.firstTread && t.index <= c.lastTread);
      expect(t.controller).toBe(block?.controller);
    }
    expect(result.feeder.runs.filter((f) => f.to === 'controller')).toHaveLength(2);
  });
});

describe('circuits with several power inputs', () => {
  it('puts a lit landing’s load in the circuit of the output that lights it (found by the property above)', () => {
    const body = {
      layout: 'tread-strips',
      staircase: { treads: 6, treadWidthMm: 900, riserHeightMm: 185, goingMm: 250, flights: [{ treads: 3 }, { treads: 3 }], litLandings: [1] },
      treadStrip: { voltageV: 24, powerWPerM: 10, cutPitchMm: 50 },
      controller: { profile: { outputs: 8, maxCurrentPerOutputA: 1.5 } },
      drivers: { powerInputsPerController: 2 },
    };
    const result = estimate(estimateRequestSchema.parse(body));
    // 7 lit pieces of 850 mm at 10 W/m (6 treads and the landing, as wide as the stair): 7 × 8.5 W = 59.5 W
    const rail = result.drivers[0]!;
    expect(rail.loadW).toBeCloseTo(59.5, 6);
    const inCircuits = result.circuits.reduce((sum, c) => sum + c.loadW, 0);
    expect(inCircuits).toBeCloseTo(rail.loadW, 3);
  });
});
