/** Where a command writes: stdout for results (pipeable), stderr for progress and errors. */
export interface CliIo {
  out(text: string): void;
  err(text: string): void;
  fetch: typeof fetch;
}

export const processIo: CliIo = {
  out: (text) => process.stdout.write(text.endsWith('\n') ? text : `${text}\n`),
  err: (text) => process.stderr.write(text.endsWith('\n') ? text : `${text}\n`),
  fetch: (...args) => fetch(...args),
};
