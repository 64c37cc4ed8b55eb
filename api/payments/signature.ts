import { createHmac } from 'node:crypto';

/**
 * The provider's webhook signature header: `t=<unix seconds>,v1=<hex HMAC-SHA256 of "t.payload"
 * under the endpoint secret>`. The SDK's constructEvent verifies it (tests prove it against the
 * SDK's own test-header helper).
 */
export function signPayload(payload: string, secret: string, timestampSeconds: number): string {
  const v1 = createHmac('sha256', secret).update(`${timestampSeconds}.${payload}`, 'utf8').digest('hex');
  return `t=${timestampSeconds},v1=${v1}`;
}
