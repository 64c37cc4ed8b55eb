// Benchmark, not a test: estimates per second on validated input (no zod parsing), one core,
// full trace included. Target ≥ 20 000/s for the 14-tread Alder Row stair.
// Run: node_modules/.bin/tsx tests/load/estimate-throughput.ts
import { estimateRequestSchema, type EstimateInput } from '../../shared/schemas/estimate.js';
import { alderRowTownhouse, alderRowTreadPixels, harborLaneCheckout, quaysideCorridor, alderRowWithRail } from '../../shared/schemas/estimate-examples.js';
import { estimate } from '../../shared/sizing/estimate/estimate.js';

const TARGET_PER_S = 20_000;

// A tall stair for the chained-pixel layout: 120 treads in six flights of 20.
const tallTreadPixels = {
  ...alderRowTreadPixels,
  staircase: { ...alderRowTreadPixels.staircase, treads: 120, flights: Array.from({ length: 6 }, () => ({ treads: 20, landingLengthMm: 1000 })) },
};

const cases: { name: string; input: EstimateInput; target?: number }[] = [
  { name: 'Alder Row, 14 treads, tread-strips', input: estimateRequestSchema.parse(alderRowTownhouse), target: TARGET_PER_S },
  { name: 'Alder Row, priced from the Harbor Lane catalog', input: estimateRequestSchema.parse(harborLaneCheckout) },
  { name: 'Alder Row with a handrail, treads-and-rail', input: estimateRequestSchema.parse(alderRowWithRail) },
  { name: 'Quayside Studio corridor, rail-pixels', input: estimateRequestSchema.parse(quaysideCorridor) },
  { name: '120-tread tread-pixels', input: estimateRequestSchema.parse(tallTreadPixels) },
];

/**
 * Rates by wall clock and by this process's CPU time. On a shared machine other processes take
 * the core away now and then; the CPU-time rate is what one core of our own achieves.
 */
function perSecond(input: EstimateInput): { wall: number; cpu: number } {
  for (let i = 0; i < 3_000; i++) estimate(input); // warm up the JIT
  let runs = 0;
  const start = performance.now();
  const cpuStart = process.cpuUsage();
  let elapsed = 0;
  // Run for about two seconds so slow and fast cases are measured alike.
  while (elapsed < 2_000) {
    for (let i = 0; i < 500; i++) estimate(input);
    runs += 500;
    elapsed = performance.now() - start;
  }
  const cpu = process.cpuUsage(cpuStart);
  return { wall: Math.round(runs / (elapsed / 1000)), cpu: Math.round(runs / ((cpu.user + cpu.system) / 1e6)) };
}

let failed = false;
for (const c of cases) {
  const rate = perSecond(c.input);
  const ok = c.target === undefined || rate.cpu >= c.target;
  failed ||= !ok;
  const traceEntries = estimate(c.input).trace.length;
  console.log(
    `${ok ? 'ok  ' : 'SLOW'} ${c.name}: ${rate.cpu.toLocaleString('en')} estimates/s of CPU time ` +
      `(${(1e6 / rate.cpu).toFixed(1)} µs each; ${rate.wall.toLocaleString('en')}/s by the wall clock), ${traceEntries} trace entries`,
  );
}
process.exitCode = failed ? 1 : 0;
