import { z } from 'zod';
import { CONDUCTOR_TABLE_IDS } from '../tables/conductors.js';
import { defaultTableFor, findConductor, type ConductorSize } from '../tables/conductors.js';
import { SizingInputError } from '../tables/errors.js';

/** Pieces the voltage-drop and cable schemas share. */

export const conductorTableSchema = z.enum(CONDUCTOR_TABLE_IDS).meta({
  id: 'ConductorTableId',
  description:
    'Resistance table: IEC 60228 class 5 / class 1-2 / class 5 tinned (mm², 20 °C), ASTM B258 solid AWG (20 °C) or NEC Chapter 9 Table 8 stranded AWG (75 °C).',
  example: 'iec60228-class5',
});

export const metricConductorSchema = z.strictObject({
  crossSectionMm2: z.number().positive().max(1000).meta({ description: 'Nominal cross-section of one conductor, mm².', example: 0.75 }),
});

export const awgConductorSchema = z.strictObject({
  awg: z.int().min(0).max(40).meta({ description: 'American Wire Gauge, 0 (meaning 1/0) to 40.', example: 18 }),
});

export const conductorSizeSchema = z.union([metricConductorSchema, awgConductorSchema]).meta({
  id: 'ConductorSize',
  description: 'One conductor of the two-wire run, either by mm² or by AWG.',
  example: { crossSectionMm2: 0.75 },
});

export const supplyVoltageSchema = z.number().min(1).max(1000).meta({
  description: 'DC voltage at the source end of the run, V.',
  example: 24,
});

export const currentSchema = z.number().positive().max(1000).meta({
  description: 'Current the run carries, A.',
  example: 0.354,
});

export const lengthSchema = z.number().positive().max(1000).meta({
  description: 'One-way run length, m (the two-wire loop is twice this).',
  example: 2.68,
});

export const temperatureSchema = z.number().min(-50).max(150).meta({
  description: 'Conductor temperature, °C. Default: the table’s reference (20 °C; 75 °C for NEC Table 8).',
  example: 20,
});

export const maxDropPercentSchema = z.number().min(0.1).max(50).meta({
  description:
    'Drop limit, % of the supply voltage. Default 5: common practice, no standard gives a limit for LED strip runs (IEC 60364-5-52 Table G.52.1 gives 3 % / 6 % for lighting circuits).',
  example: 5,
  default: 5,
});

export const loadDistributionSchema = z.enum(['end', 'uniform']).meta({
  id: 'LoadDistribution',
  description: '"end": the whole load at the far end (default). "uniform": spread evenly along the run, fed from one end, which halves the drop.',
  example: 'end',
});

/**
 * Turns the engine's conductor check into a zod issue, so a 400 names the field
 * (`conductorTable` for a mismatched system, `conductor.crossSectionMm2` / `conductor.awg`
 * for a size the table lacks).
 */
export function checkConductorInTable(
  value: { conductor: ConductorSize; conductorTable?: (typeof CONDUCTOR_TABLE_IDS)[number] | undefined },
  ctx: z.RefinementCtx,
): void {
  try {
    findConductor(value.conductorTable ?? defaultTableFor(value.conductor), value.conductor);
  } catch (error) {
    if (!(error instanceof SizingInputError)) throw error;
    ctx.addIssue({ code: 'custom', path: error.path, message: error.message });
  }
}
