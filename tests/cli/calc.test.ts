import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { runCli } from '../support/cli-run.js';
import { startCliServer, type CliServer } from '../support/cli-server.js';

let s: CliServer;
let key: string[];
beforeAll(async () => {
  s = await startCliServer();
  key = ['--api-url', s.apiUrl, '--api-key', s.token];
});
afterAll(async () => {
  await s.close();
});

describe('treadwise calc', () => {
  it('voltage-drop: a run within the limit exits 0, one over it exits 3', async () => {
    // IEC 60228 class 5, 0.75 mm²: 26.0 Ω/km at 20 °C; loop 2 × 10 m → 0.52 Ω; 4 A → 2.08 V = 8.67 % of 24 V
    const over = await runCli(['calc', 'voltage-drop', '--supply-v', '24', '--current-a', '4', '--length-m', '10', '--mm2', '0.75', ...key]);
    expect(over.code).toBe(3);
    expect(over.stdout).toMatch(/^Drop +2\.08 V \(8\.67 %\), limit 5 % — OVER the limit$/m);
    expect(over.stdout).toMatch(/^Resistance +26 Ω\/km, loop 0\.52 Ω/m);
    expect(over.stderr).toBe('treadwise: the drop 8.67 % is over the 5 % limit\n');

    // same conductor, 2 m: 0.104 Ω × 4 A = 0.416 V = 1.73 %
    const within = await runCli(['calc', 'voltage-drop', '--supply-v', '24', '--current-a', '4', '--length-m', '2', '--mm2', '0.75', '--json', ...key]);
    expect(within.code).toBe(0);
    expect(JSON.parse(within.stdout)).toMatchObject({ withinLimit: true, dropV: 0.416, resistanceOhmPerKm: 26 });
  });

  it('voltage-drop needs exactly one of --mm2 and --awg, and numbers for numbers', async () => {
    const neither = await runCli(['calc', 'voltage-drop', '--supply-v', '24', '--current-a', '4', '--length-m', '2', ...key]);
    expect(neither.code).toBe(2);
    expect(neither.stderr).toBe('treadwise: give the conductor as --mm2 <mm²> or --awg <n> (one of them)\n');
    const word = await runCli(['calc', 'voltage-drop', '--supply-v', 'twelve', '--current-a', '4', '--length-m', '2', '--mm2', '1', ...key]);
    expect(word.code).toBe(2);
    expect(word.stderr).toContain('--supply-v: must be a number');
    const missing = await runCli(['calc', 'voltage-drop', '--current-a', '4', ...key]);
    expect(missing.code).toBe(2);
    expect(missing.stderr).toContain("required option '--supply-v <V>' not specified");
  });

  it('cable recommends the smallest size that passes', async () => {
    // 12 m, 4 A, 24 V, 5 %: 1.5 mm² (13.3 Ω/km, IEC 60228 class 5) drops 5.32 %; 2.5 mm² (7.98 Ω/km) drops 3.19 %
    const run = await runCli(['calc', 'cable', '--supply-v', '24', '--current-a', '4', '--length-m', '12', ...key]);
    expect(run.code).toBe(0);
    expect(run.stdout).toMatch(/^Recommended +2\.5 mm²: drop 0\.766 V \(3\.19 %\)/m);
    expect(run.stdout).toMatch(/^1\.5 mm² +1\.277 +5\.32 +16 +no$/m);
  });

  it('driver picks a driver at no more than 80 % loading', async () => {
    // 119 W / 0.8 = 148.75 W → one 150 W driver (80 % loading: common practice, no published source)
    const run = await runCli(['calc', 'driver', '--load-w', '119', '--output-v', '24', '--json', ...key]);
    expect(run.code).toBe(0);
    expect(JSON.parse(run.stdout)).toMatchObject({ requiredRatingW: 148.75, drivers: [{ ratingW: 150, count: 1 }] });
  });

  it('pixels gives the refresh rate of a one-wire run', async () => {
    // 800 kbit/s one-wire: 1.25 µs per bit × 24 bits × 1080 pixels = 32 400 µs + 280 µs reset → 30.6 Hz (timing from the protocol's bit rate)
    const run = await runCli(['calc', 'pixels', '--pixels', '1080', '--protocol', 'one-wire-800k', ...key]);
    expect(run.code).toBe(0);
    expect(run.stdout).toMatch(/^Frame +32680 µs \(25920 bits\) → 30\.6 Hz at most$/m);
  });

  it('reels packs 850x14 into three 5 m reels', async () => {
    // five 850 mm pieces per 5000 mm reel (5 × 850 = 4250): ⌈14 / 5⌉ = 3 reels
    const run = await runCli(['calc', 'reels', '850x14', '--json', ...key]);
    expect(run.code).toBe(0);
    const answer = JSON.parse(run.stdout);
    expect(answer.reels).toBe(3);
    expect(answer.plan.flatMap((c: { piecesMm: number[] }) => c.piecesMm)).toHaveLength(14);
    const bad = await runCli(['calc', 'reels', '85cm', ...key]);
    expect(bad.code).toBe(2);
    expect(bad.stderr).toContain('piece "85cm" is not a length in mm');
  });
});
