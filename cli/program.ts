import { Command } from 'commander';
import { API_VERSION } from '../api/version.js';
import { healthCommand } from './commands/health.js';
import type { CliIo } from './io.js';

/** The root `treadwise` command; tests call `createProgram(io).parseAsync([...], { from: 'user' })`. */
export function createProgram(io: CliIo): Command {
  const program = new Command('treadwise')
    .description('Treadwise — sizing for motion-activated LED stair and corridor lighting')
    .version(API_VERSION, '-V, --version', 'print the CLI version')
    .configureOutput({ writeOut: (s) => io.out(s), writeErr: (s) => io.err(s) })
    .showHelpAfterError('(run treadwise --help for usage)');
  program.addCommand(healthCommand(io));
  // addCommand does not copy settings: give every subcommand the same output and exit handling.
  for (const command of program.commands) {
    command.configureOutput({ writeOut: (s) => io.out(s), writeErr: (s) => io.err(s) }).exitOverride();
  }
  return program;
}
