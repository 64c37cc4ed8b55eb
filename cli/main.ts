import { handleError } from './errors.js';
import { processIo } from './io.js';
import { createProgram } from './program.js';

const program = createProgram(processIo).exitOverride();
try {
  await program.parseAsync(process.argv);
} catch (err) {
  // --help and --version end through exitOverride too, with their own (zero) exit codes.
  process.exitCode = handleError(err, processIo);
}
