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

async function json(url: string, init: RequestInit) {
  const res = await fetch(url, { ...init, headers: { 'content-type': 'application/json', ...init.headers } });
  if (!res.ok) throw new Error(`${init.method ?? 'GET'} ${url}: ${res.status} ${await res.text()}`);
  return res.json();
}

/**
 * The calculation is measured as a shop calls it: with a secret key, through authentication,
 * rate limiting and metering. The demo organisation is moved to the internal `platform` plan
 * (by the operator, through the API) so the limits measure their cost, not their refusals.
 */
export async function measureHttp(): Promise<HttpFigures> {
  const dataDir = mkdtempSync(path.join(tmpdir(), 'treadwise-bench-'));
  const server = spawn(process.execPath, ['dist/server/main.js'], {
    env: { ...process.env, PORT: '0', HOST: '127.0.0.1', DATA_DIR: dataDir, LOG_LEVEL: 'warn' },
    stdio: ['ignore', 'pipe', 'inherit'],
  });
  try {
    const out = await new Promise<string>((resolve, reject) => {
      let text = '';
      server.stdout!.on('data', (d) => {
        text += d;
        if (/running at/.test(text) && /harbor-lane\s+server/.test(text)) resolve(text);
      });
      server.once('exit', (code) => reject(new Error(`server exited with ${code}`)));
    });
    const base = /running at (http:\/\/\S+)/.exec(out)![1];
    const key = /harbor-lane\s+server\s+(tw_server_\S+)/.exec(out)![1];
    const password = /Demo password for every demo account: (\S+)/.exec(out)![1];
    const session = await json(`${base}/v1/auth/sign-in`, { method: 'POST', body: JSON.stringify({ email: 'ops@treadwise.test', password }) });
    const orgs = await json(`${base}/v1/organizations?limit=100`, { headers: { authorization: `Bearer ${session.accessToken}` } });
    const harbor = orgs.items.find((o: { slug: string }) => o.slug === 'harbor-lane');
    await json(`${base}/v1/organizations/${harbor.id}`, { method: 'PATCH', headers: { authorization: `Bearer ${session.accessToken}` }, body: JSON.stringify({ planId: 'platform' }) });

    const drop = { method: 'POST' as const, body: VOLTAGE_DROP_BODY, headers: { 'content-type': 'application/json', authorization: `Bearer ${key}` } };
    // Warm both routes up so neither pays for JIT or first-use costs in its window.
    await run(`${base}/v1/health`, { duration: 2 });
    await run(`${base}/v1/calculations/voltage-drop`, { duration: 2, ...drop });
    const health = await run(`${base}/v1/health`, {});
    const calc = await run(`${base}/v1/calculations/voltage-drop`, drop);
    if (health.non2xx || calc.non2xx || health.errors || calc.errors) {
      throw new Error(`benchmark saw failed requests (health ${health.non2xx}/${health.errors}, voltage-drop ${calc.non2xx}/${calc.errors})`);
    }
    return { healthRps: health.requests.average, voltageDropRps: calc.requests.average, ratio: calc.requests.average / health.requests.average };
  } finally {
    server.kill('SIGTERM');
    await new Promise((r) => server.once('exit', r));
    rmSync(dataDir, { recursive: true, force: true });
  }
}
