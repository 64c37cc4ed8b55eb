import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { handleError } from '../../cli/errors.js';
import type { CliIo } from '../../cli/io.js';
import { createProgram } from '../../cli/program.js';

export interface CliRun {
  code: number;
  stdout: string;
  stderr: string;
}

export interface CliRunOptions {
  fetch?: typeof fetch;
  /** The environment the command sees (not the test process's). */
  env?: Record<string, string | undefined>;
  stdin?: string;
  /** Where login is stored; default: a fresh temporary folder, so tests never touch the user's. */
  configDir?: string;
  stdoutIsTTY?: boolean;
  /** Ctrl-C: aborting it calls the command's interrupt handler (as SIGINT does in a terminal). */
  interrupt?: AbortSignal;
}

/** Runs the `treadwise` program in-process the way cli/main.ts does, capturing its output. */
export async function runCli(args: string[], options: CliRunOptions | typeof fetch = {}): Promise<CliRun> {
  const opts = typeof options === 'function' ? { fetch: options } : options;
  const configDir = opts.configDir ?? mkdtempSync(path.join(tmpdir(), 'treadwise-cli-'));
  let stdout = '';
  let stderr = '';
  const io: CliIo = {
    out: (t) => (stdout += t.endsWith('\n') ? t : `${t}\n`),
    err: (t) => (stderr += t.endsWith('\n') ? t : `${t}\n`),
    fetch: opts.fetch ?? fetch,
    env: opts.env ?? {},
    readStdin: async () => opts.stdin ?? '',
    stdoutIsTTY: opts.stdoutIsTTY ?? false,
    configDir: () => configDir,
    onInterrupt: (handler) => {
      const signal = opts.interrupt;
      if (!signal) return () => {};
      if (signal.aborted) {
        queueMicrotask(handler);
        return () => {};
      }
      signal.addEventListener('abort', handler, { once: true });
      return () => signal.removeEventListener('abort', handler);
    },
  };
  const program = createProgram(io).exitOverride();
  let code = 0;
  try {
    await program.parseAsync(args, { from: 'user' });
  } catch (err) {
    code = handleError(err, io);
  }
  return { code, stdout, stderr };
}
