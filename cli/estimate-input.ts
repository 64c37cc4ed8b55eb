import { z } from 'zod';

const LAYOUTS = ['tread-strips', 'rail-pixels', 'treads-and-rail', 'tread-pixels'] as const;
const PROTOCOLS = ['one-wire-800k', 'one-wire-400k', 'clocked'] as const;

const number = z.coerce.number({ error: 'must be a number' }).refine(Number.isFinite, 'must be a number');
const integer = z.coerce.number({ error: 'must be a whole number' }).int('must be a whole number');
const list = z
  .string()
  .transform((s) => s.split(',').map((part) => Number(part.trim())))
  .refine((values) => values.every((v) => Number.isInteger(v) && v > 0), 'must be whole numbers separated by commas, e.g. 7,8');

/** The estimate flags, raw from commander (strings), checked before any request is built. */
export const estimateFlagsSchema = z.object({
  layout: z.enum(LAYOUTS).optional(),
  treads: integer.optional(),
  treadWidthMm: number.optional(),
  riserMm: number.optional(),
  goingMm: number.optional(),
  flights: list.optional(),
  voltage: number.optional(),
  railVoltage: number.optional(),
  wattsPerM: number.optional(),
  cutPitchMm: number.optional(),
  pixelsPerM: number.optional(),
  protocol: z.enum(PROTOCOLS).optional(),
  railLengthM: number.optional(),
  profileId: z.string().min(1).optional(),
  position: z.union([z.enum(['bottom', 'top', 'middle']), integer]).optional(),
  maxDropPercent: number.optional(),
  class2: z.boolean().optional(),
  storedCatalog: z.boolean().optional(),
  profiles: z.boolean().optional(),
});
export type EstimateFlags = z.output<typeof estimateFlagsSchema>;

/**
 * The request fields the flags give, shaped like the API's request so they can be laid over a
 * file. Blocks a layout does not use are left out (the API refuses unknown blocks).
 */
export function requestFromFlags(flags: EstimateFlags, fileLayout: unknown): Record<string, unknown> {
  const layout = flags.layout ?? (typeof fileLayout === 'string' ? fileLayout : 'tread-strips');
  const usesStrip = layout === 'tread-strips' || layout === 'treads-and-rail';
  const usesRail = layout === 'rail-pixels' || layout === 'treads-and-rail';
  const usesTreadPixels = layout === 'tread-pixels';
  const pixels = { pixelsPerM: flags.pixelsPerM, protocol: flags.protocol };

  const request: Record<string, unknown> = {
    layout,
    staircase: {
      treads: flags.treads,
      treadWidthMm: flags.treadWidthMm,
      riserHeightMm: flags.riserMm,
      goingMm: flags.goingMm,
      flights: flags.flights?.map((treads) => ({ treads })),
    },
    controller: {
      profileId: flags.profileId,
      position: typeof flags.position === 'number' ? { tread: flags.position } : flags.position,
    },
    cable: { maxDropPercent: flags.maxDropPercent },
    drivers: { class2: flags.class2 },
    useStoredCatalog: flags.storedCatalog === false ? false : undefined,
    profiles: flags.profiles,
  };
  if (usesStrip) request.treadStrip = { voltageV: flags.voltage, powerWPerM: flags.wattsPerM, cutPitchMm: flags.cutPitchMm };
  if (usesRail) request.railPixels = { lengthM: flags.railLengthM, voltageV: layout === 'rail-pixels' ? (flags.railVoltage ?? flags.voltage) : flags.railVoltage, ...pixels };
  if (usesTreadPixels) request.treadPixels = { voltageV: flags.voltage, cutPitchMm: flags.cutPitchMm, ...pixels };
  return prune(request) ?? {};
}

/** Drops undefined values and the objects left empty by them. */
function prune(value: Record<string, unknown>): Record<string, unknown> | undefined {
  const out: Record<string, unknown> = {};
  for (const [key, v] of Object.entries(value)) {
    const kept = v !== null && typeof v === 'object' && !Array.isArray(v) ? prune(v as Record<string, unknown>) : v;
    if (kept !== undefined) out[key] = kept;
  }
  return Object.keys(out).length ? out : undefined;
}
