// `npm run bench:ab -- <other build>`: the built server against another build of it (e.g. main's,
// built into dist/base/main.js), loaded in turn, round after round, on one route; prints each
// one's CPU time per answer and req/s. Alternating rounds share whatever else the machine runs,
// so a change to the request path shows even on a busy machine where absolute figures swing.
//   PROFILE_ROUTE=voltage-drop|estimate|health, BENCH_SECONDS per round (default 3), AB_ROUNDS (default 4).
import { spawnSync } from 'node:child_process';
import { ESTIMATE_BODY, VOLTAGE_DROP_BODY, load, post, startServer, type Load } from './http-ratio.js';

const other = process.argv[2] ?? 'dist/base/main.js';
const route = process.env.PROFILE_ROUTE ?? 'voltage-drop';
const seconds = Number(process.env.BENCH_SECONDS ?? 3);
const rounds = Number(process.env.AB_ROUNDS ?? 4);

const build = spawnSync('npm', ['run', '--silent', 'build:server'], { stdio: 'ignore' });
if (build.status !== 0) throw new Error('server build failed');

const servers = [
  { name: 'this build', stack: await startServer([], 'dist/server/main.js'), runs: [] as Load[] },
  { name: other, stack: await startServer([], other), runs: [] as Load[] },
];
try {
  for (let round = 0; round < rounds; round++) {
    for (const s of round % 2 ? [...servers].reverse() : servers) {
      const { base, key } = s.stack;
      const target = {
        'voltage-drop': [`${base}/v1/calculations/voltage-drop`, post(VOLTAGE_DROP_BODY, key)],
        estimate: [`${base}/v1/estimates`, post(ESTIMATE_BODY, key)],
        health: [`${base}/v1/health`, {}],
      }[route] as [string, object];
      s.runs.push(await load(target[0], seconds, target[1], s.stack.server));
    }
  }
} finally {
  await Promise.all(servers.map((s) => s.stack.stop()));
}
const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)];
const [a, b] = servers.map((s) => ({ cpu: median(s.runs.map((r) => r.cpuUsPerAnswer)), rps: median(s.runs.map((r) => r.rps)) }));
for (const [i, s] of servers.entries()) {
  console.log(`${s.name.padEnd(20)} ${route}: CPU µs/answer ${s.runs.map((r) => Math.round(r.cpuUsPerAnswer)).join(' ')}; req/s ${s.runs.map((r) => Math.round(r.rps)).join(' ')}`);
  void i;
}
console.log(`median CPU/answer: this build ${Math.round(a.cpu)} µs vs ${Math.round(b.cpu)} µs (${((100 * (a.cpu - b.cpu)) / b.cpu).toFixed(1)} %); req/s ${Math.round(a.rps)} vs ${Math.round(b.rps)}`);
