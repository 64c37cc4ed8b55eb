import { z } from 'zod';
import { engineVersionSchema, traceEntrySchema, warningSchema } from './common.js';

export const driverRequestSchema = z
  .strictObject({
    loadW: z.number().positive().max(100_000).meta({ description: 'Total DC load the drivers feed, W.', example: 119 }),
    outputVoltageV: z.number().min(1).max(1000).meta({ description: 'Constant-voltage output of the drivers, V DC.', example: 24 }),
    maxLoadingPercent: z.number().min(10).max(100).optional().meta({
      description: 'Load each driver to at most this % of its rating. Default 80: common practice (the NEC 125 % continuous-load rule is the same figure).',
      example: 80,
      default: 80,
    }),
    availableRatingsW: z
      .array(z.number().min(1).max(100_000))
      .min(1)
      .max(16)
      .optional()
      .meta({
        description: 'Driver ratings to choose from, W; mixing ratings is allowed. Default 30, 60, 100, 150, 200, 240, 320, 480.',
        example: [60, 100, 150, 240],
      }),
    maxSupplyVA: z.number().min(1).max(100_000).optional().meta({
      description: 'Cap on each supply’s rating, VA (= W on the DC side); larger ratings are not used.',
      example: 100,
    }),
    class2: z.boolean().optional().meta({
      description:
        'Cap each supply by the NEC Chapter 9 Table 11(B) Class 2 limit for its maximum output voltage (≤ 20 V: 5 × Vmax VA and 5 A; 20–60 V: 100 VA). Class 2 supplies are never paralleled or interconnected: each covers its own circuit.',
      example: false,
    }),
    maxOutputVoltageV: z.number().min(1).max(1000).optional().meta({
      description: 'Added field: the supply’s maximum output voltage (Vmax, e.g. with its adjustment turned up), V; the Class 2 limit follows Vmax, not the nominal. Default: outputVoltageV.',
      example: 24,
    }),
    efficiencyPercent: z.number().min(10).max(100).optional().meta({
      description: 'Driver efficiency, %. When given, the mains input power and current are reported.',
      example: 90,
    }),
    mainsVoltageV: z.number().min(50).max(1000).optional().meta({ description: 'Mains voltage, V AC. Default 230.', example: 230, default: 230 }),
    powerFactor: z.number().min(0.1).max(1).optional().meta({ description: 'Driver input power factor. Default 0.9 (assumed).', example: 0.9, default: 0.9 }),
  })
  .meta({
    id: 'DriverRequest',
    description:
      'Choose LED drivers (constant-voltage power supplies) for a load, one supply per circuit: drivers are never paralleled. When no single available rating covers load / loading (or the Class 2 / maxSupplyVA cap rules it out), the load is split evenly into the fewest separate circuits, each on its own driver of the smallest (or cheapest) rating that covers it.',
    // 14 treads × 850 mm of 24 V 10 W/m strip = 119 W, from a shop's 24 V driver range.
    example: { loadW: 119, outputVoltageV: 24, availableRatingsW: [60, 100, 150, 240] },
  });

export const driverGroupSchema = z
  .object({
    ratingW: z.number().meta({ description: 'Rating of each driver in this group, W.' }),
    count: z.int().meta({
      description: 'How many separate circuits get a driver of this rating: each driver feeds its own circuit; drivers are never paralleled, so count is never a number of units sharing one load.',
    }),
    loadW: z.number().meta({ description: 'Load of the circuit each of these drivers feeds (the largest, where circuits differ), W.' }),
    loadingPercent: z.number().meta({ description: 'loadW / ratingW, %.' }),
  })
  .meta({ id: 'DriverGroup', description: 'Drivers of one rating, one per circuit.' });

export const driverResponseSchema = z
  .object({
    requiredRatingW: z.number().meta({ description: 'loadW / (maxLoadingPercent / 100), W.' }),
    maxLoadingPercent: z.number().meta({ description: 'The loading limit applied, %.' }),
    drivers: z.array(driverGroupSchema).meta({ description: 'The chosen drivers, largest rating first; empty when no rating is usable.' }),
    driverCount: z.int().meta({ description: 'Number of drivers in total (= circuits).' }),
    circuits: z.int().meta({ description: 'Separate circuits the load must be wired as, each on its own driver; 1 when one driver covers it.' }),
    circuitLoadW: z.number().nullable().meta({ description: 'Load of each circuit, W (loadW / circuits); null when no rating is usable.' }),
    totalRatingW: z.number().meta({ description: 'Sum of the chosen ratings, W.' }),
    loadingPercent: z.number().nullable().meta({ description: 'circuitLoadW / ratingW, % (the same for every circuit).' }),
    maxSupplyW: z.number().nullable().meta({ description: 'Cap on one supply from class2 and maxSupplyVA, W; null when uncapped.' }),
    unusableRatingsW: z.array(z.number()).meta({ description: 'Available ratings above the cap, not used.' }),
    totalPrice: z.number().optional().meta({ description: 'Total price of the drivers, when prices were given (catalog use).' }),
    inputPowerW: z.number().optional().meta({ description: 'loadW / efficiency, W (when efficiencyPercent is given).' }),
    mainsCurrentA: z.number().optional().meta({ description: 'inputPowerW / (mainsVoltageV × powerFactor), A.' }),
    warnings: z.array(warningSchema),
    engineVersion: engineVersionSchema,
    trace: z.array(traceEntrySchema),
  })
  .meta({
    id: 'DriverResponse',
    description: 'The circuits and the driver for each, its loading and, with an efficiency, the mains side.',
    example: {
      requiredRatingW: 148.75,
      maxLoadingPercent: 80,
      drivers: [{ ratingW: 150, count: 1, loadW: 119, loadingPercent: 79.3333 }],
      driverCount: 1,
      circuits: 1,
      circuitLoadW: 119,
      totalRatingW: 150,
      loadingPercent: 79.3333,
      maxSupplyW: null,
      unusableRatingsW: [],
      warnings: [],
      engineVersion: '2.1.0',
      trace: [
        {
          quantity: 'requiredRatingW',
          value: 148.75,
          unit: 'W',
          formula: 'P_load / (maxLoadingPercent / 100)',
          inputs: { loadW: 119, maxLoadingPercent: 80 },
          reference: 'common practice, no published source (80 % loading); closest published rule NEC 210.19(A)(1) / 215.2(A)(1): 125 % of a continuous load',
        },
      ],
    },
  });

export type DriverInput = z.output<typeof driverRequestSchema>;
export type DriverResult = z.output<typeof driverResponseSchema>;
export type DriverGroup = z.output<typeof driverGroupSchema>;
