// Benchmark, not a test: the estimate plans reels on every call, so 14 equal tread pieces
// must plan at ≥ 20 000 per second. Run: node_modules/.bin/tsx tests/load/reels-throughput.ts
import { planReels } from '../../shared/sizing/reels.js';

const TARGET_PER_S = 20_000;
const cases = {
  'Alder Row, 14 × 850 mm': { piecesMm: Array.from({ length: 14 }, () => 850), reelLengthMm: 5000, cutPitchMm: 50 },
  '12 mixed pieces (exact search)': { piecesMm: [1874, 1788, 1805, 1949, 2315, 2083, 1978, 1424, 1684, 1784, 2128, 1955] },
};

let failed = false;
for (const [name, input] of Object.entries(cases)) {
  for (let i = 0; i < 2_000; i++) planReels(input); // warm up the JIT
  const runs = 50_000;
  const start = performance.now();
  for (let i = 0; i < runs; i++) planReels(input);
  const perS = Math.round(runs / ((performance.now() - start) / 1000));
  const ok = name.startsWith('Alder') ? perS >= TARGET_PER_S : true;
  failed ||= !ok;
  console.log(`${ok ? 'ok  ' : 'SLOW'} ${name}: ${perS.toLocaleString('en')} plans/s`);
}
process.exitCode = failed ? 1 : 0;
