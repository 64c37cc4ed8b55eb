import { Command } from 'commander';
import { createApiClient, unwrap } from '../api-client.js';
import { CliError, EXIT } from '../errors.js';
import { estimateFlagsSchema, requestFromFlags } from '../estimate-input.js';
import { estimateReport, hasFailingCheck } from '../estimate-report.js';
import { deepMerge, readDocument } from '../input-file.js';
import type { CliIo } from '../io.js';
import { apiOptionsSchema, withApiOptions, withExamples } from '../options.js';
import { painter } from '../style.js';
import { requireKey } from '../target.js';

export function estimateCommand(io: CliIo): Command {
  const command = new Command('estimate')
    .description('size a whole stair or corridor (POST /v1/estimates); exit code 3 when a design check fails')
    .argument('[file]', 'estimate request as JSON or YAML; - reads stdin. Flags override its fields')
    .option('--layout <layout>', 'tread-strips | rail-pixels | treads-and-rail | tread-pixels (default: the file’s, else tread-strips)')
    .option('--treads <n>', 'treads in the stair')
    .option('--tread-width-mm <mm>', 'tread width')
    .option('--riser-mm <mm>', 'riser height')
    .option('--going-mm <mm>', 'going (tread depth)')
    .option('--flights <list>', 'treads per flight, foot first, e.g. 7,8')
    .option('--voltage <V>', 'strip voltage (tread strip, tread pixels, or the rail for rail-pixels)')
    .option('--rail-voltage <V>', 'rail pixel voltage (treads-and-rail)')
    .option('--watts-per-m <W>', 'tread strip power per metre, W/m')
    .option('--cut-pitch-mm <mm>', 'cut pitch of the tread strip or pixels')
    .option('--pixels-per-m <n>', 'pixels per metre (rail or tread pixels)')
    .option('--protocol <protocol>', 'one-wire-800k | one-wire-400k | clocked')
    .option('--rail-length-m <m>', 'length of the rail pixel run')
    .option('--profile-id <id>', 'controller profile id or SKU from the catalog')
    .option('--position <where>', 'controller position: bottom | top | middle | a tread number')
    .option('--max-drop-percent <n>', 'end-to-end voltage drop limit, % (default 5)')
    .option('--class2', 'cap every supply at its Class 2 limit')
    .option('--no-stored-catalog', 'do not price from the organisation’s stored catalog')
    .option('--profiles', 'add aluminium profiles and end caps to the BOM');
  withExamples(
    withApiOptions(command),
    'treadwise estimate stair.yaml',
    'treadwise estimate --treads 14 --tread-width-mm 900 --riser-mm 185 --going-mm 250 --voltage 24 --watts-per-m 10 --cut-pitch-mm 50 --profile-id HL-K20',
    'cat stair.json | treadwise estimate - --class2 --json > estimate.json',
  );
  return command.action(async (file: string | undefined, raw: Record<string, unknown>) => {
    const opts = apiOptionsSchema.parse({ apiUrl: raw.apiUrl, apiKey: raw.apiKey, json: raw.json, color: raw.color });
    const flags = estimateFlagsSchema.parse({ ...raw, apiUrl: undefined, apiKey: undefined, json: undefined, color: undefined });
    const fromFlags = Object.values(flags).some((v) => v !== undefined && v !== true);
    if (!file && !fromFlags) throw new CliError('give a request file (or - for stdin) or the stair as flags; see treadwise estimate --help', EXIT.usage);

    const document = file ? await readDocument(io, file) : {};
    if (typeof document !== 'object' || document === null || Array.isArray(document)) throw new CliError(`${file === '-' ? 'stdin' : file} must hold one estimate request (an object)`, EXIT.usage);
    const fileLayout = (document as { layout?: unknown }).layout;
    const body = deepMerge(document, requestFromFlags(flags, fileLayout));

    const api = createApiClient(io, requireKey(io, opts));
    // The API validates the body (strict schemas) and answers field errors we print as one line.
    const estimate = await unwrap(api.POST('/v1/estimates', { body: body as never }));
    io.out(opts.json ? JSON.stringify(estimate) : estimateReport(estimate, painter(io, opts)));
    if (hasFailingCheck(estimate)) throw new CliError(`${estimate.summary.checks.fail} design check(s) failed: change the design before buying parts`, EXIT.checksFailed);
  });
}
