import { z } from 'zod';
import type { CliIo } from './io.js';

/** A failure the user can act on; printed without a stack trace. */
export class CliError extends Error {
  constructor(
    message: string,
    readonly exitCode = 1,
  ) {
    super(message);
  }
}

/** The single exit path for every command's failure. Returns the exit code to use. */
export function handleError(err: unknown, io: CliIo): number {
  if (err instanceof z.ZodError) {
    io.err('Invalid options:');
    for (const issue of err.issues) io.err(`  --${optionName(issue.path)}: ${issue.message}`);
    return 2;
  }
  if (err instanceof CliError) {
    io.err(`treadwise: ${err.message}`);
    return err.exitCode;
  }
  io.err(`treadwise: ${err instanceof Error ? err.message : String(err)}`);
  return 1;
}

/** `apiUrl` → `api-url`, the spelling the user typed. */
function optionName(path: PropertyKey[]): string {
  return path.map((p) => String(p).replace(/[A-Z]/g, (c) => `-${c.toLowerCase()}`)).join('.') || '?';
}
