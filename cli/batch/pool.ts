import { createRequire } from 'node:module';
import { pathToFileURL } from 'node:url';
import { Piscina } from 'piscina';
import type { ChunkResult, ChunkTask } from './size-chunk.js';

/**
 * The worker pool of `treadwise batch --local`. From source (tsx, tests) the worker is
 * cli/batch/worker.ts, loaded through tsx in each thread; in the built CLI it is
 * dist/cli/batch-worker.js beside main.js (a second esbuild entry of build:cli).
 */
function workerFile(): { filename: string; execArgv: string[] } {
  const here = import.meta.url;
  if (here.endsWith('.ts')) {
    const tsx = pathToFileURL(createRequire(here).resolve('tsx')).href;
    return { filename: new URL('./worker.ts', here).href, execArgv: ['--import', tsx] };
  }
  return { filename: new URL('./batch-worker.js', here).href, execArgv: [] };
}

export interface ChunkPool {
  run(task: ChunkTask): Promise<ChunkResult>;
  close(): Promise<void>;
}

export function createChunkPool(threads: number): ChunkPool {
  const { filename, execArgv } = workerFile();
  const pool = new Piscina<ChunkTask, ChunkResult>({ filename, execArgv, minThreads: threads, maxThreads: threads, idleTimeout: 1000 });
  return {
    run: (task) => pool.run(task),
    close: () => pool.destroy(),
  };
}
