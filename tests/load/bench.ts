// `npm run bench`: the figures the README quotes. Not part of `npm test` (timing is noisy).
//  1. estimates/s of the engine's estimate() on validated input, in-process on one core;
//  2. the API path against a bare Express 5 app, as ratios measured in one run
//     (autocannon, 20 connections, BENCH_SECONDS each, default 8).
import { spawnSync } from 'node:child_process';
import { measureHttp, type Load } from './http-ratio.js';

// BENCH_ENGINE=0 skips the engine half (while iterating on the HTTP path).
const engine = process.env.BENCH_ENGINE === '0' ? { status: 0 } : spawnSync(process.execPath, ['--import', 'tsx', 'tests/load/estimate-throughput.ts'], { stdio: 'inherit' });

const seconds = Number(process.env.BENCH_SECONDS ?? 8);
console.log(`\nHTTP (autocannon, 20 connections, ${seconds} s each after a 2 s warm-up; server logging at info):`);
const build = spawnSync('npm', ['run', '--silent', 'build:server'], { stdio: 'ignore' });
if (build.status !== 0) throw new Error('server build failed');
const f = await measureHttp(seconds);

const rows: { name: string; load: Load; against: Load; target: number; p99Within?: number }[] = [
  { name: 'GET  /v1/health                          ÷ bare GET ', load: f.health, against: f.bareGet, target: 0.85 },
  { name: 'POST /v1/calculations/voltage-drop (key) ÷ bare POST', load: f.voltageDrop, against: f.barePost, target: 0.6, p99Within: 2 },
  { name: 'POST /v1/estimates, 14 treads (key)      ÷ bare POST', load: f.estimate, against: f.barePost, target: 0.45 },
];
const n = (x: number) => Math.round(x).toLocaleString('en');
const cpu = (l: Load) => `${n(l.cpuUsPerAnswer)} µs CPU/answer`;
console.log(`  bare Express GET    ${n(f.bareGet.rps)} req/s, p99 ${f.bareGet.p99Ms} ms, ${cpu(f.bareGet)}`);
console.log(`  bare Express POST   ${n(f.barePost.rps)} req/s, p99 ${f.barePost.p99Ms} ms, ${cpu(f.barePost)}`);
let allMet = true;
for (const row of rows) {
  const ratio = row.load.rps / row.against.rps;
  const p99Ratio = row.load.p99Ms / Math.max(1, row.against.p99Ms);
  const met = ratio >= row.target && (row.p99Within === undefined || p99Ratio <= row.p99Within);
  allMet &&= met;
  const p99 = row.p99Within === undefined ? '' : `, p99 ${row.load.p99Ms} ms = ${p99Ratio.toFixed(1)}× bare (target ≤ ${row.p99Within}×)`;
  // The same ratio from CPU time per answer (bare ÷ ours): what the server costs, whatever else the machine runs.
  const cpuRatio = row.against.cpuUsPerAnswer / row.load.cpuUsPerAnswer;
  console.log(
    `${met ? 'ok  ' : 'SLOW'} ${row.name} = ${ratio.toFixed(2)} (target ≥ ${row.target}; ${n(row.load.rps)} req/s, ${n(row.load.bytesPerAnswer)} B/answer${p99}; ` +
      `${cpu(row.load)} = ${cpuRatio.toFixed(2)} by CPU time)`,
  );
}
process.exitCode = engine.status !== 0 || !allMet ? 1 : 0;
