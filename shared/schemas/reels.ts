import { z } from 'zod';
import { MAX_REEL_PIECES } from '../tables/limits.js';
import { cutLengthMm, DEFAULT_REEL_LENGTH_MM, usableReelMm } from '../tables/cut-lengths.js';
import { engineVersionSchema, traceEntrySchema, warningSchema } from './common.js';

export const reelsRequestSchema = z
  .strictObject({
    piecesMm: z
      .array(z.number().min(1).max(100_000))
      .min(1)
      .max(MAX_REEL_PIECES)
      .meta({ description: `Length of each piece to cut, mm, in the order of the treads (tread 1 first); at most ${MAX_REEL_PIECES} pieces.` }),
    reelLengthMm: z.number().min(100).max(1_000_000).optional().meta({ description: 'Length of one reel, mm.', default: DEFAULT_REEL_LENGTH_MM }),
    cutPitchMm: z
      .number()
      .min(1)
      .max(1_000)
      .optional()
      .meta({ description: 'Cut pitch, mm: each piece is cut at the last mark within its length (shortened to whole pitches, never longer than the space measured).' }),
  })
  .superRefine((value, ctx) => {
    const reel = value.reelLengthMm ?? DEFAULT_REEL_LENGTH_MM;
    if (value.cutPitchMm !== undefined && value.cutPitchMm > reel) {
      ctx.addIssue({ code: 'custom', path: ['cutPitchMm'], message: 'The cut pitch is longer than the reel.' });
      return;
    }
    const usable = usableReelMm(reel, value.cutPitchMm);
    value.piecesMm.forEach((piece, i) => {
      if (value.cutPitchMm !== undefined && cutLengthMm(piece, value.cutPitchMm) <= 0) {
        ctx.addIssue({ code: 'custom', path: ['piecesMm', i], message: `A ${piece} mm piece is shorter than one ${value.cutPitchMm} mm cut pitch: no strip can be cut for it.` });
      } else if (cutLengthMm(piece, value.cutPitchMm) > usable) {
        ctx.addIssue({
          code: 'custom',
          path: ['piecesMm', i],
          message: `A ${piece} mm piece does not fit a ${usable} mm reel without a joint.`,
        });
      }
    });
  })
  .meta({
    id: 'ReelsRequest',
    description: 'Tread pieces to cut from strip reels without joints.',
    // Alder Row townhouse: 14 treads of 850 mm strip (900 mm tread) with a 50 mm cut pitch.
    example: { piecesMm: Array.from({ length: 14 }, () => 850), reelLengthMm: 5000, cutPitchMm: 50 },
  });

export const reelCutSchema = z
  .object({
    reel: z.int().meta({ description: 'Reel number, from 1.' }),
    piecesMm: z.array(z.number()).meta({ description: 'Pieces cut from this reel, mm, as cut (whole pitches within each measured length).' }),
    pieceIndexes: z.array(z.int()).meta({ description: 'Positions of these pieces in the request list, from 0.' }),
    wasteMm: z.number().meta({ description: 'Reel length left over, mm.' }),
  })
  .meta({ id: 'ReelCut', description: 'The pieces cut from one reel.' });

export const reelsResponseSchema = z
  .object({
    reels: z.int().meta({ description: 'Reels needed.' }),
    plan: z.array(reelCutSchema),
    totalWasteMm: z.number().meta({ description: 'Strip left over on all reels, mm.' }),
    lowerBoundReels: z.int().meta({ description: 'ceil(Σ pieces / usable reel length): no plan can use fewer.' }),
    provenOptimal: z.boolean().meta({ description: 'No plan uses fewer reels.' }),
    method: z.enum(['exact', 'first-fit-decreasing', 'identical-pieces']).meta({
      description: 'exact search up to 12 pieces, first-fit decreasing beyond, or the closed form for equal pieces.',
    }),
    reelLengthMm: z.number().meta({ description: 'Reel length used, mm.' }),
    usableReelLengthMm: z.number().meta({ description: 'Reel length usable at whole cut pitches, mm.' }),
    warnings: z.array(warningSchema),
    engineVersion: engineVersionSchema,
    trace: z.array(traceEntrySchema),
  })
  .meta({
    id: 'ReelsResponse',
    description: 'How many reels the pieces need and which piece comes from which reel.',
    example: {
      reels: 3,
      plan: [
        { reel: 1, piecesMm: [850, 850, 850, 850, 850], pieceIndexes: [0, 1, 2, 3, 4], wasteMm: 750 },
        { reel: 2, piecesMm: [850, 850, 850, 850, 850], pieceIndexes: [5, 6, 7, 8, 9], wasteMm: 750 },
        { reel: 3, piecesMm: [850, 850, 850, 850], pieceIndexes: [10, 11, 12, 13], wasteMm: 1600 },
      ],
      totalWasteMm: 3100,
      lowerBoundReels: 3,
      provenOptimal: true,
      method: 'identical-pieces',
      reelLengthMm: 5000,
      usableReelLengthMm: 5000,
      warnings: [],
      engineVersion: '1.0.0',
      trace: [
        {
          quantity: 'reels',
          value: 3,
          unit: 'reels',
          formula: 'equal pieces: ceil(pieces / floor(usable reel / piece))',
          inputs: { pieces: 14, reelLengthMm: 5000, cutPitchMm: 50 },
          reference: 'one-dimensional cutting stock without joints',
        },
      ],
    },
  });

export type ReelsInput = z.output<typeof reelsRequestSchema>;
export type ReelsResult = z.output<typeof reelsResponseSchema>;
export type ReelCutResult = z.output<typeof reelCutSchema>;
