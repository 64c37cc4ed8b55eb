import { Command } from 'commander';
import { CliError, EXIT } from '../errors.js';
import { identify } from '../identity.js';
import type { CliIo } from '../io.js';
import { writeLogin } from '../login-store.js';
import { apiOptionsSchema, DEFAULT_API_URL, withApiOptions, withExamples } from '../options.js';
import { describeIdentity } from './whoami.js';

export function loginCommand(io: CliIo): Command {
  const command = new Command('login').description('check an API key and remember it with the API URL (file mode 0600)');
  withExamples(
    withApiOptions(command),
    'treadwise login --api-url https://api.example.test        # asks for the key without echoing it',
    'printf %s "$KEY" | treadwise login --api-url https://api.example.test --api-key -   # keeps the key out of shell history',
  );
  return command.action(async (raw: Record<string, unknown>) => {
    const opts = apiOptionsSchema.parse(raw);
    const apiUrl = opts.apiUrl ?? (io.env.TREADWISE_API_URL || DEFAULT_API_URL);
    let apiKey = opts.apiKey ?? (io.env.TREADWISE_API_KEY || undefined);
    if (apiKey === '-') apiKey = (await io.readStdin()).trim();
    else if (!apiKey && io.promptSecret) apiKey = await io.promptSecret(`API key for ${apiUrl}: `);
    if (!apiKey) throw new CliError('give the key: --api-key <key>, --api-key - to read it from stdin, or TREADWISE_API_KEY', EXIT.usage);

    // A key the API refuses (401) is never stored.
    const identity = await identify(io, { apiUrl, apiKey });
    const file = writeLogin(io, { apiUrl, apiKey });
    if (opts.json) {
      io.out(JSON.stringify({ ...identity, configFile: file }));
    } else {
      io.out(describeIdentity(identity));
      io.out(`Saved to ${file} (readable by you only). TREADWISE_API_URL, TREADWISE_API_KEY and the flags override it.`);
    }
  });
}
