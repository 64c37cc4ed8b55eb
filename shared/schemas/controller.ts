import { z } from 'zod';

export const sensorInputSchema = z
  .object({
    type: z.enum(['pnp', 'npn']).meta({
      description: 'Output type the sensor input expects: pnp (sourcing, signal goes high) or npn (sinking).',
    }),
    supplyV: z.number().positive().max(60).meta({ description: 'Voltage the controller supplies to each sensor, V.' }),
    maxCurrentMa: z.number().positive().max(1000).meta({ description: 'Current the controller can give one sensor, mA.' }),
  })
  .meta({
    id: 'SensorInput',
    description: "The controller's motion-sensor input.",
    example: { type: 'pnp', supplyV: 5, maxCurrentMa: 12 },
  });

export const controllerProfileSchema = z
  .object({
    outputs: z.int().min(0).max(512).meta({ description: 'Constant-voltage outputs (channels), one tread each by default.' }),
    maxCurrentPerOutputA: z.number().positive().max(100).meta({ description: 'Largest current one CV output may carry, A.' }),
    dataOutputs: z.int().min(0).max(64).optional().meta({ description: 'Pixel data outputs.' }),
    maxPixelsPerOutput: z.int().min(1).max(100_000).optional().meta({ description: 'Most pixels one data output can drive.' }),
    minTreads: z.int().min(1).max(512).optional().meta({ description: 'Fewest treads the controller supports.' }),
    maxTreads: z.int().min(1).max(512).optional().meta({ description: 'Most treads the controller supports.' }),
    maxInputCurrentA: z.number().positive().max(1000).optional().meta({ description: 'Largest total current into the controller, A.' }),
    sensorInput: sensorInputSchema.optional(),
  })
  .refine((p) => p.minTreads === undefined || p.maxTreads === undefined || p.minTreads <= p.maxTreads, {
    message: 'maxTreads must not be below minTreads',
    path: ['maxTreads'],
  })
  .meta({
    id: 'ControllerProfile',
    description: 'What a stair controller can drive; profiles are data, so any controller can be described.',
    example: {
      outputs: 20,
      maxCurrentPerOutputA: 1.5,
      dataOutputs: 1,
      maxPixelsPerOutput: 800,
      minTreads: 2,
      maxTreads: 20,
      sensorInput: { type: 'pnp', supplyV: 5, maxCurrentMa: 12 },
    },
  });

export type ControllerProfile = z.output<typeof controllerProfileSchema>;
export type SensorInput = z.output<typeof sensorInputSchema>;
