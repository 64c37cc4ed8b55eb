import { z } from 'zod';
import { flightsMismatch } from '../tables/stair-flights.js';
import {
  MAX_CURRENT_PER_PIXEL_MA,
  MAX_FLIGHTS,
  MAX_PIXELS_PER_M,
  MAX_PIXELS_PER_RUN,
  MAX_RAIL_LENGTH_M,
  MAX_TREADS,
  MIN_FEED_CURRENT_A,
  MIN_FEED_LENGTH_M,
} from '../tables/limits.js';
import { catalogSchema } from './catalog.js';
import { engineVersionSchema, traceEntrySchema } from './common.js';
import { conductorTableSchema, maxDropPercentSchema, temperatureSchema } from './conductor.js';
import { controllerProfileSchema } from './controller.js';
import { minCrossSectionSchema } from './cable.js';
import { driverGroupSchema } from './driver.js';
import { pixelProtocolSchema } from './pixels.js';
import { reelCutSchema } from './reels.js';
import {
  alderRowCornerUnit,
  alderRowTownhouse,
  alderRowTreadPixels,
  alderRowTownhouseResponse,
  alderRowWithRail,
  harborLaneCheckout,
  quaysideCorridor,
} from './estimate-examples.js';

// ---------------------------------------------------------------------------------------------
// Request: POST /v1/estimates
// ---------------------------------------------------------------------------------------------

export { MAX_TREADS };

const flightSchema = z
  .strictObject({
    treads: z.int().min(1).max(MAX_TREADS).meta({ description: 'Treads in this flight.' }),
    landingLengthMm: z
      .number()
      .min(0)
      .max(20_000)
      .optional()
      .meta({ description: 'Cable length across the landing at the head of this flight, mm (both legs for a corner). Default: the tread width.' }),
  })
  .meta({ id: 'Flight', description: 'A run of treads between landings, foot first.', example: { treads: 7, landingLengthMm: 900 } });

export const staircaseSchema = z
  .strictObject({
    treads: z.int().min(1).max(MAX_TREADS).meta({ description: `Treads in the whole stair, numbered from 1 at the foot (at most ${MAX_TREADS}).` }),
    treadWidthMm: z.number().min(100).max(5000).meta({ description: 'Tread width, side to side, mm.' }),
    riserHeightMm: z.number().min(50).max(400).meta({ description: 'Riser height, mm.' }),
    goingMm: z.number().min(50).max(1000).meta({ description: 'Going (tread depth, front to back), mm.' }),
    flights: z.array(flightSchema).min(1).max(MAX_FLIGHTS).optional().meta({ description: `Flights foot first; they must add up to \`treads\`. Default: one straight flight. At most ${MAX_FLIGHTS}.` }),
    treadWidthsMm: z
      .array(z.number().min(100).max(5000))
      .min(1)
      .max(MAX_TREADS)
      .optional()
      .meta({
        description:
          'Added field: width of each tread where the strip goes, foot first, mm (winders, a bullnose first step: the length along the nosing). One per tread; default: every tread `treadWidthMm` wide.',
        example: [1150, 900, 900, 900],
      }),
    litLandings: z
      .array(z.int().min(1).max(19))
      .max(19)
      .optional()
      .meta({
        description:
          'Added field: landings lit with a strip along their front edge, as wide as the stair (1 = the landing above flight 1). Each lights in the step sequence between its flights on a CV output of its own (tread-strip layouts).',
      }),
  })
  .superRefine((stair, ctx) => {
    const issue = flightsMismatch(stair);
    if (issue) ctx.addIssue({ code: 'custom', path: ['flights'], message: issue });
    const landings = (stair.flights?.length ?? 1) - 1;
    stair.litLandings?.forEach((landing, i) => {
      if (landing > landings) {
        ctx.addIssue({ code: 'custom', path: ['litLandings', i], message: landings === 0 ? 'the stair has no landing between flights' : `must be a landing from 1 to ${landings}` });
      }
    });
    if (stair.treadWidthsMm && stair.treadWidthsMm.length !== stair.treads) {
      ctx.addIssue({ code: 'custom', path: ['treadWidthsMm'], message: `gives ${stair.treadWidthsMm.length} widths but the stair has ${stair.treads} treads` });
    }
  })
  .meta({ id: 'Staircase', description: 'The stair as measured.', example: { treads: 14, treadWidthMm: 900, riserHeightMm: 185, goingMm: 250 } });

const endClearanceSchema = z
  .number()
  .min(0)
  .max(500)
  .optional()
  .meta({ description: 'Gap left at each end of the tread, mm. Default 20 (common practice).', default: 20 });

const skuField = z.string().min(1).max(64).optional().meta({ description: 'SKU of this part in the catalog, when one is sent.' });

export const treadStripSchema = z
  .strictObject({
    voltageV: z.number().min(1).max(400).meta({ description: 'Strip voltage, V DC.' }),
    powerWPerM: z.number().positive().max(200).meta({ description: 'Strip power per metre, W/m.' }),
    cutPitchMm: z.number().min(1).max(1000).meta({ description: 'Cut pitch: the strip may only be cut at these marks, mm.' }),
    endClearanceMm: endClearanceSchema,
    sku: skuField,
  })
  .meta({ id: 'TreadStrip', description: 'The constant-voltage strip fitted on each tread.', example: { voltageV: 24, powerWPerM: 10, cutPitchMm: 50, sku: 'HL-S24-10' } });

const pixelCommon = {
  pixelsPerM: z
    .number()
    .min(1)
    .max(MAX_PIXELS_PER_M)
    .meta({ description: `Pixels (driver ICs) per metre; on 12 V / 24 V strip one pixel often drives 3 or 6 LEDs. At most ${MAX_PIXELS_PER_M}; the whole run holds at most ${MAX_PIXELS_PER_RUN} pixels.` }),
  voltageV: z.number().min(1).max(60).meta({ description: 'Strip voltage, V DC.' }),
  protocol: pixelProtocolSchema,
  // `type` and `enum` spelt out: the OpenAPI generator renders a multi-value literal with its first value only.
  bitsPerPixel: z.literal([24, 32]).optional().meta({ description: 'One-wire bits per pixel: 24 RGB, 32 RGBW.', default: 24, type: 'integer', enum: [24, 32] }),
  currentPerPixelMa: z
    .number()
    .min(0)
    .max(MAX_CURRENT_PER_PIXEL_MA)
    .optional()
    .meta({ description: `Current of one pixel at full white, mA (at most ${MAX_CURRENT_PER_PIXEL_MA}). Default 60 (a 5 V RGB pixel).`, default: 60 }),
  brightnessPercent: z
    .number()
    .min(1)
    .max(100)
    .optional()
    .meta({ description: 'Added field: brightness cap the controller enforces; current scales linearly. Default 100.', default: 100 }),
  maxFeedLengthM: z
    .number()
    .min(MIN_FEED_LENGTH_M)
    .max(100)
    .optional()
    .meta({ description: `Longest strip the datasheet allows from one feed point, m (at least ${MIN_FEED_LENGTH_M}). Default 2.5 m at 5 V, 5 m at 12 / 24 V (from memory).` }),
  sku: skuField,
  // Added for issue 8 (pixel current defaults, brightness cap, clocked timing, data lines, feed points):
  powerWPerM: z
    .number()
    .positive()
    .max(200)
    .optional()
    .meta({
      description:
        'Added field: strip power per metre at full white, W/m (datasheet). Sets the current per pixel when currentPerPixelMa is not given. Default without either: 60 mA per 5 V RGB pixel, 80 mA per 5 V RGBW pixel, 14.4 W/m (× 4/3 RGBW) for 12 / 24 V strip (from memory), with a pixel-current warning.',
    }),
  sizeForFullWhite: z
    .boolean()
    .optional()
    .meta({
      description:
        'Added field: with a brightness cap, size drivers and cables for full white (true) or for the cap (false, the default: the cap must then be enforced in the controller and the supply overload-protected, as the brightness-cap check says).',
      default: false,
    }),
  clockHz: z
    .number()
    .min(1_000)
    .max(50_000_000)
    .optional()
    .meta({ description: 'Added field: clock rate of a clocked (data + clock) strip, Hz. Default 1 MHz.', default: 1_000_000 }),
  resetUs: z
    .number()
    .min(0)
    .max(10_000)
    .optional()
    .meta({ description: 'Added field: latch time after each frame, µs: one-wire reset (default 280); clocked parts that latch on a pause (default 0).' }),
  maxDataLinkM: z
    .number()
    .min(0.1)
    .max(100)
    .optional()
    .meta({ description: 'Added field: longest unbuffered one-wire data gap from one pixel to the next (tread to tread), m. Default 2 (about 1–2 m, from memory).', default: 2 }),
  maxFeedCurrentA: z
    .number()
    .min(MIN_FEED_CURRENT_A)
    .max(100)
    .optional()
    .meta({ description: `Added field: most current one feed point may push into the strip copper, A (strip datasheet; at least ${MIN_FEED_CURRENT_A}). Default 5 A (common practice, from memory).`, default: 5 }),
};

export const railPixelsSchema = z
  .strictObject({
    lengthM: z
      .number()
      .min(0.1)
      .max(MAX_RAIL_LENGTH_M)
      .meta({ description: `Length of the rail (handrail, skirting or corridor wall) run, m (at most ${MAX_RAIL_LENGTH_M}).` }),
    ...pixelCommon,
    dataLeadM: z
      .number()
      .min(0)
      .max(100)
      .optional()
      .meta({
        description: 'Added field: data lead from the controller to the start of the rail, m. Default 0.5 (controller beside the rail’s start); each further data output’s lead runs on to the start of its stretch.',
        default: 0.5,
      }),
  })
  .meta({
    id: 'RailPixels',
    description: 'An addressable pixel run along a handrail, skirting or corridor wall.',
    example: { lengthM: 18, pixelsPerM: 60, voltageV: 5, protocol: 'one-wire-800k', sku: 'HL-P05-60' },
  });

export const treadPixelsSchema = z
  .strictObject({
    ...pixelCommon,
    cutPitchMm: z.number().min(1).max(1000).optional().meta({ description: 'Cut pitch, mm. Default: every pixel is a cut point.' }),
    endClearanceMm: endClearanceSchema,
  })
  .meta({
    id: 'TreadPixels',
    description: 'An addressable segment on every tread, the segments chained tread to tread.',
    example: { pixelsPerM: 20, voltageV: 24, protocol: 'one-wire-800k', currentPerPixelMa: 12, cutPitchMm: 50 },
  });

export const controllerPositionSchema = z
  .union([
    z.enum(['bottom', 'top', 'middle']),
    z.strictObject({ tread: z.int().min(1).max(MAX_TREADS).meta({ description: 'Tread the controller sits at (1 = foot).' }) }),
  ])
  .meta({
    id: 'ControllerPosition',
    description:
      'Where the controller sits along the stair: bottom (tread 1), top (tread n), middle (⌈n/2⌉) or a tread. Default: where the longest run is shortest. With several controllers it applies within each one’s block of treads.',
    example: 'middle',
  });

export const estimateControllerSchema = z
  .strictObject({
    profile: controllerProfileSchema.optional(),
    profileId: z
      .string()
      .min(1)
      .max(64)
      .optional()
      .meta({ description: 'A controller of the catalog (inline `catalog` item of kind "controller", by its profileId or SKU).' }),
    position: controllerPositionSchema.optional(),
  })
  .superRefine((c, ctx) => {
    if ((c.profile === undefined) === (c.profileId === undefined)) {
      ctx.addIssue({ code: 'custom', path: ['profile'], message: 'give either an inline profile or a profileId' });
    }
  })
  .meta({
    id: 'EstimateController',
    description: 'The controller: an inline profile, or a profileId resolved against the catalog.',
    example: { profileId: 'HL-K20' },
  });

export const DEFAULT_FEEDER_LENGTH_M = 2;

export const estimateCableSchema = z
  .strictObject({
    conductorTable: conductorTableSchema.optional().meta({ description: 'Table to choose cable from; an AWG table gives `awg` sizes. Default iec60228-class5.' }),
    maxDropPercent: maxDropPercentSchema.optional(),
    minCrossSectionMm2: minCrossSectionSchema.optional(),
    serviceAllowanceM: z
      .number()
      .min(0)
      .max(10)
      .optional()
      .meta({ description: 'Added to every run for the drop to the strip’s feed end, m. Default 0.5.', default: 0.5 }),
    temperatureC: temperatureSchema.optional().meta({
      description:
        'Conductor temperature, °C, for R′ = R_ref · (1 + α · (T − T_ref)) (IEC 60028). Default: none — estimates take the IEC 60364-5-52 Annex G resistivity in service, R′ = 1.25 × R′20 (from memory), and say so in the trace.',
    }),
    feederLengthM: z
      .number()
      .min(0.1)
      .max(100)
      .optional()
      .meta({
        description: `Added field: the part of each feeder that is not along the run — from the driver to the stringer or rail and the connections, m; each feeder adds its distance along the run from the driver (drivers.positionsM) to its controller or feed point. Default ${DEFAULT_FEEDER_LENGTH_M}.`,
        default: DEFAULT_FEEDER_LENGTH_M,
      }),
    jurisdiction: z
      .enum(['iec', 'uk', 'us'])
      .optional()
      .meta({
        description:
          'Added field: wiring rules to apply. iec / uk: the ELV lighting section’s minimum conductor, 1.5 mm² (1 mm² for flexible cable up to 3 m; IEC 60364-7-715 / BS 7671 715.524, from memory), unless minCrossSectionMm2 is given. us: NEC practice — Class 2 limits apply where drivers.class2 asks for them. Default: none (trade practice, 0.5 mm² minimum). The 5 % end-to-end drop default is the ELV lighting section’s (IEC 60364-7-715 / BS 7671 715.525, from memory) in every case.',
      }),
    feederDropPercent: z
      .number()
      .min(0.1)
      .max(20)
      .optional()
      .meta({
        description:
          'Added field: the share of maxDropPercent given to the feeders, %; the leads get the rest. The limit always applies end to end (driver → feeder → lead → strip). Default: no fixed split — feeder and leads are sized together for the least copper within the end-to-end limit.',
      }),
  })
  .meta({ id: 'EstimateCable', description: 'How runs and feeders are sized.', example: { conductorTable: 'iec60228-class5', maxDropPercent: 5, feederLengthM: 2 } });

export const estimateDriversSchema = z
  .strictObject({
    maxLoadingPercent: z.number().min(10).max(100).optional().meta({ description: 'Load each driver to at most this % of its rating. Default 80.', default: 80 }),
    availableRatingsW: z
      .array(z.number().min(1).max(100_000))
      .min(1)
      .max(16)
      .optional()
      .meta({ description: 'Ratings to choose from, W. With a catalog, only its drivers of these ratings. Default: the catalog’s drivers at the rail voltage, else 30–480 W.' }),
    class2: z.boolean().optional().meta({ description: 'Cap each supply at the NEC Chapter 9 Table 11 Class 2 limit for its voltage.' }),
    efficiencyPercent: z.number().min(10).max(100).optional().meta({ description: 'Driver efficiency, %; gives the mains input power and current.' }),
    mainsVoltageV: z.number().min(50).max(1000).optional().meta({ description: 'Mains voltage, V AC. Default 230.', default: 230 }),
    powerFactor: z.number().min(0.1).max(1).optional().meta({ description: 'Added field: driver input power factor. Default 0.9 (assumed).', default: 0.9 }),
    powerInputsPerController: z
      .int()
      .min(1)
      .max(16)
      .optional()
      .meta({
        description:
          'Added field: separate power inputs on each controller, each feeding its own group of CV outputs (from the controller’s datasheet). Each input is a feed of its own, so its group may have a driver of its own. Default 1: a controller with one power input gets one driver.',
        default: 1,
      }),
    positionsM: z
      .array(z.number().min(0).max(500))
      .min(1)
      .max(50)
      .optional()
      .meta({
        description:
          'Added field: where the drivers sit, m along the run from its start (a stair: along the stringer from tread 1, landings included; a rail or corridor: from the rail’s start). Each circuit’s driver sits at the listed place nearest its feeds; several places spread the drivers along the run. Default: one place, midway between the farthest feeds. Every feeder is cable.feederLengthM plus its distance along the run.',
        example: [0],
      }),
    currentLimitPercent: z
      .number()
      .min(100)
      .max(300)
      .optional()
      .meta({
        description:
          'Added field: the driver’s output current limit (overload protection), % of its rated current. Default 150 (constant-voltage LED driver datasheets commonly give 105–150 %, from memory). A cable that could carry less than this limit relies on a fuse the limited driver may never blow, so it is sized for the limit instead.',
        default: 150,
      }),
  })
  .meta({ id: 'EstimateDrivers', description: 'How drivers are chosen for each rail voltage.', example: { maxLoadingPercent: 80, availableRatingsW: [60, 100, 150, 240] } });

export const estimateSensorsSchema = z
  .strictObject({
    motion: z
      .strictObject({
        outputType: z.enum(['pnp', 'npn']).meta({ description: 'Sensor output: pnp (sourcing) or npn (sinking).' }),
        supplyV: z.number().positive().max(60).meta({ description: 'Supply voltage the sensor runs on, V.' }),
        currentMa: z.number().positive().max(1000).meta({ description: 'Current one sensor draws, mA.' }),
      })
      .optional()
      .meta({ description: 'The motion sensor fitted. Default: the catalog’s motion sensor, if any.' }),
    daylightCutoffLux: z
      .number()
      .min(1)
      .max(100_000)
      .optional()
      .meta({ description: 'The lights run only below this ambient level, lx. Default 50 (below a lit hallway and EN 12464-1’s 100 / 150 lx).', default: 50 }),
    useDaylightCutoff: z
      .boolean()
      .optional()
      .meta({ description: 'Added field: fit an ambient-light sensor for the cut-off (one per controller). Default true.', default: true }),
    joinedLandings: z
      .array(z.int().min(1).max(19))
      .max(19)
      .optional()
      .meta({ description: 'Added field: landings where people join the stair (1 = the landing above flight 1); each gets its own sensor.' }),
    sideEntrances: z
      .int()
      .min(0)
      .max(50)
      .optional()
      .meta({ description: 'Added field: side entrances along a corridor (rail-pixels without a staircase); each gets its own sensor. Default 0.' }),
  })
  .meta({ id: 'EstimateSensors', description: 'Motion and daylight sensing.', example: { motion: { outputType: 'pnp', supplyV: 5, currentMa: 8 }, daylightCutoffLux: 50 } });

export const estimateReelsSchema = z
  .strictObject({
    reelLengthMm: z.number().min(100).max(1_000_000).optional().meta({ description: 'Reel length, mm. Default: the catalog item’s, else 5000.', default: 5000 }),
  })
  .meta({ id: 'EstimateReelLength', description: 'Strip reels.', example: { reelLengthMm: 5000 } });

export const estimateStandbySchema = z
  .strictObject({
    litMinutesPerDay: z.number().min(0).max(1440).optional().meta({ description: 'Minutes a day the lights are on, for the yearly energy. Default 30 (an assumption for a dwelling’s stair).', default: 30 }),
    controllerW: z.number().min(0).max(50).optional().meta({ description: 'A controller’s own standby draw, W. Default 0.5 (from memory; use the datasheet).', default: 0.5 }),
    driverNoLoadW: z.number().min(0).max(50).optional().meta({ description: 'A driver’s no-load input, W. Default 0.5 (the EU standby limit for control gear, from memory).', default: 0.5 }),
    darkPixelMa: z.number().min(0).max(20).optional().meta({ description: 'Current of a dark pixel IC, mA. Default 1 (0.5–1 mA typical, from memory).', default: 1 }),
    daylightSensorW: z.number().min(0).max(10).optional().meta({ description: 'An ambient-light sensor’s draw, W. Default 0.05 (from memory).', default: 0.05 }),
  })
  .meta({
    id: 'EstimateStandbyRequest',
    description: 'Added block: figures for the standby power and the yearly energy; every figure left out takes a documented default.',
    example: { litMinutesPerDay: 30 },
  });

const commonFields = {
  controller: estimateControllerSchema,
  cable: estimateCableSchema.optional(),
  drivers: estimateDriversSchema.optional(),
  sensors: estimateSensorsSchema.optional(),
  reels: estimateReelsSchema.optional(),
  catalog: catalogSchema.optional(),
  useStoredCatalog: z
    .boolean()
    .optional()
    .meta({
      description:
        'Without an inline `catalog`, the estimate is priced from the organisation’s stored catalog (its active items). false: leave it unpriced. Default true.',
      default: true,
    }),
  profiles: z
    .boolean()
    .optional()
    .meta({ description: 'true: add aluminium profile bars and end caps for every lit tread piece, from the catalog. Default false.', default: false }),
  standby: estimateStandbySchema.optional(),
};

type CrossCheckable = {
  staircase?: { treads: number; flights?: { treads: number }[] | undefined; litLandings?: number[] | undefined } | undefined;
  controller: { position?: z.output<typeof controllerPositionSchema> | undefined };
  sensors?: { joinedLandings?: number[] | undefined } | undefined;
  reels?: { reelLengthMm?: number | undefined } | undefined;
  treadStrip?: { cutPitchMm: number } | undefined;
  treadPixels?: { cutPitchMm?: number | undefined; pixelsPerM: number } | undefined;
  railPixels?: { lengthM: number; pixelsPerM: number } | undefined;
};

/** Pixels a run of this length and density holds, before any grouping (the engine's floor(lengthM × pixelsPerM)). */
const pixelsIn = (lengthM: number, pixelsPerM: number) => Math.floor(lengthM * pixelsPerM + 1e-9);

/** Every pixel run within MAX_PIXELS_PER_RUN: the answer and the work grow with the pixels. */
function pixelBounds(value: CrossCheckable & { staircase?: { treads: number; treadWidthMm?: number; treadWidthsMm?: number[] | undefined } | undefined }, ctx: z.RefinementCtx): void {
  const rail = value.railPixels;
  if (rail && pixelsIn(rail.lengthM, rail.pixelsPerM) > MAX_PIXELS_PER_RUN) {
    ctx.addIssue({
      code: 'custom',
      path: ['railPixels', 'pixelsPerM'],
      message: `the rail would hold ${pixelsIn(rail.lengthM, rail.pixelsPerM)} pixels; at most ${MAX_PIXELS_PER_RUN} in one run (split it into several estimates)`,
    });
  }
  const stair = value.staircase;
  if (value.treadPixels && stair?.treadWidthMm !== undefined) {
    const widthM = (stair.treadWidthsMm ?? Array.from({ length: stair.treads }, () => stair.treadWidthMm as number)).reduce((sum, mm) => sum + mm, 0) / 1000;
    const pixels = pixelsIn(widthM, value.treadPixels.pixelsPerM);
    if (pixels > MAX_PIXELS_PER_RUN) {
      ctx.addIssue({ code: 'custom', path: ['treadPixels', 'pixelsPerM'], message: `the treads would hold about ${pixels} pixels; at most ${MAX_PIXELS_PER_RUN} in one run` });
    }
  }
}

/** Fields that only make sense against the stair they belong to. */
function crossCheck(value: CrossCheckable, ctx: z.RefinementCtx): void {
  pixelBounds(value, ctx);
  const position = value.controller.position;
  const treads = value.staircase?.treads;
  if (position && typeof position === 'object' && treads !== undefined && position.tread > treads) {
    ctx.addIssue({ code: 'custom', path: ['controller', 'position', 'tread'], message: `must be a tread from 1 to ${treads}` });
  }
  const reel = value.reels?.reelLengthMm;
  const pitch = value.treadStrip?.cutPitchMm ?? value.treadPixels?.cutPitchMm;
  if (reel !== undefined && pitch !== undefined && reel < pitch) {
    ctx.addIssue({ code: 'custom', path: ['reels', 'reelLengthMm'], message: `a reel must hold at least one ${pitch} mm cut pitch` });
  }
  if ((value.staircase?.litLandings?.length ?? 0) > 0 && value.treadStrip === undefined) {
    ctx.addIssue({ code: 'custom', path: ['staircase', 'litLandings'], message: 'lit landings are sized with tread strips (layouts tread-strips and treads-and-rail)' });
  }
  checkJoinedLandings(value, ctx);
}

/** A joined landing must be a landing of this stair (between two of its flights). */
export function checkJoinedLandings(
  value: { staircase?: { flights?: unknown[] | undefined } | undefined; sensors?: { joinedLandings?: number[] | undefined } | undefined },
  ctx: z.RefinementCtx,
): void {
  const landings = (value.staircase?.flights?.length ?? 1) - 1;
  value.sensors?.joinedLandings?.forEach((landing, i) => {
    if (landing > landings) {
      ctx.addIssue({
        code: 'custom',
        path: ['sensors', 'joinedLandings', i],
        message: landings === 0 ? 'the stair has no landing between flights' : `must be a landing from 1 to ${landings}`,
      });
    }
  });
}

export const treadStripsRequestSchema = z
  .strictObject({ layout: z.literal('tread-strips'), staircase: staircaseSchema, treadStrip: treadStripSchema, ...commonFields })
  .superRefine(crossCheck)
  .meta({ id: 'TreadStripsEstimateRequest', description: 'One CV strip per tread, each tread on its own controller output.' });

export const railPixelsRequestSchema = z
  .strictObject({ layout: z.literal('rail-pixels'), staircase: staircaseSchema.optional(), railPixels: railPixelsSchema, ...commonFields })
  .superRefine(crossCheck)
  .meta({
    id: 'RailPixelsEstimateRequest',
    description: 'An addressable pixel run along a rail or corridor; `staircase` is optional (without it the run is a corridor with a sensor at each end).',
  });

export const treadsAndRailRequestSchema = z
  .strictObject({
    layout: z.literal('treads-and-rail'),
    staircase: staircaseSchema,
    treadStrip: treadStripSchema,
    railPixels: railPixelsSchema,
    ...commonFields,
  })
  .superRefine(crossCheck)
  .meta({ id: 'TreadsAndRailEstimateRequest', description: 'Tread strips and a rail pixel run that moves in step with them (two pixel groups per tread).' });

export const treadPixelsRequestSchema = z
  .strictObject({ layout: z.literal('tread-pixels'), staircase: staircaseSchema, treadPixels: treadPixelsSchema, ...commonFields })
  .superRefine(crossCheck)
  .meta({ id: 'TreadPixelsEstimateRequest', description: 'An addressable segment on every tread, chained in series tread to tread.' });

export const estimateRequestSchema = z
  .discriminatedUnion('layout', [treadStripsRequestSchema, railPixelsRequestSchema, treadsAndRailRequestSchema, treadPixelsRequestSchema])
  .meta({
    id: 'EstimateRequest',
    description:
      'A whole stair or corridor to size. `layout` chooses what is fitted, and the block that layout needs is required: ' +
      '`treadStrip` for tread-strips, `railPixels` for rail-pixels, both for treads-and-rail, `treadPixels` for tread-pixels.',
    example: alderRowTownhouse,
    examples: [alderRowTownhouse, alderRowCornerUnit, quaysideCorridor, harborLaneCheckout, alderRowWithRail, alderRowTreadPixels],
  });

// The layouts' examples are typed by these very schemas, so they join the metadata afterwards.
const layoutExamples: [z.ZodType, unknown][] = [
  [treadStripsRequestSchema, alderRowTownhouse],
  [railPixelsRequestSchema, quaysideCorridor],
  [treadsAndRailRequestSchema, alderRowWithRail],
  [treadPixelsRequestSchema, alderRowTreadPixels],
];
for (const [schema, example] of layoutExamples) z.globalRegistry.add(schema, { ...z.globalRegistry.get(schema), example });

export type EstimateInput = z.output<typeof estimateRequestSchema>;
export type EstimateLayout = EstimateInput['layout'];
export type TreadStripsInput = z.output<typeof treadStripsRequestSchema>;
export type RailPixelsInput = z.output<typeof railPixelsRequestSchema>;
export type TreadsAndRailInput = z.output<typeof treadsAndRailRequestSchema>;
export type TreadPixelsInput = z.output<typeof treadPixelsRequestSchema>;
export type StaircaseInput = z.output<typeof staircaseSchema>;
export type TreadStripInput = z.output<typeof treadStripSchema>;
export type RailPixelsBlock = z.output<typeof railPixelsSchema>;
export type TreadPixelsBlock = z.output<typeof treadPixelsSchema>;

// ---------------------------------------------------------------------------------------------
// Response
// ---------------------------------------------------------------------------------------------

/** Quayside Studio's rail as the estimate reports it (see estimate-examples.ts for the request). */
const quaysideRailRun = {
  run: 'rail',
  pixels: 1080,
  lengthM: 18,
  pixelsPerM: 60,
  voltageV: 5,
  protocol: 'one-wire-800k',
  bitsPerPixel: 24,
  dataOutputs: 2,
  pixelsPerOutput: 540,
  frameTimeUs: 16480,
  maxRefreshHz: 60.68,
  fullWhiteCurrentA: 32.4,
  powerW: 162,
  brightnessPercent: 50,
  currentPerPixelMa: 60,
  currentPerPixelSource: 'default-5v-pixel',
  uncappedCurrentA: 64.8,
  uncappedPowerW: 324,
  sizedForBrightnessPercent: 50,
  feedPoints: 8,
  injectionPoints: 7,
  maxFeedLengthM: 2.5,
  maxFeedCurrentA: 5,
  dataGaps: [
    { kind: 'lead', controller: 1, output: 1, tread: null, lengthM: 0.5, limitM: 2, withinLimit: true },
    { kind: 'lead', controller: 1, output: 2, tread: null, lengthM: 9.5, limitM: 2, withinLimit: false },
  ],
} as const;

/** Stable check ids: other tools are built against them, so ids are added, never renamed. */
export const CHECK_IDS = [
  'output-count',
  'output-current',
  'tread-count-range',
  'controller-input-current',
  'driver-loading',
  'class2-limit',
  'cable-drop',
  'cable-current',
  'cable-run-length',
  'cable-min-size',
  'pixels-per-output',
  'pixels-total',
  'refresh-rate',
  'sensor-type',
  'sensor-current',
  'selv-voltage',
  'strip-fits-tread',
  // Added beyond the contract's list:
  'sensor-supply',
  'rail-grouping',
  'piece-fits-reel',
  'circuit-protection',
  'feeder-derating',
  'pixel-current',
  'brightness-cap',
  'data-line-length',
  'data-logic-level',
  'sensor-inputs',
  'feed-point-current',
  'rail-holds-pixels',
] as const;

export type CheckId = (typeof CHECK_IDS)[number];

const sizeFields = {
  crossSectionMm2: z.number().nullable().optional().meta({ description: 'Conductor size, mm² (metric tables); null when no size of the table passes.' }),
  awg: z.number().nullable().optional().meta({ description: 'Conductor gauge (AWG tables); null when no size passes.' }),
};

export const estimateTreadSchema = z
  .object({
    index: z.int().meta({ description: 'Tread number, 1 = foot.' }),
    stripLengthMm: z.number().meta({ description: 'Strip (or pixel segment) cut for this tread, mm; 0 when none fits.' }),
    pixels: z.int().optional().meta({ description: 'Pixels on this tread (tread-pixels).' }),
    powerW: z.number().meta({ description: 'Power of this tread, W (pixels at full white and the brightness cap).' }),
    currentA: z.number().meta({ description: 'Current of this tread, A.' }),
    controller: z.int().nullable().meta({ description: 'Controller number, from 1; null when no output can take it.' }),
    output: z.int().nullable().meta({ description: 'Output of that controller: CV output (tread strips) or data output (tread pixels).' }),
    cableKind: z
      .enum(['tread-lead', 'chain-lead', 'chain-link', 'data-link'])
      .meta({
        description:
          'tread-lead: controller → tread; chain-lead: controller → first tread of a pixel chain (data); chain-link: previous tread → this one, power and data; data-link: previous tread → this one where power is injected here (data only).',
      }),
    cableLengthM: z.number().meta({ description: 'One-way length of the cable into this tread, service allowance included, m.' }),
    ...sizeFields,
    dropPercent: z.number().meta({ description: 'Voltage drop to this tread’s strip, % (cumulative from the feed point along a pixel chain).' }),
    pathDropPercent: z
      .number()
      .optional()
      .meta({ description: 'Added field: drop from the driver to this tread’s strip, end to end (feeder + lead), %; tread strips.' }),
  })
  .meta({ id: 'EstimateTread', description: 'One row of the wiring schedule.', example: alderRowTownhouseResponse.treads[2] });

export const estimateLandingSchema = z
  .object({
    landing: z.int().meta({ description: 'Landing number: 1 = the landing above flight 1.' }),
    belowTread: z.int().meta({ description: 'The tread just below it; the landing lights after it.' }),
    stripLengthMm: z.number().meta({ description: 'Strip cut for the landing’s front edge, mm; 0 when none fits.' }),
    powerW: z.number(),
    currentA: z.number(),
    controller: z.int().nullable(),
    output: z.int().nullable(),
    cableLengthM: z.number().meta({ description: 'Lead from the controller to the landing, service allowance included, m.' }),
    ...sizeFields,
    dropPercent: z.number(),
  })
  .meta({
    id: 'EstimateLanding',
    description: 'One lit landing of the wiring schedule.',
    example: { landing: 1, belowTread: 7, stripLengthMm: 850, powerW: 8.5, currentA: 0.3542, controller: 1, output: 8, cableLengthM: 0.811, crossSectionMm2: 0.5, dropPercent: 0.239 },
  });

const cvOutputSchema = z
  .object({
    controller: z.int(),
    output: z.int(),
    treads: z.array(z.int()).meta({ description: 'Treads on this output.' }),
    landings: z.array(z.int()).optional().meta({ description: 'Added field: lit landings on this output (1 = the landing above flight 1).' }),
    currentA: z.number(),
    withinLimit: z.boolean().meta({ description: 'currentA ≤ maxCurrentPerOutputA.' }),
  })
  .meta({ id: 'EstimateCvOutput', description: 'One constant-voltage output.', example: alderRowTownhouseResponse.outputs.cv[0] });

const dataOutputSchema = z
  .object({
    controller: z.int(),
    output: z.int().meta({ description: 'The data output of this controller (the first of the row’s range).' }),
    lastOutput: z.int().meta({ description: 'Added field: the last output of the row’s range; equal to `output` for a row of one.' }),
    count: z.int().meta({ description: 'Added field: identical outputs in this row (lastOutput − output + 1), each driving `pixels` pixels.' }),
    run: z.enum(['rail', 'treads']),
    pixels: z.int().meta({ description: 'Pixels on each output of the row.' }),
    firstTread: z.int().nullable(),
    lastTread: z.int().nullable(),
  })
  .meta({
    id: 'EstimateDataOutput',
    description:
      'Pixel data outputs: one row per range of consecutive outputs of one controller that drive the same number of rail pixels (a tread output, which names its treads, is a row of its own). The rows of a controller add up to its outputs in use.',
    example: { controller: 1, output: 1, lastOutput: 2, count: 2, run: 'rail', pixels: 540, firstTread: null, lastTread: null },
  });

export const estimateOutputsSchema = z
  .object({
    controllers: z.int().meta({ description: 'Controllers needed.' }),
    controllerTreads: z
      .array(z.object({ controller: z.int(), firstTread: z.int(), lastTread: z.int(), atTread: z.int(), currentA: z.number() }))
      .meta({ description: 'Block of treads each controller serves, where it sits, and the CV current it passes.' }),
    cvOutputsPerController: z.int(),
    maxCurrentPerOutputA: z.number(),
    maxOutputCurrentA: z.number().meta({ description: 'Current of the busiest CV output, A.' }),
    cv: z.array(cvOutputSchema),
    dataOutputsPerController: z.int(),
    data: z.array(dataOutputSchema).meta({ description: 'Data outputs in use, identical neighbours summarised in one row (see EstimateDataOutput).' }),
  })
  .meta({ id: 'EstimateOutputs', description: 'Controllers and their outputs.', example: alderRowTownhouseResponse.outputs });

export const estimateRailSupplySchema = z
  .object({
    voltageV: z.number(),
    loads: z.array(z.enum(['tread strips', 'rail pixels', 'tread pixels'])),
    loadW: z.number(),
    currentA: z.number(),
    requiredRatingW: z.number(),
    maxLoadingPercent: z.number(),
    drivers: z.array(driverGroupSchema.extend({ sku: z.string().optional() })),
    driverCount: z.int(),
    totalRatingW: z.number(),
    loadingPercent: z.number().nullable(),
    maxSupplyW: z.number().nullable().meta({ description: 'Cap on one supply (Class 2), W.' }),
    circuits: z.int().optional().meta({ description: 'Added field: separate circuits on this voltage, each on its own driver (drivers[].count adds up to it where every circuit has a driver).' }),
    ratingsSource: z.enum(['catalog', 'request', 'default']),
    totalPrice: z.number().optional(),
    inputPowerW: z.number().optional(),
    mainsCurrentA: z.number().optional(),
  })
  .meta({ id: 'EstimateRailSupply', description: 'Drivers for one rail voltage, one per circuit (drivers[].loadW and loadingPercent: the busiest circuit of that rating).', example: alderRowTownhouseResponse.drivers[0] });

export const estimateFeederRunSchema = z
  .object({
    voltageV: z.number(),
    to: z.enum(['controller', 'pixel feed point']),
    controller: z.int().nullable(),
    count: z.int().meta({ description: 'Identical feeders of this kind.' }),
    currentA: z.number().meta({ description: 'Current one feeder carries, A.' }),
    lengthM: z.number(),
    ...sizeFields,
    dropV: z.number(),
    dropPercent: z.number(),
    currentRatingA: z.number().nullable(),
    maxInputCurrentA: z.number().nullable().meta({ description: 'The controller’s maximum input current, when it feeds a controller.' }),
    circuit: z.int().meta({ description: 'Added field: the circuit (and so the one driver) this feeder belongs to; see `circuits`.' }),
    powerInput: z.int().nullable().optional().meta({ description: 'Added field: the controller’s power input this feeder serves, when it has several (drivers.powerInputsPerController).' }),
    feedPoint: z.int().nullable().meta({ description: 'Added field: feed point along the pixel run (1 = its start); null for a controller.' }),
    positionM: z.number().meta({ description: 'Added field: where the controller or feed point is, m along the run.' }),
    alongRunM: z.number().meta({ description: 'Added field: distance along the run from the driver to here, m; lengthM = feeder.lengthM + alongRunM.' }),
    pathDropPercent: z
      .number()
      .meta({ description: 'Added field: end-to-end drop from the driver to the farthest strip behind this feeder (feeder + lead, or feeder + chain links), %.' }),
    fuseA: z.number().nullable().meta({ description: 'Added field: fuse at the driver for this feeder, A (1.25 × I_B ≤ I_n ≤ I_z of the thinnest cable it protects); null when none fits.' }),
    protectedBy: z
      .enum(['driver current limit', 'fuse', 'none'])
      .meta({ description: 'Added field: what keeps the thinnest cable of this feeder within its rating: the driver’s own current limit, the fuse, or nothing (a failed check).' }),
  })
  .meta({ id: 'EstimateFeederRun', description: 'A feeder from a circuit’s driver to one controller or pixel feed point.', example: alderRowTownhouseResponse.feeder.runs[0] });

export const estimateCircuitSchema = z
  .object({
    circuit: z.int().meta({ description: 'Circuit number, from 1.' }),
    name: z.string().meta({ description: 'What the circuit feeds, in words (e.g. “controller 1”, “feed points 1–4 of the rail”).' }),
    voltageV: z.number(),
    loads: z.array(z.enum(['tread strips', 'rail pixels', 'tread pixels'])).meta({ description: 'What the circuit feeds (one driver may feed a controller and rail feed points on the same voltage).' }),
    loadW: z.number(),
    currentA: z.number(),
    driver: z
      .object({
        ratingW: z.number(),
        loadingPercent: z.number(),
        currentLimitA: z.number().meta({ description: 'The driver’s output current limit (drivers.currentLimitPercent of its rated current), A: every cable it can overload is sized or fused for it.' }),
        sku: z.string().optional(),
      })
      .nullable()
      .meta({ description: 'The one driver of this circuit; null when no available rating covers it (a failed check).' }),
    driverPositionM: z.number().meta({ description: 'Where the driver sits, m along the run.' }),
    feeds: z.int().meta({ description: 'Feeders from this driver (one per controller or feed point); see feeder.runs with this circuit number.' }),
    worstPathDropPercent: z.number().meta({ description: 'Worst drop from this driver to a strip, end to end, %.' }),
    fusesA: z.array(z.number().nullable()).meta({ description: 'Fuse per feeder at the driver, A, in feeder order.' }),
    protectedBy: z.enum(['driver current limit', 'fuse', 'none']),
  })
  .meta({
    id: 'EstimateCircuit',
    description:
      'One supply per circuit: a driver and what it alone feeds. Drivers are never paralleled; Class 2 circuits are never interconnected (not even by a shared 0 V along one data chain).',
    example: {
      circuit: 1,
      name: 'controller 1',
      voltageV: 24,
      loads: ['tread strips'],
      loadW: 119,
      currentA: 4.9583,
      driver: { ratingW: 150, loadingPercent: 79.3333, currentLimitA: 9.375 },
      driverPositionM: 2.177,
      feeds: 1,
      worstPathDropPercent: 4.9,
      fusesA: [8],
      protectedBy: 'driver current limit',
    },
  });

export const estimateFeederSchema = z
  .object({
    lengthM: z.number().meta({ description: 'The part of every feeder off the run (cable.feederLengthM), m; each run adds its distance along the run.' }),
    lengthDefaulted: z.boolean(),
    runs: z.array(estimateFeederRunSchema),
  })
  .meta({
    id: 'EstimateFeeder',
    description: 'Feeders from the drivers to each controller (tread strips) and to each pixel feed point.',
    example: alderRowTownhouseResponse.feeder,
  });

export const estimatePixelRunSchema = z
  .object({
    run: z.enum(['rail', 'treads']),
    pixels: z.int(),
    lengthM: z.number().meta({ description: 'Strip length of the run, m.' }),
    pixelsPerM: z.number(),
    voltageV: z.number(),
    protocol: pixelProtocolSchema,
    bitsPerPixel: z.int(),
    dataOutputs: z.int().meta({ description: 'Data outputs (chains) the run uses.' }),
    pixelsPerOutput: z.int().meta({ description: 'Pixels on the busiest output.' }),
    frameTimeUs: z.number(),
    maxRefreshHz: z.number(),
    fullWhiteCurrentA: z.number(),
    powerW: z.number(),
    brightnessPercent: z.number(),
    currentPerPixelMa: z.number().meta({ description: 'Added field: current of one pixel at full white used, mA.' }),
    currentPerPixelSource: z
      .enum(['given', 'strip-power', 'default-5v-pixel', 'default-segment', 'default-strip-power'])
      .meta({ description: 'Added field: where that current came from: the request, its powerWPerM, or a default by channels and voltage.' }),
    uncappedCurrentA: z.number().meta({ description: 'Added field: the run at full white with no brightness cap, A.' }),
    uncappedPowerW: z.number().meta({ description: 'Added field: the run at full white with no brightness cap, W.' }),
    sizedForBrightnessPercent: z.number().meta({ description: 'Added field: brightness the drivers and cables are sized for (100 with sizeForFullWhite).' }),
    feedPoints: z.int().meta({ description: 'Points where power is fed (the first plus injection points).' }),
    injectionPoints: z.int(),
    maxFeedLengthM: z.number(),
    maxFeedCurrentA: z.number().meta({ description: 'Added field: most current one feed point may push into the strip, A (given or the 5 A default).' }),
    chainCableLengthM: z.number().optional().meta({ description: 'Chaining cable between treads in total, m (tread pixels).' }),
    dataGaps: z
      .array(
        z.object({
          kind: z.enum(['lead', 'link']).meta({ description: 'lead: data output → first pixel; link: last pixel of one tread → first of the next.' }),
          controller: z.int().nullable(),
          output: z.int().nullable(),
          tread: z.int().nullable().meta({ description: 'Tread the gap leads into; null on a rail.' }),
          lengthM: z.number(),
          limitM: z.number().meta({ description: 'Longest unbuffered one-wire gap allowed, m.' }),
          withinLimit: z.boolean(),
        }),
      )
      .meta({ description: 'Added field: every data gap of the run, each checked on its own (each pixel regenerates the data).' }),
  })
  .meta({ id: 'EstimatePixelRun', description: 'An addressable run: data timing, power and feed points.', example: quaysideRailRun });

export const estimatePixelsSchema = z
  .object({
    rail: estimatePixelRunSchema.nullable(),
    treads: estimatePixelRunSchema.nullable(),
    railGrouping: z
      .object({ groups: z.int(), pixelsPerGroup: z.int(), pixelsToFit: z.int(), sparePixels: z.int(), fits: z.boolean() })
      .nullable()
      .meta({ description: 'treads-and-rail: two rail groups per tread; the rail is fitted with pixelsToFit pixels.' }),
  })
  .meta({ id: 'EstimatePixels', description: 'Pixel runs; null where the layout has none.', example: { rail: quaysideRailRun, treads: null, railGrouping: null } });

export const estimateReelsResultSchema = z
  .object({
    treads: z
      .object({
        sku: z.string().optional(),
        reels: z.int(),
        reelLengthMm: z.number(),
        plan: z.array(reelCutSchema),
        totalWasteMm: z.number(),
        lowerBoundReels: z.int(),
        provenOptimal: z.boolean(),
        method: z.enum(['exact', 'first-fit-decreasing', 'identical-pieces']),
        unplaceableTreads: z.array(z.int()).meta({ description: 'Treads whose piece is longer than a reel (needs a joint).' }),
      })
      .nullable(),
    rail: z
      .object({ sku: z.string().optional(), reels: z.int(), reelLengthMm: z.number(), lengthM: z.number(), joints: z.int() })
      .nullable()
      .meta({ description: 'A rail run is joined from whole reels.' }),
  })
  .meta({ id: 'EstimateReelsResult', description: 'Reels to buy and how the tread pieces are cut (no joint inside a piece).', example: alderRowTownhouseResponse.reels });

export const estimateCableLineSchema = z
  .object({
    ...sizeFields,
    cores: z.int(),
    use: z.enum(['tread leads', 'feeders', 'chain leads', 'chain links', 'data links']),
    runs: z.int(),
    totalLengthM: z.number(),
    orderLengthM: z.int().meta({ description: 'totalLengthM rounded up to whole metres.' }),
  })
  .meta({ id: 'EstimateCableLine', description: 'Cable of one size and use, summed over its runs.', example: alderRowTownhouseResponse.cables[0] });

export const estimateSensorsResultSchema = z
  .object({
    motionSensors: z.int(),
    placements: z.array(
      z.object({
        role: z.enum(['foot', 'head', 'landing', 'corridor-end', 'side-entrance']),
        flight: z.int().nullable(),
        tread: z.int().nullable(),
        cableLengthM: z.number().optional().meta({ description: 'Added field: sensor cable from the controller to this sensor, m (from the geometry).' }),
      }),
    ),
    sensorCableM: z.number().optional().meta({ description: 'Added field: sensor cable in total, m.' }),
    motion: z
      .object({ outputType: z.enum(['pnp', 'npn']), supplyV: z.number(), currentMa: z.number(), source: z.enum(['request', 'catalog']), sku: z.string().optional() })
      .nullable(),
    controllerInput: z.object({ type: z.enum(['pnp', 'npn']), supplyV: z.number(), maxCurrentMa: z.number(), source: z.enum(['profile', 'typical']) }),
    typeMatch: z.boolean().nullable(),
    needsInterface: z.boolean(),
    supplyMatch: z.boolean().nullable(),
    currentOk: z.boolean().nullable(),
    totalSensorCurrentMa: z.number().nullable(),
    daylightSensors: z.int(),
    daylightCutoffLux: z.number().nullable().meta({ description: 'null when no daylight cut-off is used.' }),
    daylightCutoffDefaulted: z.boolean(),
  })
  .meta({ id: 'EstimateSensorsResult', description: 'Where the motion sensors go and whether they suit the controller input.', example: alderRowTownhouseResponse.sensors });

export const bomLineSchema = z
  .object({
    sku: z.string().optional(),
    category: z.enum([
      'strip',
      'pixel-strip',
      'aluminium-profile',
      'end-caps',
      'driver',
      'fuse',
      'controller',
      'motion-sensor',
      'daylight-sensor',
      'cable',
      // differential data links and level shifters of pixel data lines
      'data-line',
    ]),
    description: z.string(),
    quantity: z.int(),
    unit: z.enum(['reel', 'pcs', 'm', 'pair']),
    unitPrice: z.number().optional(),
    lineTotal: z.number().optional(),
    note: z.string().optional().meta({ description: 'Why a line has no price, or how it was matched.' }),
    missing: z
      .object({
        kind: z.string().meta({ description: 'The catalog kind the line needs.', example: 'driver' }),
        fields: z
          .record(z.string(), z.union([z.string(), z.number(), z.boolean()]))
          .meta({ description: 'The fields an item of that kind must have to fill the line.', example: { voltageV: 24, ratingW: 150 } }),
      })
      .optional()
      .meta({ description: 'With a catalog: the item the catalog lacks for this line (no active item of this kind with these fields).' }),
  })
  .meta({
    id: 'BomLine',
    description: 'One line of the bill of materials.',
    example: { sku: 'HL-S24-10', category: 'strip', description: 'CV strip 24 V 10 W/m, 5 m reel', quantity: 3, unit: 'reel', unitPrice: 39, lineTotal: 117 },
  });

export const cartLineSchema = z
  .object({
    sku: z.string(),
    quantity: z.int(),
    unitPrice: z.number().meta({ description: 'Net price of one unit, major units of `currency`.' }),
  })
  .meta({ id: 'CartLine', description: 'One line a shop’s basket takes: SKU, quantity and net unit price.', example: { sku: 'HL-S24-10', quantity: 3, unitPrice: 39 } });

export const estimatePricingSchema = z
  .object({
    source: z.enum(['inline', 'stored']).meta({ description: '`inline`: the request’s catalog; `stored`: the organisation’s stored catalog.' }),
    catalogVersion: z.int().nullable().meta({ description: 'Version of the stored catalog that priced the estimate; null for an inline catalog.' }),
    currency: z.string(),
    taxRatePercent: z.number(),
    net: z.number().meta({ description: 'Sum of the priced lines, net, computed in integer minor units.' }),
    tax: z.number().meta({ description: 'Tax on the net total, rounded half up to the minor unit.' }),
    gross: z.number().meta({ description: 'net + tax.' }),
    complete: z.boolean().meta({ description: 'false when some lines are not priced (see their `missing` and `note`).' }),
    unpricedLines: z.int(),
  })
  .meta({
    id: 'EstimatePricing',
    description: 'Which catalog priced the estimate, and its totals net, tax and gross.',
    example: { source: 'stored', catalogVersion: 21, currency: 'EUR', taxRatePercent: 20, net: 250.5, tax: 50.1, gross: 300.6, complete: true, unpricedLines: 0 },
  });

export const estimateCheckSchema = z
  .object({
    id: z.enum(CHECK_IDS),
    status: z.enum(['pass', 'warn', 'fail']),
    message: z.string(),
    value: z.union([z.number(), z.string(), z.boolean(), z.null()]),
    limit: z.union([z.number(), z.string(), z.null()]),
    unit: z.string(),
    reference: z.string().meta({ description: 'Published source, or “common practice, no published source”.' }),
    suggestion: z.string().optional().meta({ description: 'What to change; present on every warn and fail.' }),
  })
  .meta({ id: 'EstimateCheck', description: 'One design check against a limit.', example: alderRowTownhouseResponse.checks[4] });

export const cautionSchema = z
  .object({ code: z.string(), message: z.string() })
  .meta({ id: 'Caution', description: 'Safety and scope notes every estimate carries.', example: alderRowTownhouseResponse.cautions[0] });

export const estimateStandbyResultSchema = z
  .object({
    controllerW: z.number().meta({ description: 'Controllers’ own draw, W.' }),
    sensorsW: z.number().meta({ description: 'Motion sensors (their supply × current) and ambient-light sensors, W.' }),
    driversW: z.number().meta({ description: 'Drivers at no load, W (mains side).' }),
    pixelIcsW: z.number().meta({ description: 'Dark pixel ICs, W.' }),
    totalW: z.number().meta({ description: 'Standby power while the stair is dark, W.' }),
    litMinutesPerDay: z.number(),
    litLoadW: z.number().meta({ description: 'Load while lit (brightness cap applied), W.' }),
    standbyKWhPerYear: z.number(),
    litKWhPerYear: z.number(),
    totalKWhPerYear: z.number(),
    defaultsUsed: z.array(z.string()).meta({ description: 'Figures taken from the defaults rather than the request.' }),
  })
  .meta({
    id: 'EstimateStandby',
    description: 'Added field: what the installation draws while dark, and its yearly energy for the stated use.',
    example: {
      controllerW: 0.5,
      sensorsW: 0.13,
      driversW: 0.5,
      pixelIcsW: 0,
      totalW: 1.13,
      litMinutesPerDay: 30,
      litLoadW: 119,
      standbyKWhPerYear: 9.693,
      litKWhPerYear: 21.924,
      totalKWhPerYear: 31.617,
      defaultsUsed: ['controllerW', 'driverNoLoadW', 'darkPixelMa', 'daylightSensorW', 'litMinutesPerDay'],
    },
  });

export const estimateSummarySchema = z
  .object({
    treads: z.int(),
    litTreads: z.int(),
    controllers: z.int(),
    totalLoadW: z.number(),
    driverCount: z.int(),
    longestRunM: z.number().meta({
      description: 'Longest lead from a controller to a tread (tread leads and pixel chain leads, service allowance included), m — the run the 10 m practice limit and the cable-run-length check are about; 0 when the layout has none. Feeders: longestFeederM.',
    }),
    longestFeederM: z.number().optional().meta({ description: 'Added field: longest feeder from a driver to a controller or feed point, m.' }),
    worstDropPercent: z.number().meta({ description: 'Worst drop from a driver to a strip, end to end (feeder + lead or chain links), % — the cable-drop check’s value.' }),
    motionSensors: z.int(),
    reels: z.int(),
    checks: z.object({ pass: z.int(), warn: z.int(), fail: z.int() }),
  })
  .meta({ id: 'EstimateSummary', description: 'Headline numbers at a glance.', example: alderRowTownhouseResponse.summary });

export const estimateResponseSchema = z
  .object({
    engineVersion: engineVersionSchema,
    layout: z.enum(['tread-strips', 'rail-pixels', 'treads-and-rail', 'tread-pixels']),
    summary: estimateSummarySchema,
    treads: z.array(estimateTreadSchema).meta({ description: 'Wiring schedule, foot first; empty for a corridor.' }),
    landings: z.array(estimateLandingSchema).optional().meta({ description: 'Added field: wiring schedule of the lit landings, when the stair has any.' }),
    outputs: estimateOutputsSchema,
    drivers: z.array(estimateRailSupplySchema),
    circuits: z.array(estimateCircuitSchema).meta({ description: 'Added field: one supply per circuit — each circuit’s driver, load, feeders and protection.' }),
    feeder: estimateFeederSchema,
    pixels: estimatePixelsSchema,
    reels: estimateReelsResultSchema,
    cables: z.array(estimateCableLineSchema),
    sensors: estimateSensorsResultSchema,
    bom: z.array(bomLineSchema),
    bomTotal: z.number().optional().meta({ description: 'Sum of the priced lines, computed in integer minor units (with a catalog).' }),
    bomTotalComplete: z.boolean().optional().meta({ description: 'false when some lines have no catalog price.' }),
    currency: z.string().optional(),
    pricing: estimatePricingSchema.optional().meta({ description: 'With a catalog: which one priced the estimate, and the totals net, tax and gross.' }),
    cart: z
      .array(cartLineSchema)
      .optional()
      .meta({ description: 'With a catalog: the priced lines as a shop’s basket takes them (SKU, quantity, net unit price), in `currency`.' }),
    checks: z.array(estimateCheckSchema),
    cautions: z.array(cautionSchema),
    standby: estimateStandbyResultSchema,
    trace: z.array(traceEntrySchema),
  })
  .meta({
    id: 'EstimateResponse',
    description: 'The whole estimate: wiring schedule, outputs, drivers, feeders, pixels, reels, cable, sensors, bill of materials, checks, cautions and trace.',
    example: alderRowTownhouseResponse,
  });

export type EstimateResult = z.output<typeof estimateResponseSchema>;
export type EstimateTread = z.output<typeof estimateTreadSchema>;
export type EstimateLanding = z.output<typeof estimateLandingSchema>;
export type EstimateCheck = z.output<typeof estimateCheckSchema>;
export type EstimateOutputs = z.output<typeof estimateOutputsSchema>;
export type EstimateRailSupply = z.output<typeof estimateRailSupplySchema>;
export type EstimateFeederRun = z.output<typeof estimateFeederRunSchema>;
export type EstimateCircuit = z.output<typeof estimateCircuitSchema>;
export type EstimateStandby = z.output<typeof estimateStandbyResultSchema>;
export type EstimatePixelRun = z.output<typeof estimatePixelRunSchema>;
export type EstimateCableLine = z.output<typeof estimateCableLineSchema>;
export type EstimateSensorsResult = z.output<typeof estimateSensorsResultSchema>;
export type BomLine = z.output<typeof bomLineSchema>;
export type CartLine = z.output<typeof cartLineSchema>;
export type EstimatePricing = z.output<typeof estimatePricingSchema>;
export type Caution = z.output<typeof cautionSchema>;
