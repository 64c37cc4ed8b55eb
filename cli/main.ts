import { handleError } from './errors.js';
import { processIo } from './io.js';
import { createProgram } from './program.js';

// `treadwise catalog export | head` closes the pipe early: that is the reader's choice, not a failure.
process.stdout.on('error', (err: NodeJS.ErrnoException) => {
  if (err.code === 'EPIPE') process.exit(0);
  throw err;
});

const program = createProgram(processIo).exitOverride();
try {
  await program.parseAsync(process.argv);
} catch (err) {
  // --help and --version end through exitOverride too, with their own (zero) exit codes.
  process.exitCode = handleError(err, processIo);
}
