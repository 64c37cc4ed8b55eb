import { describe, expect, it } from 'vitest';
import { createLogger } from '../../api/logger.js';
import { createBillingMaintenance } from '../../api/services/billing-maintenance.js';

describe('the billing maintenance loop', () => {
  it('runs a pass at start, never two at once, survives a failed pass, and close() waits for the pass under way', async () => {
    let passes = 0;
    let running = 0;
    let most = 0;
    let release: () => void = () => {};
    const maintain = async () => {
      passes += 1;
      running += 1;
      most = Math.max(most, running);
      await new Promise<void>((r) => (release = r));
      running -= 1;
      if (passes === 1) throw new Error('provider unreachable');
    };
    const loop = createBillingMaintenance({ maintain, logger: createLogger('silent'), intervalMs: 5 });
    loop.start();
    expect(passes).toBe(1);
    await new Promise((r) => setTimeout(r, 30)); // ticks while the first pass waits start no second one
    expect(passes).toBe(1);
    release();
    await expect.poll(() => passes, { timeout: 2000, interval: 5 }).toBe(2); // the failure was logged, the next tick ran
    let closed = false;
    const closing = loop.close().then(() => (closed = true));
    await new Promise((r) => setTimeout(r, 20));
    expect(closed).toBe(false);
    release();
    await closing;
    expect(most).toBe(1);
  });
});
