import { createServer, type Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import express from 'express';
import type { Logger } from 'pino';
import { fakeApiRouter } from './fake-api.js';
import { createFakeLedger, type FakePrice } from './fake-ledger.js';
import { addHostedPages } from './fake-pages.js';
import { addSimulationControls } from './fake-simulation.js';
import { fakeStateFile, type FakeMeterEvent, type FakeState } from './fake-state.js';
import { signPayload } from './signature.js';

export type { FakePrice } from './fake-ledger.js';

export interface FakeProviderOptions {
  dataDir: string;
  host: string;
  /** 0: any free port. */
  port?: number;
  /** The key the API's SDK sends; any other is refused as the provider would. */
  secretKey: string;
  /** Webhooks are signed with this, as the provider signs with an endpoint's secret. */
  webhookSecret: string;
  logger: Logger;
  /** First retry delay after a non-2xx; doubled per attempt. */
  retryDelayMs?: number;
  /** Deliveries of one event before it is given up (and logged). */
  maxAttempts?: number;
  clock?: () => Date;
}

export interface FakeProvider {
  /** Where the SDK connects (host, port, protocol options). */
  host: string;
  port: number;
  url: string;
  setPrices(prices: FakePrice[]): void;
  /** Where events go; until set, they wait (and survive a restart). */
  setWebhookUrl(url: string): void;
  /** The meter events received (tests read what was reported). */
  meterEvents(): FakeMeterEvent[];
  /** Resolves once no event waits for delivery (tests; a shutdown does not need it). */
  drained(): Promise<void>;
  close(): Promise<void>;
}


/**
 * A local stand-in for the payment provider, so billing runs and is tested offline. It answers
 * only the calls the API makes through the SDK (customers, checkout sessions in subscription
 * mode, subscriptions, invoices, meter events, billing portal sessions: fake-api.ts), serves plain
 * hosted pages (checkout with pay and decline, invoice, payment details: fake-pages.ts), plays
 * the calendar on demand (fake-simulation.ts) and delivers signed webhooks with retries (here).
 * Its state lives in DATA_DIR, written atomically.
 */
export async function startFakeProvider(options: FakeProviderOptions): Promise<FakeProvider> {
  const clock = options.clock ?? (() => new Date());
  const now = () => Math.floor(clock().getTime() / 1000);
  const store = fakeStateFile(options.dataDir);
  const state: FakeState = store.load();
  const retryDelayMs = options.retryDelayMs ?? 1000;
  const maxAttempts = options.maxAttempts ?? 8;
  let webhookUrl: string | undefined;
  let closed = false;
  let delivering: Promise<void> | undefined;
  let retryTimer: NodeJS.Timeout | undefined;
  const save = () => store.save(state);

  /** One delivery pass at a time; failed events wait for the next pass (exponential back-off). */
  const deliver = (): Promise<void> => {
    if (delivering) return delivering;
    const pass = (async () => {
      await Promise.resolve(); // so `delivering` is set before the pass can end
      try {
        let failedDelay: number | undefined;
        for (const entry of [...state.pending]) {
          if (closed || !webhookUrl) return;
          const payload = JSON.stringify(entry.event);
          let ok = false;
          try {
            const res = await fetch(webhookUrl, {
              method: 'POST',
              headers: { 'content-type': 'application/json', 'stripe-signature': signPayload(payload, options.webhookSecret, now()) },
              body: payload,
            });
            ok = res.ok;
            await res.arrayBuffer();
          } catch {
            ok = false;
          }
          entry.attempts += 1;
          if (ok || entry.attempts >= maxAttempts) {
            if (!ok) options.logger.warn({ event: entry.event.id, type: entry.event.type }, 'simulated payments: webhook given up after retries');
            state.pending.splice(state.pending.indexOf(entry), 1);
          } else {
            failedDelay = Math.min(failedDelay ?? Infinity, retryDelayMs * 2 ** (entry.attempts - 1));
          }
          save();
        }
        if (failedDelay !== undefined && !closed) {
          clearTimeout(retryTimer);
          retryTimer = setTimeout(() => void deliver(), failedDelay);
          retryTimer.unref();
        }
      } finally {
        delivering = undefined; // one pass at a time: this is the one
      }
    })();
    delivering = pass;
    return pass;
  };


  const ledger = createFakeLedger(state, clock, save, () => {
    save();
    void deliver();
  });

  const app = express();
  app.disable('x-powered-by');
  // The SDK posts form-encoded bodies with bracketed keys (items[0][price]); extended parsing reads them.
  app.use(express.urlencoded({ extended: true, limit: '64kb' }));
  app.use('/v1', fakeApiRouter(ledger, options.secretKey));
  addHostedPages(app, ledger);
  addSimulationControls(app, ledger);

  const server: Server = createServer(app);
  await new Promise<void>((resolve, reject) => {
    server.once('error', reject);
    server.listen(options.port ?? 0, options.host, () => {
      server.off('error', reject);
      resolve();
    });
  });
  const { port } = server.address() as AddressInfo;
  const host = options.host === '0.0.0.0' || options.host === '::' ? 'localhost' : options.host;
  const baseUrl = `http://${host}:${port}`;
  ledger.setBaseUrl(baseUrl);

  return {
    host,
    port,
    url: baseUrl,
    setPrices(list) {
      ledger.prices.clear();
      for (const p of list) ledger.prices.set(p.id, p);
    },
    meterEvents(): FakeMeterEvent[] {
      return structuredClone(Object.values(state.meterEvents));
    },
    setWebhookUrl(url) {
      webhookUrl = url;
      void deliver();
    },
    async drained() {
      while (state.pending.length > 0 && !closed && webhookUrl) {
        await new Promise((r) => setTimeout(r, 10));
      }
    },
    async close() {
      closed = true;
      clearTimeout(retryTimer);
      await delivering;
      server.closeAllConnections();
      await new Promise<void>((resolve) => server.close(() => resolve()));
    },
  };
}
