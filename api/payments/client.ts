import Stripe from 'stripe';

/** How the API reaches the payment provider: the real one, or the local simulation. */
export interface PaymentsConnection {
  secretKey: string;
  webhookSecret: string;
  /** Unset: the provider's own API. */
  apiUrl?: string;
  /** True when the local simulation answers (said at start-up and in GET /v1/billing). */
  simulated: boolean;
}

/** Seconds a signed webhook stays acceptable (the SDK's default is the same five minutes). */
export const WEBHOOK_TOLERANCE_SECONDS = 300;

/** The official SDK, pointed with its host/port/protocol options at the configured address. */
export function createPaymentsClient(connection: PaymentsConnection): Stripe {
  const target = connection.apiUrl ? new URL(connection.apiUrl) : undefined;
  return new Stripe(connection.secretKey, {
    ...(target && {
      host: target.hostname,
      port: Number(target.port || (target.protocol === 'https:' ? 443 : 80)),
      protocol: target.protocol === 'https:' ? 'https' : 'http',
    }),
    maxNetworkRetries: 2,
    timeout: 20_000,
    telemetry: false,
    appInfo: { name: 'Treadwise' },
  });
}
