import cluster from 'node:cluster';
import { runPrimary, singleProcessReason } from './cluster.js';
import { ConfigError, loadConfig, type Config } from './config.js';
import { DEMO_PASSWORD, demoMembers, demoOperator } from './db/demo-data.js';
import { createServerLogger } from './logger.js';
import { startServer, type RunningServer } from './server.js';

function configOrExit(): Config {
  try {
    return loadConfig();
  } catch (err) {
    if (!(err instanceof ConfigError)) throw err;
    console.error(err.message);
    process.exit(1);
  }
}

async function main(): Promise<void> {
  const config = configOrExit();
  const { logger, flush } = createServerLogger(config.logLevel);
  // Lines still queued reach stdout before the process ends, however it ends normally.
  process.on('exit', flush);
  const single = singleProcessReason(config);
  if (single) process.stdout.write(`${single}\n`);
  else if (config.webConcurrency > 1 && cluster.isPrimary) return runPrimary(config, logger);

  // Handlers go in before anything starts: a signal during start-up must still close the
  // database cleanly instead of killing the process mid-write.
  let server: RunningServer | undefined;
  let stopping = false;
  const shutdown = (signal: string) => {
    if (stopping) return;
    stopping = true;
    logger.info({ signal }, 'shutting down');
    if (server) void stop(server);
  };
  const stop = (running: RunningServer) =>
    running.close().then(
      () => process.exit(0),
      (err) => {
        logger.error({ err }, 'shutdown failed');
        process.exit(1);
      },
    );
  process.on('SIGTERM', () => shutdown('SIGTERM'));
  process.on('SIGINT', () => shutdown('SIGINT'));

  server = await startServer(config, logger);
  if (stopping) return void stop(server);
  // Under WEB_CONCURRENCY the first worker speaks for all; the others only log that they listen.
  if (cluster.isWorker && cluster.worker?.id !== 1) return void logger.info({ worker: cluster.worker?.id }, 'worker listening');

  const where = config.databaseUrl ? 'PostgreSQL (DATABASE_URL)' : `PGlite in ${config.dataDir}`;
  // Plain lines on stdout, written at once, so a person starting the demo sees where to go.
  const workers = cluster.isWorker ? `, ${config.webConcurrency} workers` : '';
  const lines = [
    `Treadwise is running at ${server.url}  (database: ${where}${workers})`,
    `  Console:  ${server.url}/`,
    `  API docs: ${server.url}/docs   (OpenAPI: ${server.url}/openapi.json)`,
  ];
  if (server.payments.simulated) lines.push(`  Payments: SIMULATED by a local stand-in at ${server.payments.url}/ (no real payment provider; set PAYMENTS_SECRET_KEY for one)`);
  if (server.demoShop) lines.push(`  Demo shop: ${server.demoShop.url}/   (Harbor Lane's product page with the estimator)`);
  if (server.seed.seeded || config.seedDemo) {
    lines.push(`  Demo sign-in: ${demoOperator.email} (operator), ${demoMembers.map((m) => `${m.email} (${m.role})`).join(', ')}`);
    lines.push(`  Demo password for every demo account: ${DEMO_PASSWORD}`);
  }
  if (server.seed.seeded) {
    lines.push('  Demo data seeded. Demo API keys (shown only now; create more with POST /v1/keys):');
    for (const key of server.seed.keys) {
      const where = key.allowedOrigins.length ? `  from ${key.allowedOrigins.join(', ')}` : '';
      lines.push(`    ${key.organization.padEnd(16)} ${key.kind.padEnd(12)} ${key.token}${where}`);
    }
  } else if (config.seedDemo) {
    lines.push('  Demo data already present (its keys were printed at the first start).');
  }
  process.stdout.write(`${lines.join('\n')}\n`);
}

main().catch((err) => {
  console.error(`Treadwise failed to start: ${err instanceof Error ? err.message : String(err)}`);
  process.exit(1);
});
