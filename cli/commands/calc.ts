import { Command, Option } from 'commander';
import { z } from 'zod';
import type { components } from '../../openapi/api-types.js';
import { createApiClient, unwrap } from '../api-client.js';
import { CliError, EXIT } from '../errors.js';
import type { CliIo } from '../io.js';
import { apiOptionsSchema, withApiOptions, withExamples } from '../options.js';
import { fields, num, table } from '../style.js';
import { requireKey } from '../target.js';

type Schemas = components['schemas'];
type Warning = Schemas['Warning'];

const number = z.coerce.number({ error: 'must be a number' }).refine(Number.isFinite, 'must be a number');
const integer = number.refine(Number.isInteger, 'must be a whole number');
const numbers = z
  .string()
  .transform((s) => s.split(',').map((p) => Number(p.trim())))
  .refine((values) => values.every(Number.isFinite), 'must be numbers separated by commas, e.g. 60,100,150');
const TABLES = ['iec60228-class5', 'iec60228-class1-2', 'iec60228-class5-tinned', 'awg-solid', 'nec-ch9-t8-stranded'] as const;

/** One flag of a calculation: its commander spelling, the request field it fills, and its check. */
interface Flag {
  flags: string;
  field: string;
  help: string;
  schema: z.ZodType;
  required?: boolean;
}

interface Calculation<Res> {
  name: 'voltage-drop' | 'cable' | 'driver' | 'pixels' | 'reels';
  description: string;
  examples: string[];
  flags: Flag[];
  /** Request fields the flags cannot express one to one. */
  shape?(body: Record<string, unknown>): Record<string, unknown>;
  render(res: Res): string;
  /** A single answer that breaks its limit exits 3, like a failing design check. */
  failed?(res: Res): string | undefined;
}

const warningLines = (warnings: Warning[]) => warnings.map((w) => `  ! ${w.message}`).join('\n');
const withWarnings = (text: string, warnings: Warning[]) => (warnings.length ? `${text}\n\nWarnings\n${warningLines(warnings)}` : text);
const size = (s: { crossSectionMm2: number } | { awg: number }) => ('crossSectionMm2' in s ? `${num(s.crossSectionMm2)} mm²` : `AWG ${s.awg}`);

const supplyFlags: Flag[] = [
  { flags: '--supply-v <V>', field: 'supplyVoltageV', help: 'supply voltage, V DC', schema: number, required: true },
  { flags: '--current-a <A>', field: 'currentA', help: 'load current, A', schema: number, required: true },
  { flags: '--length-m <m>', field: 'lengthM', help: 'one-way cable length, m', schema: number, required: true },
  { flags: '--max-drop-percent <n>', field: 'maxDropPercent', help: 'voltage drop limit, % (default 5)', schema: number },
  { flags: '--table <id>', field: 'conductorTable', help: `conductor table: ${TABLES.join(' | ')}`, schema: z.enum(TABLES) },
  { flags: '--temperature-c <C>', field: 'temperatureC', help: 'conductor temperature, °C', schema: number },
  { flags: '--uniform', field: 'loadDistribution', help: 'load spread along the run (a strip) instead of at its end', schema: z.boolean() },
];
const uniformLoad = (body: Record<string, unknown>): Record<string, unknown> => ({ ...body, loadDistribution: body.loadDistribution ? 'uniform' : undefined });

const voltageDrop: Calculation<Schemas['VoltageDropResponse']> = {
  name: 'voltage-drop',
  description: 'voltage drop along a two-wire DC run (POST /v1/calculations/voltage-drop); exit 3 over the limit',
  examples: ['treadwise calc voltage-drop --supply-v 24 --current-a 4 --length-m 10 --mm2 0.75', 'treadwise calc voltage-drop --supply-v 12 --current-a 2 --length-m 5 --awg 18 --json'],
  flags: [
    ...supplyFlags,
    { flags: '--mm2 <mm2>', field: 'crossSectionMm2', help: 'conductor cross-section, mm² (or --awg)', schema: number },
    { flags: '--awg <n>', field: 'awg', help: 'conductor size, AWG (or --mm2)', schema: integer },
  ],
  shape(body) {
    const { crossSectionMm2, awg, ...rest } = uniformLoad(body);
    if ((crossSectionMm2 === undefined) === (awg === undefined)) throw new CliError('give the conductor as --mm2 <mm²> or --awg <n> (one of them)', EXIT.usage);
    return { ...rest, conductor: crossSectionMm2 !== undefined ? { crossSectionMm2 } : { awg } };
  },
  render: (r) =>
    withWarnings(
      fields([
        ['Drop', `${num(r.dropV, 3)} V (${num(r.dropPercent)} %), limit ${num(r.maxDropPercent)} % — ${r.withinLimit ? 'within' : 'OVER the limit'}`],
        ['At the load', `${num(r.voltageAtLoadV, 3)} V`],
        ['Resistance', `${num(r.resistanceOhmPerKm, 3)} Ω/km, loop ${num(r.loopResistanceOhm, 4)} Ω (${r.conductorTable}, ${num(r.temperatureC, 1)} °C, load at ${r.loadDistribution})`],
        ['Rating', `${num(r.currentRatingA, 1)} A`],
      ]),
      r.warnings,
    ),
  failed: (r) => (r.withinLimit ? undefined : `the drop ${num(r.dropPercent)} % is over the ${num(r.maxDropPercent)} % limit`),
};

const cable: Calculation<Schemas['CableResponse']> = {
  name: 'cable',
  description: 'the smallest cable that keeps the drop in limit and carries the current (POST /v1/calculations/cable)',
  examples: ['treadwise calc cable --supply-v 24 --current-a 4 --length-m 12', 'treadwise calc cable --supply-v 12 --current-a 3 --length-m 8 --table awg-solid --max-drop-percent 3'],
  flags: [...supplyFlags, { flags: '--min-mm2 <mm2>', field: 'minCrossSectionMm2', help: 'smallest size to consider, mm² (default 0.5)', schema: number }],
  shape: uniformLoad,
  render: (r) =>
    withWarnings(
      `${fields([
        ['Recommended', r.recommended ? `${size(r.recommended)}: drop ${num(r.dropV, 3)} V (${num(r.dropPercent)} %), rated ${num(r.currentRatingA, 1)} A` : 'none of the table’s sizes passes'],
        ['Limit', `${num(r.maxDropPercent)} % drop (${r.conductorTable}, ${num(r.temperatureC, 1)} °C)`],
      ])}\n\n${table(
        ['size', 'drop V', 'drop %', 'rating A', 'fits'],
        r.alternatives.map((a) => [size(a), num(a.dropV, 3), num(a.dropPercent), num(a.currentRatingA, 1), a.withinLimit && a.carriesCurrent && a.meetsMinimum ? 'yes' : 'no']),
        [1, 2, 3],
      )}`,
      r.warnings,
    ),
  failed: (r) => (r.recommended ? undefined : 'no cable size keeps the drop within the limit and carries the current'),
};

const driver: Calculation<Schemas['DriverResponse']> = {
  name: 'driver',
  description: 'LED drivers for a load with headroom (POST /v1/calculations/driver)',
  examples: ['treadwise calc driver --load-w 119 --output-v 24', 'treadwise calc driver --load-w 300 --output-v 24 --class2 --ratings 60,100'],
  flags: [
    { flags: '--load-w <W>', field: 'loadW', help: 'load, W', schema: number, required: true },
    { flags: '--output-v <V>', field: 'outputVoltageV', help: 'driver output voltage, V', schema: number, required: true },
    { flags: '--max-loading-percent <n>', field: 'maxLoadingPercent', help: 'load each driver to at most this %, default 80', schema: number },
    { flags: '--ratings <list>', field: 'availableRatingsW', help: 'ratings to choose from, W, e.g. 60,100,150', schema: numbers },
    { flags: '--max-supply-va <VA>', field: 'maxSupplyVA', help: 'cap on each supply, VA', schema: number },
    { flags: '--class2', field: 'class2', help: 'cap each supply at its Class 2 limit', schema: z.boolean() },
    { flags: '--efficiency-percent <n>', field: 'efficiencyPercent', help: 'driver efficiency, % (gives the mains input)', schema: number },
    { flags: '--mains-v <V>', field: 'mainsVoltageV', help: 'mains voltage, V AC (default 230)', schema: number },
    { flags: '--power-factor <pf>', field: 'powerFactor', help: 'input power factor (default 0.9)', schema: number },
  ],
  render: (r) =>
    withWarnings(
      fields([
        ['Required', `${num(r.requiredRatingW, 1)} W at ≤ ${num(r.maxLoadingPercent)} % loading`],
        ['Drivers', r.drivers.map((d) => `${d.count} × ${num(d.ratingW, 0)} W (${num(d.loadW, 1)} W each, ${num(d.loadingPercent, 1)} %)`).join(', ') || 'none fits'],
        ['Total', `${num(r.totalRatingW, 0)} W in ${r.circuits} circuit(s)${r.maxSupplyW !== null ? `, each supply ≤ ${num(r.maxSupplyW, 0)} W` : ''}`],
        ...(r.inputPowerW !== undefined ? ([['Mains', `${num(r.inputPowerW, 1)} W input, ${num(r.mainsCurrentA, 2)} A`]] as [string, string][]) : []),
      ]),
      r.warnings,
    ),
  failed: (r) => (r.drivers.length ? undefined : 'no driver rating fits the load'),
};

const pixels: Calculation<Schemas['PixelsResponse']> = {
  name: 'pixels',
  description: 'refresh rate, data outputs and current of a pixel run (POST /v1/calculations/pixels)',
  examples: ['treadwise calc pixels --pixels 1080 --protocol one-wire-800k', 'treadwise calc pixels --pixels 600 --protocol clocked --clock-hz 4000000 --supply-v 5'],
  flags: [
    { flags: '--pixels <n>', field: 'pixels', help: 'pixels in the run', schema: integer, required: true },
    { flags: '--protocol <p>', field: 'protocol', help: 'one-wire-800k | one-wire-400k | clocked', schema: z.enum(['one-wire-800k', 'one-wire-400k', 'clocked']), required: true },
    { flags: '--bits-per-pixel <n>', field: 'bitsPerPixel', help: '24 (RGB) or 32 (RGBW)', schema: z.coerce.number().pipe(z.union([z.literal(24), z.literal(32)], { error: 'must be 24 or 32' })) },
    { flags: '--reset-us <us>', field: 'resetUs', help: 'latch time after each frame, µs', schema: number },
    { flags: '--clock-hz <Hz>', field: 'clockHz', help: 'clock rate of a clocked strip', schema: number },
    { flags: '--max-pixels-per-output <n>', field: 'maxPixelsPerOutput', help: 'pixels one controller output may drive', schema: integer },
    { flags: '--current-per-pixel-ma <mA>', field: 'currentPerPixelMa', help: 'current of one pixel at full white', schema: number },
    { flags: '--supply-v <V>', field: 'supplyVoltageV', help: 'strip voltage (default 5)', schema: number },
    { flags: '--brightness-percent <n>', field: 'brightnessPercent', help: 'brightness cap, %', schema: number },
  ],
  render: (r) =>
    withWarnings(
      fields([
        ['Frame', `${num(r.frameTimeUs, 1)} µs (${r.bitsPerFrame} bits) → ${num(r.maxRefreshHz, 1)} Hz at most`],
        ['Outputs', `${r.outputsNeeded} data output(s) of ${r.pixelsPerOutput} pixels`],
        ['Full white', `${num(r.fullWhiteCurrentA)} A, ${num(r.powerW, 1)} W (${num(r.currentPerPixelMa)} mA per pixel)`],
      ]),
      r.warnings,
    ),
};

const reels: Calculation<Schemas['ReelsResponse']> = {
  name: 'reels',
  description: 'cut pieces from as few reels as possible (POST /v1/calculations/reels)',
  examples: ['treadwise calc reels 850x14 --reel-length-mm 5000', 'treadwise calc reels 1150 900 900 850x4 --cut-pitch-mm 50'],
  flags: [
    { flags: '--reel-length-mm <mm>', field: 'reelLengthMm', help: 'reel length, mm (default 5000)', schema: number },
    { flags: '--cut-pitch-mm <mm>', field: 'cutPitchMm', help: 'cut pitch, mm', schema: number },
  ],
  render: (r) =>
    withWarnings(
      `${fields([
        ['Reels', `${r.reels} of ${num(r.reelLengthMm, 0)} mm (lower bound ${r.lowerBoundReels}${r.provenOptimal ? ', proven optimal' : ''}; ${r.method})`],
        ['Waste', `${num(r.totalWasteMm, 0)} mm`],
      ])}\n\n${table(['reel', 'pieces mm', 'waste mm'], r.plan.map((c) => [String(c.reel), c.piecesMm.map((p) => num(p, 0)).join(' + '), num(c.wasteMm, 0)]), [0, 2])}`,
      r.warnings,
    ),
};

/** `850x14` is fourteen pieces of 850 mm. */
function pieces(args: string[]): number[] {
  const out: number[] = [];
  for (const arg of args) {
    const m = /^(\d+(?:\.\d+)?)(?:x(\d+))?$/.exec(arg.trim());
    if (!m) throw new CliError(`piece "${arg}" is not a length in mm (e.g. 850, or 850x14 for fourteen of them)`, EXIT.usage);
    const count = m[2] ? Number(m[2]) : 1;
    if (count > 1000) throw new CliError(`piece "${arg}": at most 1000 of one length`, EXIT.usage);
    for (let i = 0; i < count; i++) out.push(Number(m[1]));
  }
  return out;
}

function calculationCommand<Res>(io: CliIo, calc: Calculation<Res>): Command {
  const command = new Command(calc.name).description(calc.description);
  if (calc.name === 'reels') command.argument('<pieces...>', 'piece lengths, mm; 850x14 means fourteen of 850');
  for (const flag of calc.flags) command.addOption(new Option(flag.flags, flag.help).makeOptionMandatory(Boolean(flag.required)));
  withExamples(withApiOptions(command), ...calc.examples);
  return command.action(async (...args: unknown[]) => {
    const raw = (calc.name === 'reels' ? args[1] : args[0]) as Record<string, unknown>;
    const opts = apiOptionsSchema.parse({ apiUrl: raw.apiUrl, apiKey: raw.apiKey, json: raw.json, color: raw.color });
    // Checked under the flags' own names, so an error names what the user typed.
    const checked = z.object(Object.fromEntries(calc.flags.map((f) => [new Option(f.flags).attributeName(), f.schema.optional()]))).parse(raw) as Record<string, unknown>;
    let body: Record<string, unknown> = Object.fromEntries(calc.flags.map((f) => [f.field, checked[new Option(f.flags).attributeName()]]));
    if (calc.name === 'reels') body.piecesMm = pieces(args[0] as string[]);
    if (calc.shape) body = calc.shape(body);
    body = Object.fromEntries(Object.entries(body).filter(([, v]) => v !== undefined));

    const api = createApiClient(io, requireKey(io, opts));
    const result = (await unwrap(api.POST(`/v1/calculations/${calc.name}`, { body: body as never }))) as Res;
    io.out(opts.json ? JSON.stringify(result) : calc.render(result));
    const failure = calc.failed?.(result);
    if (failure) throw new CliError(failure, EXIT.checksFailed);
  });
}

export function calcCommand(io: CliIo): Command {
  const command = new Command('calc').description('quick single answers: voltage-drop | cable | driver | pixels | reels');
  withExamples(command, 'treadwise calc cable --supply-v 24 --current-a 4 --length-m 12', 'treadwise calc reels 850x14');
  for (const calc of [voltageDrop, cable, driver, pixels, reels] as Calculation<unknown>[]) command.addCommand(calculationCommand(io, calc));
  return command;
}
