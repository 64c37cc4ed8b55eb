// HTTP half of `npm run bench`: a bare Express 5 app and the built server, each in its own
// process, loaded in turn by autocannon in this one. Every figure is a ratio measured in the same
// run, so the machine's speed (shared, noisy) cancels out.
import { spawn, type ChildProcess } from 'node:child_process';
import { mkdtempSync, openSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import autocannon from 'autocannon';
import { alderRowTownhouse } from '../../shared/schemas/estimate-examples.js';

export interface Load {
  rps: number;
  p99Ms: number;
  bytesPerAnswer: number;
  /**
   * CPU time (user + system) the server process spent per answer over the measured run. Unlike
   * req/s it barely moves when other work shares the machine, so it is the steadier yardstick.
   */
  cpuUsPerAnswer: number;
}

export interface HttpFigures {
  bareGet: Load;
  barePost: Load;
  health: Load;
  voltageDrop: Load;
  estimate: Load;
}

const CONNECTIONS = 20;
export const VOLTAGE_DROP_BODY = JSON.stringify({ supplyVoltageV: 24, currentA: 2, lengthM: 10, conductor: { crossSectionMm2: 0.75 } });
export const ESTIMATE_BODY = JSON.stringify(alderRowTownhouse); // 14 treads, trace on

/** Clock ticks a second in /proc/<pid>/stat (USER_HZ: 100 on Linux everywhere in practice). */
const TICKS_PER_S = 100;

/** User + system CPU time of a process so far, in µs (Linux /proc); NaN where there is no /proc. */
function cpuUs(pid: number | undefined): number {
  try {
    const stat = readFileSync(`/proc/${pid}/stat`, 'utf8');
    const fields = stat.slice(stat.lastIndexOf(')') + 2).split(' ');
    return ((Number(fields[11]) + Number(fields[12])) * 1e6) / TICKS_PER_S; // utime, stime
  } catch {
    return Number.NaN;
  }
}

/** Loads `url` for `seconds` after a warm-up; `server` is the process answering (for its CPU time). */
export async function load(url: string, seconds: number, opts: Partial<autocannon.Options> = {}, server?: ChildProcess): Promise<Load> {
  await autocannon({ url, connections: CONNECTIONS, duration: 2, ...opts }); // warm-up: JIT and first-use costs
  const cpuBefore = cpuUs(server?.pid);
  const r = await autocannon({ url, connections: CONNECTIONS, duration: seconds, ...opts });
  const cpu = cpuUs(server?.pid) - cpuBefore;
  if (r.non2xx || r.errors || r.timeouts) throw new Error(`${url}: ${r.non2xx} non-2xx, ${r.errors} errors, ${r.timeouts} timeouts`);
  const answers = Math.max(1, r.requests.total);
  return { rps: r.requests.average, p99Ms: r.latency.p99, bytesPerAnswer: r.throughput.total / answers, cpuUsPerAnswer: cpu / answers };
}

async function json(url: string, init: RequestInit) {
  const res = await fetch(url, { ...init, headers: { 'content-type': 'application/json', ...init.headers } });
  if (!res.ok) throw new Error(`${init.method ?? 'GET'} ${url}: ${res.status} ${await res.text()}`);
  return res.json();
}

function stop(child: ChildProcess): Promise<unknown> {
  if (child.exitCode !== null) return Promise.resolve();
  const exited = new Promise((r) => child.once('exit', r));
  child.kill('SIGTERM');
  return exited;
}

/** Starts a process and waits for `pattern` in what it writes to `file` (its stdout). */
async function started(child: ChildProcess, file: string, pattern: RegExp): Promise<string> {
  for (let waited = 0; waited < 60_000; waited += 100) {
    const text = readFileSync(file, 'utf8');
    if (pattern.test(text)) return text;
    if (child.exitCode !== null) throw new Error(`process exited with ${child.exitCode}:\n${text}`);
    await new Promise((r) => setTimeout(r, 100));
  }
  throw new Error('process did not start');
}

/** The built server, started as `npm start` starts it, with a key whose organisation is on the internal plan. */
export interface RunningStack {
  base: string;
  key: string;
  server: ChildProcess;
  stop(): Promise<void>;
}

/**
 * The server runs as `npm start` runs it: request logging at the default level (info), its
 * stdout going to a file as a process manager would keep it. The calls are made as a shop makes
 * them: with a secret key, through authentication, limits, quota and metering; the demo
 * organisation is moved to the internal `platform` plan (by the operator, through the API) so
 * the limits measure their cost, not their refusals. `nodeArgs` go before the script (e.g.
 * `--cpu-prof` for `npm run bench:profile`).
 */
export async function startServer(nodeArgs: string[] = [], script = 'dist/server/main.js'): Promise<RunningStack> {
  const dir = mkdtempSync(path.join(tmpdir(), 'treadwise-bench-'));
  const serverOut = path.join(dir, 'server.out');
  const server = spawn(process.execPath, [...nodeArgs, script], {
    env: { ...process.env, PORT: '0', HOST: '127.0.0.1', DATA_DIR: path.join(dir, 'data'), LOG_LEVEL: 'info' },
    stdio: ['ignore', openSync(serverOut, 'w'), 'inherit'],
  });
  const stopAll = async () => {
    await stop(server);
    rmSync(dir, { recursive: true, force: true });
  };
  try {
    const out = await started(server, serverOut, /harbor-lane\s+server/);
    const base = /running at (http:\/\/\S+)/.exec(out)![1];
    const key = /harbor-lane\s+server\s+(tw_server_\S+)/.exec(out)![1];
    const password = /Demo password for every demo account: (\S+)/.exec(out)![1];
    const session = await json(`${base}/v1/auth/sign-in`, { method: 'POST', body: JSON.stringify({ email: 'ops@treadwise.test', password }) });
    const orgs = await json(`${base}/v1/organizations?limit=100`, { headers: { authorization: `Bearer ${session.accessToken}` } });
    const harbor = orgs.items.find((o: { slug: string }) => o.slug === 'harbor-lane');
    await json(`${base}/v1/organizations/${harbor.id}`, { method: 'PATCH', headers: { authorization: `Bearer ${session.accessToken}` }, body: JSON.stringify({ planId: 'platform' }) });
    return { base, key, server, stop: stopAll };
  } catch (err) {
    await stopAll();
    throw err;
  }
}

export const post = (body: string, auth?: string) => ({
  method: 'POST' as const,
  body,
  headers: { 'content-type': 'application/json', ...(auth ? { authorization: `Bearer ${auth}` } : {}) },
});

export async function measureHttp(seconds: number): Promise<HttpFigures> {
  const dir = mkdtempSync(path.join(tmpdir(), 'treadwise-bare-'));
  const bareOut = path.join(dir, 'bare.out');
  const bare = spawn(process.execPath, ['tests/load/bare-express.mjs'], { stdio: ['ignore', openSync(bareOut, 'w'), 'inherit'] });
  let stack: RunningStack | undefined;
  try {
    const bareUrl = /listening at (\S+)/.exec(await started(bare, bareOut, /listening at/))![1];
    // BENCH_SERVER: another build to measure the same way (e.g. main's, built into dist/base/main.js).
    stack = await startServer([], process.env.BENCH_SERVER ?? 'dist/server/main.js');
    const { base, key } = stack;
    return {
      bareGet: await load(`${bareUrl}/get`, seconds, {}, bare),
      barePost: await load(`${bareUrl}/post`, seconds, post(VOLTAGE_DROP_BODY), bare),
      health: await load(`${base}/v1/health`, seconds, {}, stack.server),
      voltageDrop: await load(`${base}/v1/calculations/voltage-drop`, seconds, post(VOLTAGE_DROP_BODY, key), stack.server),
      // Uncompressed, as autocannon asks: the answer is built and written in full.
      estimate: await load(`${base}/v1/estimates`, seconds, post(ESTIMATE_BODY, key), stack.server),
    };
  } finally {
    await Promise.all([stop(bare), stack?.stop()]);
    rmSync(dir, { recursive: true, force: true });
  }
}
