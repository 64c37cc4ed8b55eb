import { Command } from 'commander';
import { API_VERSION } from '../api/version.js';
import { batchCommand } from './commands/batch.js';
import { calcCommand } from './commands/calc.js';
import { catalogCommand } from './commands/catalog.js';
import { estimateCommand } from './commands/estimate.js';
import { healthCommand } from './commands/health.js';
import { keysCommand } from './commands/keys.js';
import { loginCommand } from './commands/login.js';
import { logoutCommand } from './commands/logout.js';
import { projectsCommand } from './commands/projects.js';
import { usageCommand } from './commands/usage.js';
import { whoamiCommand } from './commands/whoami.js';
import type { CliIo } from './io.js';

/** Every command and its subcommands get the same output and exit handling (addCommand does not copy them). */
function configure(command: Command, io: CliIo): void {
  command.configureOutput({ writeOut: (s) => io.out(s), writeErr: (s) => io.err(s) }).exitOverride();
  for (const sub of command.commands) configure(sub, io);
}

/** The root `treadwise` command; tests call `createProgram(io).parseAsync([...], { from: 'user' })`. */
export function createProgram(io: CliIo): Command {
  const program = new Command('treadwise')
    .description('Treadwise — sizing for motion-activated LED stair and corridor lighting')
    .version(API_VERSION, '-V, --version', 'print the CLI version')
    .showHelpAfterError('(run treadwise --help for usage)')
    .addHelpText(
      'after',
      '\nExit codes: 0 ok, 1 failure, 2 usage error (bad flags or request), 3 design checks failed.\n' +
        'Credentials: --api-url/--api-key, else TREADWISE_API_URL/TREADWISE_API_KEY, else treadwise login.\n\n' +
        'Examples:\n  $ treadwise login --api-url https://api.example.test --api-key -\n  $ treadwise estimate stair.yaml\n  $ treadwise batch stairs.csv -o results.csv\n  $ treadwise calc cable --supply-v 24 --current-a 4 --length-m 12\n',
    );
  program.addCommand(loginCommand(io));
  program.addCommand(logoutCommand(io));
  program.addCommand(whoamiCommand(io));
  program.addCommand(estimateCommand(io));
  program.addCommand(batchCommand(io));
  program.addCommand(calcCommand(io));
  program.addCommand(keysCommand(io));
  program.addCommand(catalogCommand(io));
  program.addCommand(projectsCommand(io));
  program.addCommand(usageCommand(io));
  program.addCommand(healthCommand(io));
  configure(program, io);
  return program;
}
