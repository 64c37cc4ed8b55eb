import cluster from 'node:cluster';
import { randomBytes } from 'node:crypto';
import type { Logger } from 'pino';
import type { Config } from '../config.js';
import type { PaymentsConnection } from './client.js';
import { startFakeProvider, type FakeProvider } from './fake-provider.js';

export interface Payments {
  connection: PaymentsConnection;
  /** The local simulation, when no provider is configured. */
  fake?: FakeProvider;
}

/**
 * The configured provider, or (without PAYMENTS_SECRET_KEY) the local simulation on a free
 * port with secrets made up for this process: both ends live here, so nothing needs keeping.
 */
export async function startPayments(config: Config, logger: Logger): Promise<Payments | undefined> {
  if (config.payments) return { connection: { ...config.payments, simulated: false } };
  // Each worker would start a simulation of its own over one state file: billing needs a real provider there.
  if (cluster.isWorker) {
    logger.warn('billing is off: several workers need PAYMENTS_SECRET_KEY and PAYMENTS_WEBHOOK_SECRET (the local simulation serves one process)');
    return undefined;
  }
  const secretKey = `sk_test_sim${randomBytes(16).toString('hex')}`;
  const webhookSecret = `whsec_sim${randomBytes(16).toString('hex')}`;
  const host = config.host === '0.0.0.0' || config.host === '::' ? '127.0.0.1' : config.host;
  const fake = await startFakeProvider({ dataDir: config.dataDir, host, port: 0, secretKey, webhookSecret, logger });
  return { connection: { secretKey, webhookSecret, apiUrl: fake.url, simulated: true }, fake };
}
