import { z } from 'zod';
import { MAX_CURRENT_PER_PIXEL_MA, MAX_PIXELS_PER_DATA_OUTPUT, MAX_PIXELS_PER_RUN } from '../tables/limits.js';
import { engineVersionSchema, traceEntrySchema, warningSchema } from './common.js';

export const pixelProtocolSchema = z.enum(['one-wire-800k', 'one-wire-400k', 'clocked']).meta({
  id: 'PixelProtocol',
  description: 'one-wire NRZ at 800 or 400 kbit/s, or two-wire data + clock.',
});

export const pixelsRequestSchema = z
  .strictObject({
    pixels: z.int().min(1).max(MAX_PIXELS_PER_RUN).meta({ description: `Pixels (driver ICs) on the run (at most ${MAX_PIXELS_PER_RUN}).` }),
    protocol: pixelProtocolSchema,
    bitsPerPixel: z
      .literal([24, 32])
      .optional()
      // `type` and `enum` spelt out: the OpenAPI generator renders a multi-value literal with its first value only.
      .meta({ description: 'One-wire bits per pixel: 24 for RGB, 32 for RGBW. Ignored for clocked.', default: 24, type: 'integer', enum: [24, 32] }),
    resetUs: z
      .number()
      .min(0)
      .max(10_000)
      .optional()
      .meta({
        description: 'Latch time after each frame, µs: the one-wire reset (default 280); for clocked parts that latch on a pause rather than on the end frame, the pause (default 0).',
        default: 280,
      }),
    clockHz: z
      .number()
      .min(1_000)
      .max(50_000_000)
      .optional()
      .meta({ description: 'Clock rate of a clocked (data + clock) run, Hz.', default: 1_000_000 }),
    maxPixelsPerOutput: z
      .int()
      .min(1)
      .max(MAX_PIXELS_PER_DATA_OUTPUT)
      .optional()
      .meta({ description: `Most pixels one data output drives (the controller's limit; at most ${MAX_PIXELS_PER_DATA_OUTPUT}).` }),
    currentPerPixelMa: z
      .number()
      .min(0)
      .max(MAX_CURRENT_PER_PIXEL_MA)
      .optional()
      .meta({
        description:
          'Current of one pixel at full white, mA. Default by channels and voltage: 60 for a 5 V RGB pixel, 80 for 5 V RGBW (32 bits), 60 / 80 per 12 V or 24 V segment (all from memory); a warning says when it was assumed.',
        default: 60,
      }),
    supplyVoltageV: z.number().positive().max(60).optional().meta({ description: 'Strip supply voltage, V.', default: 5 }),
    brightnessPercent: z
      .number()
      .min(0)
      .max(100)
      .optional()
      .meta({ description: 'Brightness cap; current scales linearly with it.', default: 100 }),
  })
  .meta({
    id: 'PixelsRequest',
    description: 'Data timing, outputs and full-white power of an addressable pixel run.',
    // Quayside Studio: 18 m corridor rail at 60 pixels/m on a controller output of 800 pixels.
    example: { pixels: 1080, protocol: 'one-wire-800k', maxPixelsPerOutput: 800, supplyVoltageV: 5, brightnessPercent: 50 },
  });

export const pixelsResponseSchema = z
  .object({
    frameTimeUs: z.number().meta({ description: 'Time to send one frame to the pixels of one output, µs.' }),
    maxRefreshHz: z.number().meta({ description: 'Highest frame rate the data line allows, Hz.' }),
    bitsPerFrame: z.int().meta({ description: 'Bits sent per frame on one output (clocked frames included).' }),
    outputsNeeded: z.int().meta({ description: 'Data outputs needed for the per-output limit.' }),
    pixelsPerOutput: z.int().meta({ description: 'Pixels on the busiest output after an even split.' }),
    fullWhiteCurrentA: z.number().meta({ description: 'Current of the whole run at full white and the brightness cap, A.' }),
    powerW: z.number().meta({ description: 'Power at the supply voltage, W.' }),
    currentPerPixelMa: z.number().meta({ description: 'Added field: current of one pixel at full white used, mA (given or the default).' }),
    uncappedCurrentA: z.number().meta({ description: 'Added field: current at full white with no brightness cap, A.' }),
    uncappedPowerW: z.number().meta({ description: 'Added field: power at full white with no brightness cap, W: what the supply sees if the cap is not enforced.' }),
    warnings: z.array(warningSchema),
    engineVersion: engineVersionSchema,
    trace: z.array(traceEntrySchema),
  })
  .meta({
    id: 'PixelsResponse',
    description: 'Frame time, refresh rate, data outputs and power of a pixel run.',
    example: {
      frameTimeUs: 16480,
      maxRefreshHz: 60.68,
      bitsPerFrame: 12960,
      outputsNeeded: 2,
      pixelsPerOutput: 540,
      fullWhiteCurrentA: 32.4,
      powerW: 162,
      currentPerPixelMa: 60,
      uncappedCurrentA: 64.8,
      uncappedPowerW: 324,
      warnings: [{ code: 'high_current', message: 'The run draws 32.4 A at full white; feed it at several points.' }],
      engineVersion: '1.0.0',
      trace: [
        {
          quantity: 'frameTimeUs',
          value: 16480,
          unit: 'µs',
          formula: 'pixels × bitsPerPixel × bitTimeUs + resetUs',
          inputs: { pixels: 540, bitsPerPixel: 24, bitTimeUs: 1.25, resetUs: 280 },
          reference: 'WS2812B datasheet: 1.25 µs per bit at 800 kbit/s, reset ≥ 280 µs',
        },
      ],
    },
  });

export type PixelProtocol = z.output<typeof pixelProtocolSchema>;
export type PixelsInput = z.output<typeof pixelsRequestSchema>;
export type PixelsResult = z.output<typeof pixelsResponseSchema>;
