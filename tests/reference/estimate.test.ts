import { describe, expect, it } from 'vitest';
import { estimateRequestSchema, type EstimateResult } from '../../shared/schemas/estimate.js';
import {
  alderRowCornerUnit,
  alderRowTownhouse,
  alderRowTreadPixels,
  alderRowWithRail,
  harborLaneCheckout,
  quaysideCorridor,
} from '../../shared/schemas/estimate-examples.js';
import { estimate } from '../../shared/sizing/estimate/estimate.js';

const run = (body: unknown): EstimateResult => estimate(estimateRequestSchema.parse(body));
const check = (result: EstimateResult, id: string) => result.checks.find((c) => c.id === id);
const traced = (result: EstimateResult, quantity: string) => result.trace.find((t) => t.quantity === quantity);

// Pythagoras: √(185² + 250²) = √96 725 = 311.0064 mm per step along the stringer
const STEP_M = Math.sqrt(185 ** 2 + 250 ** 2) / 1000;
// IEC 60364-5-52 Annex G: resistivity in service 1.25 × ρ20 (from memory) — the estimate's default without a temperatureC
const AG = 1.25;

describe('Alder Row townhouse: 14 treads of 900 mm, HL-S24-10 strip, HL-K20 controller', () => {
  const result = run(alderRowTownhouse);

  it('cuts 850 mm of strip per tread', () => {
    // domain rules: 900 − 2 × 20 mm clearance = 860 mm → 17 whole 50 mm pitches = 850 mm
    for (const t of result.treads) expect(t.stripLengthMm).toBe(850);
    expect(result.treads).toHaveLength(14);
    expect(result.treads[0]?.index).toBe(1);
  });

  it('draws 8.5 W per tread, 119 W and 4.96 A in all', () => {
    // hand arithmetic: 0.85 m × 10 W/m = 8.5 W; 8.5 W / 24 V = 0.3542 A
    for (const t of result.treads) {
      expect(t.powerW).toBeCloseTo(8.5, 9);
      expect(t.currentA).toBeCloseTo(0.3542, 4);
    }
    // hand arithmetic: 14 × 8.5 W = 119 W; 119 W / 24 V = 4.9583 A
    expect(result.summary.totalLoadW).toBeCloseTo(119, 9);
    expect(result.drivers[0]?.loadW).toBeCloseTo(119, 9);
    expect(result.drivers[0]?.currentA).toBeCloseTo(4.9583, 4);
  });

  it('puts each tread on its own output, within the 1.5 A per output', () => {
    // demo scenario: HL-K20 has 20 outputs at 1.5 A; one tread per output (domain rule)
    expect(result.outputs.cv.map((o) => o.treads)).toEqual(Array.from({ length: 14 }, (_, i) => [i + 1]));
    expect(result.outputs.controllers).toBe(1);
    expect(check(result, 'output-count')?.status).toBe('pass');
    // hand arithmetic: 0.3542 A ≤ 1.5 A (HL-K20 profile)
    expect(check(result, 'output-current')).toMatchObject({ status: 'pass', limit: 1.5 });
  });

  it('chooses one 150 W driver for the 148.75 W the 80 % rule asks', () => {
    // common practice, no published source: rating ≥ 119 / 0.8 = 148.75 W
    expect(result.drivers[0]?.requiredRatingW).toBeCloseTo(148.75, 9);
    // domain default series 30…480 W: fewest drivers, then least total rating → 1 × 150 W
    expect(result.drivers[0]?.drivers).toMatchObject([{ ratingW: 150, count: 1 }]);
    // hand arithmetic: 119 / 150 = 79.33 %
    expect(result.drivers[0]?.loadingPercent).toBeCloseTo(79.3333, 3);
    expect(check(result, 'driver-loading')?.status).toBe('pass');
  });

  it('puts the controller mid-flight, where the longest run is shortest', () => {
    // Pythagoras: one step is 0.3110 m
    expect(traced(result, 'stepLengthM')?.value).toBeCloseTo(STEP_M, 4);
    // domain rule: tread 7 and 8 tie on the longest run; the lower wins (geometry module)
    expect(result.outputs.controllerTreads[0]?.atTread).toBe(7);
    // hand arithmetic: 7 steps to tread 14 + 0.5 m service allowance = 2.677 m
    expect(result.summary.longestRunM).toBeCloseTo(7 * STEP_M + 0.5, 3);
    expect(result.treads[13]?.cableLengthM).toBeCloseTo(7 * STEP_M + 0.5, 3);
    // hand arithmetic: the controller's own tread gets the 0.5 m allowance only
    expect(result.treads[6]?.cableLengthM).toBe(0.5);
    // common practice, no published source: 10 m limit
    expect(check(result, 'cable-run-length')).toMatchObject({ status: 'pass', limit: 10 });
  });

  it('sizes the farthest lead by the two-wire loop formula', () => {
    const far = result.treads[13];
    // common practice, no published source: 0.5 mm² minimum; it carries 0.354 A (BS 7671 4F3A, from memory: 3 A)
    expect(far?.crossSectionMm2).toBe(0.5);
    // IEC 60364-5-52 Annex G: Vd = 2 · L · I · R′, IEC 60228 class 5 0.5 mm²: 39.0 Ω/km
    const dropV = 2 * (7 * STEP_M + 0.5) * (8.5 / 24) * 0.039 * AG;
    // hand arithmetic: 2 × 2.6770 × 0.35417 × 0.039 × 1.25 (Annex G in service) = 0.09244 V = 0.3852 % of 24 V
    expect(far?.dropPercent).toBeCloseTo((dropV / 24) * 100, 3);
    expect(far?.dropPercent).toBeCloseTo(0.385, 3);
    // end to end (IEC 60364-7-715 / BS 7671 715.525, from memory): the feeder's drop plus this lead's
    expect(far?.pathDropPercent).toBeCloseTo(result.feeder.runs[0]!.dropPercent + far!.dropPercent, 2);
  });

  it('sizes the feeder for the whole 4.96 A and for the driver’s current limit', () => {
    const feeder = result.feeder.runs[0];
    // Changed by the circuits-and-protection rule: 0.75 mm² (6 A, BS 7671 Appendix 4 Table 4F3A, from memory) would carry
    // 4.96 A, but its fuse must be ≥ 1.25 × 4.96 = 6.2 A (NEC 210.20(A), analogous) → 6.3 A > 6 A (IEC 60364-4-43 433.1:
    // I_n ≤ I_z, from memory), so the cable must carry the 150 W driver's limit: 6.25 A × 150 % = 9.375 A → 1.0 mm² (10 A)
    expect(feeder?.crossSectionMm2).toBe(1);
    expect(feeder?.protectedBy).toBe('driver current limit');
    // IEC 60364-5-52 Annex G with IEC 60228 class 5 1.0 mm² 19.5 Ω/km × 1.25 in service over the 2 m default:
    // 2 × 2 × 4.9583 × 0.0195 × 1.25 = 0.4834 V
    expect(feeder?.dropV).toBeCloseTo(0.4834, 4);
    // hand arithmetic: 0.4834 / 24 = 2.014 %
    expect(feeder?.dropPercent).toBeCloseTo(2.014, 3);
    expect(result.feeder.lengthDefaulted).toBe(true);
    // the profile gives no maximum input current: the check asks to confirm it (controller profile)
    expect(check(result, 'controller-input-current')?.status).toBe('warn');
  });

  it('cuts the 14 pieces from 3 reels', () => {
    // hand arithmetic: floor(5000 / 850) = 5 pieces per 5 m reel → ceil(14 / 5) = 3 reels
    expect(result.reels.treads?.reels).toBe(3);
    // hand arithmetic: 3 × 5000 − 14 × 850 = 3100 mm left over
    expect(result.reels.treads?.totalWasteMm).toBe(3100);
    expect(result.reels.treads?.plan.map((r) => r.pieceIndexes.length)).toEqual([5, 5, 4]);
  });

  it('fits two motion sensors and one daylight sensor', () => {
    // common practice, no published source: one sensor at the foot and one at the head of a flight
    expect(result.sensors.motionSensors).toBe(2);
    expect(result.sensors.placements.map((p) => [p.role, p.tread])).toEqual([
      ['foot', 1],
      ['head', 14],
    ]);
    // demo scenario: HL-M05 is PNP, 5 V, 8 mA; HL-K20 takes PNP at 5 V, up to 12 mA
    expect(check(result, 'sensor-type')?.status).toBe('pass');
    expect(check(result, 'sensor-current')).toMatchObject({ status: 'pass', value: 8, limit: 12 });
    // common practice, no published source: 50 lx default cut-off (below EN 12464-1's 150 lx for stairs)
    expect(result.sensors.daylightCutoffLux).toBe(50);
    expect(result.sensors.daylightCutoffDefaulted).toBe(true);
  });

  it('orders the tread leads rounded up to whole metres', () => {
    // hand arithmetic: Σ|k − 7| over treads 1…14 = 21 + 28 = 49 steps, + 14 × 0.5 m = 22.239 m → 23 m
    const leads = result.cables.find((c) => c.use === 'tread leads');
    expect(leads?.totalLengthM).toBeCloseTo(49 * STEP_M + 7, 3);
    expect(leads?.orderLengthM).toBe(23);
  });

  it('stays within SELV and carries the cautions', () => {
    // IEC 60598-1 8.2.3: 24 V DC ≤ 60 V
    expect(check(result, 'selv-voltage')?.status).toBe('pass');
    const codes = result.cautions.map((c) => c.code);
    for (const code of ['mains-work', 'first-power-on', 'driver-heat', 'not-emergency-lighting', 'nominal-data']) expect(codes).toContain(code);
    // EN 1838 covers escape lighting, which these lights are not
    expect(result.cautions.find((c) => c.code === 'not-emergency-lighting')?.message).toMatch(/EN 1838/);
  });

  it('traces the headline numbers and the defaults it used', () => {
    for (const q of ['stripLengthMm', 'tread.powerW', 'treadStrips.totalLoadW', 'longestRunM', '24 V rail: requiredRatingW', 'worstDropPercent', 'treads.reels', 'motionSensors']) {
      expect(traced(result, q), q).toBeDefined();
    }
    const defaults = result.trace.filter((t) => t.quantity.startsWith('default ')).map((t) => t.quantity);
    expect(defaults).toEqual(expect.arrayContaining(['default endClearanceMm', 'default cable.maxDropPercent', 'default cable.feederLengthM', 'default reels.reelLengthMm']));
  });
});

describe('Harbor Lane checkout: the Alder Row stair priced from the shop catalog', () => {
  const result = run(harborLaneCheckout);

  it('matches each line to a SKU and prices it', () => {
    const line = (sku: string) => result.bom.find((l) => l.sku === sku);
    // demo scenario prices (EUR), hand arithmetic for the totals
    expect(line('HL-S24-10')).toMatchObject({ quantity: 3, unitPrice: 39, lineTotal: 117 });
    expect(line('HL-D24-150')).toMatchObject({ quantity: 1, unitPrice: 46, lineTotal: 46 });
    // one 1 m profile bar per 850 mm piece: 14 × €8.50 = €119
    expect(line('HL-A100')).toMatchObject({ quantity: 14, lineTotal: 119 });
    // one pair of end caps per piece: 14 × €0.90 = €12.60
    expect(line('HL-E02')).toMatchObject({ quantity: 14, lineTotal: 12.6 });
    // 23 m of 0.5 mm² at €0.60 = €13.80; 2 m of 1.0 mm² feeder at €1.00 = €2.00 (the feeder carries the driver's limit, see above)
    expect(line('HL-C050')).toMatchObject({ quantity: 23, lineTotal: 13.8 });
    expect(line('HL-C100')).toMatchObject({ quantity: 2, lineTotal: 2 });
    // one 6.3 A fuse at the driver (smallest R10 rating ≥ 1.25 × 4.96 A, IEC 60127-2, from memory): HL-F06 at €3.20
    expect(line('HL-F06')).toMatchObject({ quantity: 1, unitPrice: 3.2, lineTotal: 3.2, description: expect.stringMatching(/6\.3 A/) });
    // prices the demo scenario leaves open, invented for the seeded catalog: HL-K20 €119, HL-M05 €12.50, HL-L01 €9.90
    expect(line('HL-K20')).toMatchObject({ quantity: 1, lineTotal: 119 });
    expect(line('HL-M05')).toMatchObject({ quantity: 2, lineTotal: 25 });
    expect(line('HL-L01')).toMatchObject({ quantity: 1, lineTotal: 9.9 });
    // 6 m of 3-core 0.5 mm² sensor cable (HL-C3-050, invented) at €0.90 = €5.40
    expect(line('HL-C3-050')).toMatchObject({ quantity: 6, lineTotal: 5.4 });
  });

  it('totals €472.90 with every line priced, and a cart of the same lines', () => {
    // hand arithmetic: 117 + 119 + 12.60 + 46 + 3.20 + 119 + 25 + 9.90 + 13.80 + 2.00 + 5.40 = 472.90
    // (the 1.0 mm² feeder replaces 0.75 mm²)
    expect(result.bomTotal).toBe(472.9);
    expect(result.currency).toBe('EUR');
    expect(result.bomTotalComplete).toBe(true);
    // the inline catalog states no tax rate: tax 0, gross = net
    expect(result.pricing).toMatchObject({ source: 'inline', catalogVersion: null, net: 472.9, tax: 0, gross: 472.9, unpricedLines: 0 });
    expect(result.cart?.reduce((sum, c) => sum + Math.round(c.unitPrice * 100) * c.quantity, 0)).toBe(47290);
  });
});

describe('Alder Row corner unit: 7 + 8 treads turning at a 900 mm landing', () => {
  const result = run(alderRowCornerUnit);

  it('needs a sensor at the foot and head of the whole stair, and one on an entered landing', () => {
    // team handbook, rules of thumb (common practice, no published source): an L stair with a plain
    // landing still has two sensors (issue 8: the old rule of two per flight gave 4)
    expect(result.sensors.motionSensors).toBe(2);
    // a landing where people join gets its own (common practice, no published source): 3
    const joined = run({ ...alderRowCornerUnit, sensors: { ...alderRowCornerUnit.sensors, joinedLandings: [1] } });
    expect(joined.sensors.motionSensors).toBe(3);
  });

  it('loads 127.5 W on one 200 W driver', () => {
    // hand arithmetic: 15 × 8.5 W = 127.5 W; 127.5 / 0.8 = 159.375 W → 1 × 200 W (domain default series)
    expect(result.drivers[0]?.loadW).toBeCloseTo(127.5, 9);
    expect(result.drivers[0]?.drivers).toMatchObject([{ ratingW: 200, count: 1 }]);
  });

  it('runs the cable across the landing from a controller at tread 8', () => {
    // geometry model: landing crossing = step + √(185² + 900²) = 0.3110 + 0.9188 m
    const landingM = STEP_M + Math.sqrt(185 ** 2 + 900 ** 2) / 1000;
    // hand arithmetic: tread 8 sits 6 steps + landing = 3.096 m up the route, nearest its 5.273 m midpoint
    expect(result.outputs.controllerTreads[0]?.atTread).toBe(8);
    // hand arithmetic: longest run back to tread 1 = 6 steps + landing + 0.5 m = 3.596 m
    expect(result.summary.longestRunM).toBeCloseTo(6 * STEP_M + landingM + 0.5, 3);
  });
});

describe('Quayside Studio: 18 m corridor handrail, 60 pixels/m at 5 V, HL-K36', () => {
  const result = run(quaysideCorridor);
  const rail = result.pixels.rail;

  it('splits 1 080 pixels over both data outputs', () => {
    // hand arithmetic: 18 m × 60 pixels/m = 1080; HL-K36 (demo scenario): 2 outputs of 600 → 540 each
    expect(rail?.pixels).toBe(1080);
    expect(rail?.dataOutputs).toBe(2);
    expect(rail?.pixelsPerOutput).toBe(540);
    expect(check(result, 'pixels-per-output')?.status).toBe('pass');
    // hand arithmetic: 1080 ≤ 2 × 600
    expect(check(result, 'pixels-total')).toMatchObject({ status: 'pass', limit: 1200 });
  });

  it('refreshes a frame in 16.48 ms', () => {
    // WS2812B datasheet: 540 × 24 bits × 1.25 µs + 280 µs reset = 16 480 µs → 60.68 Hz
    expect(rail?.frameTimeUs).toBeCloseTo(16480, 6);
    expect(rail?.maxRefreshHz).toBeCloseTo(60.68, 2);
    expect(check(result, 'refresh-rate')?.status).toBe('pass');
  });

  it('draws 32.4 A at the 50 % cap and feeds it at 8 points', () => {
    // 60 mA per 5 V RGB pixel at full white (common practice, from memory); × 50 % cap → 1080 × 0.03 A = 32.4 A, × 5 V = 162 W
    expect(rail?.fullWhiteCurrentA).toBeCloseTo(32.4, 9);
    expect(rail?.powerW).toBeCloseTo(162, 9);
    // common practice, from memory: about 2.5 m from one feed at 5 V → ceil(18 / 2.5) = 8 feeds, 7 injection points
    expect(rail?.feedPoints).toBe(8);
    expect(rail?.injectionPoints).toBe(7);
    // common practice, no published source: 162 / 0.8 = 202.5 W → 1 × 240 W from the default series
    expect(result.drivers[0]?.drivers).toMatchObject([{ ratingW: 240, count: 1 }]);
  });

  it('sizes each pixel feeder for its 4.05 A over its own length from the driver', () => {
    const runs = result.feeder.runs;
    expect(runs).toHaveLength(8);
    // hand arithmetic: 32.4 A / 8 feeds = 4.05 A; feeds at the start of each 2.25 m section: 0, 2.25 … 15.75 m
    expect(runs[0]?.currentA).toBeCloseTo(4.05, 9);
    expect(runs.map((r) => r.positionM)).toEqual([0, 2.25, 4.5, 6.75, 9, 11.25, 13.5, 15.75]);
    // one circuit (162 W on one 240 W driver) placed midway between the farthest feeds: (0 + 15.75) / 2 = 7.875 m
    expect(result.circuits).toHaveLength(1);
    expect(result.circuits[0]?.driverPositionM).toBe(7.875);
    // feeder 1: 2 m off the run + 7.875 m along it = 9.875 m; IEC 60364-5-52 Annex G (× 1.25 in service) with IEC 60228
    // class 5 10 mm² (1.91 Ω/km, from memory): 2 × 9.875 × 4.05 × 0.00191 × 1.25 = 0.1910 V = 3.819 % of 5 V; 6 mm² (3.30) would drop 6.6 %
    expect(runs[0]).toMatchObject({ lengthM: 9.875, crossSectionMm2: 10 });
    expect(runs[0]?.dropPercent).toBeCloseTo(((2 * 9.875 * 4.05 * 0.00191 * AG) / 5) * 100, 3);
    // feeder 4: 2 + 1.125 m = 3.125 m → 2.5 mm² would drop 5.05 %, so 4 mm² (4.95 Ω/km): 2 × 3.125 × 4.05 × 0.00495 × 1.25 / 5 = 3.13 %
    expect(runs[3]).toMatchObject({ lengthM: 3.125, crossSectionMm2: 4 });
    expect(runs[3]?.dropPercent).toBeCloseTo(((2 * 3.125 * 4.05 * 0.00495 * AG) / 5) * 100, 3);
  });

  it('states the Annex G service resistivity in the trace', () => {
    // IEC 60364-5-52 Annex G: ρ in service = 1.25 × ρ20 (from memory), applied by default in estimates
    const entry = traced(result, 'default cable.temperatureC');
    expect(entry?.value).toMatch(/1\.25 × R′ at 20 °C/);
    expect(entry?.reference).toMatch(/Annex G/);
  });

  it('a driver at one end of the 18 m corridor: the farthest feeder is 17.75 m, and a tighter limit asks to spread the drivers', () => {
    const atEnd = run({ ...quaysideCorridor, drivers: { positionsM: [0] } });
    const far = atEnd.feeder.runs[7];
    // issue 8 item 3: 2 m + 15.75 m = 17.75 m; on 1.5 mm² (13.3 Ω/km, IEC 60228 class 5) that would drop 2 × 17.75 × 4.05 × 0.0133 / 5 = 38.2 %
    expect(far?.lengthM).toBe(17.75);
    expect(((2 * 17.75 * 4.05 * 0.0133) / 5) * 100).toBeCloseTo(38.24, 2);
    // only 16 mm² (1.21 Ω/km, IEC 60228, from memory) keeps it within 5 %: 2 × 17.75 × 4.05 × 0.00121 × 1.25 / 5 = 4.35 %
    expect(far?.crossSectionMm2).toBe(16);
    const tight = run({ ...quaysideCorridor, drivers: { positionsM: [0] }, cable: { maxDropPercent: 4 } });
    // 4.35 % > 4 % with the largest size: the check fails and says the drivers must be spread along the run
    expect(check(tight, 'cable-drop')).toMatchObject({ status: 'fail', limit: 4 });
    expect(check(tight, 'cable-drop')?.value).toBeCloseTo(((2 * 17.75 * 4.05 * 0.00121 * AG) / 5) * 100, 3);
    expect(check(tight, 'cable-drop')?.suggestion).toMatch(/drivers must be spread along the run.*positionsM: \[7\.88\]/);
  });

  it('joins the run from 4 reels and puts a sensor at each end', () => {
    // hand arithmetic: ceil(18 m / 5 m) = 4 reels, 3 joints
    expect(result.reels.rail).toMatchObject({ reels: 4, joints: 3 });
    // common practice, no published source: a corridor has a sensor at each end
    expect(result.sensors.placements.map((p) => p.role)).toEqual(['corridor-end', 'corridor-end']);
    // as requested: 80 lx cut-off
    expect(result.sensors.daylightCutoffLux).toBe(80);
    expect(result.treads).toEqual([]);
  });
});

describe('Alder Row with a 24 V handrail in step with the treads', () => {
  const result = run(alderRowWithRail);

  it('gives the rail two pixel groups per tread', () => {
    // common practice, no published source: 2 × 14 = 28 groups; 4.5 m × 20 = 90 pixels → 3 per group → 84
    expect(result.pixels.railGrouping).toMatchObject({ groups: 28, pixelsPerGroup: 3, pixelsToFit: 84, sparePixels: 6 });
    expect(result.pixels.rail?.pixels).toBe(84);
    // WS2812B datasheet: 84 × 24 × 1.25 µs + 280 µs = 2 800 µs
    expect(result.pixels.rail?.frameTimeUs).toBeCloseTo(2800, 6);
  });

  it('puts rail and treads on one 24 V supply rail', () => {
    // hand arithmetic: 84 × 12 mA × 24 V = 24.192 W, + 119 W of tread strip = 143.192 W → ≥ 178.99 W → 1 × 200 W
    expect(result.drivers).toHaveLength(1);
    expect(result.drivers[0]?.loadW).toBeCloseTo(143.192, 4);
    expect(result.drivers[0]?.drivers).toMatchObject([{ ratingW: 200, count: 1 }]);
  });

  it('gives a 5 V rail beside 24 V treads its own driver', () => {
    // 5 V pixel strip (demo scenario HL-P05-60) beside 24 V tread strip: one rail per voltage
    const mixed = run({ ...alderRowWithRail, railPixels: { lengthM: 4.5, pixelsPerM: 60, voltageV: 5, protocol: 'one-wire-800k' } });
    expect(mixed.drivers.map((d) => d.voltageV)).toEqual([24, 5]);
    // 60 mA per 5 V RGB pixel (common practice, from memory); 4.5 m × 60 = 270 → 28 groups of 9 = 252 pixels × 0.06 A × 5 V = 75.6 W
    expect(mixed.drivers[1]?.loadW).toBeCloseTo(75.6, 6);
  });
});

describe('Alder Row with a pixel segment on every tread', () => {
  const result = run(alderRowTreadPixels);

  it('puts 17 pixels on each tread, 238 in one chain', () => {
    // hand arithmetic: 850 mm at one pixel per 50 mm cut (20 pixels/m) = 17 pixels; 14 × 17 = 238
    for (const t of result.treads) expect(t.pixels).toBe(17);
    expect(result.pixels.treads?.pixels).toBe(238);
    // WS2812B datasheet: 238 × 24 × 1.25 µs + 280 µs = 7 420 µs
    expect(result.pixels.treads?.frameTimeUs).toBeCloseTo(7420, 6);
    // HL-K20 (demo scenario): one data output of 800 pixels
    expect(result.outputs.data).toMatchObject([{ controller: 1, output: 1, pixels: 238, firstTread: 1, lastTread: 14 }]);
  });

  it('injects power at 3 points along the 11.9 m chain', () => {
    // common practice, from memory: about 5 m from one feed at 24 V → ceil(14 × 0.85 / 5) = 3 feeds
    expect(result.pixels.treads?.feedPoints).toBe(3);
    // blockSizes: 5 + 5 + 4 treads; power enters at treads 1, 6 and 11
    expect(result.treads.filter((t) => t.cableKind !== 'chain-link').map((t) => t.index)).toEqual([1, 6, 11]);
  });

  it('drops along the chain links by the two-wire loop formula', () => {
    // the link into tread 2 carries treads 2–5: 4 × 17 × 12 mA = 0.816 A over one step + 0.5 m
    const linkM = STEP_M + 0.5;
    // IEC 60364-5-52 Annex G (× 1.25 in service) with IEC 60228 class 5 0.5 mm² 39.0 Ω/km: 2 × 0.811 × 0.816 × 0.039 × 1.25 = 0.06453 V
    const firstV = 2 * linkM * 0.816 * 0.039 * AG;
    expect(result.treads[1]?.dropPercent).toBeCloseTo((firstV / 24) * 100, 3);
    // the next link carries 3 treads: the drop adds up along the chain
    const secondV = firstV + 2 * linkM * 0.612 * 0.039 * AG;
    expect(result.treads[2]?.dropPercent).toBeCloseTo((secondV / 24) * 100, 3);
    expect(result.treads[1]?.cableLengthM).toBeCloseTo(linkM, 3);
  });
});

describe('conductor tables', () => {
  it('AWG tables give gauges', () => {
    const awg = run({ ...alderRowTownhouse, cable: { conductorTable: 'awg-solid' } });
    // ASTM B258: 20 AWG is 0.518 mm² (≥ the 0.5 mm² minimum), 21 AWG 0.412 mm² is thinner
    for (const t of awg.treads) {
      expect(t.awg).toBe(20);
      expect(t.crossSectionMm2).toBeUndefined();
    }
    // at the table's own 75 °C (a given temperature replaces the Annex G service resistivity)
    const nec = run({ ...alderRowTownhouse, cable: { conductorTable: 'nec-ch9-t8-stranded', temperatureC: 75 } });
    // NEC Chapter 9 Table 8: 18 AWG is the smallest size listed; 7.95 Ω/kft stranded at 75 °C = 26.08 Ω/km
    expect(nec.treads[13]?.awg).toBe(18);
    const dropV = 2 * (7 * STEP_M + 0.5) * (8.5 / 24) * (7.95 / 304.8);
    expect(nec.treads[13]?.dropPercent).toBeCloseTo((dropV / 24) * 100, 3);
  });
});

describe('designs that break a limit still get a full answer', () => {
  it('a strip too strong for an output fails output-current and names a strip that fits', () => {
    const result = run({ ...alderRowTownhouse, treadStrip: { voltageV: 24, powerWPerM: 50, cutPitchMm: 50 } });
    // hand arithmetic: 0.85 m × 50 W/m / 24 V = 1.771 A > 1.5 A (HL-K20)
    expect(check(result, 'output-current')).toMatchObject({ status: 'fail', limit: 1.5 });
    expect(check(result, 'output-current')?.value).toBeCloseTo(1.7708, 4);
    // hand arithmetic: 1.5 A × 24 V / 0.85 m = 42.35 W/m, rounded down
    expect(check(result, 'output-current')?.suggestion).toMatch(/42\.3 W\/m/);
    expect(result.treads).toHaveLength(14);
    expect(result.bom.length).toBeGreaterThan(0);
  });

  it('a long run from the foot warns and names the tread to move to', () => {
    // invented profile with 48 outputs so that one controller takes all 40 treads
    const result = run({
      ...alderRowTownhouse,
      staircase: { ...alderRowTownhouse.staircase, treads: 40 },
      controller: { profile: { outputs: 48, maxCurrentPerOutputA: 1.5 }, position: 'bottom' },
    });
    // hand arithmetic: 39 steps × 0.3110 m + 0.5 m = 12.63 m > 10 m (common practice, no published source)
    expect(check(result, 'cable-run-length')).toMatchObject({ status: 'warn', limit: 10 });
    expect(check(result, 'cable-run-length')?.value).toBeCloseTo(39 * STEP_M + 0.5, 3);
    // hand arithmetic: from tread 20 the farthest is tread 40, 20 steps + 0.5 m = 6.72 m
    expect(check(result, 'cable-run-length')?.suggestion).toMatch(/tread 20: the longest run falls to 6\.72 m/);
  });

  it('a feeder too long for any size fails cable-drop and says how short it must be', () => {
    const result = run({ ...alderRowTownhouse, cable: { maxDropPercent: 0.1, feederLengthM: 100 } });
    // IEC 60364-5-52 Annex G, IEC 60228 class 5 16 mm² 1.21 Ω/km × 1.25: 2 × 100 × 4.9583 × 0.00121 × 1.25 = 1.5 V = 6.25 % > 0.1 %
    expect(check(result, 'cable-drop')).toMatchObject({ status: 'fail', limit: 0.1 });
    expect(result.feeder.runs[0]?.crossSectionMm2).toBeNull();
    // The limit is end to end now (IEC 60364-7-715 / BS 7671 715.525, from memory) and R′ is 1.25 × R′20 (Annex G):
    // the feeder drops 6.25 %, the lead behind takes 0.086 % of the 0.1 %, leaving 0.014 % → L = 100 m × 0.014 / 6.25 = 0.22 m → 0.2 m
    expect(check(result, 'cable-drop')?.message).toMatch(/feeder 6\.25 % .*\+ 0\.086 % on the lead to tread/);
    expect(check(result, 'cable-drop')?.suggestion).toMatch(/Shorten the feeder to 0\.2 m or less/);
  });

  it('Class 2: 119 W on one controller input is not covered by 100 W + 60 W in parallel', () => {
    const result = run({ ...alderRowTownhouse, drivers: { class2: true } });
    // NEC Chapter 9 Table 11(B): 100 VA at 20–60 V; NEC 725.121(B) (2017/2020) / 725.60(B) (2023), from memory:
    // Class 2 supplies are not paralleled, and one controller input takes one supply → 119 W > 80 W (80 % of 100 VA) fails
    expect(result.drivers[0]?.maxSupplyW).toBe(100);
    expect(result.drivers[0]?.driverCount).toBe(0);
    expect(check(result, 'class2-limit')).toMatchObject({ status: 'fail', limit: 100, value: 119 });
    // hand arithmetic: ceil(119 / 80) = 2 controllers of at most 80 W, each on its own Class 2 supply
    expect(check(result, 'class2-limit')?.suggestion).toMatch(/Split the treads over 2 controllers of at most 80 W each, each on its own listed Class 2 supply/);
    expect(check(result, 'driver-loading')?.status).toBe('fail');
  });

  it('Class 2: two controllers of 7 treads each get one 100 VA supply each', () => {
    // invented profile: 7 outputs per controller → 2 controllers of 59.5 W; 59.5 / 0.8 = 74.4 W → 100 W each (NEC Ch. 9 Table 11(B))
    const result = run({ ...alderRowTownhouse, controller: { profile: { outputs: 7, maxCurrentPerOutputA: 1.5 } }, drivers: { class2: true } });
    expect(result.circuits.map((c) => [c.name, c.driver?.ratingW])).toEqual([
      ['controller 1', 100],
      ['controller 2', 100],
    ]);
    expect(check(result, 'class2-limit')).toMatchObject({ status: 'pass', limit: 100 });
  });

  it('an NPN sensor on a PNP input fails and asks for an interface', () => {
    const result = run({ ...alderRowTownhouse, sensors: { motion: { outputType: 'npn', supplyV: 5, currentMa: 8 } } });
    // three-wire DC sensor outputs (IEC 60947-5-2): NPN sinks, PNP sources — they do not interchange
    expect(check(result, 'sensor-type')?.status).toBe('fail');
    expect(check(result, 'sensor-type')?.suggestion).toMatch(/NPN-to-PNP interface for each of the 2 sensors/);
  });

  it('a strip above 120 V DC fails SELV', () => {
    const result = run({ ...alderRowTownhouse, treadStrip: { voltageV: 230, powerWPerM: 10, cutPitchMm: 50 } });
    // IEC 61140: SELV ends at 120 V ripple-free DC
    expect(check(result, 'selv-voltage')).toMatchObject({ status: 'fail', limit: 120 });
  });
});
