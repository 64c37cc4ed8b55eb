import { CommanderError } from 'commander';
import { z } from 'zod';
import type { CliIo } from './io.js';

/** Exit codes: 0 ok, 1 failure, 2 usage error, 3 design checks failed (or a dependency down). */
export const EXIT = { ok: 0, failure: 1, usage: 2, checksFailed: 3 } as const;

/** A failure the user can act on; printed as one line without a stack trace. */
export class CliError extends Error {
  constructor(
    message: string,
    readonly exitCode: number = EXIT.failure,
  ) {
    super(message);
  }
}

// Commander's own failures are all about how the command was typed: a usage error.
const COMMANDER_OK = new Set(['commander.helpDisplayed', 'commander.version', 'commander.executeSubCommandAsync']);

/** The single exit path for every command's failure. Returns the exit code to use. */
export function handleError(err: unknown, io: CliIo): number {
  if (err instanceof CommanderError) {
    // Commander has already printed its message (or the help).
    return COMMANDER_OK.has(err.code) ? err.exitCode : EXIT.usage;
  }
  if (err instanceof z.ZodError) {
    io.err('Invalid options:');
    for (const issue of err.issues) io.err(`  --${optionName(issue.path)}: ${issue.message}`);
    return EXIT.usage;
  }
  if (err instanceof CliError) {
    io.err(`treadwise: ${err.message}`);
    return err.exitCode;
  }
  const code = (err as NodeJS.ErrnoException | undefined)?.code;
  if (code === 'ENOENT' || code === 'EACCES' || code === 'EISDIR') {
    io.err(`treadwise: cannot read or write ${(err as NodeJS.ErrnoException).path ?? 'a file'} (${code})`);
    return EXIT.failure;
  }
  io.err(`treadwise: ${err instanceof Error ? err.message : String(err)}`.split('\n')[0]);
  return EXIT.failure;
}

/** `apiUrl` → `api-url`, the spelling the user typed. */
function optionName(path: PropertyKey[]): string {
  return path.map((p) => String(p).replace(/[A-Z]/g, (c) => `-${c.toLowerCase()}`)).join('.') || '?';
}
