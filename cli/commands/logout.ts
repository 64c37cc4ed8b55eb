import { Command } from 'commander';
import type { CliIo } from '../io.js';
import { loginFile, removeLogin } from '../login-store.js';
import { withExamples } from '../options.js';

export function logoutCommand(io: CliIo): Command {
  const command = new Command('logout')
    .description('forget the stored API URL and key (the key itself stays valid: revoke it with treadwise keys revoke)')
    .option('--json', 'print the result as JSON');
  withExamples(command, 'treadwise logout');
  return command.action(async (opts: { json?: boolean }) => {
    const file = loginFile(io);
    const removed = removeLogin(io);
    if (opts.json) io.out(JSON.stringify({ removed, configFile: file }));
    else io.out(removed ? `Logged out: removed ${file}.` : `Not logged in (no ${file}).`);
  });
}
