import { z } from 'zod';
import { engineVersionSchema, traceEntrySchema, warningSchema } from './common.js';
import {
  checkConductorInTable,
  conductorSizeSchema,
  conductorTableSchema,
  currentSchema,
  lengthSchema,
  loadDistributionSchema,
  maxDropPercentSchema,
  supplyVoltageSchema,
  temperatureSchema,
} from './conductor.js';

export const voltageDropRequestSchema = z
  .strictObject({
    supplyVoltageV: supplyVoltageSchema,
    currentA: currentSchema,
    lengthM: lengthSchema,
    conductor: conductorSizeSchema,
    conductorTable: conductorTableSchema.optional(),
    temperatureC: temperatureSchema.optional(),
    loadDistribution: loadDistributionSchema.optional(),
    maxDropPercent: maxDropPercentSchema.optional(),
  })
  .superRefine(checkConductorInTable)
  .meta({
    id: 'VoltageDropRequest',
    description:
      'Drop along a two-wire DC run. conductorTable defaults to iec60228-class5 for crossSectionMm2 and awg-solid for awg; a size the table lacks, or a system that does not match it, is a 400.',
    // Farthest tread of a 14-tread flight from a mid-flight controller: 850 mm of 24 V 10 W/m strip.
    example: { supplyVoltageV: 24, currentA: 0.354, lengthM: 2.68, conductor: { crossSectionMm2: 0.5 } },
  });

export const voltageDropResponseSchema = z
  .object({
    resistanceOhmPerKm: z.number().meta({ description: 'One conductor at temperatureC, Ω/km.' }),
    loopResistanceOhm: z.number().meta({ description: 'Both conductors over the run, Ω.' }),
    dropV: z.number().meta({ description: 'Voltage lost in the cable (at the far end for a uniform load), V.' }),
    dropPercent: z.number().meta({ description: 'dropV as % of supplyVoltageV.' }),
    voltageAtLoadV: z.number().meta({ description: 'supplyVoltageV − dropV; 0 when the drop is not less than the supply (warning `drop_exceeds_supply`, withinLimit false): no voltage reaches the load.' }),
    maxDropPercent: z.number().meta({ description: 'The limit applied (given or the default 5).' }),
    withinLimit: z.boolean().meta({ description: 'dropPercent ≤ maxDropPercent.' }),
    conductorTable: conductorTableSchema,
    temperatureC: z.number().meta({ description: 'Conductor temperature used, °C.' }),
    loadDistribution: loadDistributionSchema,
    currentRatingA: z.number().meta({ description: 'Current rating of the conductor (see the trace for its source), A.' }),
    warnings: z.array(warningSchema),
    engineVersion: engineVersionSchema,
    trace: z.array(traceEntrySchema),
  })
  .meta({
    id: 'VoltageDropResponse',
    description: 'Drop, percent and limit check; the trace names the formula and source of each number.',
    example: {
      resistanceOhmPerKm: 39,
      loopResistanceOhm: 0.20904,
      dropV: 0.074,
      dropPercent: 0.3083,
      voltageAtLoadV: 23.926,
      maxDropPercent: 5,
      withinLimit: true,
      conductorTable: 'iec60228-class5',
      temperatureC: 20,
      loadDistribution: 'end',
      currentRatingA: 3,
      warnings: [],
      engineVersion: '2.1.0',
      trace: [
        {
          quantity: 'dropV',
          value: 0.074,
          unit: 'V',
          formula: 'Vd = 2 · L · I · R′',
          inputs: { lengthM: 2.68, currentA: 0.354, resistanceOhmPerM: 0.039 },
          reference: 'IEC 60364-5-52 Annex G, two-wire DC loop (cos φ = 1)',
        },
      ],
    },
  });

export type VoltageDropInput = z.output<typeof voltageDropRequestSchema>;
export type VoltageDropResult = z.output<typeof voltageDropResponseSchema>;
