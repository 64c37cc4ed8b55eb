// `npm run bench:profile`: where the built server spends its CPU under load. Starts
// dist/server/main.js with `node --cpu-prof` (as `npm run bench` starts it: key on the internal
// plan, access log at info), loads one route with autocannon (20 connections), stops the server
// and prints self time of the load window only, by function and by package.
//   PROFILE_ROUTE=voltage-drop|estimate|health (default voltage-drop), BENCH_SECONDS (default 8).
// The .cpuprofile is kept (path printed) for Chrome DevTools or speedscope.
import { spawnSync } from 'node:child_process';
import { mkdtempSync, readdirSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { ESTIMATE_BODY, VOLTAGE_DROP_BODY, load, post, startServer } from './http-ratio.js';

interface ProfileNode {
  id: number;
  callFrame: { functionName: string; url: string; lineNumber: number };
}
interface CpuProfile {
  nodes: ProfileNode[];
  samples: number[];
  timeDeltas: number[];
  startTime: number;
  endTime: number;
}

const route = process.env.PROFILE_ROUTE ?? 'voltage-drop';
const seconds = Number(process.env.BENCH_SECONDS ?? 8);
const TOP = Number(process.env.PROFILE_TOP ?? 30);

const build = spawnSync('npm', ['run', '--silent', 'build:server'], { stdio: 'ignore' });
if (build.status !== 0) throw new Error('server build failed');

const dir = mkdtempSync(path.join(tmpdir(), 'treadwise-profile-'));
const stack = await startServer(['--cpu-prof', `--cpu-prof-dir=${dir}`]);
const target = {
  'voltage-drop': { url: `${stack.base}/v1/calculations/voltage-drop`, opts: post(VOLTAGE_DROP_BODY, stack.key) },
  estimate: { url: `${stack.base}/v1/estimates`, opts: post(ESTIMATE_BODY, stack.key) },
  health: { url: `${stack.base}/v1/health`, opts: {} },
}[route];
if (!target) throw new Error(`PROFILE_ROUTE must be voltage-drop, estimate or health (got ${route})`);

// load() warms up for 2 s first; the window kept is the measured part only.
const loadStart = performance.now();
const figures = await load(target.url, seconds, target.opts);
const loadEnd = performance.now();
await stack.stop();
const exited = performance.now();

const file = readdirSync(dir).find((f) => f.endsWith('.cpuprofile'));
if (!file) throw new Error(`no profile written in ${dir}`);
const profile = JSON.parse(readFileSync(path.join(dir, file), 'utf8')) as CpuProfile;

// Sample times in the profile's clock; the window ends as long before the process's end as the load did.
const windowEnd = profile.endTime - (exited - loadEnd) * 1000;
const windowStart = windowEnd - (loadEnd - loadStart) * 1000 + 2_000_000; // the 2 s warm-up inside load()
const byId = new Map(profile.nodes.map((n) => [n.id, n]));
const selfUs = new Map<number, number>();
let t = profile.startTime;
for (let i = 0; i < profile.samples.length; i++) {
  t += profile.timeDeltas[i];
  if (t < windowStart || t > windowEnd) continue;
  const delta = profile.timeDeltas[i + 1] ?? 0;
  selfUs.set(profile.samples[i], (selfUs.get(profile.samples[i]) ?? 0) + delta);
}

function packageOf(node: ProfileNode): string {
  const { url, functionName } = node.callFrame;
  const pkg = /node_modules\/((?:@[^/]+\/)?[^/]+)/.exec(url);
  if (pkg) return pkg[1];
  if (url.includes('dist/server/main.js')) return 'treadwise (bundle)';
  if (url.startsWith('node:')) return url.replace(/^node:internal\//, 'node:').split('/').slice(0, 2).join('/');
  return functionName || '(anonymous)';
}

const byFunction = new Map<string, number>();
const byPackage = new Map<string, number>();
let busy = 0;
for (const [id, us] of selfUs) {
  const node = byId.get(id)!;
  if (node.callFrame.functionName === '(idle)') continue;
  busy += us;
  const { functionName, url, lineNumber } = node.callFrame;
  const where = url ? `${path.basename(url)}:${lineNumber + 1}` : '';
  const name = `${functionName || '(anonymous)'} ${where} [${packageOf(node)}]`;
  byFunction.set(name, (byFunction.get(name) ?? 0) + us);
  byPackage.set(packageOf(node), (byPackage.get(packageOf(node)) ?? 0) + us);
}

const pct = (us: number) => `${((100 * us) / busy).toFixed(1).padStart(5)} %`;
const top = (m: Map<string, number>, n: number) => [...m].sort((a, b) => b[1] - a[1]).slice(0, n);
console.log(`${route}: ${Math.round(figures.rps)} req/s over ${seconds} s; busy CPU in the window ${(busy / 1e6).toFixed(2)} s (${Math.round(busy / (figures.rps * seconds))} µs a request)`);
console.log('\nSelf time by package:');
for (const [name, us] of top(byPackage, 20)) console.log(`  ${pct(us)}  ${name}`);
console.log(`\nSelf time by function (top ${TOP}):`);
for (const [name, us] of top(byFunction, TOP)) console.log(`  ${pct(us)}  ${name}`);
console.log(`\nProfile: ${path.join(dir, file)}`);
