import { CommanderError } from 'commander';
import { handleError } from '../../cli/errors.js';
import type { CliIo } from '../../cli/io.js';
import { createProgram } from '../../cli/program.js';

export interface CliRun {
  code: number;
  stdout: string;
  stderr: string;
}

/** Runs the `treadwise` program in-process the way cli/main.ts does, capturing its output. */
export async function runCli(args: string[], fetchImpl: typeof fetch = fetch): Promise<CliRun> {
  let stdout = '';
  let stderr = '';
  const io: CliIo = {
    out: (t) => (stdout += t.endsWith('\n') ? t : `${t}\n`),
    err: (t) => (stderr += t.endsWith('\n') ? t : `${t}\n`),
    fetch: fetchImpl,
  };
  const program = createProgram(io).exitOverride();
  let code = 0;
  try {
    await program.parseAsync(args, { from: 'user' });
  } catch (err) {
    code = err instanceof CommanderError ? err.exitCode : handleError(err, io);
  }
  return { code, stdout, stderr };
}
