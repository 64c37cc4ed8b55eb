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
import { gracefulCloser } from './graceful-close.js';
import { createHttpServer } from './http-server.js';
import { shareWorkerRegistries } from './metrics/cluster-metrics.js';

export interface RunningServer {
  url: string;
  database: Database;
  seed: SeedResult;
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
  try {
    await migrateDatabase(database);
    seed = await seedDemo(database, config.seedDemo, secrets.pepper);
    app = createApp({ config, database, logger, secrets, clock: () => new Date() });
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
  } catch (err) {
    await database.close(); // before the lock goes, so the next owner finds the files closed
    throw err;
  }
  const closer = gracefulCloser(server);
  const { port } = server.address() as AddressInfo;
  const host = config.host === '0.0.0.0' || config.host === '::' ? 'localhost' : config.host;

  let closing: Promise<void> | undefined;
  const close = () =>
    (closing ??= (async () => {
      // Answers under way reach their clients (up to SHUTDOWN_DRAIN_MS), then the sockets close.
      await closer.close(config.shutdownDrainMs);
      // In-flight requests are done: write the buffered usage and last-used times, then close.
      await app.locals.services.passwordResets.settled(); // reset mails started before the stop
      await app.locals.services.batchJobs.close(); // the chunk under way is written; later ones resume at the next start
      await app.locals.services.usageMeter.close();
      await app.locals.services.rateLimitStores.close();
      await database.close();
      await lock?.release();
    })());

  return { url: `http://${host}:${port}`, database, seed, close };
}
