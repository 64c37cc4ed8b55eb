import { z } from 'zod';
import { DEFAULT_OPTION_DESIGNS, MAX_OPTION_CANDIDATES, MAX_OPTION_DESIGNS, MAX_OPTION_SKUS, MAX_OPTION_VOLTAGES } from '../tables/option-limits.js';
import { catalogSchema } from './catalog.js';
import { engineVersionSchema, traceEntrySchema } from './common.js';
import {
  cautionSchema,
  cartLineSchema,
  estimateCableSchema,
  estimateDriversSchema,
  estimatePricingSchema,
  estimateReelsSchema,
  estimateSensorsSchema,
  estimateStandbySchema,
  estimateSummarySchema,
  staircaseSchema,
  treadStripsRequestSchema,
} from './estimate.js';
import { alderRowStair, harborLaneCatalog, hlM05Motion } from './estimate-examples.js';

// ---------------------------------------------------------------------------------------------
// Request: POST /v1/estimates/options
// ---------------------------------------------------------------------------------------------

/** Where a part sits along the stair; the same three words for the controller and the drivers. */
export const OPTION_POSITIONS = ['bottom', 'middle', 'top'] as const;
export type OptionPosition = (typeof OPTION_POSITIONS)[number];

const sku = z.string().min(1).max(64);

const uniquePositions = z
  .array(z.enum(OPTION_POSITIONS))
  .min(1)
  .max(OPTION_POSITIONS.length)
  .refine((list) => new Set(list).size === list.length, 'list each position once');

export const kitConstraintsSchema = z
  .strictObject({
    stripSkus: z
      .array(sku)
      .min(1)
      .max(MAX_OPTION_SKUS)
      .optional()
      .meta({ description: `Only these strips (a strip family, a colour temperature the shop sells under these SKUs). At most ${MAX_OPTION_SKUS}. Default: every active strip of the catalog.` }),
    voltagesV: z
      .array(z.number().positive().max(400))
      .min(1)
      .max(MAX_OPTION_VOLTAGES)
      .optional()
      .meta({ description: 'Only strips of these voltages, V DC.' }),
    colourTemperatureK: z
      .int()
      .min(1000)
      .max(20_000)
      .optional()
      .meta({ description: 'Only strips of this colour temperature, K (catalog strips that state `colourTemperatureK`).', example: 3000 }),
    minPowerWPerM: z.number().positive().max(200).optional().meta({ description: 'Only strips of at least this power per metre, W/m.' }),
    maxPowerWPerM: z.number().positive().max(200).optional().meta({ description: 'Only strips of at most this power per metre, W/m.' }),
    controllerSkus: z
      .array(sku)
      .min(1)
      .max(MAX_OPTION_SKUS)
      .optional()
      .meta({ description: 'Only these controllers. Default: every active controller of the catalog with constant-voltage outputs.' }),
    controllerPositions: uniquePositions.optional().meta({
      description: 'Where the controller may sit: bottom (tread 1), middle (⌈n/2⌉) or top (tread n). Default: all three.',
      example: ['bottom', 'middle'],
    }),
    driverPositions: uniquePositions.optional().meta({
      description:
        'Where the drivers may sit along the stringer: bottom (beside tread 1), top (beside the last tread) or middle (midway between the farthest feeds). Ignored when drivers.positionsM is given. Default: all three.',
    }),
  })
  .refine((c) => c.minPowerWPerM === undefined || c.maxPowerWPerM === undefined || c.minPowerWPerM <= c.maxPowerWPerM, {
    message: 'maxPowerWPerM must not be below minPowerWPerM',
    path: ['maxPowerWPerM'],
  })
  .meta({
    id: 'KitConstraints',
    description: 'What the shopper has chosen already; every choice left open is searched over the catalog.',
    example: { voltagesV: [24], controllerPositions: ['bottom', 'middle'] },
  });

export const kitBudgetSchema = z
  .strictObject({
    maxTotal: z.number().positive().max(10_000_000).meta({ description: 'Most the kit may cost, in the catalog currency.' }),
    basis: z
      .enum(['gross', 'net'])
      .optional()
      .meta({ description: 'gross: tax included (what the shopper pays); net: before tax. Default gross.', default: 'gross' }),
  })
  .meta({ id: 'KitBudget', description: 'A cap on the kit’s price: designs above it are counted in overBudget, not listed.', example: { maxTotal: 400, basis: 'gross' } });

export const kitOptionsRequestSchema = z
  .strictObject({
    layout: z.literal('tread-strips').meta({ description: 'What is fitted. Kit options size one constant-voltage strip per tread.' }),
    staircase: staircaseSchema,
    endClearanceMm: z.number().min(0).max(500).optional().meta({ description: 'Gap left at each end of the tread, mm. Default 20 (common practice).', default: 20 }),
    constraints: kitConstraintsSchema.optional(),
    budget: kitBudgetSchema.optional(),
    limit: z
      .int()
      .min(1)
      .max(MAX_OPTION_DESIGNS)
      .optional()
      .meta({ description: `Designs to answer, cheapest first (at most ${MAX_OPTION_DESIGNS}). Default ${DEFAULT_OPTION_DESIGNS}.`, default: DEFAULT_OPTION_DESIGNS }),
    cable: estimateCableSchema.optional(),
    drivers: estimateDriversSchema.optional(),
    sensors: estimateSensorsSchema.optional(),
    reels: estimateReelsSchema.optional(),
    profiles: z.boolean().optional().meta({ description: 'true: add aluminium profile bars and end caps to every kit. Default false.', default: false }),
    standby: estimateStandbySchema.optional(),
    catalog: catalogSchema
      .optional()
      .meta({ description: 'An inline catalog to build the kits from. Default: the organisation’s stored catalog (its active items).' }),
  })
  .superRefine((value, ctx) => {
    // As the estimate request checks it: a joined landing must be a landing of this stair.
    const landings = (value.staircase.flights?.length ?? 1) - 1;
    value.sensors?.joinedLandings?.forEach((landing, i) => {
      if (landing > landings) {
        ctx.addIssue({
          code: 'custom',
          path: ['sensors', 'joinedLandings', i],
          message: landings === 0 ? 'the stair has no landing between flights' : `must be a landing from 1 to ${landings}`,
        });
      }
    });
  })
  .meta({
    id: 'KitOptionsRequest',
    description:
      'A stair and the shopper’s constraints. Every compatible choice of the catalog — strip, controller, controller position, driver position — is sized as a full estimate; the cheapest designs that pass every check are answered.',
  });

export type KitOptionsInput = z.output<typeof kitOptionsRequestSchema>;
export type KitConstraints = z.output<typeof kitConstraintsSchema>;

// ---------------------------------------------------------------------------------------------
// Response
// ---------------------------------------------------------------------------------------------

export const kitChoicesSchema = z
  .object({
    stripSku: z.string(),
    voltageV: z.number(),
    powerWPerM: z.number(),
    cutPitchMm: z.number(),
    controllerSku: z.string(),
    controllerPosition: z.enum(OPTION_POSITIONS),
    driverPosition: z.enum([...OPTION_POSITIONS, 'given']).meta({ description: '`given`: the request fixed drivers.positionsM.' }),
  })
  .meta({
    id: 'KitChoices',
    description: 'What makes this design: the strip, the controller and where the controller and the drivers sit.',
    example: { stripSku: 'HL-S24-10', voltageV: 24, powerWPerM: 10, cutPitchMm: 50, controllerSku: 'HL-K20', controllerPosition: 'middle', driverPosition: 'middle' },
  });

export const kitDesignSchema = z
  .object({
    rank: z.int().meta({ description: '1 = cheapest.' }),
    choices: kitChoicesSchema,
    pricing: estimatePricingSchema,
    summary: estimateSummarySchema,
    cart: z.array(cartLineSchema).meta({ description: 'The priced lines as a shop’s basket takes them.' }),
    fillable: z.boolean().meta({ description: 'true when the catalog holds an active item for every line; false when some line names a `missing` part (such kits rank after the fillable ones).' }),
    unpriced: z
      .array(
        z.object({
          category: z.string(),
          description: z.string(),
          quantity: z.int(),
          note: z.string().optional(),
          missing: z
            .object({ kind: z.string(), fields: z.record(z.string(), z.union([z.string(), z.number(), z.boolean()])) })
            .optional()
            .meta({ description: 'The item the catalog lacks for this line: its kind and fields.' }),
        }),
      )
      .meta({ description: 'Lines the catalog does not price (no active item fits, or it has no price): they are not in the total.' }),
    warnings: z
      .array(z.object({ id: z.string(), message: z.string(), suggestion: z.string().optional() }))
      .meta({ description: 'The checks of this design that warn (none fails).' }),
    // The body that sizes this design in full with POST /v1/estimates (a $ref to that request).
    estimateRequest: treadStripsRequestSchema,
  })
  .meta({
    id: 'KitDesign',
    description:
      'One design that passes every check, with its price and cart. `estimateRequest` is the body that sizes it in full with POST /v1/estimates (send the inline catalog again if the options were priced from one).',
  });

export const kitOptionsResponseSchema = z
  .object({
    engineVersion: engineVersionSchema,
    layout: z.literal('tread-strips'),
    currency: z.string(),
    rankedBy: z.string().meta({ description: 'How the designs are ordered.' }),
    designs: z.array(kitDesignSchema),
    possible: z.int().meta({ description: 'Candidates the catalog and constraints allow (after pruning).' }),
    candidates: z.int().meta({ description: `Candidates sized (at most ${MAX_OPTION_CANDIDATES}).` }),
    capped: z.boolean().meta({ description: `true when possible > ${MAX_OPTION_CANDIDATES}: the candidates with the cheapest parts were sized, the rest not. Narrow the constraints to search them all.` }),
    passed: z.int().meta({ description: 'Candidates with no failing check, within the budget.' }),
    failed: z.int().meta({ description: 'Candidates with at least one failing check.' }),
    overBudget: z.int().meta({ description: 'Candidates that pass every check but cost more than the budget.' }),
    failuresByCheck: z.record(z.string(), z.int()).meta({ description: 'For each check id, how many candidates it failed.', example: { 'output-current': 9 } }),
    pruned: z
      .array(z.object({ sku: z.string(), kind: z.enum(['strip', 'controller']), reason: z.string() }))
      .meta({ description: 'Catalog items left out before sizing, and why.' }),
    cautions: z
      .array(cautionSchema)
      .meta({ description: 'The safety and scope notes of the listed designs (each once): mains work, overloaded drivers, hot cables — local codes and licensed practice prevail.' }),
    pricingSource: z.enum(['inline', 'stored']),
    catalogVersion: z.int().nullable(),
    trace: z.array(traceEntrySchema),
  })
  .meta({ id: 'KitOptionsResponse', description: 'The cheapest designs that pass every check, and what the others failed on.' });

export type KitOptionsResult = z.output<typeof kitOptionsResponseSchema>;
export type KitDesign = z.output<typeof kitDesignSchema>;
export type KitChoices = z.output<typeof kitChoicesSchema>;

// ---------------------------------------------------------------------------------------------
// Examples (the invented demo scenario)
// ---------------------------------------------------------------------------------------------

/** Harbor Lane's product page: three kits for the Alder Row stair from the shop's catalog, at most €450 with tax. */
export const harborLaneKitOptions = {
  layout: 'tread-strips',
  staircase: alderRowStair,
  sensors: { motion: hlM05Motion },
  budget: { maxTotal: 450, basis: 'gross' },
  catalog: { ...harborLaneCatalog, taxRatePercent: 20 },
} as const;

/** The same stair from the stored catalog, 24 V strip only, the controller at the foot or midway. */
export const alderRowKitOptions = {
  layout: 'tread-strips',
  staircase: alderRowStair,
  constraints: { voltagesV: [24], controllerPositions: ['bottom', 'middle'] },
  limit: 5,
} as const;

z.globalRegistry.add(kitOptionsRequestSchema, {
  ...z.globalRegistry.get(kitOptionsRequestSchema),
  example: harborLaneKitOptions,
  examples: [harborLaneKitOptions, alderRowKitOptions],
});
