import type { Logger } from 'pino';

/** How often the grace fall-backs and the overage report run (both idempotent, several instances may run them). */
export const BILLING_MAINTENANCE_MS = 10 * 60 * 1000;

/**
 * The periodic billing work, scheduled like the batch job sweep: an unref'd interval started
 * with the server, one pass at a time, a failed pass logged and tried again at the next tick.
 */
export function createBillingMaintenance({ maintain, logger, intervalMs = BILLING_MAINTENANCE_MS }: { maintain: () => Promise<void>; logger: Logger; intervalMs?: number }) {
  let timer: NodeJS.Timeout | undefined;
  let running: Promise<void> | undefined;
  const tick = () => {
    running ??= maintain()
      .catch((err) => logger.error({ err }, 'billing maintenance failed'))
      .finally(() => {
        running = undefined;
      });
    return running;
  };
  return {
    start(): void {
      timer = setInterval(() => void tick(), intervalMs);
      timer.unref();
      void tick();
    },
    async close(): Promise<void> {
      clearInterval(timer);
      await running;
    },
  };
}
