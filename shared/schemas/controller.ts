import { z } from 'zod';
import { MAX_CV_OUTPUTS_PER_CONTROLLER, MAX_DATA_OUTPUTS_PER_CONTROLLER, MAX_PIXELS_PER_DATA_OUTPUT, MAX_TREADS, MIN_PIXELS_PER_DATA_OUTPUT } from '../tables/limits.js';

export const sensorInputSchema = z
  .strictObject({
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
  .strictObject({
    outputs: z.int().min(0).max(MAX_CV_OUTPUTS_PER_CONTROLLER).meta({ description: `Constant-voltage outputs (channels), one tread each by default (at most ${MAX_CV_OUTPUTS_PER_CONTROLLER}).` }),
    maxCurrentPerOutputA: z.number().positive().max(100).meta({ description: 'Largest current one CV output may carry, A.' }),
    dataOutputs: z.int().min(0).max(MAX_DATA_OUTPUTS_PER_CONTROLLER).optional().meta({ description: `Pixel data outputs (at most ${MAX_DATA_OUTPUTS_PER_CONTROLLER}).` }),
    maxPixelsPerOutput: z
      .int()
      .min(MIN_PIXELS_PER_DATA_OUTPUT)
      .max(MAX_PIXELS_PER_DATA_OUTPUT)
      .optional()
      .meta({ description: `Most pixels one data output can drive (${MIN_PIXELS_PER_DATA_OUTPUT} to ${MAX_PIXELS_PER_DATA_OUTPUT}).` }),
    minTreads: z.int().min(1).max(MAX_TREADS).optional().meta({ description: 'Fewest treads the controller supports.' }),
    maxTreads: z.int().min(1).max(MAX_TREADS).optional().meta({ description: 'Most treads the controller supports.' }),
    maxInputCurrentA: z.number().positive().max(1000).optional().meta({ description: 'Largest total current into the controller, A.' }),
    sensorInput: sensorInputSchema.optional(),
    // Added for issue 8 (data lines, sensors):
    dataLogicV: z
      .number()
      .positive()
      .max(24)
      .optional()
      .meta({ description: 'Added field: logic-high voltage of the data outputs, V (e.g. 3.3 or 5). A pixel reads high from 0.7 × its VDD, so 3.3 V on 5 V pixels needs a level shifter.' }),
    maxDataLeadM: z
      .number()
      .min(0.1)
      .max(1000)
      .optional()
      .meta({
        description: 'Added field: longest unbuffered data lead from a data output to the first pixel, m. Default 2 (one-wire data kept to about 1–2 m, from memory); a built-in buffer or differential output allows more.',
        default: 2,
      }),
    sensorInputs: z
      .int()
      .min(0)
      .max(64)
      .optional()
      .meta({ description: 'Added field: motion-sensor inputs on one controller. Default 2 (foot and head; common practice, from memory).', default: 2 }),
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
