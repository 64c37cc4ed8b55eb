import { SingleBar } from 'cli-progress';
import type { CliIo } from '../io.js';

/** Quiet progress lines (stderr not a terminal) at most this often. */
const LINE_INTERVAL_MS = 2000;

/** Progress on stderr: a bar with rows/s and ETA on a terminal, else a line now and then. */
export interface Progress {
  update(done: number, total?: number | null): void;
  stop(): void;
}

function rate(done: number, since: number, startDone: number): number {
  const seconds = (Date.now() - since) / 1000;
  return seconds > 0 ? Math.round((done - startDone) / seconds) : 0;
}

export function createProgress(io: CliIo, opts: { label: string; quiet?: boolean }): Progress {
  const started = Date.now();
  let startDone: number | undefined;
  if (opts.quiet) return { update: () => {}, stop: () => {} };
  if (io.stderrIsTTY) {
    const bar = new SingleBar({
      stream: process.stderr,
      format: `${opts.label} [{bar}] {value}/{total} rows | {rate} rows/s | ETA {eta_formatted}`,
      barsize: 30,
      hideCursor: true,
      clearOnComplete: true,
      etaBuffer: 50,
      noTTYOutput: false,
    });
    let running = false;
    return {
      update(done, total) {
        startDone ??= done;
        const t = Math.max(total ?? 0, done);
        if (!running) {
          bar.start(t, done, { rate: 0 });
          running = true;
        }
        bar.setTotal(t);
        bar.update(done, { rate: rate(done, started, startDone) });
      },
      stop() {
        if (running) bar.stop();
      },
    };
  }
  let last = 0;
  let lastDone = -1;
  return {
    update(done, total) {
      startDone ??= done;
      const now = Date.now();
      if (now - last < LINE_INTERVAL_MS || done === lastDone) return;
      last = now;
      lastDone = done;
      io.err(`${opts.label}: ${done}${total ? `/${total}` : ''} rows, ${rate(done, started, startDone)} rows/s`);
    },
    stop() {},
  };
}
