import { describe, expect, it } from 'vitest';
import { estimateRequestSchema, type EstimateResult } from '../../shared/schemas/estimate.js';
import { alderRowTownhouse, alderRowTreadPixels, quaysideCorridor } from '../../shared/schemas/estimate-examples.js';
import { estimate } from '../../shared/sizing/estimate/estimate.js';
import { fuseFor, protectionFor } from '../../shared/sizing/protection.js';

const run = (body: unknown): EstimateResult => estimate(estimateRequestSchema.parse(body));
const check = (result: EstimateResult, id: string) => result.checks.find((c) => c.id === id);

// IEC 60364-5-52 Annex G: resistivity in service 1.25 × ρ20 (from memory) — the estimate's default
const AG = 1.25;
// Pythagoras: √(185² + 250²) mm per step along the stringer (Alder Row stair)
const STEP_M = Math.sqrt(185 ** 2 + 250 ** 2) / 1000;
// invented profile: 20 outputs of 3 A, no tread range, for loads the example controller could not carry
const wideProfile = { outputs: 20, maxCurrentPerOutputA: 3 };

describe('one supply per circuit (issue 8 item 1)', () => {
  it('a controller with one power input gets one driver; too large for any rating → a second controller', () => {
    // 14 × 0.85 m × 40 W/m = 476 W → 595 W needed > 480 W, the largest default rating (domain.md "Driver")
    const result = run({ ...alderRowTownhouse, treadStrip: { voltageV: 24, powerWPerM: 40, cutPitchMm: 50 }, controller: { profile: wideProfile } });
    expect(result.circuits).toHaveLength(1);
    expect(result.circuits[0]?.driver).toBeNull();
    // common practice, no published source: drivers are not paralleled onto one input; ceil(476 / (480 × 0.8)) = 2 controllers
    expect(check(result, 'driver-loading')).toMatchObject({ status: 'fail', value: null });
    expect(check(result, 'driver-loading')?.message).toMatch(/Controller 1 draws 476 W on one power input.*not paralleled/);
    expect(check(result, 'driver-loading')?.suggestion).toMatch(/Fit 2 controllers instead of one/);
    // and nothing in the BOM pretends to feed it with two drivers in parallel
    expect(result.bom.filter((l) => l.category === 'driver')).toEqual([]);
  });

  it('a controller with two power inputs gets a driver per input group of outputs', () => {
    // the same 476 W on an invented controller with 2 power inputs: 7 outputs each, 7 × 34 W = 238 W → 297.5 W → 320 W each
    const result = run({
      ...alderRowTownhouse,
      treadStrip: { voltageV: 24, powerWPerM: 40, cutPitchMm: 50 },
      controller: { profile: wideProfile },
      drivers: { powerInputsPerController: 2 },
    });
    expect(result.circuits.map((c) => [c.name, c.loadW, c.driver?.ratingW])).toEqual([
      ['controller 1 input 1', 238, 320],
      ['controller 1 input 2', 238, 320],
    ]);
    expect(check(result, 'driver-loading')?.status).toBe('pass');
    expect(result.feeder.runs.map((f) => f.powerInput)).toEqual([1, 2]);
  });

  it('two controllers of 350 W get one 480 W driver each, never 480 W + 320 W shared', () => {
    // invented profile: 7 outputs → 2 controllers; 7 × 0.85 m × 58.8235 W/m = 350 W each (hand arithmetic)
    const result = run({
      ...alderRowTownhouse,
      treadStrip: { voltageV: 24, powerWPerM: 350 / 7 / 0.85, cutPitchMm: 50 },
      controller: { profile: { outputs: 7, maxCurrentPerOutputA: 3 } },
    });
    // 700 W / 0.8 = 875 W; one circuit may hold at most 480 × 0.8 = 384 W → one circuit per controller, 437.5 W → 480 W each
    expect(result.circuits.map((c) => [c.name, c.loadW, c.driver?.ratingW])).toEqual([
      ['controller 1', 350, 480],
      ['controller 2', 350, 480],
    ]);
    expect(result.drivers[0]?.drivers).toEqual([{ ratingW: 480, count: 2, loadW: 350, loadingPercent: 72.9167 }]);
    // each feeder names its circuit, so the schedule says which driver feeds which controller
    expect(result.feeder.runs.map((f) => [f.controller, f.circuit])).toEqual([
      [1, 1],
      [2, 2],
    ]);
  });

  it('small controllers may share one driver, each on its own feeder (one supply, not paralleled)', () => {
    // invented profile: 7 outputs → 2 controllers of 59.5 W; 119 / 0.8 = 148.75 W → one 150 W driver, two feeders
    const result = run({ ...alderRowTownhouse, controller: { profile: { outputs: 7, maxCurrentPerOutputA: 1.5 } } });
    expect(result.circuits).toHaveLength(1);
    expect(result.circuits[0]).toMatchObject({ name: 'controllers 1–2', feeds: 2, driver: { ratingW: 150 } });
  });
});

describe('Class 2 circuits (issue 8 item 2)', () => {
  it('a data chain across two Class 2 circuits is an interconnection and fails class2-limit', () => {
    // 5 V Class 2: 5 × 5 = 25 VA per supply (NEC Chapter 9 Table 11(B), from memory) → 20 W at 80 %;
    // 40 % of 60 mA × 1080 pixels = 25.92 A → 3.24 A = 16.2 W per feed point, so one feed point per circuit (invented 5 V ratings)
    const result = run({ ...quaysideCorridor, railPixels: { ...quaysideCorridor.railPixels, brightnessPercent: 40 }, drivers: { class2: true, availableRatingsW: [10, 15, 20, 25] } });
    expect(result.circuits).toHaveLength(8);
    for (const c of result.circuits) expect(c.driver?.ratingW).toBeLessThanOrEqual(25);
    // NEC 725.121(B) (2017/2020) / 725.60(B) (2023), from memory: a shared 0 V along one data chain interconnects supplies
    expect(check(result, 'class2-limit')).toMatchObject({ status: 'fail' });
    expect(check(result, 'class2-limit')?.message).toMatch(/Data chain 1 of the rail is powered from circuits 1 and 2/);
    expect(check(result, 'class2-limit')?.suggestion).toMatch(/its own data output/);
  });
});

describe('Class 2 on a tread-pixel chain', () => {
  it('splits the chain’s feed groups into 80 W circuits and fails on the shared 0 V', () => {
    // 20 mA per pixel (invented): 5 treads × 17 px × 20 mA × 24 V = 40.8 W per feed group (groups of 5, 5 and 4 treads);
    // 100 VA at 24 V × 80 % = 80 W (NEC Chapter 9 Table 11(B)) → circuits of 40.8 W and 40.8 + 32.64 = 73.44 W
    const result = run({ ...alderRowTreadPixels, treadPixels: { ...alderRowTreadPixels.treadPixels, currentPerPixelMa: 20 }, drivers: { class2: true } });
    expect(result.circuits.map((c) => [c.name, c.loadW])).toEqual([
      ['feed point 1 of the tread pixels', 40.8],
      ['feed points 2–3 of the tread pixels', 73.44],
    ]);
    // NEC 725.121(B) / 725.60(B), from memory: the one data chain would join the 0 V of both supplies
    expect(check(result, 'class2-limit')?.message).toMatch(/Data chain 1 of the tread pixels is powered from circuits 1 and 2/);
  });
});

describe('end-to-end drop (issue 8 items 4 and 5)', () => {
  it('sizes feeder and leads together so driver → feeder → lead stays within 5 % at 12 V', () => {
    // 12 V strip of 14.4 W/m (domain.md: 5050 60 LED/m) on the invented wide profile, feeder 6 m off the run
    const result = run({
      ...alderRowTownhouse,
      treadStrip: { voltageV: 12, powerWPerM: 14.4, cutPitchMm: 50 },
      controller: { profile: wideProfile, position: 'bottom' },
      cable: { feederLengthM: 6 },
    });
    // IEC 60364-7-715 / BS 7671 715.525, from memory: ≤ 5 % from the driver to the farthest luminaire
    for (const t of result.treads) expect(t.pathDropPercent).toBeLessThanOrEqual(5 + 1e-9);
    const feeder = result.feeder.runs[0]!;
    const far = result.treads[13]!;
    expect(far.pathDropPercent).toBeCloseTo(feeder.dropPercent + far.dropPercent, 2);
    expect(check(result, 'cable-drop')).toMatchObject({ status: 'pass', value: feeder.pathDropPercent });
    expect(check(result, 'cable-drop')?.message).toMatch(/end-to-end limit/);
  });

  it('a fixed split gives the feeders their share and the leads the rest', () => {
    const result = run({ ...alderRowTownhouse, cable: { feederDropPercent: 1 } });
    // as requested: feeder ≤ 1 %, each lead ≤ 5 − 1 = 4 %
    expect(result.feeder.runs[0]!.dropPercent).toBeLessThanOrEqual(1);
    for (const t of result.treads) expect(t.dropPercent).toBeLessThanOrEqual(4);
    // IEC 60228 class 5 × 1.25 (Annex G): 2 × 2 × 4.9583 × R′ / 24 ≤ 1 % → R′ ≤ 12.1 Ω/km → 2.5 mm² (7.98 × 1.25 = 9.975)
    expect(result.feeder.runs[0]!.crossSectionMm2).toBe(2.5);
  });

  it('a run that fails on current is not reported as within the drop limit', () => {
    // 1 V strip: 8.5 W per tread = 8.5 A; the feeder carries 119 A, over the 73 A of 16 mm² (Treadwise estimate, no published source)
    const result = run({ ...alderRowTownhouse, treadStrip: { voltageV: 1, powerWPerM: 10, cutPitchMm: 50 }, controller: { profile: { outputs: 20, maxCurrentPerOutputA: 10 } } });
    expect(check(result, 'cable-current')?.status).toBe('fail');
    // IEC 60364-5-52 Annex G: 16 mm² 1.21 Ω/km × 1.25, 2 × 2 m × 119 A = 0.72 V on 1 V: far over 5 %, and said so
    expect(check(result, 'cable-drop')).toMatchObject({ status: 'fail' });
    expect(check(result, 'cable-drop')?.value as number).toBeGreaterThan(((2 * 2 * 119 * 0.00121 * AG) / 1) * 100 - 1e-6);
  });
});

describe('feeder lengths from the geometry (issue 8 item 3)', () => {
  it('measures each feeder from the driver’s place along the stair', () => {
    // invented profile: 7 outputs → controllers at their blocks' best treads; drivers given at the foot (0 m)
    const result = run({ ...alderRowTownhouse, controller: { profile: { outputs: 7, maxCurrentPerOutputA: 1.5 } }, drivers: { positionsM: [0] } });
    const [a, b] = result.feeder.runs;
    // each feeder = 2 m off the run + its controller's distance from tread 1 along the stringer (stair geometry)
    expect(a!.lengthM).toBeCloseTo(2 + a!.positionM, 3);
    expect(b!.lengthM).toBeCloseTo(2 + b!.positionM, 3);
    // controller 2 sits at tread 11 (best for treads 8–14): 10 steps from the foot
    expect(b!.positionM).toBeCloseTo(10 * STEP_M, 3);
    expect(result.summary.longestFeederM).toBeCloseTo(2 + 10 * STEP_M, 3);
  });

  it('with two driver places each circuit takes the nearer one', () => {
    const result = run({
      ...alderRowTownhouse,
      treadStrip: { voltageV: 24, powerWPerM: 350 / 7 / 0.85, cutPitchMm: 50 },
      controller: { profile: { outputs: 7, maxCurrentPerOutputA: 3 } },
      drivers: { positionsM: [0, 4] },
    });
    // controller 1 at tread 4 (0.933 m) → the driver at 0 m; controller 2 at tread 11 (3.110 m) → the one at 4 m
    expect(result.circuits.map((c) => c.driverPositionM)).toEqual([0, 4]);
    expect(result.feeder.runs[1]!.alongRunM).toBeCloseTo(4 - 10 * STEP_M, 3);
  });
});

describe('protection (circuits and protection)', () => {
  it('picks the smallest R10 fuse at or above 1.25 × I_B that does not exceed the cable rating', () => {
    // NEC 210.20(A) (analogous): 1.25 × 4.9583 = 6.2 A → 6.3 A; IEC 60364-4-43 433.1 (from memory): I_n ≤ I_z
    expect(fuseFor(4.9583, 10)).toBe(6.3);
    expect(fuseFor(4.9583, 6)).toBeNull();
  });

  it('a current-limited driver that cannot open the fuse must be carried by the cable', () => {
    // IEC 60127-2 (from memory): a fuse opens at about 2.1 × I_n; a 9.375 A limit cannot open 6.3 A (13.2 A needed)
    expect(protectionFor(4.9583, 10, 9.375)).toMatchObject({ fuseA: 6.3, driverProtects: true, protectedBy: 'driver current limit' });
    expect(protectionFor(4, 6, 9.375)).toMatchObject({ fuseA: 5, fuseProtects: false, protectedBy: 'none' });
    // a 60 A-limited driver opens a 5 A fuse: the fuse protects the 16 A cable
    expect(protectionFor(4, 16, 60)).toMatchObject({ fuseA: 5, protectedBy: 'fuse' });
  });

  it('reports every feeder’s fuse in the circuits, the check and the BOM', () => {
    const result = run(alderRowTownhouse);
    expect(result.circuits[0]).toMatchObject({ fusesA: [6.3], protectedBy: 'driver current limit', driver: { ratingW: 150, currentLimitA: 9.375 } });
    // the driver's limit: 150 W / 24 V × 150 % = 9.375 A (from memory: CV drivers limit at 105–150 % of rated output)
    expect(check(result, 'circuit-protection')).toMatchObject({ status: 'pass', value: 10 });
    expect(result.bom.find((l) => l.category === 'fuse')).toMatchObject({ quantity: 1 });
  });

  it('fails circuit-protection when thin pixel links sit behind a driver that cannot open their fuse', () => {
    // tread pixels at 30 mA per pixel (invented): 5 treads × 17 px × 30 mA = 2.55 A through 0.5 mm² links rated 3 A
    // (BS 7671 4F3A, from memory); a fuse must be ≥ 1.25 × 2.55 = 3.19 A → 4 A > 3 A, and the 240 W driver limits at 15 A
    const result = run({
      ...alderRowTreadPixels,
      treadPixels: { ...alderRowTreadPixels.treadPixels, currentPerPixelMa: 30 },
      controller: { profile: { outputs: 0, maxCurrentPerOutputA: 1, dataOutputs: 1, maxPixelsPerOutput: 800 } },
    });
    // IEC 60364-4-43 433.1 (from memory): I_B ≤ I_n ≤ I_z cannot hold for the links
    expect(check(result, 'circuit-protection')).toMatchObject({ status: 'fail', value: 3, limit: 15 });
    expect(check(result, 'circuit-protection')?.suggestion).toMatch(/feeder and links rated at least 4 A, so a 4 A fuse at the driver protects them/);
  });

  it('warns about grouping and terminals on feeders of 25 A and more', () => {
    // 12 V, 30 W/m: 14 × 0.85 × 30 = 357 W → 29.75 A through one feeder (hand arithmetic)
    const result = run({ ...alderRowTownhouse, treadStrip: { voltageV: 12, powerWPerM: 30, cutPitchMm: 50 }, controller: { profile: wideProfile } });
    // BS 7671 Appendix 4 grouping factors, from memory: free-air cord ratings do not hold grouped or enclosed
    expect(check(result, 'feeder-derating')).toMatchObject({ status: 'warn', value: 29.75, limit: 25 });
    expect(check(run(alderRowTownhouse), 'feeder-derating')).toBeUndefined();
  });
});

describe('smaller fixes (issue 8 item 12)', () => {
  it('summary.longestRunM is the longest controller → tread lead, the same run cable-run-length checks', () => {
    const result = run(alderRowTownhouse);
    // stair geometry: 7 steps + 0.5 m from the controller at tread 7 to tread 14
    expect(result.summary.longestRunM).toBeCloseTo(7 * STEP_M + 0.5, 3);
    expect(check(result, 'cable-run-length')?.value).toBe(result.summary.longestRunM);
    // and summary.worstDropPercent is the end-to-end value the cable-drop check judges (IEC 60364-7-715 / BS 7671 715.525, from memory)
    expect(result.summary.worstDropPercent).toBe(check(result, 'cable-drop')?.value);
    expect(result.summary.worstDropPercent).toBeCloseTo(result.feeder.runs[0]!.dropPercent + result.treads[13]!.dropPercent, 2);
  });

  it('cable-min-size never passes without a size', () => {
    // 1 V strip and a 0.1 % limit: no lead, and no feeder, finds a size (IEC 60364-5-52 Annex G drops)
    const result = run({
      ...alderRowTownhouse,
      treadStrip: { voltageV: 1, powerWPerM: 10, cutPitchMm: 50 },
      controller: { profile: { outputs: 20, maxCurrentPerOutputA: 10 } },
      cable: { maxDropPercent: 0.1 },
    });
    expect(result.treads.every((t) => t.crossSectionMm2 === null)).toBe(true);
    expect(check(result, 'cable-min-size')).toMatchObject({ status: 'fail', value: null });
  });

  it('a design where nothing fits orders no lead cable', () => {
    // 120 mm tread, 20 mm clearance each end → 80 mm < one 100 mm pitch: nothing fits (domain.md "Strip on a tread")
    const result = run({ ...alderRowTownhouse, staircase: { ...alderRowTownhouse.staircase, treadWidthMm: 120 }, treadStrip: { voltageV: 24, powerWPerM: 10, cutPitchMm: 100 } });
    expect(check(result, 'strip-fits-tread')?.status).toBe('fail');
    expect(result.cables.filter((c) => c.use === 'tread leads')).toEqual([]);
    // no 2-core lead or feeder cable (the sensors' own 3-core cable is another matter)
    expect(result.bom.filter((l) => l.category === 'cable' && l.description.startsWith('2-core'))).toEqual([]);
  });
});

describe('jurisdiction settings', () => {
  it('IEC / UK apply the ELV lighting minimum: 1.5 mm², 1 mm² for flexible cable up to 3 m', () => {
    const result = run({ ...alderRowTownhouse, cable: { jurisdiction: 'uk', feederLengthM: 5 } });
    // IEC 60364-7-715 / BS 7671 715.524 (from memory): every lead here is ≤ 3 m of class 5 flexible → 1 mm²
    for (const t of result.treads) expect(t.crossSectionMm2).toBeGreaterThanOrEqual(1);
    expect(result.treads[13]?.crossSectionMm2).toBe(1);
    // the 5 m feeder is over 3 m → at least 1.5 mm²
    expect(result.feeder.runs[0]!.crossSectionMm2).toBeGreaterThanOrEqual(1.5);
    expect(check(result, 'cable-min-size')).toMatchObject({ status: 'pass' });
    expect(check(result, 'cable-min-size')?.reference).toMatch(/715\.524/);
  });

  it('without a jurisdiction the trade minimum of 0.5 mm² stays, and the 5 % default cites the ELV lighting section', () => {
    const result = run(alderRowTownhouse);
    // common practice, no published source: 0.5 mm²
    expect(result.treads[13]?.crossSectionMm2).toBe(0.5);
    // IEC 60364-7-715 / BS 7671 715.525 (from memory): 5 % from the converter to the farthest luminaire
    expect(result.trace.find((t) => t.quantity === 'default cable.maxDropPercent')?.reference).toMatch(/715\.525/);
  });
});

describe('standby power and yearly energy', () => {
  it('adds controller, sensors, drivers and dark pixel ICs, and the energy for the stated use', () => {
    const result = run(alderRowTownhouse);
    // defaults from memory: controller 0.5 W, driver no-load 0.5 W, daylight sensor 0.05 W;
    // sensors from their data: 2 × 5 V × 8 mA = 0.08 W (demo scenario HL-M05) → 0.5 + 0.13 + 0.5 = 1.13 W
    expect(result.standby).toMatchObject({ controllerW: 0.5, sensorsW: 0.13, driversW: 0.5, pixelIcsW: 0, totalW: 1.13 });
    // hand arithmetic, 30 min a day (assumption): 1.13 W × 23.5 h × 365 = 9.693 kWh; (1.13 + 119) W × 0.5 h × 365 = 21.924 kWh
    expect(result.standby.standbyKWhPerYear).toBeCloseTo(9.693, 3);
    expect(result.standby.litKWhPerYear).toBeCloseTo(21.924, 3);
    expect(result.standby.defaultsUsed).toContain('litMinutesPerDay');
  });

  it('counts the dark pixel ICs of a pixel run, and takes the stated figures', () => {
    const result = run({ ...quaysideCorridor, standby: { darkPixelMa: 0.5, litMinutesPerDay: 60 } });
    // domain.md: a dark pixel IC draws about 0.5–1 mA (from memory); 1080 pixels × 0.5 mA × 5 V = 2.7 W
    expect(result.standby.pixelIcsW).toBeCloseTo(2.7, 6);
    expect(result.standby.litMinutesPerDay).toBe(60);
    expect(result.standby.defaultsUsed).not.toContain('darkPixelMa');
  });
});
