import cluster from 'node:cluster';
import type { AddressInfo } from 'node:net';
import type { Server } from 'node:http';
import path from 'node:path';
import type { Logger } from 'pino';
import { createApp } from './app.js';
import { loadSecrets } from './auth/secrets.js';
import type { Config } from './config.js';
import { openDatabase, type Database } from './db/client.js';
import { lockDataDir, type DataDirLock } from './db/data-dir-lock.js';
import { migrateDatabase } from './db/migrate.js';
import { seedDemo, type SeedResult } from './db/seed.js';
import { DEMO_SHOP_ORGANIZATION } from './db/demo-data.js';
import { loadShopKey, saveShopKey } from './demo-shop/shop-key.js';
import { startDemoShop, type DemoShop } from './demo-shop/shop-server.js';
import { readEmbedBundle } from './embed/bundle.js';
import { gracefulCloser } from './graceful-close.js';
import { createHttpServer } from './http-server.js';
import { shareWorkerRegistries } from './metrics/cluster-metrics.js';
import { startPayments, type Payments } from './payments/start.js';
import { providerPrices } from './services/plans.js';

export interface RunningServer {
  url: string;
  database: Database;
  seed: SeedResult;
  /** The Harbor Lane demo shop (a second origin), when the demo is seeded and the shop is present. */
  demoShop?: DemoShop;
  /** Where payments go; `simulated` with the local fake's address when no provider is configured (off in cluster workers without one). */
  payments: { simulated: boolean; url?: string };
  /**
   * Stops accepting connections, lets in-flight answers reach their clients (up to
   * SHUTDOWN_DRAIN_MS), writes the buffered usage, closes the database and releases DATA_DIR.
   */
  close(): Promise<void>;
}

export async function startServer(config: Config, logger: Logger): Promise<RunningServer> {
  // The embedded database has one owner: lock DATA_DIR before reading its secrets or files.
  // A real server (DATABASE_URL) has no data directory and is shared by design.
  const lock = config.databaseUrl ? undefined : await lockDataDir(config.dataDir, lockLost(logger));
  try {
    return await listening(config, logger, lock);
  } catch (err) {
    await lock?.release();
    throw err;
  }
}

/** Another process removed or replaced our lock: stop at once rather than write beside it. */
const lockLost = (logger: Logger) => (err: Error) => {
  logger.fatal({ err }, 'the data directory lock was lost; stopping so two servers never write one database');
  process.exit(1);
};

async function listening(config: Config, logger: Logger, lock: DataDirLock | undefined): Promise<RunningServer> {
  const secrets = loadSecrets(config); // before the database: a missing secret is a config error
  const database = await openDatabase({
    url: config.databaseUrl,
    dataDir: path.join(config.dataDir, 'pglite'),
  });
  let app: ReturnType<typeof createApp>;
  let seed: SeedResult;
  let server: Server;
  let demoShop: DemoShop | undefined;
  let payments: Payments | undefined;
  try {
    await migrateDatabase(database);
    // The shop listens first: its origins go into the demo page key's allow-list at seeding.
    // One process only: cluster workers would each serve it with a different knowledge of the key.
    demoShop = config.seedDemo && !cluster.isWorker ? await startDemoShopOrWarn(config, logger) : undefined;
    seed = await seedDemo(database, config.seedDemo, secrets.pepper, { extraEmbedOrigins: { [DEMO_SHOP_ORGANIZATION]: demoShop?.origins ?? [] } });
    // Before the app: the SDK is built with the provider's (or the simulation's) address.
    payments = await startPayments(config, logger);
    payments?.fake?.setPrices(await providerPrices(database.db));
    app = createApp({ config, database, logger, secrets, clock: () => new Date(), payments: payments?.connection });
    // Under WEB_CONCURRENCY the primary gathers every worker's metrics from these registries.
    if (cluster.isWorker) shareWorkerRegistries(app.locals.services.metrics.registries());
    server = createHttpServer(app, config);
    await new Promise<void>((resolve, reject) => {
      server.once('error', reject);
      server.listen(config.port, config.host, () => {
        server.off('error', reject);
        resolve();
      });
    });
    // Jobs left queued or running by an earlier process (a crash, a restart) resume here.
    await app.locals.services.batchJobs.start();
    // Grace fall-backs and the daily overage report (idempotent: every instance may run them).
    app.locals.services.billing?.maintenance.start();
  } catch (err) {
    await payments?.fake?.close();
    await demoShop?.close();
    await database.close(); // before the lock goes, so the next owner finds the files closed
    throw err;
  }
  const closer = gracefulCloser(server);
  const { port } = server.address() as AddressInfo;
  const host = config.host === '0.0.0.0' || config.host === '::' ? 'localhost' : config.host;
  const url = `http://${host}:${port}`;
  if (demoShop) configureDemoShop(demoShop, config, seed, url);
  // The simulation delivers its events to our own webhook route, as the provider would.
  const loopback = config.host === '0.0.0.0' || config.host === '::' ? '127.0.0.1' : config.host.includes(':') ? `[${config.host}]` : config.host;
  payments?.fake?.setWebhookUrl(`http://${loopback}:${port}/v1/billing/webhook`);

  let closing: Promise<void> | undefined;
  const close = () =>
    (closing ??= (async () => {
      // Answers under way reach their clients (up to SHUTDOWN_DRAIN_MS), then the sockets close.
      await demoShop?.close();
      await payments?.fake?.close();
      await closer.close(config.shutdownDrainMs);
      // In-flight requests are done: write the buffered usage and last-used times, then close.
      await app.locals.services.passwordResets.settled(); // reset mails started before the stop
      await app.locals.services.batchJobs.close(); // the chunk under way is written; later ones resume at the next start
      await app.locals.services.billing?.maintenance.close();
      await app.locals.services.usageMeter.close();
      await app.locals.services.rateLimitStores.close();
      await database.close();
      await lock?.release();
    })());

  return { url, database, seed, demoShop, payments: { simulated: payments?.connection.simulated ?? false, url: payments?.fake?.url }, close };
}

/** The demo shop is an extra: a busy port must not keep the API from starting. */
async function startDemoShopOrWarn(config: Config, logger: Logger): Promise<DemoShop | undefined> {
  try {
    return await startDemoShop({ dir: config.demoShopDir, host: config.host, port: config.demoShopPort });
  } catch (err) {
    logger.warn({ err, port: config.demoShopPort }, 'the demo shop could not listen (set DEMO_SHOP_PORT); starting without it');
    return undefined;
  }
}

/** The shop page gets the API's address, the script's manifest and Harbor Lane's page key. */
function configureDemoShop(shop: DemoShop, config: Config, seed: SeedResult, apiUrl: string): void {
  const seededKey = seed.keys.find((k) => k.organization === DEMO_SHOP_ORGANIZATION && k.kind === 'embed')?.token;
  // The seed prints keys once; a data directory keeps the page key for the next starts.
  if (seededKey && !config.databaseUrl) saveShopKey(config.dataDir, seededKey);
  const embedKey = seededKey ?? (config.databaseUrl ? undefined : loadShopKey(config.dataDir));
  shop.configure({ apiOrigin: apiUrl, embedKey, manifest: readEmbedBundle(config.embedDir)?.manifest });
}
