import { z } from 'zod';
import { engineVersionSchema, traceEntrySchema, warningSchema } from './common.js';
import {
  awgConductorSchema,
  conductorSizeSchema,
  conductorTableSchema,
  currentSchema,
  lengthSchema,
  loadDistributionSchema,
  maxDropPercentSchema,
  metricConductorSchema,
  supplyVoltageSchema,
  temperatureSchema,
} from './conductor.js';

export const minCrossSectionSchema = z.number().positive().max(100).meta({
  description:
    'Never recommend a thinner conductor, mm² (for an AWG table the gauge’s ASTM B258 area is compared). Default 0.5: common practice, no published source.',
  example: 0.5,
  default: 0.5,
});

export const cableRequestSchema = z
  .strictObject({
    supplyVoltageV: supplyVoltageSchema,
    currentA: currentSchema,
    lengthM: lengthSchema,
    maxDropPercent: maxDropPercentSchema.optional(),
    conductorTable: conductorTableSchema.optional().meta({ description: 'Table to choose from. Default iec60228-class5.' }),
    minCrossSectionMm2: minCrossSectionSchema.optional(),
    temperatureC: temperatureSchema.optional(),
    loadDistribution: loadDistributionSchema.optional(),
  })
  .meta({
    id: 'CableRequest',
    description:
      'Choose the smallest standard conductor of a table that keeps the drop within the limit and carries the current.',
    // Farthest tread of a 14-tread flight from a mid-flight controller: 850 mm of 24 V 10 W/m strip.
    example: { supplyVoltageV: 24, currentA: 0.354, lengthM: 2.68, maxDropPercent: 5 },
  });

const alternativeFields = {
  areaMm2: z.number().meta({ description: 'Cross-section, mm² (ASTM B258 area for a gauge).' }),
  dropV: z.number().meta({ description: 'Drop with this size, V.' }),
  dropPercent: z.number().meta({ description: 'Drop with this size, % of the supply voltage.' }),
  currentRatingA: z.number().meta({ description: 'Current rating of this size, A.' }),
  withinLimit: z.boolean().meta({ description: 'Drop within maxDropPercent.' }),
  carriesCurrent: z.boolean().meta({ description: 'currentA ≤ currentRatingA.' }),
  meetsMinimum: z.boolean().meta({ description: 'Not thinner than minCrossSectionMm2.' }),
};

export const cableAlternativeSchema = z
  .union([metricConductorSchema.extend(alternativeFields), awgConductorSchema.extend(alternativeFields)])
  .meta({ id: 'CableAlternative', description: 'One standard size of the table, checked against the run.' });

export const cableResponseSchema = z
  .object({
    recommended: conductorSizeSchema.nullable().meta({ description: 'Smallest size that passes every check; null when none does.' }),
    dropV: z.number().nullable().meta({ description: 'Drop with the recommended size, V.' }),
    dropPercent: z.number().nullable().meta({ description: 'Drop with the recommended size, %.' }),
    currentRatingA: z.number().nullable().meta({ description: 'Current rating of the recommended size, A.' }),
    conductorTable: conductorTableSchema,
    temperatureC: z.number().meta({ description: 'Conductor temperature used, °C.' }),
    maxDropPercent: z.number().meta({ description: 'The limit applied, %.' }),
    minCrossSectionMm2: z.number().meta({ description: 'The minimum applied, mm².' }),
    alternatives: z.array(cableAlternativeSchema).meta({ description: 'Every size of the table, ascending.' }),
    warnings: z.array(warningSchema),
    engineVersion: engineVersionSchema,
    trace: z.array(traceEntrySchema),
  })
  .meta({
    id: 'CableResponse',
    description: 'The recommended conductor and every alternative with its drop and rating.',
    example: {
      recommended: { crossSectionMm2: 0.5 },
      dropV: 0.074,
      dropPercent: 0.3083,
      currentRatingA: 3,
      conductorTable: 'iec60228-class5',
      temperatureC: 20,
      maxDropPercent: 5,
      minCrossSectionMm2: 0.5,
      alternatives: [
        { crossSectionMm2: 0.5, areaMm2: 0.5, dropV: 0.074, dropPercent: 0.3083, currentRatingA: 3, withinLimit: true, carriesCurrent: true, meetsMinimum: true },
        { crossSectionMm2: 0.75, areaMm2: 0.75, dropV: 0.0493, dropPercent: 0.2056, currentRatingA: 6, withinLimit: true, carriesCurrent: true, meetsMinimum: true },
      ],
      warnings: [],
      engineVersion: '2.1.0',
      trace: [
        {
          quantity: 'recommended',
          value: '0.5 mm²',
          unit: '',
          formula: 'smallest size with area ≥ minimum, Vd ≤ limit and I ≤ rating',
          inputs: { minCrossSectionMm2: 0.5, maxDropPercent: 5, currentA: 0.354 },
          reference: 'IEC 60364-5-52 Annex G, two-wire DC loop (cos φ = 1)',
        },
      ],
    },
  });

export type CableInput = z.output<typeof cableRequestSchema>;
export type CableResult = z.output<typeof cableResponseSchema>;
export type CableAlternative = z.output<typeof cableAlternativeSchema>;
