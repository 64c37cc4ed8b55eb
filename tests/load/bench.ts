// `npm run bench`: the figures the README quotes. Not part of `npm test` (timing is noisy).
//  1. estimates/s of the engine's estimate() on validated input, in-process on one core;
//  2. calls/s of POST /v1/calculations/voltage-drop against GET /v1/health on the same server,
//     with autocannon in this process and the server in another (20 connections, 10 s).
import { spawnSync } from 'node:child_process';
import { measureHttp } from './http-ratio.js';

const engine = spawnSync(process.execPath, ['--import', 'tsx', 'tests/load/estimate-throughput.ts'], { stdio: 'inherit' });

console.log('\nHTTP (autocannon, 20 connections, 10 s each, server in its own process):');
const build = spawnSync('npm', ['run', '--silent', 'build:server'], { stdio: 'ignore' });
if (build.status !== 0) throw new Error('server build failed');
const http = await measureHttp();
const ratioOk = http.ratio >= 0.8;
console.log(`  GET  /v1/health                      ${Math.round(http.healthRps).toLocaleString('en')} req/s`);
console.log(`  POST /v1/calculations/voltage-drop   ${Math.round(http.voltageDropRps).toLocaleString('en')} req/s`);
console.log(`${ratioOk ? 'ok  ' : 'SLOW'} voltage-drop / health = ${http.ratio.toFixed(2)} (target ≥ 0.80)`);
process.exitCode = engine.status !== 0 || !ratioOk ? 1 : 0;
