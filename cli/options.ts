import { Command } from 'commander';
import { z } from 'zod';

export const DEFAULT_API_URL = 'http://localhost:3000';

const apiUrlSchema = z.url({ protocol: /^https?$/, error: 'must be an http(s) URL' });

/** Options every command that talks to the API shares (raw commander values go through zod). */
export const apiOptionsSchema = z.object({
  apiUrl: apiUrlSchema.optional(),
  apiKey: z.string().min(1, 'must not be empty').optional(),
  json: z.boolean().default(false),
  color: z.boolean().default(true),
});
export type ApiOptions = z.output<typeof apiOptionsSchema>;

export { apiUrlSchema };

/** Adds --api-url, --api-key, --json and --no-color to a command. */
export function withApiOptions(command: Command): Command {
  return command
    .option('--api-url <url>', 'base URL of the Treadwise API (env TREADWISE_API_URL; else the login)')
    .option('--api-key <key>', 'API key (env TREADWISE_API_KEY; else the login)')
    .option('--json', 'print the result as JSON')
    .option('--no-color', 'plain output without colour (also NO_COLOR)');
}

/** The command's help ends with examples, indented like commander's own sections. */
export function withExamples(command: Command, ...examples: string[]): Command {
  return command.addHelpText('after', `\nExamples:\n${examples.map((e) => `  $ ${e}`).join('\n')}\n`);
}
