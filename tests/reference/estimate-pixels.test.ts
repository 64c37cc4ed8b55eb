import { describe, expect, it } from 'vitest';
import { pixelsRequestSchema } from '../../shared/schemas/pixels.js';
import { estimateRequestSchema, type EstimateResult } from '../../shared/schemas/estimate.js';
import { alderRowCornerUnit, alderRowStair, alderRowTownhouse, alderRowTreadPixels, hlK20Profile, hlK36Profile, quaysideCorridor } from '../../shared/schemas/estimate-examples.js';
import { estimate } from '../../shared/sizing/estimate/estimate.js';
import { injectionPoints, pixelData } from '../../shared/sizing/pixels.js';

const run = (body: unknown): EstimateResult => estimate(estimateRequestSchema.parse(body));
const check = (result: EstimateResult, id: string) => result.checks.find((c) => c.id === id);
const calc = (body: unknown) => pixelData(pixelsRequestSchema.parse(body));

/** A corridor rail of the given strip on the HL-K36 profile (two outputs of 600 pixels). */
const corridor = (railPixels: Record<string, unknown>) => ({
  layout: 'rail-pixels',
  railPixels: { lengthM: 5, protocol: 'one-wire-800k', ...railPixels },
  controller: { profile: hlK36Profile },
});

describe('issue 8, item 7: pixel fit counted in integers', () => {
  it('30 pixels/m on 1000 mm treads: 28 pixels per tread, not 27', () => {
    const result = run({ ...alderRowTreadPixels, staircase: { ...alderRowStair, treadWidthMm: 1000 }, treadPixels: { pixelsPerM: 30, voltageV: 5, protocol: 'one-wire-800k' } });
    // hand arithmetic: 1000 − 2 × 20 = 960 mm; 960 × 30 / 1000 = 28.8 → 28 pixels (28 × 33.33… = 933.33 mm)
    expect(result.treads[0]?.pixels).toBe(28);
    expect(result.treads[0]?.stripLengthMm).toBeCloseTo(933.333, 3);
    expect(check(result, 'strip-fits-tread')?.message).toContain('28 pixels per tread');
    // hand arithmetic: 14 treads × 28 = 392 pixels
    expect(result.pixels.treads?.pixels).toBe(392);
  });
});

describe('issue 8, item 8: pixel current defaults by channels and voltage', () => {
  it('the calculation keeps 60 mA for a 5 V RGB pixel and says it assumed it', () => {
    const result = calc({ pixels: 100, protocol: 'one-wire-800k' });
    // 60 mA per 5 V RGB pixel (common practice, from memory): 100 × 0.06 = 6 A, 30 W at 5 V
    expect(result.currentPerPixelMa).toBe(60);
    expect(result.fullWhiteCurrentA).toBeCloseTo(6, 9);
    expect(result.warnings.map((w) => w.code)).toContain('current_per_pixel_assumed');
  });

  it('a 5 V RGBW pixel defaults to 80 mA, not the RGB 60 mA', () => {
    // about 80 mA per 5 V RGBW pixel, 20 mA per channel (common practice, from memory): 100 × 0.08 = 8 A
    expect(calc({ pixels: 100, protocol: 'one-wire-800k', bitsPerPixel: 32 }).fullWhiteCurrentA).toBeCloseTo(8, 9);
    const result = run(corridor({ pixelsPerM: 60, voltageV: 5, bitsPerPixel: 32 }));
    // 5 m × 60 = 300 pixels × 0.08 A = 24 A; × 5 V = 120 W
    expect(result.pixels.rail?.currentPerPixelMa).toBe(80);
    expect(result.pixels.rail?.powerW).toBeCloseTo(120, 9);
    expect(check(result, 'pixel-current')).toMatchObject({ status: 'warn', value: 80 });
    expect(check(result, 'pixel-current')?.reference).toContain('from memory');
  });

  it('24 V pixel strip is sized per metre, not at 60 mA per pixel', () => {
    const result = run(corridor({ pixelsPerM: 60, voltageV: 24 }));
    // 14.4 W/m assumed for 12 / 24 V strip (20 segments/m × 0.06 A × 12 V, common practice, from memory):
    // 14.4 / 60 / 24 = 10 mA per pixel; 5 m → 72 W (the old 60 mA gave 300 × 0.06 × 24 = 432 W)
    expect(result.pixels.rail?.currentPerPixelMa).toBeCloseTo(10, 9);
    expect(result.pixels.rail?.powerW).toBeCloseTo(72, 6);
    expect(result.pixels.rail?.currentPerPixelSource).toBe('default-strip-power');
    expect(check(result, 'pixel-current')?.status).toBe('warn');
  });

  it('a strip power per metre from the datasheet sets the current per pixel and passes', () => {
    const result = run(corridor({ pixelsPerM: 60, voltageV: 24, powerWPerM: 18 }));
    // hand arithmetic: 18 W/m / 60 px/m / 24 V = 12.5 mA; 5 m × 18 W/m = 90 W
    expect(result.pixels.rail?.currentPerPixelMa).toBeCloseTo(12.5, 9);
    expect(result.pixels.rail?.powerW).toBeCloseTo(90, 6);
    expect(check(result, 'pixel-current')?.status).toBe('pass');
  });

  it('without a density, a 24 V segment defaults to 60 mA in the calculation and warns', () => {
    const result = calc({ pixels: 10, protocol: 'one-wire-800k', supplyVoltageV: 24 });
    // 60 mA per 12 V / 24 V segment, 20 mA per colour (common practice, from memory): 10 × 0.06 × 24 = 14.4 W
    expect(result.powerW).toBeCloseTo(14.4, 9);
    expect(result.warnings.map((w) => w.code)).toContain('current_per_pixel_assumed');
  });
});

describe('issue 8, item 8: a brightness cap shows both loads', () => {
  it('Quayside: sized for the 50 % cap, full white shown, the cap must be enforced', () => {
    const result = run(quaysideCorridor);
    // 1 080 pixels × 60 mA (common practice, from memory) = 64.8 A at full white; × 50 % = 32.4 A
    expect(result.pixels.rail?.fullWhiteCurrentA).toBeCloseTo(32.4, 9);
    expect(result.pixels.rail?.uncappedCurrentA).toBeCloseTo(64.8, 9);
    expect(result.pixels.rail?.uncappedPowerW).toBeCloseTo(324, 9);
    const cap = check(result, 'brightness-cap');
    expect(cap).toMatchObject({ status: 'warn', value: 32.4, limit: 64.8 });
    expect(cap?.suggestion).toContain('overload-protected');
  });

  it('sizeForFullWhite sizes the drivers for full white', () => {
    const result = run({ ...quaysideCorridor, railPixels: { ...quaysideCorridor.railPixels, sizeForFullWhite: true } });
    // hand arithmetic: 64.8 A × 5 V = 324 W on the 5 V rail
    expect(result.drivers[0]?.loadW).toBeCloseTo(324, 9);
    expect(check(result, 'brightness-cap')?.status).toBe('pass');
  });
});

describe('issue 8, item 12: clocked clock and latch set in an estimate', () => {
  it('a clocked rail at 4 MHz sends a frame four times faster than at the 1 MHz default', () => {
    const base = { pixelsPerM: 20, voltageV: 5, protocol: 'clocked', currentPerPixelMa: 60 };
    const slow = run({ ...corridor(base), controller: { profile: hlK20Profile } });
    const fast = run({ ...corridor({ ...base, clockHz: 4_000_000 }), controller: { profile: hlK20Profile } });
    // APA102C datasheet frame: 100 LEDs → 32 + 3 200 + 56 = 3 288 bits; 3 288 µs at 1 MHz, 822 µs at 4 MHz
    expect(slow.pixels.rail?.frameTimeUs).toBe(3288);
    expect(fast.pixels.rail?.frameTimeUs).toBe(822);
    // a part that latches on a 500 µs pause (datasheet value as given): 822 + 500 µs
    const latched = run({ ...corridor({ ...base, clockHz: 4_000_000, resetUs: 500 }), controller: { profile: hlK20Profile } });
    expect(latched.pixels.rail?.frameTimeUs).toBe(1322);
  });
});

describe('issue 8, item 6: every one-wire data gap checked on its own', () => {
  const bomLine = (result: EstimateResult, text: string) => result.bom.find((l) => l.category === 'data-line' && l.description.includes(text));

  it('a 9.7 m unbuffered data lead fails and puts a differential link in the bill of materials', () => {
    const result = run(corridor({ pixelsPerM: 60, voltageV: 5, currentPerPixelMa: 60, dataLeadM: 9.7 }));
    // one-wire data kept to about 1–2 m unbuffered (team handbook, from memory): 9.7 m > 2 m
    expect(check(result, 'data-line-length')).toMatchObject({ status: 'fail', value: 9.7, limit: 2 });
    expect(check(result, 'data-line-length')?.suggestion).toContain('differential');
    expect(bomLine(result, 'Differential')?.quantity).toBe(1);
  });

  it('a 0.5 m lead passes and adds nothing to the bill', () => {
    const result = run(corridor({ pixelsPerM: 60, voltageV: 5, currentPerPixelMa: 60 }));
    // 0.5 m default lead (controller beside the rail's start) ≤ 2 m (from memory)
    expect(check(result, 'data-line-length')).toMatchObject({ status: 'pass', value: 0.5 });
    expect(result.bom.some((l) => l.category === 'data-line')).toBe(false);
  });

  it('Quayside: the second output’s lead runs 9.5 m to its stretch of rail', () => {
    const result = run(quaysideCorridor);
    // hand arithmetic: output 1 drives pixels 1–540; output 2 starts 540 / 60 = 9 m along, + 0.5 m lead = 9.5 m > 2 m
    expect(result.pixels.rail?.dataGaps.map((g) => g.lengthM)).toEqual([0.5, 9.5]);
    expect(check(result, 'data-line-length')).toMatchObject({ status: 'fail', value: 9.5 });
  });

  it('tread pixels: the lead from a controller at the top to tread 1 is too long', () => {
    const result = run({ ...alderRowTreadPixels, controller: { profile: hlK20Profile, position: 'top' } });
    // stair geometry: 13 steps × √(185² + 250²) mm = 4.043 m + 0.5 m allowance = 4.543 m > 2 m (from memory)
    const lead = result.pixels.treads?.dataGaps.find((g) => g.kind === 'lead');
    expect(lead?.lengthM).toBeCloseTo(13 * Math.hypot(185, 250) / 1000 + 0.5, 3);
    expect(check(result, 'data-line-length')?.status).toBe('fail');
    expect(check(result, 'data-line-length')?.message).toContain('tread 1');
  });

  it('tread pixels: every tread-to-tread link is a gap of its own', () => {
    const result = run({ ...alderRowTreadPixels, cable: { serviceAllowanceM: 2 } });
    // stair geometry: each link is one step 0.311 m + 2 m allowance = 2.311 m > 2 m; 13 links on a 14-tread chain
    const links = result.pixels.treads?.dataGaps.filter((g) => g.kind === 'link') ?? [];
    expect(links).toHaveLength(13);
    expect(links.every((g) => !g.withinLimit)).toBe(true);
    expect(bomLine(result, 'Differential')?.quantity).toBe(13);
    // Alder Row as documented (controller at the chain start, 0.5 m allowance): 0.81 m links pass
    expect(check(run(alderRowTreadPixels), 'data-line-length')?.status).toBe('pass');
  });

  it('3.3 V data on 5 V pixels needs a level shifter; 5 V data does not', () => {
    const low = run({ ...corridor({ pixelsPerM: 60, voltageV: 5, currentPerPixelMa: 60 }), controller: { profile: { ...hlK36Profile, dataLogicV: 3.3 } } });
    // WS2812B datasheet: VIH = 0.7 × VDD = 3.5 V at 5 V; 3.3 V < 3.5 V
    expect(check(low, 'data-logic-level')).toMatchObject({ status: 'fail', value: 3.3, limit: 3.5 });
    expect(bomLine(low, 'Level shifter')?.quantity).toBe(1);
    const high = run({ ...corridor({ pixelsPerM: 60, voltageV: 5, currentPerPixelMa: 60 }), controller: { profile: { ...hlK36Profile, dataLogicV: 5 } } });
    expect(check(high, 'data-logic-level')?.status).toBe('pass');
    // no data logic voltage in the profile: nothing to judge
    expect(check(run(quaysideCorridor), 'data-logic-level')).toBeUndefined();
  });
});

describe('issue 8, item 9: sensors on L and U stairs, against the controller’s inputs', () => {
  const corner = (sensors: Record<string, unknown>, profile: Record<string, unknown> = {}) =>
    run({
      ...alderRowCornerUnit,
      controller: { profile: { ...hlK20Profile, ...profile } },
      sensors: { ...alderRowCornerUnit.sensors, ...sensors },
    });

  it('an L stair with a plain landing has two sensors, on the two inputs', () => {
    const result = corner({}, { sensorInputs: 2 });
    // team handbook, rules of thumb (common practice, no published source): foot and head of the whole stair
    expect(result.sensors.placements.map((p) => [p.role, p.tread])).toEqual([
      ['foot', 1],
      ['head', 15],
    ]);
    expect(check(result, 'sensor-inputs')).toMatchObject({ status: 'pass', value: 2, limit: 2 });
  });

  it('an entered landing adds a third sensor: too many for two inputs', () => {
    const result = corner({ joinedLandings: [1] }, { sensorInputs: 2 });
    // common practice, no published source: a landing where people enter needs its own sensor → 3 > 2 inputs
    expect(result.sensors.motionSensors).toBe(3);
    expect(check(result, 'sensor-inputs')).toMatchObject({ status: 'fail', value: 3, limit: 2 });
    expect(check(corner({ joinedLandings: [1] }, { sensorInputs: 4 }), 'sensor-inputs')?.status).toBe('pass');
  });

  it('without sensorInputs in the profile, two are assumed and the check says so', () => {
    const result = run({ ...alderRowCornerUnit, controller: { profile: hlK36Profile } });
    // two sensor inputs per controller (common practice, from memory)
    expect(check(result, 'sensor-inputs')).toMatchObject({ status: 'warn', limit: 2 });
  });

  it('orders sensor cable by the geometry', () => {
    const result = run({ ...alderRowTreadPixels, controller: { profile: hlK20Profile } });
    // stair geometry: the chain starts at tread 1, so the controller sits at tread 1 (x = 0);
    // foot: 0 + 0.5 m; head: 13 × √(185² + 250²) mm = 4.043 m + 0.5 m = 4.543 m; in all 5.043 m → 6 m
    const step = Math.hypot(185, 250) / 1000;
    expect(result.sensors.placements.map((p) => p.cableLengthM)).toEqual([0.5, Number((13 * step + 0.5).toFixed(3))]);
    const line = result.bom.find((l) => l.description.startsWith('3-core sensor cable'));
    expect(line).toMatchObject({ category: 'cable', quantity: 6, unit: 'm' });
  });

  it('a corridor: one sensor at each end of the rail', () => {
    const result = run(quaysideCorridor);
    // controller beside the rail's start (0.5 m lead, Treadwise assumption): near end 0.5 m, far end 18 + 0.5 m
    expect(result.sensors.placements.map((p) => p.cableLengthM)).toEqual([0.5, 18.5]);
  });
});

describe('issue 8, item 10: feed points spaced by density and current', () => {
  it('144 pixels/m at 5 V: a feed point every 0.58 m, not every 2.5 m', () => {
    const plan = injectionPoints({ lengthM: 18, voltageV: 5, currentA: 18 * 144 * 0.06, maxFeedCurrentA: 5 });
    // hand arithmetic: 144 × 0.06 A = 8.64 A/m; 5 A / 8.64 A/m = 0.5787 m; ceil(18 / 0.5787) = 32 feeds, 31 injections
    expect(plan.maxFeedLengthSource).toBe('current');
    expect(plan.maxFeedLengthM).toBeCloseTo(5 / 8.64, 9);
    expect(plan.injectionPoints).toBe(31);
    // 155.52 A / 32 = 4.86 A per feed point ≤ 5 A
    expect(plan.feedCurrentA).toBeCloseTo(4.86, 9);
  });

  it('a 2.5 m rail at 144 pixels/m no longer pushes 21.6 A through one feed point', () => {
    const result = run(corridor({ lengthM: 2.5, pixelsPerM: 144, voltageV: 5, currentPerPixelMa: 60 }));
    // hand arithmetic: 360 pixels × 0.06 A = 21.6 A; at most 5 A per feed point (common practice, from memory) → 5 feeds of 4.32 A
    expect(result.pixels.rail?.feedPoints).toBe(5);
    expect(check(result, 'feed-point-current')).toMatchObject({ status: 'pass', value: 4.32, limit: 5 });
    // a strip rated for 10 A per feed point (datasheet, as given): ceil(21.6 / 10) = 3 feeds of 7.2 A
    const rated = run(corridor({ lengthM: 2.5, pixelsPerM: 144, voltageV: 5, currentPerPixelMa: 60, maxFeedCurrentA: 10 }));
    expect(rated.pixels.rail?.feedPoints).toBe(3);
    expect(check(rated, 'feed-point-current')).toMatchObject({ status: 'pass', value: 7.2, limit: 10 });
  });

  it('tread pixels: feed groups grow until none draws more than a feed point may push', () => {
    const result = run({ ...alderRowTreadPixels, treadPixels: { pixelsPerM: 60, voltageV: 5, protocol: 'one-wire-800k', currentPerPixelMa: 60 } });
    // hand arithmetic: 860 mm × 60 / 1000 = 51 pixels × 0.06 A = 3.06 A per tread; 5 A per feed point → 1 tread per group, 14 groups
    expect(result.pixels.treads?.feedPoints).toBe(14);
    expect(check(result, 'feed-point-current')).toMatchObject({ status: 'pass', value: 3.06 });
  });

  it('one tread above the limit cannot be fixed by more feed points: the check fails', () => {
    const result = run({ ...alderRowTreadPixels, treadPixels: { pixelsPerM: 144, voltageV: 5, protocol: 'one-wire-800k', currentPerPixelMa: 60 } });
    // hand arithmetic: 860 × 144 / 1000 = 123.84 → 123 pixels × 0.06 A = 7.38 A > 5 A (common practice, from memory)
    expect(check(result, 'feed-point-current')).toMatchObject({ status: 'fail', value: 7.38, limit: 5 });
    expect(check(result, 'feed-point-current')?.suggestion).toContain('both ends');
  });
});

describe('issue 8, item 12: smaller pixel and reel fixes', () => {
  it('a rail that holds no whole pixel fails and orders no reel', () => {
    const result = run(corridor({ lengthM: 0.15, pixelsPerM: 5, voltageV: 5, currentPerPixelMa: 60 }));
    // arithmetic: 0.15 m × 5 pixels/m = 0.75 → 0 whole pixels
    expect(result.pixels.rail?.pixels).toBe(0);
    expect(check(result, 'rail-holds-pixels')).toMatchObject({ status: 'fail', value: 0, limit: 1 });
    expect(result.reels.rail).toBeNull();
    expect(result.bom.some((l) => l.category === 'pixel-strip')).toBe(false);
    // no pixel, no data line to judge
    expect(check(result, 'data-line-length')).toBeUndefined();
    // Quayside: 18 m × 60 = 1 080 pixels (demo scenario) passes and orders reels
    const quayside = run(quaysideCorridor);
    expect(check(quayside, 'rail-holds-pixels')).toMatchObject({ status: 'pass', value: 1080 });
    expect(quayside.reels.rail?.reels).toBe(4);
  });
});

describe('treads that differ: per-tread widths (winders, a bullnose first step)', () => {
  const bullnose = { ...alderRowStair, treadWidthsMm: [1150, ...Array.from({ length: 13 }, () => 900)] };

  it('tread strips: each tread cut and loaded on its own width', () => {
    const result = run({ ...alderRowTownhouse, staircase: bullnose });
    // domain rule: 1150 − 40 = 1110 mm → 22 × 50 mm = 1100 mm; 900 − 40 = 860 → 850 mm
    expect(result.treads[0]?.stripLengthMm).toBe(1100);
    expect(result.treads[1]?.stripLengthMm).toBe(850);
    // hand arithmetic: 1.1 m × 10 W/m = 11 W; + 13 × 8.5 W = 121.5 W
    expect(result.treads[0]?.powerW).toBeCloseTo(11, 9);
    expect(result.summary.totalLoadW).toBeCloseTo(121.5, 9);
    // cutting stock: 1100 + 13 × 850 = 12 150 mm → at least ceil(12 150 / 5 000) = 3 reels; 3 are found
    expect(result.reels.treads?.reels).toBe(3);
    expect(result.reels.treads?.plan.flatMap((r) => r.piecesMm)).toContain(1100);
  });

  it('a tread too narrow for one pitch is unlit and fails strip-fits-tread, naming its width', () => {
    const widths = [120, ...Array.from({ length: 13 }, () => 900)];
    const result = run({ ...alderRowTownhouse, staircase: { ...alderRowStair, treadWidthsMm: widths }, treadStrip: { ...alderRowTownhouse.treadStrip, cutPitchMm: 100 } });
    // domain rule: 120 − 40 = 80 mm < one 100 mm pitch → no strip on tread 1; 860 → 800 mm on the others
    expect(result.treads[0]?.stripLengthMm).toBe(0);
    expect(result.summary.litTreads).toBe(13);
    expect(check(result, 'strip-fits-tread')?.status).toBe('fail');
    expect(check(result, 'strip-fits-tread')?.message).toContain('120 mm tread');
  });

  it('tread pixels: each tread holds its own pixels; totals add them up', () => {
    const result = run({ ...alderRowTreadPixels, staircase: bullnose });
    // 20 pixels/m cut every 50 mm (one pixel per cut): 1110 mm → 22 pixels; 860 mm → 17 pixels
    expect(result.treads[0]?.pixels).toBe(22);
    expect(result.treads[5]?.pixels).toBe(17);
    // hand arithmetic: 22 + 13 × 17 = 243 pixels; × 12 mA (as given) = 2.916 A
    expect(result.pixels.treads?.pixels).toBe(243);
    expect(result.pixels.treads?.fullWhiteCurrentA).toBeCloseTo(2.916, 9);
    // hand arithmetic: 1.1 m + 13 × 0.85 m = 12.15 m of pixel strip
    expect(result.pixels.treads?.lengthM).toBeCloseTo(12.15, 9);
  });

  it('one width per tread, or a 400 at staircase.treadWidthsMm', () => {
    const parsed = estimateRequestSchema.safeParse({ ...alderRowTownhouse, staircase: { ...alderRowStair, treadWidthsMm: [900, 900] } });
    expect(parsed.success).toBe(false);
    expect(parsed.error?.issues.map((i) => i.path.join('.'))).toContain('staircase.treadWidthsMm');
  });
});

describe('issue 8: the trace lists the new defaults it used', () => {
  it('feed-point current, data lead and the cap sizing on the Quayside rail', () => {
    const defaults = run(quaysideCorridor)
      .trace.filter((t) => t.quantity.startsWith('default '))
      .map((t) => t.quantity);
    // 5 A per feed point (from memory), 0.5 m data lead (Treadwise assumption), sized for the 50 % cap
    expect(defaults).toEqual(expect.arrayContaining(['default currentPerPixelMa', 'default maxFeedCurrentA', 'default dataLeadM', 'default sizeForFullWhite']));
    const given = run({ ...quaysideCorridor, railPixels: { ...quaysideCorridor.railPixels, maxFeedCurrentA: 6, dataLeadM: 1, sizeForFullWhite: false, currentPerPixelMa: 50 } })
      .trace.filter((t) => t.quantity.startsWith('default '))
      .map((t) => t.quantity);
    expect(given).not.toEqual(expect.arrayContaining(['default maxFeedCurrentA']));
    expect(given.some((q) => ['default dataLeadM', 'default sizeForFullWhite', 'default currentPerPixelMa'].includes(q))).toBe(false);
  });
});

describe('treads that differ: lit landings', () => {
  const lit = { ...alderRowCornerUnit, staircase: { ...alderRowCornerUnit.staircase, litLandings: [1] } };

  it('a lit landing lights between its flights on an output of its own', () => {
    const result = run(lit);
    // sequence foot first: treads 1–7, landing 1, treads 8–15 → 16 outputs of HL-K20's 20 (one per step, common practice)
    expect(result.outputs.cv.find((o) => o.landings?.includes(1))).toMatchObject({ output: 8, treads: [] });
    expect(result.treads[7]).toMatchObject({ index: 8, output: 9 });
    expect(check(result, 'output-count')).toMatchObject({ status: 'pass', value: 16 });
    // domain rule: the landing is as wide as the stair, 900 − 40 → 850 mm; 0.85 m × 10 W/m = 8.5 W; 16 × 8.5 W = 136 W
    expect(result.landings?.[0]).toMatchObject({ landing: 1, belowTread: 7, stripLengthMm: 850, controller: 1, output: 8 });
    expect(result.summary.totalLoadW).toBeCloseTo(136, 9);
    expect(result.summary.litTreads).toBe(15);
  });

  it('its lead runs from the controller to the landing’s front edge', () => {
    const result = run(lit);
    // stair geometry: controller at tread 8 (the corner unit's best position); the landing's edge is one step above
    // tread 7, so the lead is the landing crossing √(185² + 900²) = 0.9188 m + 0.5 m allowance
    expect(result.outputs.controllerTreads[0]?.atTread).toBe(8);
    expect(result.landings?.[0]?.cableLengthM).toBeCloseTo(Math.hypot(185, 900) / 1000 + 0.5, 3);
  });

  it('its piece is cut from the reels with the treads', () => {
    // cutting stock: 16 pieces of 850 mm, 5 per 5 m reel → ceil(16 / 5) = 4 reels (15 treads alone: 3)
    expect(run(lit).reels.treads?.reels).toBe(4);
    expect(run(alderRowCornerUnit).reels.treads?.reels).toBe(3);
  });

  it('a landing that is not there, or a lit landing on a pixel layout, is a 400 at its path', () => {
    const wrong = estimateRequestSchema.safeParse({ ...alderRowCornerUnit, staircase: { ...alderRowCornerUnit.staircase, litLandings: [2] } });
    expect(wrong.error?.issues.map((i) => i.path.join('.'))).toContain('staircase.litLandings.0');
    const pixels = estimateRequestSchema.safeParse({ ...alderRowTreadPixels, staircase: { ...alderRowCornerUnit.staircase, litLandings: [1] } });
    expect(pixels.error?.issues.map((i) => i.path.join('.'))).toContain('staircase.litLandings');
  });
});
