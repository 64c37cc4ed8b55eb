import { sizeChunk, type ChunkResult, type ChunkTask } from './size-chunk.js';

/** The piscina worker of `treadwise batch --local`: one chunk of rows per task. */
export default function run(task: ChunkTask): ChunkResult {
  return sizeChunk(task);
}
