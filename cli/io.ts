import { readFileSync } from 'node:fs';
import { createInterface } from 'node:readline';
import envPaths from 'env-paths';
import { CliError } from './errors.js';

/**
 * Everything a command touches outside itself: stdout for results (pipeable), stderr for progress
 * and errors, the network, the environment, stdin and the config directory. Tests pass their own.
 */
export interface CliIo {
  out(text: string): void;
  err(text: string): void;
  fetch: typeof fetch;
  env: Record<string, string | undefined>;
  /** The whole of stdin (estimate files piped in with `-`). */
  readStdin(): Promise<string>;
  /** Colour only on a terminal. */
  stdoutIsTTY: boolean;
  /** Where `login` keeps the API URL and key. */
  configDir(): string;
  /** Asks on the terminal without echoing; absent when stdin is not a terminal (pipes, tests). */
  promptSecret?(question: string): Promise<string>;
  /** stdin as a stream, for inputs too large to hold (`treadwise batch -`); else readStdin is used. */
  stdinStream?(): NodeJS.ReadableStream;
  /** A progress bar only on a terminal; quiet lines otherwise. */
  stderrIsTTY?: boolean;
  /**
   * Calls `handler` on Ctrl-C (SIGINT) until the returned function is called, so a long command
   * stops cleanly instead of dying; a second Ctrl-C ends the process at once.
   */
  onInterrupt?(handler: () => void): () => void;
}

function onSigint(handler: () => void): () => void {
  let seen = false;
  const listener = () => {
    if (seen) process.exit(130);
    seen = true;
    handler();
  };
  process.on('SIGINT', listener);
  return () => process.off('SIGINT', listener);
}

/** Reads one line from the terminal with echo off, so a pasted key never shows on screen. */
function promptHidden(question: string): Promise<string> {
  return new Promise((resolve, reject) => {
    const rl = createInterface({ input: process.stdin, output: process.stderr, terminal: true });
    let asked = false;
    // readline echoes through _writeToOutput: print the question, swallow what is typed.
    (rl as unknown as { _writeToOutput(s: string): void })._writeToOutput = (s: string) => {
      if (!asked) process.stderr.write(s);
      asked = true;
    };
    rl.question(question, (answer) => {
      rl.close();
      process.stderr.write('\n');
      resolve(answer.trim());
    });
    rl.on('SIGINT', () => {
      rl.close();
      reject(new CliError('cancelled'));
    });
  });
}

async function readAll(stream: NodeJS.ReadableStream): Promise<string> {
  const chunks: Buffer[] = [];
  for await (const chunk of stream) chunks.push(typeof chunk === 'string' ? Buffer.from(chunk) : chunk);
  return Buffer.concat(chunks).toString('utf8');
}

export const processIo: CliIo = {
  out: (text) => process.stdout.write(text.endsWith('\n') ? text : `${text}\n`),
  err: (text) => process.stderr.write(text.endsWith('\n') ? text : `${text}\n`),
  fetch: (...args) => fetch(...args),
  env: process.env,
  readStdin: () => readAll(process.stdin),
  stdoutIsTTY: Boolean(process.stdout.isTTY),
  // No "-nodejs" suffix: the folder is ~/.config/treadwise on Linux.
  configDir: () => envPaths('treadwise', { suffix: '' }).config,
  promptSecret: process.stdin.isTTY ? promptHidden : undefined,
  stdinStream: () => process.stdin,
  stderrIsTTY: Boolean(process.stderr.isTTY),
  onInterrupt: onSigint,
};

/** A file's text, or stdin's for `-`; a missing file is a readable error. */
export async function readInput(io: CliIo, file: string): Promise<string> {
  if (file === '-') return io.readStdin();
  return readFileSync(file, 'utf8');
}
