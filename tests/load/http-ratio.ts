// HTTP half of `npm run bench`: the built server in one process, autocannon in this one.
import { spawn } from 'node:child_process';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import autocannon from 'autocannon';

export interface HttpFigures {
  healthRps: number;
  voltageDropRps: number;
  ratio: number;
}

const VOLTAGE_DROP_BODY = JSON.stringify({ supplyVoltageV: 24, currentA: 2, lengthM: 10, conductor: { crossSectionMm2: 0.75 } });

function run(url: string, opts: Partial<autocannon.Options>): Promise<autocannon.Result> {
  return autocannon({ url, connections: 20, duration: 10, ...opts });
}

export async function measureHttp(): Promise<HttpFigures> {
  const dataDir = mkdtempSync(path.join(tmpdir(), 'treadwise-bench-'));
  const server = spawn(process.execPath, ['dist/server/main.js'], {
    env: { ...process.env, PORT: '0', HOST: '127.0.0.1', DATA_DIR: dataDir, LOG_LEVEL: 'warn' },
    stdio: ['ignore', 'pipe', 'inherit'],
  });
  try {
    const base = await new Promise<string>((resolve, reject) => {
      let out = '';
      server.stdout!.on('data', (d) => {
        out += d;
        const m = /running at (http:\/\/\S+)/.exec(out);
        if (m) resolve(m[1]);
      });
      server.once('exit', (code) => reject(new Error(`server exited with ${code}`)));
    });
    // Warm both routes up so neither pays for JIT or first-use costs in its window.
    await run(`${base}/v1/health`, { duration: 2 });
    await run(`${base}/v1/calculations/voltage-drop`, { duration: 2, method: 'POST', body: VOLTAGE_DROP_BODY, headers: { 'content-type': 'application/json' } });
    const health = await run(`${base}/v1/health`, {});
    const drop = await run(`${base}/v1/calculations/voltage-drop`, { method: 'POST', body: VOLTAGE_DROP_BODY, headers: { 'content-type': 'application/json' } });
    if (health.non2xx || drop.non2xx || health.errors || drop.errors) throw new Error('benchmark saw failed requests');
    const healthRps = health.requests.average;
    const voltageDropRps = drop.requests.average;
    return { healthRps, voltageDropRps, ratio: voltageDropRps / healthRps };
  } finally {
    server.kill('SIGTERM');
    await new Promise((r) => server.once('exit', r));
    rmSync(dataDir, { recursive: true, force: true });
  }
}
